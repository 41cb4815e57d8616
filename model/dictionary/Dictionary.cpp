#include "Dictionary.h"

#include "check/InstrumentCheck.h"
#include "layout/SvgWriter.h"

#include <QHash>
#include <QSet>

using namespace Qt::StringLiterals;

namespace rb {

namespace {

QString typeWordsOf(ItemType type) {
    switch (type) {
    case ItemType::Single:
        return u"single choice (one code)"_s;
    case ItemType::Multi:
        return u"0/1 indicator of a multiple-choice item"_s;
    case ItemType::Integer:
        return u"whole number"_s;
    case ItemType::Decimal:
        return u"decimal number"_s;
    case ItemType::Text:
        return u"text"_s;
    case ItemType::Date:
        return u"date (ISO 8601, YYYY-MM-DD)"_s;
    case ItemType::Statement:
        return u"statement (display only, no variable)"_s;
    }
    return {};
}

// Identifier characters only, so the anchor is a valid HTML id and XML ID (NCName).
QString anchorBase(const QString& variable) {
    QString out = u"V_"_s;
    for (const QChar c : variable)
        out += (c.isLetterOrNumber() && c.unicode() < 128) || c == u'_' ? c : u'_';
    return out;
}

QString skipCodeWords(const QString& code) {
    return code.isEmpty() ? u"a blank (the legitimate-skip code is blank)"_s
                          : u"the legitimate-skip code %1"_s.arg(code);
}

QString notPresentedWords(const ItemUniverse& u, const Item& item, const QString& skipCode) {
    if (item.type == ItemType::Statement)
        return u"Display only: there is no variable in the data."_s;
    switch (u.asked) {
    case ItemUniverse::Asked::Always:
        return u"Everyone is asked: there is no legitimate skip, so a blank or a missing code "
               u"is item nonresponse."_s;
    case ItemUniverse::Asked::Never:
        return u"No respondent is asked (see the routing findings): every record holds %1."_s.arg(
            skipCodeWords(skipCode));
    case ItemUniverse::Asked::Conditional:
        break;
    }
    return u"Respondents outside the universe were not asked and hold %1; among those asked, "
           u"a blank or a missing code is item nonresponse."_s.arg(skipCodeWords(skipCode));
}

QList<DictionaryCode> codesOf(const QList<Code>& codes) {
    QList<DictionaryCode> out;
    for (const Code& c : codes)
        out.append({c.code, c.label, c.missing});
    return out;
}

class Builder {
public:
    Builder(const CompiledRouting& routing, const RoutingAnalysis& analysis)
        : m_routing(routing), m_analysis(analysis) {}

    void addItems(Dictionary& d) {
        const ItemIndex& index = m_routing.index();
        for (int pos = 0; pos < index.size(); ++pos) {
            m_firstEntry.insert(pos, int(d.entries.size()));
            addItem(d, pos);
        }
        for (DictionaryEntry& e : d.entries)
            resolveLinks(e);
    }

private:
    void addItem(Dictionary& d, int pos) {
        const ItemIndex::Entry& at = m_routing.index().at(pos);
        const Item& item = *at.item;
        DictionaryEntry e;
        e.item = item.name;
        e.variable = item.name;
        e.hasVariable = item.type != ItemType::Statement;
        e.label = item.label;
        e.text = item.text;
        e.instruction = item.instruction;
        e.notes = item.notes;
        e.type = item.type;
        e.typeWords = typeWordsOf(item.type);
        e.module = at.module->name;
        e.moduleTitle = at.module->title;
        e.position = pos + 1;
        if (item.range) {
            e.rangeMin = item.range->first.text;
            e.rangeMax = item.range->second.text;
        }
        const ItemUniverse& u = universeAt(pos);
        e.asked = u.asked;
        e.askedIf = u.asked == ItemUniverse::Asked::Conditional ? u.askedIf : QString();
        e.plain = u.plain;
        for (int g : u.gatePositions)
            e.gates.append({m_routing.index().at(g).item->name, QString(), -1});
        e.notPresented =
            notPresentedWords(u, item, m_routing.instrument().settings.legitimateSkipCode);
        e.implied = item.whenSkipped;
        addRoutes(e, item, pos);
        if (item.type != ItemType::Multi) {
            e.codes = codesOf(m_routing.codes(pos));
            append(d, e);
            return;
        }
        for (const Code& c : m_routing.codes(pos)) {
            DictionaryEntry v = e;
            v.variable = item.name + u'_' + QString::number(c.code);
            v.label = item.label.isEmpty() ? c.label : item.label + u": "_s + c.label;
            v.indicatorOf = DictionaryCode{c.code, c.label, c.missing};
            v.codes = {{1, u"Chosen"_s, MissingKind::None},
                       {0, u"Not chosen"_s, MissingKind::None}};
            append(d, v);
        }
    }

