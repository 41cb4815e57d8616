#include "DataCheckJson.h"

#include <QJsonArray>

namespace rb {

bool isSuppressed(qint64 count, int suppressBelow) {
    return suppressBelow > 0 && count > 0 && count < suppressBelow;
}

QString shownCount(qint64 count, int suppressBelow) {
    return isSuppressed(count, suppressBelow) ? QStringLiteral("<%1").arg(suppressBelow)
                                              : QString::number(count);
}

namespace {

QJsonValue countValue(qint64 count, int suppressBelow) {
    if (isSuppressed(count, suppressBelow))
        return shownCount(count, suppressBelow);
    return QJsonValue(double(count));
}

// A percentage with one decimal, or null when the base is 0 or the count is suppressed.
QJsonValue percentValue(qint64 count, qint64 base, int suppressBelow) {
    if (base <= 0 || isSuppressed(count, suppressBelow))
        return QJsonValue::Null;
    return qRound(1000.0 * double(count) / double(base)) / 10.0;
}

QJsonObject problemsToJson(const ProblemRecords& p, int suppressBelow) {
    QJsonObject o{{QStringLiteral("count"), countValue(p.count, suppressBelow)}};
    // Record numbers identify rows, so they are left out once small cells are suppressed.
    if (suppressBelow <= 0)
        o.insert(QStringLiteral("first"), QJsonArray::fromStringList(p.first));
    return o;
}

QJsonObject itemToJson(const ItemCounts& c, qint64 records, int s) {
    QJsonObject byKind{{QStringLiteral("blank"), countValue(c.nonresponseByKind[0], s)},
                       {QStringLiteral("dont_know"), countValue(c.nonresponseByKind[1], s)},
                       {QStringLiteral("refused"), countValue(c.nonresponseByKind[2], s)},
                       {QStringLiteral("not_applicable"), countValue(c.nonresponseByKind[3], s)}};
    QJsonArray frequencies;
    for (const CodeCount& f : c.frequencies) {
        QJsonObject o{
            {QStringLiteral("code"), double(f.code)},
            {QStringLiteral("label"), f.label},
            {QStringLiteral("count"), countValue(f.count, s)},
            {QStringLiteral("percent_of_presented"), percentValue(f.count, c.presented, s)},
            {QStringLiteral("percent_of_records"), percentValue(f.count, records, s)}};
        if (f.missing != MissingKind::None)
            o.insert(QStringLiteral("missing"), missingKindName(f.missing));
        frequencies.append(o);
    }
    const QList<std::pair<QString, qint64>> classes = {
        {QStringLiteral("presented"), c.presented},
        {QStringLiteral("answered"), c.answered},
        {QStringLiteral("nonresponse"), c.nonresponse()},
        {QStringLiteral("invalid"), c.invalid},
        {QStringLiteral("legitimate_skip"), c.legitimateSkip},
        {QStringLiteral("routing_violation"), c.routingViolation}};
    QJsonObject o{
        {QStringLiteral("name"), c.name},
        {QStringLiteral("type"), c.type},
        {QStringLiteral("nonresponse_by_kind"), byKind},
        {QStringLiteral("frequencies"), frequencies},
        {QStringLiteral("skip_after_missing_gate"), countValue(c.skipAfterMissingGate, s)},
        {QStringLiteral("break_off_starts"), countValue(c.breakOffStarts, s)},
        {QStringLiteral("implied"), countValue(c.implied, s)}};
    QJsonObject percent;
    for (const auto& [key, value] : classes) {
        o.insert(key, countValue(value, s));
        percent.insert(key, percentValue(value, records, s));
    }
    o.insert(QStringLiteral("percent"), percent);
    return o;
}

} // namespace

QJsonObject dataCheckToJson(const DataCheckResult& result, int suppressBelow) {
    QJsonArray items;
    for (const ItemCounts& c : result.items)
        items.append(itemToJson(c, result.records, suppressBelow));
    QJsonArray invalidCells;
    if (suppressBelow <= 0)
        for (const Diagnostic& d : result.invalidCells)
            invalidCells.append(QJsonObject{{QStringLiteral("line"), d.line},
                                            {QStringLiteral("column"), d.column},
                                            {QStringLiteral("message"), d.message}});
    return QJsonObject{
        {QStringLiteral("records"), double(result.records)},
        {QStringLiteral("items"), items},
        {QStringLiteral("unknown_columns"), QJsonArray::fromStringList(result.unknownColumns)},
        {QStringLiteral("missing_columns"), QJsonArray::fromStringList(result.missingColumns)},
        {QStringLiteral("records_with_violations"),
         problemsToJson(result.violations, suppressBelow)},
        {QStringLiteral("records_with_invalid_values"),
         problemsToJson(result.invalid, suppressBelow)},
        {QStringLiteral("break_offs"), problemsToJson(result.breakOffs, suppressBelow)},
        {QStringLiteral("empty_records"), problemsToJson(result.emptyRecords, suppressBelow)},
        {QStringLiteral("route_loops"), problemsToJson(result.loops, suppressBelow)},
        {QStringLiteral("suppress_below"), suppressBelow},
        {QStringLiteral("invalid_cells"), invalidCells}};
}

} // namespace rb
