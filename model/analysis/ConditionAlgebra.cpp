#include "ConditionAlgebra.h"

#include <QHash>

#include <algorithm>
#include <cmath>
#include <limits>

namespace rb::analysis {

namespace {

void numbersOf(const cond::Expr& atom, QList<double>& out) {
    if (atom.kind == cond::Expr::Kind::Compare && atom.value.isNumber())
        out.append(atom.value.number);
    for (const cond::ListElement& e : atom.list) {
        if (e.low.isNumber())
            out.append(e.low.number);
        if (e.high && e.high->isNumber())
            out.append(e.high->number);
    }
}

void textsOf(const cond::Expr& atom, QStringList& out) {
    if (atom.kind == cond::Expr::Kind::Compare && !atom.value.isNumber())
        out.append(atom.value.text);
    for (const cond::ListElement& e : atom.list) {
        if (!e.low.isNumber())
            out.append(e.low.text);
        if (e.high && !e.high->isNumber())
            out.append(e.high->text);
    }
}

ValuePiece numberPiece(ValuePiece::Kind kind, double value) {
    ValuePiece p;
    p.kind = kind;
    p.low = p.high = p.sample = value;
    return p;
}

ValuePiece textPiece(ValuePiece::Kind kind, const QString& text, QStringList& texts) {
    ValuePiece p;
    p.kind = kind;
    p.text = int(texts.size());
    texts.append(text);
    return p;
}

// The open interval (low, high) of allowed numbers, or nothing when it holds
// no value of the item's type.
std::optional<ValuePiece> intervalPiece(double low, double high, bool integer) {
    double sample = 0;
    if (integer) {
        sample =
            std::isinf(low) ? (std::isinf(high) ? 0 : std::ceil(high) - 1) : std::floor(low) + 1;
        if (!(sample > low && sample < high))
            return std::nullopt;
    } else if (std::isinf(low) && std::isinf(high)) {
        sample = 0;
    } else if (std::isinf(low)) {
        sample = high - 1;
    } else if (std::isinf(high)) {
        sample = low + 1;
    } else {
        sample = (low + high) / 2;
        if (!(sample > low && sample < high))
            return std::nullopt;
    }
    ValuePiece p = numberPiece(ValuePiece::Kind::Interval, sample);
    p.low = low;
    p.high = high;
    return p;
}

} // namespace

ConditionAlgebra::ConditionAlgebra(const CompiledRouting& routing,
                                   const QList<cond::ExprPtr>& extra)
    : m_routing(&routing), m_varsOfPosition(std::size_t(routing.itemCount())),
      m_atoms(std::size_t(routing.itemCount())),
      m_empty(std::size_t(routing.itemCount()), Mdd::True),
      m_presented(std::size_t(routing.itemCount()), Mdd::True) {
    std::vector<std::pair<int, const cond::Expr*>> found; // (position read, atom)
    for (int p = 0; p < routing.itemCount(); ++p) {
        const CompiledRouting::CompiledItem& item = routing.item(p);
        for (const cond::ExprPtr& f : item.filters)
            collect(*f, found);
        for (const CompiledRouting::CompiledRule& r : item.rules)
            if (r.usable && r.condition)
                collect(*r.condition, found);
    }
    for (const cond::ExprPtr& e : extra)
        if (e) {
            m_keepAlive.append(e); // its atoms are kept by address
            collect(*e, found);
        }
    groupAtoms(found);
    buildVariables();
}

// Every item's atoms in one vector, item by item and in the order found (a
// counting sort): a list per read item cost an allocation each.
void ConditionAlgebra::groupAtoms(const std::vector<std::pair<int, const cond::Expr*>>& found) {
    for (const auto& [position, atom] : found)
        ++m_atoms[std::size_t(position)].count;
    int next = 0;
    for (ItemAtoms& atoms : m_atoms) {
        atoms.first = next;
        next += atoms.count;
        atoms.count = 0;
    }
    m_atomList.resize(found.size());
    for (const auto& [position, atom] : found) {
        ItemAtoms& atoms = m_atoms[std::size_t(position)];
        m_atomList[std::size_t(atoms.first + atoms.count++)] = atom;
    }
}

void ConditionAlgebra::collect(const cond::Expr& expr,
                               std::vector<std::pair<int, const cond::Expr*>>& found) {
    if (!expr.isAtom()) {
        for (const cond::ExprPtr& c : expr.children)
            collect(*c, found);
        return;
    }
    const int position = m_routing->positionOf(expr);
    if (position < 0 || m_routing->index().at(position).type == ItemType::Statement)
        return;
    ItemAtoms& atoms = m_atoms[std::size_t(position)];
    atoms.read = true;
    if (expr.kind == cond::Expr::Kind::Asked)
        return;
    found.emplace_back(position, &expr);
    if (expr.kind == cond::Expr::Kind::Has && expr.value.isNumber() &&
        std::floor(expr.value.number) == expr.value.number) {
        const qint64 code = qint64(expr.value.number);
        if (!atoms.hasCodes.contains(code))
            atoms.hasCodes.append(code);
    }
}

void ConditionAlgebra::buildVariables() {
    // Later items first: smaller variable ids sit nearer the root.
    for (int position = int(m_atoms.size()) - 1; position >= 0; --position) {
        const ItemAtoms& atoms = m_atoms[std::size_t(position)];
        if (!atoms.read)
            continue;
        if (m_routing->index().at(position).type == ItemType::Multi)
            buildMultiVars(position, atoms);
        else
            buildValueVar(position, atoms);
    }
}

cond::Environment ConditionAlgebra::singleEnvironment(int position,
                                                      const cond::CellValue& value) const {
    // Captured by address: a copy of the value would not fit std::function's
    // own storage and cost an allocation per environment (one per cell and
    // atom of every gate item). The environment lives no longer than `value`.
    cond::Environment env;
    const cond::CellValue* valueAt = &value;
    env.value = [valueAt](const QString&) { return *valueAt; };
    const CompiledRouting* routing = m_routing;
    env.isMissingCode = [routing, position](const QString&, qint64 code) {
        return routing->isMissingCode(position, code);
    };
    return env;
}

QList<bool> ConditionAlgebra::signature(int position, const ItemAtoms& atoms,
                                        const cond::CellValue& v) const {
    const cond::Environment env = singleEnvironment(position, v);
    cond::Expr answered; // the environment answers for this item whatever the name
    answered.kind = cond::Expr::Kind::Answered;
    QList<bool> sig;
    sig.reserve(2 + atoms.count); // grown a bool at a time, it reallocated per atom
    sig << v.presented() << cond::evaluate(answered, env);
    for (const cond::Expr* a : atomsOf(atoms))
        sig.append(cond::evaluate(*a, env));
    return sig;
}

QList<ValuePiece> ConditionAlgebra::candidatePieces(int position, const ItemAtoms& atoms,
                                                    QStringList& texts) const {
    const Item& item = *m_routing->index().at(position).item;
    QList<ValuePiece> pieces;
    if (item.type == ItemType::Single) {
        for (const Code& c : m_routing->codes(position)) {
            ValuePiece p = numberPiece(ValuePiece::Kind::Code, double(c.code));
            pieces.append(p);
        }
        if (pieces.isEmpty()) // no codes: some value no condition names
            pieces.append(numberPiece(ValuePiece::Kind::Point, -1e300));
        return pieces;
    }
    if (item.type == ItemType::Integer || item.type == ItemType::Decimal) {
        const bool integer = item.type == ItemType::Integer;
        const double inf = std::numeric_limits<double>::infinity();
        const double lo = item.range ? item.range->first.value : -inf;
        const double hi = item.range ? item.range->second.value : inf;
        QList<double> points;
        for (const cond::Expr* a : atomsOf(atoms))
            numbersOf(*a, points);
        QList<double> missing;
        for (const Code& c : item.missing)
            missing.append(double(c.code));
        points += missing;
        if (item.range)
            points << lo << hi;
        std::sort(points.begin(), points.end());
        points.erase(std::unique(points.begin(), points.end()), points.end());
        auto allowed = [&](double v) {
            return missing.contains(v) || (v >= lo && v <= hi && (!integer || std::floor(v) == v));
        };
        double previous = -inf;
        for (int i = 0; i <= points.size(); ++i) {
            const double next = i < points.size() ? points[i] : inf;
            if (previous >= lo && next <= hi)
                if (std::optional<ValuePiece> gap = intervalPiece(previous, next, integer))
                    pieces.append(*gap);
            if (i < points.size() && allowed(next))
                pieces.append(numberPiece(ValuePiece::Kind::Point, next));
            previous = next;
        }
        return pieces;
    }
    // Text and dates: blank, every literal, and a value just after each literal
    // (text orders by code units, so these stand for every other string).
    QStringList literals;
    for (const cond::Expr* a : atomsOf(atoms))
        textsOf(*a, literals);
    literals.sort();
    literals.removeDuplicates();
    pieces.append(textPiece(ValuePiece::Kind::Text, QString(), texts));
    pieces.append(textPiece(ValuePiece::Kind::OtherText, QString(QChar(1)), texts));
    for (const QString& l : literals) {
        if (!l.isEmpty())
            pieces.append(textPiece(ValuePiece::Kind::Text, l, texts));
        pieces.append(textPiece(ValuePiece::Kind::OtherText, l + QChar(1), texts));
    }
    return pieces;
}

void ConditionAlgebra::buildValueVar(int position, const ItemAtoms& atoms) {
    DecisionVar var;
    var.position = position;
    ValueCell empty;
    empty.empty = true;
    var.cells.append(empty);
    // Cells by signature: an item compared with thousands of values has
    // thousands of pieces, so finding a piece's cell must not scan them all.
    QHash<QList<bool>, int> cellOf{
        {signature(position, atoms, cond::CellValue::notPresented()), 0}};
    QList<ValuePiece> candidates = candidatePieces(position, atoms, var.texts);
    std::vector<int> cellOfPiece;
    cellOfPiece.reserve(std::size_t(candidates.size()));
    for (const ValuePiece& piece : std::as_const(candidates)) {
        const QList<bool> sig = signature(position, atoms, var.valueOf(piece));
        auto same = cellOf.constFind(sig);
        if (same == cellOf.constEnd()) {
            same = cellOf.insert(sig, int(var.cells.size()));
            ValueCell cell;
            cell.answered = sig.at(1);
            var.cells.append(cell);
        }
        cellOfPiece.push_back(*same);
        ++var.cells[*same].pieceCount;
    }
    // Lay the pieces out cell by cell, each cell's in the order found.
    for (int c = 1; c < var.cells.size(); ++c)
        var.cells[c].firstPiece = var.cells[c - 1].firstPiece + var.cells[c - 1].pieceCount;
    std::vector<int> placed(std::size_t(var.cells.size()), 0);
    var.pieces.resize(candidates.size());
    for (qsizetype i = 0; i < candidates.size(); ++i) {
        const int c = cellOfPiece[std::size_t(i)];
        var.pieces[var.cells[c].firstPiece + placed[std::size_t(c)]++] = std::move(candidates[i]);
    }
    const int id = m_mdd.addVar(int(var.cells.size()));
    m_vars.append(std::move(var));
    m_varsOfPosition[std::size_t(position)] = {int(m_varIds.size()), 1};
    m_varIds.push_back(id);
    m_empty[position] = m_mdd.literalCell(id, 0);
    m_presented[position] = m_mdd.notOp(m_empty[position]);
}

void ConditionAlgebra::buildMultiVars(int position, const ItemAtoms& atoms) {
    const QList<Code>& codes = m_routing->codes(position);
    bool anyMissing = codes.isEmpty(), anyAnswered = false;
    for (const Code& c : codes)
        (c.isMissing() ? anyMissing : anyAnswered) = true;
    DecisionVar status;
    status.role = DecisionVar::Role::MultiStatus;
    status.position = position;
    ValueCell empty;
    empty.empty = true;
    status.cells.append(empty);
    if (anyMissing)
        status.cells.append(ValueCell{});
    if (anyAnswered) {
        ValueCell answered;
        answered.answered = true;
        status.cells.append(answered);
    }
    const int statusVar = m_mdd.addVar(int(status.cells.size()));
    m_vars.append(status);
    QList<int> ids{statusVar};
    int emptyNode = m_mdd.literalCell(statusVar, 0);
    int someAnswered = Mdd::False, someMissing = Mdd::False, noAnswered = Mdd::True;
    QList<qint64> inH;
    for (qint64 code : atoms.hasCodes) {
        auto it =
            std::find_if(codes.begin(), codes.end(), [&](const Code& c) { return c.code == code; });
        if (it == codes.end())
            continue; // `has` of a code the item lacks: always false, no variable
        DecisionVar has;
        has.role = DecisionVar::Role::MultiHas;
        has.position = position;
        has.code = code;
        has.cells = {ValueCell{}, ValueCell{}};
        const int v = m_mdd.addVar(2);
        m_vars.append(std::move(has));
        ids.append(v);
        inH.append(code);
        const int yes = m_mdd.literalCell(v, 1);
        emptyNode = m_mdd.andOp(emptyNode, m_mdd.notOp(yes));
        if (it->isMissing()) {
            someMissing = m_mdd.orOp(someMissing, yes);
        } else {
            someAnswered = m_mdd.orOp(someAnswered, yes);
            noAnswered = m_mdd.andOp(noAnswered, m_mdd.notOp(yes));
        }
    }
    bool answeredOutside = false, missingOutside = codes.isEmpty();
    for (const Code& c : codes)
        if (!inH.contains(c.code))
            (c.isMissing() ? missingOutside : answeredOutside) = true;
    if (answeredOutside)
        someAnswered = Mdd::True;
    if (missingOutside)
        someMissing = Mdd::True;
    // The status cells that exist: 1 = presented, not answered (if any); last = answered.
    int presented = Mdd::False;
    for (int cell = 1; cell < status.cells.size(); ++cell) {
        const int is = m_mdd.literalCell(statusVar, cell);
        const int consistent =
            status.cells[cell].answered ? someAnswered : m_mdd.andOp(noAnswered, someMissing);
        presented = m_mdd.orOp(presented, m_mdd.andOp(is, consistent));
    }
    m_varsOfPosition[std::size_t(position)] = {int(m_varIds.size()), int(ids.size())};
    m_varIds.insert(m_varIds.end(), ids.begin(), ids.end());
    m_empty[position] = emptyNode;
    m_presented[position] = presented;
}

int ConditionAlgebra::emptyOf(int position) const {
    return m_empty.at(position);
}

int ConditionAlgebra::presentedOf(int position) const {
    return m_presented.at(position);
}

int ConditionAlgebra::conditionText(const QString& text) {
    const cond::ExprPtr expr = m_routing->compileCondition(text);
    if (!expr)
        return -1;
    m_keepAlive.append(expr); // the atom cache is keyed by node address
    return condition(*expr);
}

int ConditionAlgebra::conditionAt(const cond::Expr& expr, int firstEmpty) {
    int f = condition(expr);
    for (int v : m_mdd.support(f))
        if (m_vars[v].position >= firstEmpty)
            f = m_mdd.restrict(f, v, 0); // cell 0: empty / status empty / code not chosen
    return f;
}

int ConditionAlgebra::condition(const cond::Expr& expr) {
    using K = cond::Expr::Kind;
    switch (expr.kind) {
    case K::True:
        return Mdd::True;
    case K::False:
        return Mdd::False;
    case K::Not:
        return m_mdd.notOp(condition(*expr.children.at(0)));
    case K::And: {
        int f = Mdd::True;
        for (const cond::ExprPtr& c : expr.children)
            f = m_mdd.andOp(f, condition(*c));
        return f;
    }
    case K::Or: {
        int f = Mdd::False;
        for (const cond::ExprPtr& c : expr.children)
            f = m_mdd.orOp(f, condition(*c));
        return f;
    }
    default:
        return atom(expr);
    }
}

// A small direct-mapped cache rather than a table of every atom: atoms are
// translated again mostly while nearby (a module's filter, once for each of its
// items), and a table holding all of a large instrument's atoms cost two
// probes far apart in memory for each one. A lost entry is only recomputed:
// the diagram gives the same node for the same function.
ConditionAlgebra::AtomSlot& ConditionAlgebra::atomSlot(const cond::Expr* expr) {
    const auto address = reinterpret_cast<std::uintptr_t>(expr);
    return m_atomCache[((address >> 4) ^ (address >> 14)) & (AtomCacheSize - 1)];
}

int ConditionAlgebra::atom(const cond::Expr& expr) {
    AtomSlot& slot = atomSlot(&expr);
    if (slot.expr == &expr)
        return slot.node;
    const int position = m_routing->positionOf(expr);
    const std::span<const int> vars = position < 0 ? std::span<const int>() : varsOf(position);
    int result = Mdd::False;
    if (vars.empty()) {
        // Not a gate item (an unknown name or a statement): it reads as empty.
        result = cond::evaluate(expr, singleEnvironment(std::max(position, 0),
                                                        cond::CellValue::notPresented()))
                     ? Mdd::True
                     : Mdd::False;
    } else if (m_vars[vars[0]].role == DecisionVar::Role::Value) {
        const DecisionVar& var = m_vars[vars[0]];
        std::vector<bool> truth;
        for (int c = 0; c < var.cells.size(); ++c) {
            const cond::CellValue v =
                var.cells[c].empty ? cond::CellValue::notPresented() : var.sampleOf(c);
            truth.push_back(cond::evaluate(expr, singleEnvironment(position, v)));
        }
        result = m_mdd.literal(vars[0], truth);
    } else {
        const DecisionVar& status = m_vars[vars[0]];
        using K = cond::Expr::Kind;
        if (expr.kind == K::Has) {
            for (int v : vars)
                if (m_vars[v].role == DecisionVar::Role::MultiHas &&
                    double(m_vars[v].code) == expr.value.number && expr.value.isNumber())
                    result = m_mdd.literalCell(v, 1);
        } else {
            std::vector<bool> truth;
            for (const ValueCell& cell : status.cells) {
                if (expr.kind == K::Asked)
                    truth.push_back(!cell.empty);
                else if (expr.kind == K::Answered)
                    truth.push_back(cell.answered);
                else // comparisons on a set of codes: constant per emptiness
                    truth.push_back(cond::evaluate(
                        expr,
                        singleEnvironment(position, cell.empty ? cond::CellValue::notPresented()
                                                               : cond::CellValue::ofCodes({}))));
            }
            result = m_mdd.literal(vars[0], truth);
        }
    }
    slot = {&expr, result};
    return result;
}

int ConditionAlgebra::valueCellOf(int var, const cond::CellValue& value) const {
    const DecisionVar& v = m_vars[var];
    if (!value.presented())
        return 0;
    // A cell's signature is that of any of its pieces (cells are made by
    // signature); worked out again here rather than kept with every cell, as
    // only replaying answers asks.
    const ItemAtoms& atoms = m_atoms[std::size_t(v.position)];
    const QList<bool> sig = signature(v.position, atoms, value);
    for (int c = 1; c < v.cells.size(); ++c)
        if (signature(v.position, atoms, v.sampleOf(c)) == sig)
            return c;
    return -1; // a value outside the item's domain (invalid data)
}

std::vector<int> ConditionAlgebra::assignmentOf(const QList<cond::CellValue>& values) const {
    std::vector<int> cells(m_vars.size(), 0);
    for (int id = 0; id < m_vars.size(); ++id) {
        const DecisionVar& v = m_vars[id];
        const cond::CellValue& value = values.at(v.position);
        if (v.role == DecisionVar::Role::Value) {
            cells[id] = valueCellOf(id, value);
        } else if (v.role == DecisionVar::Role::MultiHas) {
            cells[id] = value.presented() && value.codes.contains(v.code) ? 1 : 0;
        } else if (value.presented()) {
            bool answered = false;
            for (qint64 c : value.codes)
                answered = answered || !m_routing->isMissingCode(v.position, c);
            for (int c = 1; c < v.cells.size(); ++c)
                if (v.cells[c].answered == answered)
                    cells[id] = c;
        }
    }
    return cells;
}

cond::CellValue ConditionAlgebra::sampleValue(int position,
                                              const std::vector<int>& cellOfVar) const {
    const std::span<const int> vars = varsOf(position);
    if (vars.empty())
        return cond::CellValue::notPresented();
    const DecisionVar& first = m_vars[vars[0]];
    int cell = cellOfVar.at(vars[0]);
    if (cell < 0)
        cell = first.cells.size() > 1 ? 1 : 0;
    if (cell == 0)
        return cond::CellValue::notPresented();
    if (first.role == DecisionVar::Role::Value)
        return first.sampleOf(cell);
    QList<qint64> chosen;
    for (int v : vars.subspan(1))
        if (cellOfVar.at(v) == 1)
            chosen.append(m_vars[v].code);
    const bool wantAnswered = first.cells[cell].answered;
    bool answered = false;
    for (qint64 c : chosen)
        answered = answered || !m_routing->isMissingCode(position, c);
    if (answered != wantAnswered || chosen.isEmpty()) {
        // Add a code no `has` names, of the kind the status needs.
        for (const Code& c : m_routing->codes(position)) {
            bool named = false;
            for (int v : vars.subspan(1))
                named = named || m_vars[v].code == c.code;
            if (!named && c.isMissing() != wantAnswered) {
                chosen.append(c.code);
                break;
            }
        }
    }
    return cond::CellValue::ofCodes(chosen);
}

} // namespace rb::analysis
