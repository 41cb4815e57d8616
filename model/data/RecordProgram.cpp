#include "RecordProgram.h"

#include "CellReading.h"
#include "routing/Simulator.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstring>

namespace rb {

using State = cond::CellValue::State;
using Kind = cond::Expr::Kind;

namespace {

constexpr qint64 kDenseCodeSpan = 4096;
constexpr int kSmallNumbers = 1000; // cells of 1 to 3 digits

bool isAscii(QByteArrayView bytes) {
    for (char c : bytes)
        if (static_cast<unsigned char>(c) >= 0x80)
            return false;
    return true;
}

// QString::trimmed() on ASCII removes exactly these.
bool isAsciiSpace(char c) {
    return c == ' ' || (c >= '\t' && c <= '\r');
}

[[gnu::always_inline]] inline int threeWay(double a, double b) {
    return a < b ? -1 : (a > b ? 1 : 0);
}

[[gnu::always_inline]] inline bool holds(cond::CompareOp op, int c) {
    switch (op) {
    case cond::CompareOp::Eq:
        return c == 0;
    case cond::CompareOp::Ne:
        return c != 0;
    case cond::CompareOp::Lt:
        return c < 0;
    case cond::CompareOp::Le:
        return c <= 0;
    case cond::CompareOp::Gt:
        return c > 0;
    case cond::CompareOp::Ge:
        return c >= 0;
    }
    return false;
}

// A double that names a code: whole and within qint64.
bool asCode(double v, qint64& code) {
    if (std::floor(v) != v || !(std::abs(v) < 9.2e18))
        return false;
    code = qint64(v);
    return true;
}

} // namespace

const RecordProgram::CodeTable::Entry* RecordProgram::CodeTable::find(qint64 code) const {
    if (!dense.empty()) {
        const quint64 k = quint64(code - low);
        return k < dense.size() && dense[size_t(k)].slot >= 0 ? &dense[size_t(k)] : nullptr;
    }
    const auto it = sparse.constFind(code);
    return it == sparse.constEnd() ? nullptr : &*it;
}

void RecordProgram::CodeTable::add(qint64 code, MissingKind kind, int slot) {
    Entry* e = nullptr;
    if (!dense.empty()) {
        e = &dense[size_t(code - low)];
    } else {
        e = &sparse[code];
    }
    if (e->slot < 0) {
        e->slot = slot;
        e->firstIsMissing = kind != MissingKind::None;
    }
    e->kind = kind;
}

RecordProgram::RecordProgram(const CompiledRouting& routing, const HeaderMapping& mapping)
    : m_skipCode(routing.instrument().settings.legitimateSkipCode.toUtf8()) {
    m_skipCodeIsDigits = !m_skipCode.isEmpty();
    for (char c : m_skipCode)
        m_skipCodeIsDigits &= c >= '0' && c <= '9';
    const int count = routing.itemCount();
    m_items.resize(size_t(count));
    for (int p = 0; p < count; ++p) {
        ItemProgram& t = m_items[size_t(p)];
        const Item& item = *routing.index().at(p).item;
        t.type = item.type;
        if (item.range) {
            t.hasRange = true;
            t.min = item.range->first.value;
            t.max = item.range->second.value;
        }
        if (t.type != ItemType::Statement) {
            t.resultIndex = m_variables++;
            t.column = mapping.column[size_t(p)];
            t.multiColumns = mapping.multiColumns[size_t(p)];
            t.frequencyBase = m_frequencySlots;
        }
        const QList<Code>& codes = routing.codes(p);
        qint64 low = 0, high = -1;
        for (const Code& c : codes) {
            low = high < low ? c.code : qMin(low, c.code);
            high = qMax(high < low ? c.code : high, c.code);
        }
        if (!codes.isEmpty() && high - low < kDenseCodeSpan) {
            t.codes.low = low;
            t.codes.dense.resize(size_t(high - low + 1));
        }
        int distinct = 0;
        for (const Code& c : codes) {
            const bool fresh = t.codes.find(c.code) == nullptr;
            t.codes.add(c.code, c.missing, fresh ? distinct : -1);
            distinct += fresh ? 1 : 0;
            t.multiCodes.push_back(c.code);
        }
        if (t.type != ItemType::Statement)
            m_frequencySlots += distinct;

        const CompiledRouting::CompiledItem& compiled = routing.item(p);
        for (const cond::ExprPtr& filter : compiled.filters)
            t.filters.push_back(compile(*filter, routing));
        for (const CompiledRouting::CompiledRule& rule : compiled.rules)
            if (rule.usable)
                t.rules.push_back(
                    {rule.condition ? compile(*rule.condition, routing) : -1, rule.target});
        // The reference classes items in questionnaire order: a gate at or after the
        // item is not classed yet then and never marks it, so only earlier ones count.
        for (int g : skipGates(routing, p))
            if (g < p)
                t.gates.push_back(g);
        for (const Rule& rule : t.rules)
            m_forwardOnly &= rule.target > p;
        if (item.whenSkipped && t.type != ItemType::Statement) {
            if (!item.whenSkipped->condition) {
                t.hasImplied = true;
            } else if (const cond::ExprPtr e =
                           routing.compileCondition(*item.whenSkipped->condition)) {
                t.hasImplied = true; // an `if` that does not compile never fills
                t.impliedIf = compile(*e, routing);
            }
        }
        buildSmallTable(t);
    }
    buildHot();
    for (int p = 0; p < count; ++p)
        if (m_items[size_t(p)].hasImplied)
            m_impliedItems.push_back(p);
}

static_assert(sizeof(void*) != 8 || sizeof(RecordProgram::Cell) == 40);

void RecordProgram::buildHot() {
    static_assert(sizeof(void*) != 8 || sizeof(Hot) == 64);
    m_hot.resize(m_items.size());
    for (size_t p = 0; p < m_items.size(); ++p) {
        const ItemProgram& t = m_items[p];
        Hot& h = m_hot[p];
        h.type = t.type;
        h.hasImplied = t.hasImplied;
        h.counterOffset = t.resultIndex < 0 ? -1 : t.resultIndex * kCounters;
        h.column = t.column;
        h.small = t.small;
        h.frequencyBase = t.frequencyBase;
        h.filtersFrom = int(m_filters.size());
        m_filters.insert(m_filters.end(), t.filters.begin(), t.filters.end());
        h.filterCount = uint8_t(t.filters.size()); // the module's and the item's own at most
        h.rulesFrom = int(m_rules.size());
        m_rules.insert(m_rules.end(), t.rules.begin(), t.rules.end());
        h.rulesTo = int(m_rules.size());
        h.gatesFrom = int(m_gates.size());
        m_gates.insert(m_gates.end(), t.gates.begin(), t.gates.end());
        h.gatesTo = int(m_gates.size());
        if (t.filters.size() == 1) {
            const Node& n = m_nodes[size_t(t.filters.front())];
            if (n.kind == Kind::Compare && n.isNumber && n.position >= 0) {
                h.quickNode = t.filters.front();
                h.quickPosition = n.position;
                h.quickOp = n.op;
                h.quickNumber = n.number;
            }
        }
    }
    markRuns();
}

// Runs of variables under the same quick filter of an earlier item, without
// rules: classifyForward answers the filter once for the run. The filter's item
// is before the run, so its value cannot change within it.
void RecordProgram::markRuns() {
    auto member = [&](size_t p) {
        const Hot& h = m_hot[p];
        return h.quickNode >= 0 && h.rulesFrom == h.rulesTo && h.counterOffset >= 0;
    };
    for (size_t a = 0; a < m_hot.size();) {
        size_t b = a + 1;
        if (member(a)) {
            const Hot& first = m_hot[a];
            while (b < m_hot.size() && member(b) && m_hot[b].quickPosition == first.quickPosition &&
                   m_hot[b].quickOp == first.quickOp && m_hot[b].quickNumber == first.quickNumber)
                ++b;
            if (size_t(first.quickPosition) >= a) // reads an item of the run: no run
                b = a + 1;
        }
        if (b > a + 1)
            m_hot[a].runEnd = int(b);
        a = b;
    }
}

// What decodeNumber reads of an item (its frequency slots are relative), so
// two items that agree on it have the same small table.
bool RecordProgram::decodeAlike(const ItemProgram& a, const ItemProgram& b) {
    auto same = [](const CodeTable::Entry& x, const CodeTable::Entry& y) {
        return x.kind == y.kind && x.slot == y.slot;
    };
    const CodeTable &x = a.codes, &y = b.codes;
    const bool codes =
        x.low == y.low && x.sparse.size() == y.sparse.size() &&
        std::equal(x.dense.begin(), x.dense.end(), y.dense.begin(), y.dense.end(), same) &&
        std::all_of(x.sparse.keyValueBegin(), x.sparse.keyValueEnd(), [&](auto kv) {
            const auto it = y.sparse.constFind(kv.first);
            return it != y.sparse.constEnd() && same(kv.second, *it);
        });
    return codes && a.type == b.type && a.hasRange == b.hasRange &&
           (!a.hasRange || (a.min == b.min && a.max == b.max));
}

// The table is filled by decodeNumber itself, so both ways agree by construction.
// Most items of a large instrument decode alike (a few code lists, a few
// ranges), so an item first looks for an earlier one whose table it can share:
// building a table decodes a thousand cells.
void RecordProgram::buildSmallTable(ItemProgram& t) {
    if (t.type != ItemType::Single && t.type != ItemType::Integer && t.type != ItemType::Decimal)
        return;
    for (const SmallTable& shared : m_smallTables)
        if (decodeAlike(*shared.owner, t)) {
            t.small = shared.entries->data();
            return;
        }
    auto table = std::make_unique<std::vector<Small>>(kSmallNumbers);
    char digits[4];
    for (int v = 0; v < kSmallNumbers; ++v) {
        const auto end = std::to_chars(digits, digits + sizeof digits, v).ptr;
        Cell cell;
        decodeNumber(t, QByteArrayView(digits, end - digits), cell);
        (*table)[size_t(v)] = {cell.presentedClass, cell.skipIsLegitimate,
                               cell.slot >= 0 ? cell.slot - t.frequencyBase : -1};
    }
    t.small = table->data();
    m_smallTables.push_back({&t, std::move(table)});
}

// Cells of 1 to 3 digits by table; false for anything else.
bool RecordProgram::decodeSmall(const Hot& t, QByteArrayView v, Cell& out) const {
    const size_t n = size_t(v.size());
    if (!t.small || n - 1 > 2) // 1 to 3 digits (n == 0 wraps round)
        return false;
    // Without a branch on the length (1, 2 or 3 digits alternate in real data):
    // the digits past the length read the first one again and weigh nothing.
    static constexpr unsigned kWeight[4][3] = {{0, 0, 0}, {1, 0, 0}, {10, 1, 0}, {100, 10, 1}};
    const auto* c = reinterpret_cast<const unsigned char*>(v.data());
    const unsigned d0 = c[0] - unsigned('0'), d1 = c[n > 1] - unsigned('0'),
                   d2 = c[size_t(n > 2) * 2] - unsigned('0');
    if ((d0 > 9) | (d1 > 9) | (d2 > 9))
        return false;
    const unsigned value = d0 * kWeight[n][0] + d1 * kWeight[n][1] + d2 * kWeight[n][2];
    if (m_skipCodeIsDigits && v == QByteArrayView(m_skipCode))
        return false;
    const Small& e = t.small[value];
    out.state = State::Number;
    out.number = value;
    out.presentedClass = e.presentedClass;
    out.skipIsLegitimate = e.skipIsLegitimate;
    out.slot = e.slot >= 0 ? t.frequencyBase + e.slot : -1;
    return true;
}

RecordProgram::Literal RecordProgram::literal(const cond::Value& v) {
    Literal l;
    l.isNumber = v.isNumber();
    l.number = v.number;
    l.text = v.text;
    const QByteArray utf8 = v.text.toUtf8();
    l.isAscii = isAscii(utf8);
    if (l.isAscii)
        l.ascii = utf8;
    return l;
}

int RecordProgram::compile(const cond::Expr& expr, const CompiledRouting& routing) {
    Node n;
    n.kind = expr.kind;
    n.op = expr.op;
    n.negated = expr.negated;
    n.isNumber = expr.value.isNumber();
    n.number = expr.value.number;
    m_literals.push_back(literal(expr.value));
    n.literal = int(m_literals.size()) - 1;
    if (!expr.name.isEmpty())
        n.position = routing.positionOf(expr); // unknown: -1, never presented
    std::vector<int> children;
    for (const cond::ExprPtr& child : expr.children)
        children.push_back(compile(*child, routing));
    n.first = int(m_children.size());
    n.count = int(children.size());
    m_children.insert(m_children.end(), children.begin(), children.end());
    if (expr.kind == Kind::In) {
        n.first = int(m_elements.size());
        n.count = int(expr.list.size());
        for (const cond::ListElement& e : expr.list)
            m_elements.push_back(
                {literal(e.low), e.high ? literal(*e.high) : Literal{}, e.high.has_value()});
    }
    m_nodes.push_back(n);
    return int(m_nodes.size()) - 1;
}

void RecordProgram::prepare(Scratch& s) const {
    const size_t count = m_items.size();
    s.cells.assign(count, Cell{});
    s.live.assign(count, 0);
    s.presented.assign(count, 0);
    s.unknownSkip.assign(count, 0);
    s.implied.assign(count, 0);
    s.classes.assign(count, CellClass::Answered);
    s.seen.assign(count, 0);
    s.path.reserve(count * 4);
    s.ownCounters.assign(size_t(m_variables) * kCounters, 0);
    s.ownFrequencies.assign(size_t(m_frequencySlots), 0);
}

bool RecordProgram::isSkipValue(const ItemProgram& t, QByteArrayView cell) const {
    if (cell.isEmpty() || (!m_skipCode.isEmpty() && cell == QByteArrayView(m_skipCode)))
        return true;
    double v = 0;
    qint64 code = 0;
    if (!parseCellNumber(cell, v) || !asCode(v, code))
        return false;
    const CodeTable::Entry* e = t.codes.find(code);
    return e && e->kind == MissingKind::NotApplicable;
}

void RecordProgram::decodeNumber(const ItemProgram& t, QByteArrayView cell, Cell& out) const {
    double v = 0;
    if (!parseCellNumber(cell, v)) { // compared as it stands: text never equals a number
        out.state = State::Text;
        out.text = cell;
        out.presentedClass = CellClass::Invalid;
        out.skipIsLegitimate = !m_skipCode.isEmpty() && cell == QByteArrayView(m_skipCode);
        return;
    }
    out.state = State::Number;
    out.number = v;
    qint64 code = 0;
    const CodeTable::Entry* e = asCode(v, code) ? t.codes.find(code) : nullptr;
    out.skipIsLegitimate = (e && e->kind == MissingKind::NotApplicable) ||
                           (!m_skipCode.isEmpty() && cell == QByteArrayView(m_skipCode));
    const bool whole = std::floor(v) == v && std::abs(v) < 9e15;
    if (e && whole) {
        out.presentedClass = classOfMissing(e->kind);
        out.slot = t.frequencyBase + e->slot;
        return;
    }
    bool ok = t.type != ItemType::Single && (t.type == ItemType::Decimal || whole);
    if (ok && t.hasRange)
        ok = v >= t.min && v <= t.max;
    out.presentedClass = ok ? CellClass::Answered : CellClass::Invalid;
}

void RecordProgram::decodeMulti(const ItemProgram& t, RecordFields fields, Cell& out,
                                Scratch& s) const {
    bool invalid = false, anyValue = false, anyAnswer = false;
    out.codesFrom = int(s.codes.size());
    for (size_t k = 0; k < t.multiColumns.size(); ++k) {
        if (t.multiColumns[k] < 0)
            continue;
        const QByteArrayView cell = fields[size_t(t.multiColumns[k])];
        if (cell.isEmpty() || cell == "0")
            continue;
        if (!m_skipCode.isEmpty() && cell == QByteArrayView(m_skipCode))
            continue;
        anyValue = true;
        if (cell != "1") {
            invalid = true;
            continue;
        }
        const qint64 code = t.multiCodes[k];
        const CodeTable::Entry* e = t.codes.find(code);
        s.codes.push_back(code);
        s.codeSlots.push_back(t.frequencyBase + e->slot);
        if (e->kind == MissingKind::None)
            anyAnswer = true;
    }
    out.codesCount = int(s.codes.size()) - out.codesFrom;
    out.skipIsLegitimate = !anyValue;
    out.state = out.codesCount ? State::Codes : State::Blank;
    if (invalid)
        out.presentedClass = CellClass::Invalid;
    else if (!out.codesCount)
        out.presentedClass = CellClass::Blank;
    else if (anyAnswer)
        out.presentedClass = CellClass::Answered;
    else
        out.presentedClass = classOfMissing(t.codes.find(s.codes[size_t(out.codesFrom)])->kind);
}

void RecordProgram::decode(size_t p, RecordFields fields, Cell& cell, Scratch& s) const {
    const Hot& h = m_hot[p];
    cell = Cell{};
    switch (h.type) {
    case ItemType::Statement:
        cell.presentedClass = CellClass::Answered;
        return;
    case ItemType::Multi:
        decodeMulti(m_items[p], fields, cell, s);
        return;
    default:
        break;
    }
    const QByteArrayView v = h.column < 0 ? QByteArrayView() : fields[size_t(h.column)];
    if (v.isEmpty())
        return; // blank: presented blank, skipped legitimately
    if (h.type == ItemType::Text || h.type == ItemType::Date) {
        cell.state = State::Text;
        cell.text = v;
        cell.presentedClass =
            h.type == ItemType::Text || isIsoDate(v) ? CellClass::Answered : CellClass::Invalid;
        cell.skipIsLegitimate = isSkipValue(m_items[p], v);
        return;
    }
    if (!decodeSmall(h, v, cell))
        decodeNumber(m_items[p], v, cell);
}

bool RecordProgram::compare(const Cell* cell, cond::CompareOp op, const Literal& v) const {
    if (op == cond::CompareOp::Ne) // `x <> v` is `not (x = v)`
        return !compare(cell, cond::CompareOp::Eq, v);
    if (!cell)
        return false;
    if (cell->state == State::Number && v.isNumber)
        return holds(op, threeWay(cell->number, v.number));
    if (cell->state != State::Text || v.isNumber)
        return false;
    int c = 0;
    if (v.isAscii && isAscii(cell->text)) { // ASCII bytes order as UTF-16 code units do
        const size_t common = size_t(qMin(cell->text.size(), v.ascii.size()));
        c = std::memcmp(cell->text.data(), v.ascii.constData(), common);
        if (c == 0)
            c = cell->text.size() < v.ascii.size() ? -1 : (cell->text.size() > v.ascii.size());
    } else {
        c = QString::fromUtf8(cell->text).compare(v.text);
    }
    return holds(op, c < 0 ? -1 : (c > 0 ? 1 : 0));
}

bool RecordProgram::answered(const Cell* cell, int position, const Scratch& s) const {
    if (!cell || cell->state == State::Blank)
        return false;
    if (cell->state == State::Text) {
        if (!isAscii(cell->text))
            return !QString::fromUtf8(cell->text).trimmed().isEmpty();
        for (char c : cell->text)
            if (!isAsciiSpace(c))
                return true;
        return false;
    }
    const CodeTable& codes = m_items[size_t(position)].codes;
    auto missing = [&](qint64 code) {
        const CodeTable::Entry* e = codes.find(code);
        return e && e->firstIsMissing;
    };
    if (cell->state == State::Number) {
        qint64 code = 0;
        return !(std::isfinite(cell->number) && asCode(cell->number, code) && missing(code));
    }
    for (int k = 0; k < cell->codesCount; ++k)
        if (!missing(s.codes[size_t(cell->codesFrom + k)]))
            return true;
    return false;
}

bool RecordProgram::evaluate(int index, const Scratch& s) const {
    const Node& n = m_nodes[size_t(index)];
    switch (n.kind) {
    case Kind::Or:
        for (int k = 0; k < n.count; ++k)
            if (evaluate(m_children[size_t(n.first + k)], s))
                return true;
        return false;
    case Kind::And:
        for (int k = 0; k < n.count; ++k)
            if (!evaluate(m_children[size_t(n.first + k)], s))
                return false;
        return true;
    case Kind::Not:
        return !evaluate(m_children[size_t(n.first)], s);
    case Kind::Compare: {
        const Cell* cell = valueAt(n.position, s);
        if (cell && cell->state == State::Number && n.isNumber) // the common case
            return holds(n.op, threeWay(cell->number, n.number));
        return compare(cell, n.op, m_literals[size_t(n.literal)]);
    }
    case Kind::In: {
        const Cell* cell = valueAt(n.position, s);
        bool in = false;
        for (int k = 0; k < n.count && !in; ++k) {
            const Element& e = m_elements[size_t(n.first + k)];
            in = e.hasHigh ? compare(cell, cond::CompareOp::Ge, e.low) &&
                                 compare(cell, cond::CompareOp::Le, e.high)
                           : compare(cell, cond::CompareOp::Eq, e.low);
        }
        return in != n.negated;
    }
    case Kind::Has: {
        const Cell* cell = valueAt(n.position, s);
        if (!cell || cell->state != State::Codes || !n.isNumber)
            return false;
        for (int k = 0; k < cell->codesCount; ++k)
            if (double(s.codes[size_t(cell->codesFrom + k)]) == n.number)
                return true;
        return false;
    }
    case Kind::Asked:
        return valueAt(n.position, s) != nullptr;
    case Kind::Answered:
        return answered(valueAt(n.position, s), n.position, s);
    case Kind::True:
        return true;
    case Kind::False:
        return false;
    }
    return false;
}

// The reference route (Simulator.h), over the value slots.
void RecordProgram::route(Scratch& s) const {
    const int count = itemCount();
    std::fill(s.live.begin(), s.live.end(), 0);
    std::fill(s.presented.begin(), s.presented.end(), 0);
    s.path.clear();
    s.loop = false;
    const qint64 guard = routeStepLimit(count);
    qint64 steps = 0;
    int position = 0;
    while (position < count) {
        if (++steps > guard) {
            s.loop = true;
            break;
        }
        const Hot& t = m_hot[size_t(position)];
        bool pass = true;
        for (int f = t.filtersFrom; f < t.filtersFrom + t.filterCount && pass; ++f)
            pass = evaluate(m_filters[size_t(f)], s);
        if (!pass) {
            s.live[size_t(position)] = 0; // filtered: empty
            ++position;
            continue;
        }
        s.live[size_t(position)] = 1;
        s.presented[size_t(position)] = 1;
        s.path.push_back(position);
        int next = position + 1;
        for (int r = t.rulesFrom; r < t.rulesTo; ++r) {
            const Rule& rule = m_rules[size_t(r)];
            if (rule.condition < 0 || evaluate(rule.condition, s)) {
                next = rule.target;
                break;
            }
        }
        position = next;
    }
}

// DESIGN.md's table, item by item in questionnaire order (a gate later in the
// order is read before it is classed, as the reference does).
void RecordProgram::classifyCells(Scratch& s, const Tally* tally) const {
    std::fill(s.classes.begin(), s.classes.end(), CellClass::Answered);
    std::fill(s.unknownSkip.begin(), s.unknownSkip.end(), 0);
    std::fill(s.implied.begin(), s.implied.end(), 0);
    s.anyValue = s.anyViolation = s.anyInvalid = false;
    for (int p = 0; p < itemCount(); ++p) {
        const Hot& t = m_hot[size_t(p)];
        if (t.counterOffset < 0)
            continue;
        qint64* counters = tally ? tally->counters + t.counterOffset : nullptr;
        const Cell& cell = s.cells[size_t(p)];
        CellClass& c = s.classes[size_t(p)];
        if (s.presented[size_t(p)]) {
            c = cell.presentedClass;
            s.anyValue |= c != CellClass::Blank;
            s.anyInvalid |= c == CellClass::Invalid;
            if (counters) {
                ++counters[int(c)];
                countCodes(cell, s, tally->frequencies);
            }
            continue;
        }
        if (!cell.skipIsLegitimate) {
            c = CellClass::RoutingViolation;
            s.anyViolation = true;
            if (counters)
                ++counters[int(c)];
            continue;
        }
        c = CellClass::LegitimateSkip;
        for (int k = t.gatesFrom; k < t.gatesTo; ++k) {
            const int g = m_gates[size_t(k)];
            if (s.presented[size_t(g)] ? isNonresponse(s.classes[size_t(g)])
                                       : bool(s.unknownSkip[size_t(g)])) {
                s.unknownSkip[size_t(p)] = 1;
                break;
            }
        }
        if (t.hasImplied &&
            (m_items[size_t(p)].impliedIf < 0 || evaluate(m_items[size_t(p)].impliedIf, s)))
            s.implied[size_t(p)] = 1;
        if (counters) {
            ++counters[int(c)];
            counters[SkipAfterMissingGate] += s.unknownSkip[size_t(p)];
            counters[Implied] += s.implied[size_t(p)];
        }
    }
}

// Break-off: the presented items are blank from some item to the end (at least
// two of them, so that one unanswered last question is not a break-off).
void RecordProgram::findBreakOff(Scratch& s, const Tally* tally) const {
    if (++s.stamp == 0) { // wrapped: forget old stamps
        std::fill(s.seen.begin(), s.seen.end(), 0);
        s.stamp = 1;
    }
    int runStart = -1, runLength = 0;
    for (int p : s.path) {
        if (m_hot[size_t(p)].counterOffset < 0 || s.seen[size_t(p)] == s.stamp)
            continue;
        s.seen[size_t(p)] = s.stamp;
        if (s.classes[size_t(p)] == CellClass::Blank) {
            if (runLength++ == 0)
                runStart = p;
        } else {
            runLength = 0;
        }
    }
    s.breakOffStart = runLength >= 2 ? runStart : -1;
    if (tally && s.breakOffStart >= 0 && s.anyValue) // an empty record is no break-off
        ++tally->counters[m_hot[size_t(runStart)].counterOffset + BreakOffStarts];
}

void RecordProgram::classify(RecordFields fields, Scratch& s, const Tally* tally) const {
    s.codes.clear();
    s.codeSlots.clear();
    if (m_forwardOnly) {
        classifyForward(fields, s, tally);
        return;
    }
    for (size_t p = 0; p < m_items.size(); ++p)
        decode(p, fields, s.cells[p], s);
    route(s);
    classifyCells(s, tally);
    findBreakOff(s, tally);
}

// The same route and classes in one pass, for routing whose rules all jump
// forward: every position is then reached, filtered or jumped over exactly
// once, in order, so an item's class is final when the route passes it (its
// gates are earlier items). Cells are decoded only when presented, or when a
// skipped cell is not blank; implied values wait for the route's final values.
// What this loop keeps per cell is kept small on purpose (measured: each store
// and each value held across the loop costs time at 135 million cells): `live`
// doubles as the presented flags until the end, the zero flags are cleared once
// per record, the counters always exist (the scratch's when there is no tally)
// and the path is left for toClassification to read off the flags.
void RecordProgram::classifyForward(RecordFields fields, Scratch& s, const Tally* tally) const {
    // The scratch arrays through local pointers: the byte arrays' stores may
    // alias anything, so through `s` every store would make the compiler load
    // every array's address again.
    const int count = itemCount();
    uint8_t* const live = s.live.data();
    uint8_t* const unknownSkip = s.unknownSkip.data();
    CellClass* const classes = s.classes.data();
    Cell* const cells = s.cells.data();
    const Hot* const hot = m_hot.data();
    const QByteArrayView* const field = fields.data();
    qint64* const allCounters = tally ? tally->counters : s.ownCounters.data();
    qint64* const frequencies = tally ? tally->frequencies : s.ownFrequencies.data();
    std::memset(live, 0, size_t(count)); // a condition may read a later item: not presented yet
    std::memset(unknownSkip, 0, size_t(count));
    std::memset(s.implied.data(), 0, size_t(count));
    // The classes met, one bit each: one register instead of a flag per question.
    unsigned seen = 0;
    // A presented item's cell, decoded.
    auto present = [&](int p, const Hot& t) __attribute__((always_inline))->Cell& {
        live[p] = 1;
        Cell& cell = cells[p];
        // A small number sets every field that a number's readers use; the
        // text and the codes are read only in the states that set them.
        if (!decodeSmall(t, t.column >= 0 ? field[t.column] : QByteArrayView(), cell))
            decode(size_t(p), fields, cell, s);
        return cell;
    };
    auto countPresented = [&](int p, const Hot& t, const Cell& cell)
        __attribute__((always_inline)) {
        const CellClass c = cell.presentedClass;
        classes[p] = c;
        seen |= 1u << int(c);
        ++allCounters[t.counterOffset + int(c)];
        countCodes(cell, s, frequencies);
    };
    // A variable filtered or jumped over.
    auto skip = [&](int p, const Hot& t) __attribute__((always_inline)) {
        qint64* const counters = allCounters + t.counterOffset;
        bool legitimate = true;
        if (t.type == ItemType::Multi || (t.column >= 0 && !field[t.column].isEmpty())) {
            Cell cell;
            decode(size_t(p), fields, cell, s);
            legitimate = cell.skipIsLegitimate;
        }
        if (!legitimate) {
            classes[p] = CellClass::RoutingViolation;
            seen |= 1u << int(CellClass::RoutingViolation);
            ++counters[int(CellClass::RoutingViolation)];
            return;
        }
        classes[p] = CellClass::LegitimateSkip;
        unsigned unknown = 0; // a gate that is nonresponse, or itself skipped after one
        for (int k = t.gatesFrom; k < t.gatesTo; ++k) {
            const int g = m_gates[size_t(k)];
            unknown |= live[g] ? unsigned(isNonresponse(classes[g])) : unsigned(unknownSkip[g]);
        }
        unknownSkip[p] = uint8_t(unknown);
        ++counters[int(CellClass::LegitimateSkip)];
        counters[SkipAfterMissingGate] += unknown;
    };
    int next = 0;
    for (int p = 0; p < count; ++p) {
        const Hot& t = hot[p];
        if (t.runEnd > p + 1 && next <= p) {
            // A run of variables asked under one filter of an earlier item, none
            // with rules: one answer for all of them, and no branch per item.
            const int end = t.runEnd;
            if (filtersHold(t, live, cells, s)) {
                for (; p < end; ++p)
                    countPresented(p, hot[p], present(p, hot[p]));
            } else {
                for (; p < end; ++p)
                    skip(p, hot[p]);
            }
            --p;
            continue;
        }
        if (p >= next && filtersHold(t, live, cells, s)) { // presented
            const Cell& cell = present(p, t);
            next = p + 1;
            for (int r = t.rulesFrom; r < t.rulesTo; ++r) {
                const Rule& rule = m_rules[size_t(r)];
                if (rule.condition < 0 || test(rule.condition, s)) {
                    next = rule.target;
                    break;
                }
            }
            if (t.counterOffset >= 0) // else a statement: no variable
                countPresented(p, t, cell);
        } else if (t.counterOffset >= 0) { // filtered or jumped over
            skip(p, t);
        }
    }
    std::memcpy(s.presented.data(), live, size_t(count));
    s.loop = false;
    constexpr unsigned presentedClasses = (1u << int(CellClass::LegitimateSkip)) - 1;
    const bool anyValue = seen & presentedClasses & ~(1u << int(CellClass::Blank));
    s.anyValue = anyValue;
    s.anyViolation = seen & (1u << int(CellClass::RoutingViolation));
    s.anyInvalid = seen & (1u << int(CellClass::Invalid));
    for (int p : m_impliedItems) { // over the route's final values
        if (classes[p] == CellClass::LegitimateSkip &&
            (m_items[size_t(p)].impliedIf < 0 || evaluate(m_items[size_t(p)].impliedIf, s))) {
            s.implied[size_t(p)] = 1;
            ++allCounters[hot[p].counterOffset + Implied];
        }
    }
    // The run of blank presented variables that ends the route, found from the
    // end (the loop above would track it at every cell).
    int runStart = -1, runLength = 0;
    for (int p = count - 1; p >= 0; --p) {
        if (!live[p] || hot[p].counterOffset < 0)
            continue;
        if (classes[p] != CellClass::Blank)
            break;
        runStart = p;
        ++runLength;
    }
    s.breakOffStart = runLength >= 2 ? runStart : -1;
    if (s.breakOffStart >= 0 && anyValue)
        ++allCounters[hot[runStart].counterOffset + BreakOffStarts];
}

RecordClassification RecordProgram::toClassification(const Scratch& s) const {
    RecordClassification r;
    if (m_forwardOnly) { // the one pass leaves the path in the presented flags
        for (size_t p = 0; p < m_items.size(); ++p)
            if (s.presented[p])
                r.path.append(int(p));
    } else {
        r.path = QList<int>(s.path.begin(), s.path.end());
    }
    r.loop = s.loop;
    r.classes = s.classes;
    r.presented.assign(s.presented.begin(), s.presented.end());
    r.unknownSkip.assign(s.unknownSkip.begin(), s.unknownSkip.end());
    r.implied.assign(s.implied.begin(), s.implied.end());
    r.counted.resize(m_items.size());
    for (size_t p = 0; p < m_items.size(); ++p)
        if (s.presented[p] && m_items[p].resultIndex >= 0) {
            if (s.cells[p].slot >= 0)
                r.counted[p].append(qint64(s.cells[p].number));
            for (int k = 0; k < s.cells[p].codesCount; ++k)
                r.counted[p].append(s.codes[size_t(s.cells[p].codesFrom + k)]);
        }
    r.breakOffStart = s.breakOffStart;
    r.anyValue = s.anyValue;
    return r;
}

} // namespace rb
