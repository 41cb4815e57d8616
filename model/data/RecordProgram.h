#pragma once

#include "HeaderMapping.h"
#include "RecordClassification.h"

#include <QHash>

#include <cstdint>
#include <memory>
#include <vector>

namespace rb {

// The data check's per-record work compiled into flat tables, built once per
// run: a cell decoder per item (code lookups by array, numbers parsed from the
// bytes, no QString per cell) and the routing's conditions as an array of nodes
// over per-position value slots. classify() runs the reference route of
// DESIGN.md and the classification of RecordChecker without allocating once the
// scratch has grown; tst_datacheck proves both agree on random instruments and
// records. Thread-safe: one Scratch per thread, the program is read-only.
class RecordProgram {
public:
    RecordProgram(const CompiledRouting& routing, const HeaderMapping& mapping);
    RecordProgram(const RecordProgram&) = delete; // items point into its shared tables
    RecordProgram& operator=(const RecordProgram&) = delete;

    // A decoded cell: what conditions read and how the cell is classed.
    // Packed (40 bytes) so that the cells of a 300-item record take less of the
    // first-level cache; the enums are 8-bit fields.
    struct Cell {
        double number = 0;
        QByteArrayView text;               // read only in state Text (a small number leaves it)
        int codesFrom = 0, codesCount = 0; // multi: counted codes in Scratch::codes
        int slot =
            -1; // a number that is a listed code: its frequency slot (the code is the number)
        cond::CellValue::State state : 8 = cond::CellValue::State::Blank;
        CellClass presentedClass : 8 = CellClass::Blank; // when the item is presented
        bool skipIsLegitimate = true;                    // when it is not
    };
    // Per-thread working memory, reused for every record.
    struct Scratch {
        std::vector<Cell> cells;
        std::vector<qint64> codes;  // counted codes of all cells
        std::vector<int> codeSlots; // their frequency slot (-1: not a listed code)
        std::vector<uint8_t> live;  // the route's current value is the cell (else not presented)
        std::vector<uint8_t> presented, unknownSkip, implied;
        std::vector<CellClass> classes;
        std::vector<int> path; // the route (toClassification reads it off `presented` when forward)
        std::vector<uint32_t> seen;
        std::vector<qint64> ownCounters, ownFrequencies; // counted into when there is no tally
        uint32_t stamp = 0;
        bool loop = false, anyValue = false, anyViolation = false, anyInvalid = false;
        int breakOffStart = -1;
    };

    // Per-variable counters, kCounters each: one per CellClass (by its value),
    // then these. Frequencies: one per frequency slot. Presented cells are the
    // ones of the classes before LegitimateSkip (presentedCount), not counted apart.
    enum Counter { SkipAfterMissingGate = 8, BreakOffStarts, Implied, kCounters };
    static qint64 presentedCount(const qint64* counters) {
        qint64 n = 0;
        for (int c = 0; c < int(CellClass::LegitimateSkip); ++c)
            n += counters[c];
        return n;
    }
    struct Tally {
        qint64* counters = nullptr;
        qint64* frequencies = nullptr;
    };

    void prepare(Scratch& s) const;
    // Classifies one record; with a tally, also counts it there (in the same pass).
    void classify(RecordFields fields, Scratch& s, const Tally* tally = nullptr) const;
    RecordClassification toClassification(const Scratch& s) const; // for tests

