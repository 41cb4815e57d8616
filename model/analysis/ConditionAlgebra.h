#pragma once

#include "Mdd.h"
#include "condition/Evaluator.h"
#include "routing/CompiledRouting.h"

#include <QList>

#include <cstdint>
#include <span>
#include <vector>

namespace rb::analysis {

// One piece of an item's value set, kept so that a set of cells can be printed
// back exactly: a code, a number, an interval of numbers, a text value, or
// "any other text". Plain data (a text piece's string sits in its variable's
// `texts`): an instrument's pieces run to megabytes, and pieces that own
// strings made building, printing and freeing them walk twice the memory.
struct ValuePiece {
    enum class Kind : std::uint8_t { Code, Point, Interval, Text, OtherText };
    Kind kind = Kind::Point;
    int text = -1;            // Text, OtherText: index in DecisionVar::texts
    double low = 0, high = 0; // Interval: bounds (may be +-inf), open at both ends; else the value
    double sample = 0;        // Code, Point, Interval: a number of this piece (for evaluation)

    bool isText() const { return kind == Kind::Text || kind == Kind::OtherText; }
};

// A cell: a set of values no condition of the instrument tells apart. Cell 0
// of a value variable is always *empty* (not presented).
struct ValueCell {
    bool empty = false;
    bool answered = false; // presented and not a missing code / blank text
    // Its pieces: DecisionVar::pieces[firstPiece, firstPiece + pieceCount).
    int firstPiece = 0;
    int pieceCount = 0;
};

// A decision variable. Ordinary items have one (their value); a `multi` item
// has a status variable (empty / presented, not answered / answered) and one
// yes-no variable per code that a `has` condition names.
struct DecisionVar {
    enum class Role { Value, MultiStatus, MultiHas };
    Role role = Role::Value;
    int position = -1;
    qint64 code = 0; // MultiHas
    QList<ValueCell> cells;
    // Every cell's pieces, cell after cell, in one block per variable: a list
    // per cell cost two allocations a cell, scattered over the heap, which
    // printing universes and freeing the algebra then walked.
    QList<ValuePiece> pieces;
    // The text pieces' strings: a literal (Text), or the literal followed by
    // U+0001 (OtherText: the values just after it, blank for the first gap).
    QStringList texts;

    std::span<const ValuePiece> piecesOf(int cell) const {
        const ValueCell& c = cells[cell];
        return {pieces.constData() + c.firstPiece, std::size_t(c.pieceCount)};
    }
    const QString& textOf(const ValuePiece& p) const { return texts[p.text]; }
    // A value of this piece (for evaluation).
    cond::CellValue valueOf(const ValuePiece& p) const {
        return p.isText() ? cond::CellValue::ofText(textOf(p))
                          : cond::CellValue::ofNumber(p.sample);
    }
    // A value of a presented cell (for evaluation).
    cond::CellValue sampleOf(int cell) const { return valueOf(piecesOf(cell).front()); }
};

// The canonical condition algebra of one instrument: every condition becomes a
// node of an Mdd over a finite partition of each gate item's values (codes and
// missing codes, numeric intervals cut at every threshold any condition uses,
// text literals plus "other", and empty). Only items that some usable
// condition reads get variables; later items sit nearer the root, which keeps
// the in-order dynamic programme of the analysis cheap.
class ConditionAlgebra {
public:
    // `extra` conditions are taken into account for the partition (tests and
    // callers that want to ask about conditions not in the instrument).
    explicit ConditionAlgebra(const CompiledRouting& routing,
                              const QList<cond::ExprPtr>& extra = {});

    Mdd& mdd() { return m_mdd; }
    const Mdd& mdd() const { return m_mdd; }
    const CompiledRouting& routing() const { return *m_routing; }

