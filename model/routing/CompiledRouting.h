#pragma once

#include "condition/Expr.h"
#include "instrument/Instrument.h"

#include <QList>

#include <deque>
#include <vector>

namespace rb {

// The routing of an instrument with every condition parsed and every target
// resolved, once, for the simulator and the analyzer. Broken pieces are
// dropped as DESIGN.md says: a condition with a syntax, unknown-variable or
// type-mismatch error is "absent" (a filter then always passes, a rule never
// fires), and so is a rule whose target is unknown.
class CompiledRouting {
public:
    struct CompiledRule {
        cond::ExprPtr condition; // null: always fires
        int target = -1;         // flat position; itemCount() for END
        bool usable = true;      // false: broken condition or unknown target, never fires
    };
    struct CompiledItem {
        // Filters in effect, module's first, then the item's own, joined with an
        // `and` evaluated left to right: the item's filter is only evaluated (and
        // only reads its items) where the module's holds. Broken ones are left out.
        QList<cond::ExprPtr> filters;
        bool hasModuleFilter = false; // filters.first() is the module's
        QList<CompiledRule> rules;
    };

    explicit CompiledRouting(const Instrument& instrument);
    // Not copyable: codes() points into m_joinedCodes (moves keep a deque's addresses).
    CompiledRouting(const CompiledRouting&) = delete;
    CompiledRouting& operator=(const CompiledRouting&) = delete;
    CompiledRouting(CompiledRouting&&) = default;
    CompiledRouting& operator=(CompiledRouting&&) = default;

    const Instrument& instrument() const { return *m_instrument; }
    const ItemIndex& index() const { return m_index; }
    int itemCount() const { return m_index.size(); }
    const CompiledItem& item(int position) const { return m_items.at(position); }
    // Position of a name read by a condition (any case), or -1.
    int positionOf(const QString& name) const;
    // The same for an atom (or a name use) of a tree: its resolved position
    // when compileCondition parsed it, else the name looked up.
    int positionOf(const QString& name, int resolved) const {
        return resolved != cond::Expr::kUnresolved ? resolved : positionOf(name);
    }
    int positionOf(const cond::Expr& atom) const { return positionOf(atom.name, atom.position); }
    // True when a code is a missing code of the item at this position.
    bool isMissingCode(int position, qint64 code) const;
    // Codes (with missing codes) of the item at this position.
    const QList<Code>& codes(int position) const { return *m_codes[std::size_t(position)]; }

    // Parses a condition and reports whether it is usable (no syntax error,
    // no unknown name, no type mismatch).
    cond::ExprPtr compileCondition(const QString& text) const;

private:
    static void prefetchRules(const Item& item);
    const QList<Code>* codesOf(const Item& item);
    static void prefetchConditions(const Item& item);

    const Instrument* m_instrument;
    ItemIndex m_index;
    QList<CompiledItem> m_items;
    // Each item's codes by address: in the instrument where one list holds
    // them all (a shared list, the item's own, or its missing codes alone),
    // else in m_joinedCodes. A list per item cost an allocation per item
    // with missing codes, and touched every item's list again when freed.
    std::vector<const QList<Code>*> m_codes;
    std::deque<QList<Code>> m_joinedCodes; // deque: the addresses stay put
};

} // namespace rb
