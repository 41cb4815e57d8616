#include "UniversePrinter.h"

#include "condition/Printer.h"

#include <algorithm>
#include <cmath>

using namespace Qt::StringLiterals;

namespace rb::analysis {

namespace {

QString number(double v) {
    if (std::floor(v) == v && std::fabs(v) < 1e15)
        return QString::number(qint64(v));
    return QString::number(v, 'g', 15);
}

QString quoted(const QString& text) {
    cond::Value value;
    value.kind = cond::Value::Kind::Text;
    value.text = text;
    return cond::printValue(value);
}

// "a, b or c"
QString joinWords(const QStringList& parts, const QString& last) {
    if (parts.size() <= 1)
        return parts.join(QString());
    return parts.mid(0, parts.size() - 1).join(u", "_s) + u' ' + last + u' ' + parts.last();
}

struct TextUnit {
    int cell;
    bool point;
    QString text; // the literal (point) or the literal the gap follows
};

// Text values in code-unit order: blank, a gap, the first literal, a gap, ...
QList<TextUnit> textUnits(const DecisionVar& var) {
    QList<std::pair<QString, TextUnit>> units;
    for (int c = 1; c < var.cells.size(); ++c)
        for (const ValuePiece& p : var.piecesOf(c)) {
            const bool point = p.kind == ValuePiece::Kind::Text;
            QString after = var.textOf(p);
            if (!point)
                after.chop(1); // gaps are the literal followed by U+0001
            units.append({var.textOf(p), TextUnit{c, point, after}});
        }
    std::sort(units.begin(), units.end(),
              [](const auto& a, const auto& b) { return a.first < b.first; });
    QList<TextUnit> out;
    for (const auto& u : units)
        out.append(u.second);
    return out;
}

// Maximal runs [first, last] of units whose cells are in the set.
QList<std::pair<int, int>> textRuns(const QList<TextUnit>& units, const CellSet& cells) {
    QList<std::pair<int, int>> runs;
    for (int i = 0; i < units.size(); ++i) {
        if (!cells.test(units[i].cell))
            continue;
        if (!runs.isEmpty() && runs.last().second == i - 1)
            runs.last().second = i;
        else
            runs.append({i, i});
    }
    return runs;
}

} // namespace

// From the index entry, not the item: entries sit together.
ItemType UniversePrinter::itemType(int position) const {
    return m_algebra.routing().index().at(position).type;
}

const QString& UniversePrinter::itemName(int position) const {
    return m_algebra.routing().index().at(position).item->name;
}

QString UniversePrinter::itemLabel(int position) const {
    const Item& item = *m_algebra.routing().index().at(position).item;
    return u'\'' + (item.label.isEmpty() ? item.name : item.label) + u'\'';
}

QString UniversePrinter::codeWords(int position, qint64 code) const {
    for (const Code& c : m_algebra.routing().codes(position))
        if (c.code == code)
            return c.label.isEmpty() ? QString::number(code)
                                     : c.label + u" ("_s + QString::number(code) + u')';
    return QString::number(code);
}

CellSet UniversePrinter::nonEmptyCells(const DecisionVar& var, const CellSet& cells) const {
    CellSet s;
    for (int c = 1; c < var.cells.size(); ++c)
        if (cells.test(c))
            s.set(c);
    return s;
}

QList<UniversePrinter::Segment> UniversePrinter::segmentsOf(const DecisionVar& var,
                                                            const CellSet& cells, bool integer,
                                                            bool& onlyNumbers) const {
    QList<Segment> raw;
    onlyNumbers = true;
    for (int c = 1; c < var.cells.size(); ++c) {
        if (!cells.test(c))
            continue;
        for (const ValuePiece& p : var.piecesOf(c)) {
            if (p.isText())
                onlyNumbers = false;
            else if (p.kind == ValuePiece::Kind::Interval)
                raw.append({p.low, p.high, false, false});
            else
                raw.append({p.low, p.low, true, true});
        }
    }
    if (integer) // whole numbers only: close every bound on the nearest integer inside
        for (Segment& s : raw) {
            if (!s.lowClosed && !std::isinf(s.low))
                s.low = std::floor(s.low) + 1;
            if (!s.highClosed && !std::isinf(s.high))
                s.high = std::ceil(s.high) - 1;
            s.lowClosed = s.highClosed = true;
        }
    std::sort(raw.begin(), raw.end(), [](const Segment& a, const Segment& b) {
        return a.low < b.low || (a.low == b.low && a.lowClosed && !b.lowClosed);
    });
    QList<Segment> merged;
    for (const Segment& s : raw) {
        if (!merged.isEmpty()) {
            Segment& m = merged.last();
            const bool touches =
                integer ? s.low <= m.high + 1
                        : (s.low < m.high || (s.low == m.high && (m.highClosed || s.lowClosed)));
            if (touches) {
                if (s.high > m.high || (s.high == m.high && s.highClosed)) {
                    m.high = s.high;
                    m.highClosed = s.highClosed;
                }
                continue;
            }
        }
        merged.append(s);
    }
    return merged;
}

std::optional<QString> UniversePrinter::valueList(const DecisionVar& var, const CellSet& cells,
                                                  bool& single) const {
    const ItemType type = itemType(var.position);
    single = false;
    if (type == ItemType::Text || type == ItemType::Date) {
        QStringList texts;
        for (int c = 1; c < var.cells.size(); ++c) {
            if (!cells.test(c))
                continue;
            for (const ValuePiece& p : var.piecesOf(c)) {
                if (p.kind != ValuePiece::Kind::Text)
                    return std::nullopt;
                texts.append(quoted(var.textOf(p)));
            }
        }
        single = texts.size() == 1;
        return texts.join(u", "_s);
    }
    const bool integer = type != ItemType::Decimal;
    bool onlyNumbers = true;
    const QList<Segment> segments = segmentsOf(var, cells, integer, onlyNumbers);
    QStringList elements;
    for (const Segment& s : segments) {
        if (std::isinf(s.low) || std::isinf(s.high) || !s.lowClosed || !s.highClosed)
            return std::nullopt;
        if (s.low == s.high)
            elements.append(number(s.low));
        else if (integer && s.high == s.low + 1)
            elements << number(s.low) << number(s.high);
        else
            elements.append(number(s.low) + u".."_s + number(s.high));
    }
    if (!onlyNumbers || elements.isEmpty())
        return std::nullopt;
    single = elements.size() == 1 && !elements.first().contains(u".."_s);
    return elements.join(u", "_s);
}

std::optional<QString> UniversePrinter::comparison(const QString& name,
                                                   const QList<Segment>& segments) const {
    if (segments.size() != 1)
        return std::nullopt;
    const Segment& s = segments.first();
    QStringList parts;
    if (!std::isinf(s.low))
        parts.append(name + (s.lowClosed ? u" >= "_s : u" > "_s) + number(s.low));
    if (!std::isinf(s.high))
        parts.append(name + (s.highClosed ? u" <= "_s : u" < "_s) + number(s.high));
    if (parts.isEmpty())
        return std::nullopt;
    return parts.join(u" and "_s);
}

std::optional<QString> UniversePrinter::positive(const DecisionVar& var,
                                                 const CellSet& cells) const {
    const QString& name = itemName(var.position);
    const CellSet all = nonEmptyCells(var, CellSet::full(int(var.cells.size())));
    if (cells == all)
        return u"asked("_s + name + u')';
    bool single = false;
    if (const std::optional<QString> list = valueList(var, cells, single))
        return single ? name + u" = "_s + *list : name + u" in ("_s + *list + u')';
    const ItemType type = itemType(var.position);
    if (type == ItemType::Text || type == ItemType::Date) {
        const QList<TextUnit> units = textUnits(var);
        const QList<std::pair<int, int>> runs = textRuns(units, cells);
        QStringList parts;
        for (auto [first, last] : runs) {
            if (first == last && units[first].point) {
                parts.append(name + u" = "_s + quoted(units[first].text));
                continue;
            }
            QStringList bounds;
            if (first > 0)
                bounds.append(name + (units[first].point ? u" >= "_s : u" > "_s) +
                              quoted(units[first].text));
            if (last + 1 < units.size())
                bounds.append(name + (units[last].point ? u" <= "_s + quoted(units[last].text)
                                                        : u" < "_s + quoted(units[last + 1].text)));
            parts.append(bounds.isEmpty() ? u"asked("_s + name + u')' : bounds.join(u" and "_s));
        }
        if (parts.size() == 1)
            return parts.first();
        if (!parts.isEmpty())
            return u'(' + parts.join(u" or "_s) + u')';
    }
    if (type == ItemType::Integer || type == ItemType::Decimal) {
        bool onlyNumbers = true;
        const QList<Segment> segments =
            segmentsOf(var, cells, type == ItemType::Integer, onlyNumbers);
        if (onlyNumbers)
            if (const std::optional<QString> cmp = comparison(name, segments))
                return cmp;
    }
    CellSet answered;
    for (int c = 1; c < var.cells.size(); ++c)
        if (var.cells[c].answered)
            answered.set(c);
    if (cells == answered)
        return u"answered("_s + name + u')';
    return std::nullopt;
}

QString UniversePrinter::literal(const SopLiteral& lit) const {
    const DecisionVar& var = m_algebra.variable(lit.var);
    const QString& name = itemName(var.position);
    if (var.role == DecisionVar::Role::MultiHas)
        return (lit.cells.test(1) ? QString() : u"not "_s) + name + u" has "_s +
               QString::number(var.code);
    if (var.role == DecisionVar::Role::MultiStatus) {
        const bool e = lit.cells.test(0);
        bool pna = false, pa = false, hasPna = false, hasPa = false;
        for (int c = 1; c < var.cells.size(); ++c) {
            hasPna = hasPna || !var.cells[c].answered;
            hasPa = hasPa || var.cells[c].answered;
            if (lit.cells.test(c))
                (var.cells[c].answered ? pa : pna) = true;
        }
        if (e && !pa)
            return hasPna && pna ? u"not answered("_s + name + u')' : u"not asked("_s + name + u')';
        if (!e && (pa || pna) && (pa || !hasPa) && (pna || !hasPna))
            return u"asked("_s + name + u')';
        if (!e && pa)
            return u"answered("_s + name + u')';
        if (!e && pna)
            return u"asked("_s + name + u") and not answered("_s + name + u')';
        return u"(answered("_s + name + u") or not asked("_s + name + u"))"_s;
    }
    const CellSet present = nonEmptyCells(var, lit.cells);
    if (!lit.cells.test(0)) {
        if (const std::optional<QString> p = positive(var, present))
            return *p;
    } else {
        if (present.count() == 0)
            return u"not asked("_s + name + u')';
        CellSet complement;
        for (int c = 1; c < var.cells.size(); ++c)
            if (!lit.cells.test(c))
                complement.set(c);
        bool single = false;
        if (const std::optional<QString> list = valueList(var, complement, single))
            return single ? name + u" <> "_s + *list : name + u" not in ("_s + *list + u')';
        if (const std::optional<QString> p = positive(var, complement))
            return u"not ("_s + *p + u')';
        if (const std::optional<QString> p = positive(var, present))
            return u"(not asked("_s + name + u") or "_s + *p + u')';
    }
    // Cell by cell (sets no single form states, e.g. text that is none of the literals).
    QStringList parts;
    if (lit.cells.test(0))
        parts.append(u"not asked("_s + name + u')');
    for (int c = 1; c < var.cells.size(); ++c) {
        if (!lit.cells.test(c))
            continue;
        CellSet one;
        one.set(c);
        if (const std::optional<QString> p = positive(var, one)) {
            parts.append(*p);
            continue;
        }
        CellSet others;
        for (int o = 1; o < var.cells.size(); ++o)
            if (o != c)
                others.set(o);
        bool single = false;
        const std::optional<QString> list = valueList(var, others, single);
        parts.append(
            u"asked("_s + name + u") and "_s +
            (list ? (single ? name + u" <> "_s + *list : name + u" not in ("_s + *list + u')')
                  : u"true"_s));
    }
    return parts.size() == 1 ? parts.first() : u'(' + parts.join(u" or "_s) + u')';
}

QString UniversePrinter::condition(const Sop& sop) const {
    if (sop.products.empty())
        return u"false"_s;
    QStringList products;
    for (const SopProduct& p : sop.products) {
        if (p.literals.empty())
            return u"true"_s;
        QStringList lits;
        for (const SopLiteral& l : p.literals)
            lits.append(literal(l));
        products.append(lits.join(u" and "_s));
    }
    return products.join(u" or "_s);
}

QStringList UniversePrinter::valueWords(const DecisionVar& var, const CellSet& cells) const {
    const ItemType type = itemType(var.position);
    QStringList parts;
    if (type == ItemType::Text || type == ItemType::Date) {
        const QList<TextUnit> units = textUnits(var);
        auto word = [](const QString& t) { return t.isEmpty() ? u"blank"_s : quoted(t); };
        for (auto [first, last] : textRuns(units, cells)) {
            if (first == last && units[first].point) {
                parts.append(word(units[first].text));
                continue;
            }
            QStringList bounds;
            if (first > 0)
                bounds.append((units[first].point ? u"from "_s : u"after "_s) +
                              word(units[first].text));
            if (last + 1 < units.size())
                bounds.append(units[last].point ? u"up to "_s + word(units[last].text)
                                                : u"before "_s + word(units[last + 1].text));
            parts.append(u"a text "_s + bounds.join(u" and "_s) + u" in code order"_s);
        }
        return parts;
    }
    bool onlyNumbers = true;
    const bool integer = type != ItemType::Decimal;
    const QList<Segment> segments = segmentsOf(var, cells, integer, onlyNumbers);
    for (const Segment& s : segments) {
        const bool lowInf = std::isinf(s.low), highInf = std::isinf(s.high);
        if (!lowInf && !highInf && s.low == s.high) {
            const bool isCode = type == ItemType::Single ||
                                m_algebra.routing().isMissingCode(var.position, qint64(s.low));
            parts.append(isCode ? codeWords(var.position, qint64(s.low)) : number(s.low));
        } else if (type == ItemType::Single) {
            for (double v = s.low; v <= s.high; ++v)
                for (const Code& c : m_algebra.routing().codes(var.position))
                    if (double(c.code) == v)
                        parts.append(codeWords(var.position, c.code));
        } else if (lowInf) {
            parts.append((s.highClosed ? u"at most "_s : u"less than "_s) + number(s.high));
        } else if (highInf) {
            parts.append((s.lowClosed ? u"at least "_s : u"more than "_s) + number(s.low));
        } else if (s.lowClosed && s.highClosed) {
            parts.append(u"between "_s + number(s.low) + u" and "_s + number(s.high));
        } else {
            parts.append((s.lowClosed ? u"at least "_s : u"more than "_s) + number(s.low) +
                         u" and "_s + (s.highClosed ? u"at most "_s : u"less than "_s) +
                         number(s.high));
        }
    }
    return parts;
}

QString UniversePrinter::literalWords(const SopLiteral& lit) const {
    const DecisionVar& var = m_algebra.variable(lit.var);
    const QString label = itemLabel(var.position);
    if (var.role == DecisionVar::Role::MultiHas)
        return label + (lit.cells.test(1) ? u" includes "_s : u" does not include "_s) +
               codeWords(var.position, var.code);
    if (var.role == DecisionVar::Role::MultiStatus) {
        const QString text = literal(lit);
        if (text.startsWith(u"not answered"_s))
            return label + u" was not answered"_s;
        if (text.startsWith(u"not asked"_s))
            return label + u" was not asked"_s;
        if (text.startsWith(u"answered"_s))
            return label + u" was answered"_s;
        if (text.startsWith(u"asked("_s) && !text.contains(u" and "_s))
            return label + u" was asked"_s;
        if (text.startsWith(u"asked("_s))
            return label + u" was asked but not answered"_s;
        return label + u" was answered or not asked"_s;
    }
    const CellSet present = nonEmptyCells(var, lit.cells);
    const CellSet all = nonEmptyCells(var, CellSet::full(int(var.cells.size())));
    if (!lit.cells.test(0)) {
        if (present == all)
            return label + u" was asked"_s;
        return label + u" is "_s + joinWords(valueWords(var, present), u"or"_s);
    }
    if (present.count() == 0)
        return label + u" was not asked"_s;
    CellSet complement;
    for (int c = 1; c < var.cells.size(); ++c)
        if (!lit.cells.test(c))
            complement.set(c);
    const QStringList parts = valueWords(var, complement);
    if (parts.size() == 2)
        return label + u" is neither "_s + parts[0] + u" nor "_s + parts[1];
    return label + (parts.size() > 2 ? u" is none of "_s : u" is not "_s) +
           joinWords(parts, u"or"_s);
}

QString UniversePrinter::words(const Sop& sop) const {
    if (sop.products.empty())
        return u"never asked"_s;
    QStringList products;
    bool compound = false;
    for (const SopProduct& p : sop.products) {
        if (p.literals.empty())
            return u"asked of everyone"_s;
        QStringList lits;
        for (const SopLiteral& l : p.literals)
            lits.append(literalWords(l));
        compound = compound || lits.size() > 1;
        products.append(lits.join(u" and "_s));
    }
    return u"asked when "_s + products.join(compound ? u"; or "_s : u" or "_s);
}

} // namespace rb::analysis
