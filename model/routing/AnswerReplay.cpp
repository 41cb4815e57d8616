#include "AnswerReplay.h"

#include <QDate>

#include <cmath>

namespace rb {

namespace {

bool isCode(const QList<Code>& codes, qint64 value) {
    for (const Code& c : codes)
        if (c.code == value)
            return true;
    return false;
}

bool isMissingCodeValue(const QList<Code>& codes, double value) {
    for (const Code& c : codes)
        if (c.isMissing() && double(c.code) == value)
            return true;
    return false;
}

AnswerCheck numberAnswer(const Item& item, const QList<Code>& codes, const AnswerValue& answer) {
    bool ok = false;
    const double v = answer.text.toDouble(&ok);
    if (answer.kind != AnswerValue::Kind::Number || !ok)
        return {{}, QStringLiteral("expects a number")};
    if (isMissingCodeValue(codes, v))
        return {cond::CellValue::ofNumber(v), {}};
    if (item.type == ItemType::Integer && std::floor(v) != v)
        return {{}, QStringLiteral("expects a whole number")};
    if (item.range && (v < item.range->first.value || v > item.range->second.value))
        return {{},
                QStringLiteral("%1 is outside the range %2..%3")
                    .arg(answer.text, item.range->first.text, item.range->second.text)};
    return {cond::CellValue::ofNumber(v), {}};
}

AnswerCheck singleAnswer(const QList<Code>& codes, const AnswerValue& answer) {
    bool ok = false;
    const qint64 v = answer.text.toLongLong(&ok);
    if (answer.kind != AnswerValue::Kind::Number || !ok)
        return {{}, QStringLiteral("expects one code")};
    if (!isCode(codes, v))
        return {{}, QStringLiteral("%1 is not one of its codes").arg(answer.text)};
    return {cond::CellValue::ofNumber(double(v)), {}};
}

AnswerCheck multiAnswer(const QList<Code>& codes, const AnswerValue& answer) {
    if (answer.kind != AnswerValue::Kind::List || answer.codes.isEmpty())
        return {{}, QStringLiteral("expects a non-empty list of codes")};
    for (qint64 code : answer.codes)
        if (!isCode(codes, code))
            return {{}, QStringLiteral("%1 is not one of its codes").arg(code)};
    return {cond::CellValue::ofCodes(answer.codes), {}};
}

AnswerCheck textAnswer(const Item& item, const AnswerValue& answer) {
    if (answer.kind == AnswerValue::Kind::List)
        return {{}, QStringLiteral("expects text")};
    if (item.type == ItemType::Date && !QDate::fromString(answer.text, Qt::ISODate).isValid())
        return {{}, QStringLiteral("expects a date YYYY-MM-DD")};
    return {cond::CellValue::ofText(answer.text), {}};
}

} // namespace

AnswerCheck cellForAnswer(const Item& item, const QList<Code>& codes, const AnswerValue& answer) {
    switch (item.type) {
    case ItemType::Single:
        return singleAnswer(codes, answer);
    case ItemType::Multi:
        return multiAnswer(codes, answer);
    case ItemType::Integer:
    case ItemType::Decimal:
        return numberAnswer(item, codes, answer);
    case ItemType::Text:
    case ItemType::Date:
        return textAnswer(item, answer);
    case ItemType::Statement:
        break;
    }
    return {cond::CellValue::blank(), {}};
}

ReplayResult replayAnswers(const CompiledRouting& routing,
                           const QHash<QString, AnswerValue>& answersByLowerName) {
    ReplayResult result;
    auto answerOf = [&](int position) {
        const Item& item = *routing.index().at(position).item;
        if (item.type == ItemType::Statement)
            return cond::CellValue::blank(); // presented, holds no value
        const auto it = answersByLowerName.constFind(item.name.toLower());
        if (it == answersByLowerName.constEnd()) {
            if (result.error.isEmpty())
                result.error =
                    QStringLiteral("item '%1' is presented but has no answer").arg(item.name);
            return cond::CellValue::blank();
        }
        AnswerCheck check = cellForAnswer(item, routing.codes(position), *it);
        if (!check.error.isEmpty() && result.error.isEmpty())
            result.error = QStringLiteral("answer for '%1': %2").arg(item.name, check.error);
        return check.value;
    };
    result.route = simulateRoute(routing, answerOf);
    return result;
}

QHash<QString, AnswerValue> answersByLowerName(const QList<Answer>& answers) {
    QHash<QString, AnswerValue> byName;
    for (const Answer& a : answers)
        byName.insert(a.item.toLower(), a.value);
    return byName;
}

} // namespace rb