    const ItemUniverse& universeAt(int pos) const {
        // The analysis lists every item in questionnaire order; look it up by
        // position anyway, so a shorter list cannot shift universes silently.
        for (const ItemUniverse& u : m_analysis.universes)
            if (u.position == pos)
                return u;
        static const ItemUniverse missing{};
        return missing;
    }

    void addRoutes(DictionaryEntry& e, const Item& item, int pos) {
        const QList<CompiledRouting::CompiledRule>& compiled = m_routing.item(pos).rules;
        for (int k = 0; k < item.routing.size(); ++k) {
            const Rule& rule = item.routing.at(k);
            DictionaryRoute r;
            r.condition = rule.condition.value_or(QString());
            r.target = rule.target;
            const int target = k < compiled.size() ? compiled.at(k).target : -1;
            r.usable = k < compiled.size() && compiled.at(k).usable;
            if (target == m_routing.itemCount())
                r.targetItem = u"END"_s;
            else if (target >= 0)
                r.targetItem = m_routing.index().at(target).item->name;
            e.routing.append(r);
        }
    }

    void append(Dictionary& d, DictionaryEntry e) {
        QString anchor = anchorBase(e.variable);
        if (m_anchors.contains(anchor))
            anchor += u"_p"_s + QString::number(e.position);
        for (int n = 2; m_anchors.contains(anchor); ++n)
            anchor = anchorBase(e.variable) + u"_p"_s + QString::number(e.position) + u'_' +
                     QString::number(n);
        m_anchors.insert(anchor);
        e.anchor = anchor;
        d.entries.append(e);
    }

    void resolveLinks(DictionaryEntry& e) {
        for (DictionaryGate& g : e.gates) {
            const int pos = m_routing.positionOf(g.name);
            if (pos < 0)
                continue;
            g.entry = m_firstEntry.value(pos, -1);
            g.label = m_routing.index().at(pos).item->label;
        }
        for (DictionaryRoute& r : e.routing) {
            const int pos = m_routing.index().resolveTarget(r.target);
            if (pos >= 0 && pos < m_routing.itemCount())
                r.targetEntry = m_firstEntry.value(pos, -1);
        }
    }

