#include "CellReading.h"

#include <QDate>

#include <cmath>

namespace rb {

using cond::CellValue;

bool parseCellNumber(QByteArrayView cell, double& value) {
    qsizetype i = 0;
    const qsizetype n = cell.size();
    if (i < n && cell[i] == '-')
        ++i;
    const qsizetype digitsFrom = i;
    while (i < n && cell[i] >= '0' && cell[i] <= '9')
        ++i;
    if (i == digitsFrom)
        return false;
    if (i < n && cell[i] == '.') {
        const qsizetype fraction = ++i;
        while (i < n && cell[i] >= '0' && cell[i] <= '9')
            ++i;
        if (i == fraction)
            return false;
    }
    if (i != n)
        return false;
    // Whole numbers of up to 15 digits: exact by hand, the common case in big files.
    if (n - digitsFrom <= 15 && cell.indexOf('.') < 0) {
        qint64 v = 0;
        for (qsizetype k = digitsFrom; k < n; ++k)
            v = v * 10 + (cell[k] - '0');
        value = double(digitsFrom ? -v : v);
        return true;
    }
    bool ok = false;
    value = cell.toByteArray().toDouble(&ok);
    return ok;
}

bool isIsoDate(QByteArrayView cell) {
    if (cell.size() != 10 || cell[4] != '-' || cell[7] != '-')
        return false;
    for (int k : {0, 1, 2, 3, 5, 6, 8, 9})
        if (cell[k] < '0' || cell[k] > '9')
            return false;
    auto num = [&](int from, int len) {
        int v = 0;
        for (int k = from; k < from + len; ++k)
            v = v * 10 + (cell[k] - '0');
        return v;
    };
    return QDate::isValid(num(0, 4), num(5, 2), num(8, 2));
}

CellInterpreter::CellInterpreter(const CompiledRouting& routing, const HeaderMapping& mapping)
    : m_mapping(mapping), m_skipCode(routing.instrument().settings.legitimateSkipCode.toUtf8()) {
    const int count = routing.itemCount();
    m_items.resize(size_t(count));
    for (int p = 0; p < count; ++p) {
        const Item& item = *routing.index().at(p).item;
        ItemTable& t = m_items[size_t(p)];
        t.type = item.type;
        for (const Code& c : routing.codes(p)) {
            t.codes.insert(c.code, c.missing);
            t.codeOrder.append(c.code);
        }
        if (item.range) {
            t.hasRange = true;
            t.min = item.range->first.value;
            t.max = item.range->second.value;
        }
    }
}

QString CellInterpreter::domainOf(int position) const {
    const ItemTable& t = m_items[size_t(position)];
    switch (t.type) {
    case ItemType::Single:
        return QStringLiteral("one of its codes");
    case ItemType::Multi:
        return QStringLiteral("1, 0 or blank in each NAME_CODE column");
    case ItemType::Integer:
    case ItemType::Decimal: {
        QString words = t.type == ItemType::Integer ? QStringLiteral("a whole number")
                                                    : QStringLiteral("a number");
        if (t.hasRange)
            words += QStringLiteral(" in %1..%2").arg(t.min).arg(t.max);
        return t.codes.isEmpty() ? words : words + QStringLiteral(" or one of its codes");
    }
    case ItemType::Date:
        return QStringLiteral("a date YYYY-MM-DD");
    case ItemType::Text:
    case ItemType::Statement:
        break;
    }
    return QStringLiteral("text");
}

bool CellInterpreter::isLegitimateSkipValue(const ItemTable& t, QByteArrayView cell) const {
    if (cell.isEmpty() || (!m_skipCode.isEmpty() && cell == QByteArrayView(m_skipCode)))
        return true;
    double v = 0;
    if (!parseCellNumber(cell, v) || std::floor(v) != v)
        return false;
    const auto it = t.codes.constFind(qint64(v));
    return it != t.codes.constEnd() && *it == MissingKind::NotApplicable;
}

CellClass classOfMissing(MissingKind kind) {
    switch (kind) {
    case MissingKind::DontKnow:
        return CellClass::DontKnow;
    case MissingKind::Refused:
        return CellClass::Refused;
    case MissingKind::NotApplicable:
        return CellClass::NotApplicable;
    case MissingKind::None:
        break;
    }
    return CellClass::Answered;
}

CellReading CellInterpreter::readSingleColumn(const ItemTable& t, QByteArrayView cell) const {
    CellReading r;
    r.skipIsLegitimate = isLegitimateSkipValue(t, cell);
    if (cell.isEmpty()) {
        r.value = CellValue::blank();
        r.presented = CellClass::Blank;
        return r;
    }
    if (t.type == ItemType::Text || t.type == ItemType::Date) {
        r.value = CellValue::ofText(QString::fromUtf8(cell));
        r.presented =
            t.type == ItemType::Text || isIsoDate(cell) ? CellClass::Answered : CellClass::Invalid;
        return r;
    }
    double v = 0;
    if (!parseCellNumber(cell, v)) { // compared as it stands: text never equals a number
        r.value = CellValue::ofText(QString::fromUtf8(cell));
        r.presented = CellClass::Invalid;
        return r;
    }
    r.value = CellValue::ofNumber(v);
    const bool whole = std::floor(v) == v && std::abs(v) < 9e15;
    const auto code = whole ? t.codes.constFind(qint64(v)) : t.codes.constEnd();
    if (code != t.codes.constEnd()) {
        r.presented = classOfMissing(*code);
        r.counted.append(code.key());
        return r;
    }
    bool ok = t.type != ItemType::Single && (t.type == ItemType::Decimal || whole);
    if (ok && t.hasRange)
        ok = v >= t.min && v <= t.max;
    r.presented = ok ? CellClass::Answered : CellClass::Invalid;
    return r;
}

CellReading CellInterpreter::readMulti(int position, const ItemTable& t,
                                       RecordFields fields) const {
    CellReading r;
    bool invalid = false, anyValue = false;
    const std::vector<int>& columns = m_mapping.multiColumns[size_t(position)];
    QList<qint64> chosen;
    for (size_t k = 0; k < columns.size(); ++k) {
        if (columns[k] < 0)
            continue;
        const QByteArrayView cell = fields[size_t(columns[k])];
        if (cell.isEmpty() || cell == "0")
            continue;
        if (!m_skipCode.isEmpty() && cell == QByteArrayView(m_skipCode))
            continue;
        anyValue = true;
        if (cell == "1")
            chosen.append(t.codeOrder.at(qsizetype(k)));
        else
            invalid = true;
    }
    r.skipIsLegitimate = !anyValue;
    r.counted = chosen;
    r.value = chosen.isEmpty() ? CellValue::blank() : CellValue::ofCodes(chosen);
    if (invalid) {
        r.presented = CellClass::Invalid;
    } else if (chosen.isEmpty()) {
        r.presented = CellClass::Blank;
    } else {
        r.presented = classOfMissing(t.codes.value(chosen.first()));
        for (qint64 c : chosen)
            if (t.codes.value(c) == MissingKind::None)
                r.presented = CellClass::Answered;
    }
    return r;
}

CellReading CellInterpreter::read(int position, RecordFields fields) const {
    const ItemTable& t = m_items[size_t(position)];
    if (t.type == ItemType::Statement) {
        CellReading r;
        r.value = CellValue::blank();
        r.presented = CellClass::Answered;
        return r;
    }
    if (t.type == ItemType::Multi)
        return readMulti(position, t, fields);
    const int column = m_mapping.column[size_t(position)];
    return readSingleColumn(t, column < 0 ? QByteArrayView() : fields[size_t(column)]);
}

} // namespace rb
