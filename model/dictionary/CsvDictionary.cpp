#include "CsvDictionary.h"

#include "TextEscape.h"

using namespace Qt::StringLiterals;

namespace rb {

QStringList csvDictionaryColumns() {
    return {u"variable"_s,        u"item"_s,           u"module"_s,
            u"position"_s,        u"type"_s,           u"label"_s,
            u"question_text"_s,   u"instruction"_s,    u"asked"_s,
            u"universe"_s,        u"universe_words"_s, u"gate_items"_s,
            u"not_asked_value"_s, u"implied_value"_s,  u"implied_if"_s,
            u"range_min"_s,       u"range_max"_s,      u"code"_s,
            u"code_label"_s,      u"missing_kind"_s,   u"routing"_s};
}

namespace {

QString joinRow(const QStringList& fields) {
    QStringList quoted;
    quoted.reserve(fields.size());
    for (const QString& f : fields)
        quoted.append(csvField(f));
    return quoted.join(u',') + u"\r\n"_s;
}

QStringList variableFields(const Dictionary& d, const DictionaryEntry& e) {
    QStringList gates;
    for (const DictionaryGate& g : e.gates)
        gates.append(g.name);
    const bool skipped = e.asked != ItemUniverse::Asked::Always;
    return {e.variable,
            e.item,
            e.module,
            QString::number(e.position),
            itemTypeName(e.type),
            e.label,
            e.text,
            e.instruction,
            askedName(e.asked),
            e.askedIf,
            e.plain,
            gates.join(u' '),
            skipped ? d.legitimateSkipCode : QString(),
            e.implied ? e.implied->value : QString(),
            e.implied ? e.implied->condition.value_or(QString()) : QString(),
            e.rangeMin.value_or(QString()),
            e.rangeMax.value_or(QString())};
}

} // namespace

QByteArray exportCsvDictionary(const Dictionary& d) {
    QString out = joinRow(csvDictionaryColumns());
    for (const DictionaryEntry& e : d.entries) {
        if (!e.hasVariable)
            continue;
        const QStringList fields = variableFields(d, e);
        QStringList rules;
        for (const DictionaryRoute& r : e.routing)
            rules.append(routeWords(r));
        const QString routing = rules.join(u"; "_s);
        if (e.codes.isEmpty())
            out += joinRow(fields + QStringList{QString(), QString(), QString(), routing});
        for (const DictionaryCode& c : e.codes)
            out += joinRow(fields + QStringList{QString::number(c.code), c.label,
                                                missingKindName(c.missing), routing});
    }
    return out.toUtf8();
}

} // namespace rb