    int itemCount() const { return int(m_items.size()); }
    bool hasVariable(int p) const { return m_items[size_t(p)].resultIndex >= 0; }
    int resultIndex(int p) const { return m_items[size_t(p)].resultIndex; }
    // First frequency slot of the item (its listed codes follow) and the total.
    int frequencyBase(int p) const { return m_items[size_t(p)].frequencyBase; }
    int frequencySlots() const { return m_frequencySlots; }
    int variables() const { return m_variables; }
    bool forwardOnly() const { return m_forwardOnly; } // classified in one pass

private:
    // Codes of one item by value: an array over [low, low + size) when the codes
    // are close together, a hash otherwise.
    struct CodeTable {
        struct Entry {
            MissingKind kind = MissingKind::None; // the last listing wins (as in CellInterpreter)
            bool firstIsMissing = false;          // the first listing (as CompiledRouting)
            int slot = -1;                        // frequency slot, -1: not a code
        };
        qint64 low = 0;
        std::vector<Entry> dense;
        QHash<qint64, Entry> sparse;
        const Entry* find(qint64 code) const;
        void add(qint64 code, MissingKind kind, int slot);
    };
    struct Literal {
        bool isNumber = true;
        double number = 0;
        QString text;
        QByteArray ascii; // the text when it is plain ASCII (compared as bytes)
        bool isAscii = false;
    };
    struct Node {
        cond::Expr::Kind kind = cond::Expr::Kind::True;
        cond::CompareOp op = cond::CompareOp::Eq;
        bool negated = false;
        int position = -1;        // atoms: the item read, -1 unknown (not presented)
        int first = 0, count = 0; // children in m_children, or list elements in m_elements
        bool isNumber = true;     // the literal (Compare, Has): a number...
        double number = 0;
        int literal = -1; // ...or text, in m_literals
    };
    struct Element {
        Literal low, high;
        bool hasHigh = false;
    };
    struct Rule {
        int condition = -1; // node, -1: always fires
        int target = 0;
    };
    // Cells "0".."999" decoded once, in a table shared by the items that read
    // them alike (most items of a big instrument), so it stays in the cache.
    struct Small {
        CellClass presentedClass = CellClass::Invalid;
        bool skipIsLegitimate = false;
        int slot = -1; // frequency slot (from the item's first) when the number is a code
    };
    struct ItemProgram {
        ItemType type = ItemType::Statement;
        int resultIndex = -1;
        int column = -1;
        std::vector<int> multiColumns;
        std::vector<qint64> multiCodes; // code of each multi column
        CodeTable codes;
        bool hasRange = false;
        double min = 0, max = 0;
        std::vector<int> filters; // nodes
        std::vector<Rule> rules;  // usable rules only, in order
        std::vector<int> gates;
        bool hasImplied = false;
        int impliedIf = -1; // node, -1: whenever skipped
        int frequencyBase = 0;
        const struct Small* small = nullptr; // kSmallNumbers entries, shared
    };

    // What the per-record loops read of an item, packed apart from the rest so
    // that a pass over 300 items stays in the first-level cache.
    struct Hot { // 64 bytes: one cache line per item
        const Small* small = nullptr;
        // The commonest filter, an item against a number, copied here: its node
        // is read only when the item is not a number (quickNode, else -1).
        double quickNumber = 0;
        int quickNode = -1, quickPosition = -1;
        int counterOffset = -1; // resultIndex * kCounters; -1: no variable
        int column = -1, frequencyBase = 0;
        int filtersFrom = 0;            // in m_filters, filterCount of them
        int runEnd = 0;                 // the first of a run (markRuns): one past its last item
        int rulesFrom = 0, rulesTo = 0; // in m_rules
        int gatesFrom = 0, gatesTo = 0; // in m_gates
        ItemType type : 8 = ItemType::Statement;
        cond::CompareOp quickOp : 8 = cond::CompareOp::Eq;
        bool hasImplied = false; // impliedIf is in ItemProgram
        uint8_t filterCount = 0;
    };
    void buildHot();
    void markRuns();