    const CompiledRouting& m_routing;
    const RoutingAnalysis& m_analysis;
    QHash<int, int> m_firstEntry; // item position -> index of its first entry
    QSet<QString> m_anchors;
};

void addModules(Dictionary& d, const Instrument& instrument) {
    for (const Module& m : instrument.modules)
        d.modules.append({m.name, m.title, m.askIf.value_or(QString()), {}});
    for (int i = 0; i < d.entries.size(); ++i)
        for (DictionaryModule& m : d.modules)
            if (m.name == d.entries.at(i).module) {
                m.entries.append(i);
                break;
            }
}

DictionaryCounts countOf(const Dictionary& d, const RoutingAnalysis& analysis,
                         const Findings& findings) {
    DictionaryCounts c;
    c.items = int(analysis.universes.size());
    for (const ItemUniverse& u : analysis.universes) {
        c.conditionalItems += u.asked == ItemUniverse::Asked::Conditional;
        c.neverAskedItems += u.asked == ItemUniverse::Asked::Never;
    }
    for (const DictionaryEntry& e : d.entries) {
        c.variables += e.hasVariable;
        c.conditionalVariables += e.hasVariable && e.isConditional();
    }
    c.modules = int(d.modules.size());
    const FindingCounts f = countFindings(findings);
    c.errors = f.errors;
    c.warnings = f.warnings;
    return c;
}

} // namespace

Dictionary buildDictionary(const CompiledRouting& routing, const RoutingAnalysis& analysis,
                           const Findings& findings, const QDateTime& generated,
                           const QByteArray& routeMapSvg) {
    const Instrument& instrument = routing.instrument();
    Dictionary d;
    d.title = instrument.title;
    d.version = instrument.version;
    d.language = instrument.language;
    d.generated = generated.toUTC();
    d.legitimateSkipCode = instrument.settings.legitimateSkipCode;
    d.routeMapSvg = routeMapSvg;
    Builder(routing, analysis).addItems(d);
    addModules(d, instrument);
    d.counts = countOf(d, analysis, findings);
    return d;
}

Dictionary buildDictionary(const CompiledRouting& routing, const QDateTime& generated) {
    // Laid out once for both the SVG (HTML) and the drawing (PDF); the same
    // steps as exportSvg, so the picture equals `routebook export --format svg`.
    RouteMapDrawing map;
    map.graph = layout::RouteGraph::fromRouting(routing);
    map.layout = layout::layoutRouteGraph(map.graph);
    const QByteArray svg =
        layout::writeRouteMapSvg(map.graph, map.layout, routing.instrument().title);
    Dictionary d =
        buildDictionary(routing, analyzeRouting(routing), checkInstrument(routing), generated, svg);
    d.routeMap = std::move(map);
    return d;
}

GenerationTime generationTime() {
    if (!qEnvironmentVariableIsSet("SOURCE_DATE_EPOCH"))
        return {QDateTime::currentDateTimeUtc(), std::nullopt};
    const QString text = qEnvironmentVariable("SOURCE_DATE_EPOCH").trimmed();
    bool ok = false;
    const qint64 seconds = text.toLongLong(&ok);
    if (!ok || seconds < 0)
        return {{},
                Diagnostic{u"SOURCE_DATE_EPOCH"_s, 0, 0,
                           u"SOURCE_DATE_EPOCH must be a whole number of seconds since "
                           u"1970-01-01 UTC, got '%1'"_s.arg(text)}};
    return {QDateTime::fromSecsSinceEpoch(seconds, Qt::UTC), std::nullopt};
}

QString missingKindWords(MissingKind kind) {
    switch (kind) {
    case MissingKind::None:
        return {};
    case MissingKind::DontKnow:
        return u"don't know"_s;
    case MissingKind::Refused:
        return u"refused"_s;
    case MissingKind::NotApplicable:
        return u"not applicable"_s;
    }
    return {};
}

QString askedWords(const DictionaryEntry& entry) {
    switch (entry.asked) {
    case ItemUniverse::Asked::Always:
        return u"Asked of everyone"_s;
    case ItemUniverse::Asked::Conditional:
        return u"CONDITIONAL"_s;
    case ItemUniverse::Asked::Never:
        return u"Never asked"_s;
    }
    return {};
}

QString routeWords(const DictionaryRoute& route) {
    const QString target = route.targetItem.isEmpty() || route.targetItem == route.target
                               ? route.target
                               : u"%1 (%2)"_s.arg(route.target, route.targetItem);
    QString words = route.condition.isEmpty() ? u"always go to %1"_s.arg(target)
                                              : u"if %1 go to %2"_s.arg(route.condition, target);
    if (!route.usable)
        words += u" [broken rule: never fires]"_s;
    return words;
}

QString impliedWords(const WhenSkipped& implied) {
    const QString value = implied.valueIsText ? u"\"%1\""_s.arg(implied.value) : implied.value;
    return implied.condition ? u"%1 when not asked and %2"_s.arg(value, *implied.condition)
                             : u"%1 whenever not asked"_s.arg(value);
}

} // namespace rb