    int condition(const cond::Expr& expr);
    int conditionText(const QString& text); // -1 when not usable
    // The condition as evaluated at a point of the route where the items at or
    // after `firstEmpty` have not been presented yet (so they read as empty).
    int conditionAt(const cond::Expr& expr, int firstEmpty);

    bool satisfiable(int f) const { return f != Mdd::False; }
    bool equivalent(int f, int g) const { return f == g; }
    bool implies(int f, int g) { return m_mdd.implies(f, g); }

    // Item at `position` is empty / presented (with its value in its domain).
    int emptyOf(int position) const;
    int presentedOf(int position) const;
    bool isGateItem(int position) const { return m_varsOfPosition.at(position).count > 0; }
    std::span<const int> varsOf(int position) const {
        const VarSpan s = m_varsOfPosition.at(position);
        return {m_varIds.data() + s.first, std::size_t(s.count)};
    }
    const DecisionVar& variable(int var) const { return m_vars.at(var); }
    int varCount() const { return int(m_vars.size()); }

    // The cell per variable of one respondent's final values (by position).
    std::vector<int> assignmentOf(const QList<cond::CellValue>& values) const;
    // A value of the item at `position` lying in the given cells (for replay of
    // a witness assignment); `cells` indexes varsOf(position).
    cond::CellValue sampleValue(int position, const std::vector<int>& cellOfVar) const;

private:
    struct ItemAtoms {
        // Compare / In / Has / Answered on this item, in the routing's trees (or
        // the `extra` ones, kept alive): pointers, not copies of every atom.
        int first = 0, count = 0; // in m_atomList
        QList<qint64> hasCodes;
        bool read = false; // some usable condition reads the item (asked() included)
    };
    std::span<const cond::Expr* const> atomsOf(const ItemAtoms& atoms) const {
        return {m_atomList.data() + atoms.first, std::size_t(atoms.count)};
    }
    void collect(const cond::Expr& expr, std::vector<std::pair<int, const cond::Expr*>>& found);
    void groupAtoms(const std::vector<std::pair<int, const cond::Expr*>>& found);
    void buildVariables();
    void buildValueVar(int position, const ItemAtoms& atoms);
    void buildMultiVars(int position, const ItemAtoms& atoms);
    QList<ValuePiece> candidatePieces(int position, const ItemAtoms& atoms,
                                      QStringList& texts) const;
    QList<bool> signature(int position, const ItemAtoms& atoms, const cond::CellValue& v) const;
    int atom(const cond::Expr& expr);
    int valueCellOf(int var, const cond::CellValue& value) const;
    // Every name reads `value` (by address: the environment must not outlive it).
    cond::Environment singleEnvironment(int position, const cond::CellValue& value) const;

    const CompiledRouting* m_routing;
    Mdd m_mdd;
    QList<DecisionVar> m_vars;
    // Per position (vectors, not hashes: the programme asks for every item).
    // A list per position cost an allocation per gate item, and copying one
    // touched its reference count: the ids sit in one vector, item by item.
    struct VarSpan {
        int first = 0; // in m_varIds
        int count = 0;
    };
    std::vector<VarSpan> m_varsOfPosition;
    std::vector<int> m_varIds;
    // Per position (a vector: conditions read nearby items, whose entries then
    // sit together, where a hash table put each one somewhere else).
    std::vector<ItemAtoms> m_atoms;
    std::vector<const cond::Expr*> m_atomList; // every item's atoms, item after item
    std::vector<int> m_empty, m_presented;     // position -> node (true for non-gate items)
    struct AtomSlot {
        const cond::Expr* expr = nullptr; // kept alive by the routing or m_keepAlive
        int node = Mdd::False;
    };
    static constexpr std::size_t AtomCacheSize = 1024;
    AtomSlot& atomSlot(const cond::Expr* expr);
    std::vector<AtomSlot> m_atomCache = std::vector<AtomSlot>(AtomCacheSize);
    QList<cond::ExprPtr> m_keepAlive;
};

} // namespace rb::analysis