    int compile(const cond::Expr& expr, const CompiledRouting& routing);
    static Literal literal(const cond::Value& v);
    [[gnu::always_inline]] inline void decode(size_t position, RecordFields fields, Cell& cell,
                                              Scratch& s) const;
    void decodeNumber(const ItemProgram& t, QByteArrayView cell, Cell& out) const;
    void decodeMulti(const ItemProgram& t, RecordFields fields, Cell& out, Scratch& s) const;
    bool isSkipValue(const ItemProgram& t, QByteArrayView cell) const;
    void buildSmallTable(ItemProgram& t);
    static bool decodeAlike(const ItemProgram& a, const ItemProgram& b);
    [[gnu::always_inline]] inline bool decodeSmall(const struct Hot& t, QByteArrayView v,
                                                   Cell& out) const;
    [[gnu::always_inline]] static void countCodes(const Cell& cell, const Scratch& s,
                                                  qint64* frequencies) {
        if (cell.slot >= 0)
            ++frequencies[cell.slot];
        for (int k = 0; k < cell.codesCount; ++k)
            ++frequencies[s.codeSlots[size_t(cell.codesFrom + k)]];
    }
    // The item's filters hold (forward route; live and cells are s's).
    [[gnu::always_inline]] bool filtersHold(const Hot& t, const uint8_t* live, const Cell* cells,
                                            const Scratch& s) const {
        if (t.quickNode >= 0) {
            const auto q = size_t(t.quickPosition);
            if (live[q] && cells[q].state == cond::CellValue::State::Number)
                return numbersHold(t.quickOp, cells[q].number, t.quickNumber);
            return evaluate(t.quickNode, s);
        }
        for (int f = t.filtersFrom; f < t.filtersFrom + t.filterCount; ++f)
            if (!test(m_filters[size_t(f)], s))
                return false;
        return true;
    }
    void route(Scratch& s) const;
    void classifyForward(RecordFields fields, Scratch& s, const Tally* tally) const;
    void classifyCells(Scratch& s, const Tally* tally) const;
    void findBreakOff(Scratch& s, const Tally* tally) const;
    bool evaluate(int node, const Scratch& s) const;
    // evaluate() with its commonest case (an item against a number) inline.
    [[gnu::always_inline]] bool test(int node, const Scratch& s) const {
        const Node& n = m_nodes[size_t(node)];
        if (n.kind == cond::Expr::Kind::Compare && n.isNumber && n.position >= 0 &&
            s.live[size_t(n.position)] &&
            s.cells[size_t(n.position)].state == cond::CellValue::State::Number) {
            return numbersHold(n.op, s.cells[size_t(n.position)].number, n.number);
        }
        return evaluate(node, s);
    }
    [[gnu::always_inline]] static bool numbersHold(cond::CompareOp op, double a, double b) {
        switch (op) {
        case cond::CompareOp::Eq:
            return a == b;
        case cond::CompareOp::Ne:
            return a != b;
        case cond::CompareOp::Lt:
            return a < b;
        case cond::CompareOp::Le:
            return a <= b;
        case cond::CompareOp::Gt:
            return a > b;
        case cond::CompareOp::Ge:
            return a >= b;
        }
        return false;
    }
    bool compare(const Cell* cell, cond::CompareOp op, const Literal& v) const;
    bool answered(const Cell* cell, int position, const Scratch& s) const;
    const Cell* valueAt(int position, const Scratch& s) const {
        return position >= 0 && s.live[size_t(position)] ? &s.cells[size_t(position)] : nullptr;
    }

    std::vector<ItemProgram> m_items;
    std::vector<Hot> m_hot;
    std::vector<int> m_filters, m_gates;
    std::vector<Rule> m_rules;
    std::vector<Node> m_nodes;
    std::vector<Literal> m_literals;
    std::vector<int> m_children;
    std::vector<Element> m_elements;
    struct SmallTable {
        const ItemProgram* owner; // in m_items (sized before any table is built)
        std::unique_ptr<std::vector<Small>> entries;
    };
    std::vector<SmallTable> m_smallTables;
    QByteArray m_skipCode;
    bool m_skipCodeIsDigits = false; // then a small cell may be the skip code itself
    std::vector<int> m_impliedItems; // positions with when_skipped
    bool m_forwardOnly = true;       // every usable rule jumps forward: no loop possible
    int m_frequencySlots = 0;
    int m_variables = 0;
};

} // namespace rb
