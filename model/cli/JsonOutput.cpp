#include "JsonOutput.h"

#include "check/InstrumentCheck.h"

#include <QJsonArray>

namespace rb {

static QJsonValue orNull(const QString& text) {
    return text.isEmpty() ? QJsonValue(QJsonValue::Null) : QJsonValue(text);
}

QJsonObject findingsToJson(const Findings& findings) {
    QJsonArray list;
    for (const Finding& f : findings) {
        QJsonObject o;
        o.insert(QStringLiteral("id"), f.id());
        o.insert(QStringLiteral("check"), f.check);
        o.insert(QStringLiteral("severity"), severityName(f.severity));
        o.insert(QStringLiteral("item"), orNull(f.item));
        o.insert(QStringLiteral("module"), orNull(f.module));
        if (!f.subject.isEmpty())
            o.insert(QStringLiteral("subject"), f.subject);
        o.insert(QStringLiteral("message"), f.message);
        o.insert(QStringLiteral("field"), orNull(f.field));
        o.insert(QStringLiteral("column"), f.column ? QJsonValue(*f.column) : QJsonValue());
        list.append(o);
    }
    const FindingCounts counts = countFindings(findings);
    QJsonObject summary{{QStringLiteral("errors"), counts.errors},
                        {QStringLiteral("warnings"), counts.warnings}};
    return {{QStringLiteral("findings"), list}, {QStringLiteral("summary"), summary}};
}

QJsonObject routeToJson(const CompiledRouting& routing, const RouteResult& route) {
    QJsonArray path, notPresented;
    QList<bool> presented(routing.itemCount(), false);
    for (int position : route.path) {
        path.append(routing.index().at(position).item->name);
        presented[position] = true;
    }
    for (int p = 0; p < routing.itemCount(); ++p)
        if (!presented.at(p))
            notPresented.append(routing.index().at(p).item->name);
    return {{QStringLiteral("path"), path},
            {QStringLiteral("not_presented"), notPresented},
            {QStringLiteral("end"), route.loop ? QStringLiteral("loop") : QStringLiteral("END")}};
}

} // namespace rb
