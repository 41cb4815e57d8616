// Data dictionary exports (issue 4): the builder, HTML, Markdown, CSV, DDI
// Codebook 2.5 and PDF, and `routebook export --format ...`.
#include "DictionaryTestTools.h"

#include "analysis/RoutingAnalysis.h"
#include "check/InstrumentCheck.h"
#include "dictionary/CsvDictionary.h"
#include "dictionary/DdiDictionary.h"
#include "dictionary/Dictionary.h"
#include "dictionary/DictionaryExport.h"
#include "dictionary/HtmlDictionary.h"
#include "dictionary/MarkdownDictionary.h"
#include "dictionary/PdfDictionary.h"
#include "dictionary/PdfReproducible.h"
#include "dictionary/TextEscape.h"

#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QRegularExpression>
#include <QTemporaryDir>
#include <QXmlStreamReader>
#include <QtTest>

using namespace Qt::StringLiterals;
using namespace rbtest;

namespace {

const QString kGarden = QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/dictionary/garden.yaml");
const QString kGardenCsv = QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/dictionary/garden-expected.csv");

rb::Dictionary dictionaryOf(const rb::CompiledRouting& routing) {
    return rb::buildDictionary(routing, rb::analyzeRouting(routing), rb::checkInstrument(routing),
                               fixedTime(), QByteArray());
}

QByteArray readFile(const QString& path) {
    QFile f(path);
    return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
}

bool writeFile(const QString& path, const QByteArray& bytes) {
    QFile f(path);
    return f.open(QIODevice::WriteOnly) && f.write(bytes) == bytes.size();
}

// Whitespace removed, so text that a PDF line break split still matches.
QString squeezed(QString text) {
    static const QRegularExpression space(u"\\s+"_s);
    return text.remove(space);
}

// Runs xmllint against the shared DDI Codebook 2.5 schema; "" when valid.
// Source of the schema: DDI Alliance, DDI Codebook 2.5.1 XML Schema
// (../shared/standards/ddi-codebook-2.5/, ddialliance/ddi-c_2).
QString ddiSchemaProblems(const QString& schemaDir, const QString& xmlPath) {
    QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
    env.insert(u"XML_CATALOG_FILES"_s, schemaDir + u"/catalog.xml"_s);
    const ToolRun run = runTool(u"xmllint"_s,
                                {u"--nonet"_s, u"--noout"_s, u"--schema"_s,
                                 schemaDir + u"/schemas/codebook.xsd"_s, xmlPath},
                                env);
    return run.exitCode == 0 ? QString() : QString::fromUtf8(run.err);
}

// Every xs:ID, and every reference (forward/@qstn, varGrp/@var) in the DDI.
struct DdiIds {
    QSet<QString> ids;
    QStringList references;
    QHash<QString, QString> universeById;    // var/@ID -> universe text
    QHash<QString, QStringList> missingById; // var/@ID -> "code:missType"
    QString error;
};

DdiIds readDdi(const QByteArray& xml) {
    DdiIds out;
    QXmlStreamReader r(xml);
    QString var;
    while (!r.atEnd()) {
        if (r.readNext() != QXmlStreamReader::StartElement)
            continue;
        const QXmlStreamAttributes a = r.attributes();
        if (a.hasAttribute(u"ID"_s))
            out.ids.insert(a.value(u"ID"_s).toString());
        if (r.name() == u"var"_s)
            var = a.value(u"ID"_s).toString();
        if (r.name() == u"forward"_s && a.hasAttribute(u"qstn"_s))
            out.references += a.value(u"qstn"_s).toString().split(u' ', Qt::SkipEmptyParts);
        if (r.name() == u"varGrp"_s && a.hasAttribute(u"var"_s))
            out.references += a.value(u"var"_s).toString().split(u' ', Qt::SkipEmptyParts);
        if (r.name() == u"universe"_s)
            out.universeById.insert(var, r.readElementText());
        if (r.name() == u"catgry"_s && a.value(u"missing"_s) == u"Y"_s) {
            const QString type = a.value(u"missType"_s).toString();
            r.readNextStartElement(); // catValu
            out.missingById[var].append(r.readElementText() + u':' + type);
        }
    }
    if (r.hasError())
        out.error = r.errorString();
    return out;
}

bool schemaRequired() {
    return qEnvironmentVariable("CI") == u"true"_s;
}

} // namespace

class TestDictionary : public QObject {
    Q_OBJECT

private slots:
    // --- escaping --------------------------------------------------------
    void htmlEscaping();
    void csvQuoting();
    void markdownEscaping();
    void xmlDropsForbiddenCharacters();

    // --- the builder on the hand-reasoned garden instrument ----------------
    void gardenEntries();
    void gardenCounts();
    void gardenCsvGolden();
    void gardenHtmlContent();
    void gardenMarkdownContent();
    void gardenDdiContent();
    void generationTimeFromEnvironment();

    // --- every sample project ---------------------------------------------
    void sampleUniverses_data();
    void sampleUniverses();
    void sampleDdiValidates_data();
    void sampleDdiValidates();
    void sampleHtmlPassesTidy_data();
    void sampleHtmlPassesTidy();

    // --- hostile strings -------------------------------------------------
    void hostileNothingActive();

    // --- PDF ---------------------------------------------------------------
    void pdfPageSizes_data();
    void pdfPageSizes();
    void pdfHoldsNamesAndUniverses_data();
    void pdfHoldsNamesAndUniverses();
    void pdfDrawsTheRouteMap();
    void pdfDatesAreStampedInPlace();
    void pdfIsReproducible();

    // --- command line ----------------------------------------------------
    void cliExportsEqualModel_data();
    void cliExportsEqualModel();
    void cliUniversesEqualGates_data();
    void cliUniversesEqualGates();
    void cliRejectsBadPageSize();
};

// ---------------------------------------------------------------------------

void TestDictionary::htmlEscaping() {
    // Expected references written by hand: the five characters HTML treats as
    // markup or attribute delimiters (HTML Living Standard, "escaping a string").
    QCOMPARE(rb::htmlEscaped(u"<a href=\"x\">'&'</a>"_s),
             u"&lt;a href=&quot;x&quot;&gt;&#39;&amp;&#39;&lt;/a&gt;"_s);
    QCOMPARE(rb::htmlEscaped(u"plain text"_s), u"plain text"_s);
    QCOMPARE(rb::htmlEscaped(u"a\u0001b\tc"_s), u"ab\tc"_s); // control dropped, tab kept
}

void TestDictionary::csvQuoting() {
    // RFC 4180 §2 rules 6 and 7: fields with line breaks, double quotes or
    // commas are enclosed in double quotes; a quote inside is doubled.
    QCOMPARE(rb::csvField(u"plain"_s), u"plain"_s);
    QCOMPARE(rb::csvField(u"a,b"_s), u"\"a,b\""_s);
    QCOMPARE(rb::csvField(u"say \"hi\""_s), u"\"say \"\"hi\"\"\""_s);
    QCOMPARE(rb::csvField(u"two\r\nlines"_s), u"\"two\r\nlines\""_s);
    QCOMPARE(rb::csvField(u"x <> 1"_s), u"x <> 1"_s);
}

void TestDictionary::markdownEscaping() {
    // CommonMark 0.30 §2.4: any ASCII punctuation may be backslash-escaped;
    // raw HTML (§6.6) cannot start once < is a character reference.
    QCOMPARE(rb::markdownEscaped(u"<script>"_s), u"&lt;script&gt;"_s);
    QCOMPARE(rb::markdownEscaped(u"*a* _b_ [c] | `d`"_s), u"\\*a\\* \\_b\\_ \\[c\\] \\| \\`d\\`"_s);
    QCOMPARE(rb::markdownEscaped(u"line one\nline two"_s), u"line one line two"_s);
    QCOMPARE(rb::markdownEscaped(u"Tom & Jerry"_s), u"Tom &amp; Jerry"_s);
}

void TestDictionary::xmlDropsForbiddenCharacters() {
    // XML 1.0 §2.2 Char: #x9 | #xA | #xD | [#x20-#xD7FF] | [#xE000-#xFFFD] | [#x10000-#x10FFFF].
    QString text = u"a"_s;
    text += QChar(0x0B);   // vertical tab: forbidden
    text += QChar(0xD800); // lone high surrogate: forbidden
    text += u"b"_s;
    text += QChar(0xFFFE);                    // non-character: forbidden
    text += QString::fromUcs4(U"\U0001F33B"); // sunflower, a valid pair: kept
    text += u"]]>"_s;
    QCOMPARE(rb::xmlEscaped(text), u"ab"_s + QString::fromUcs4(U"\U0001F33B") + u"]]&gt;"_s);
}

// ---------------------------------------------------------------------------
// The garden instrument (tests/dictionary/garden.yaml), reasoned by hand:
//   has_garden  asked of everyone (first item, no filter).
//               Its rule "if has_garden <> 1 go to weather" sends codes 2 and 9 past
//               the rest of module garden, so
//   beds        is presented exactly when has_garden = 1 (its only code outside {2, 9}).
//   water_how   likewise has_garden = 1; a multi item, so two 0/1 variables
//               water_how_1 and water_how_2, both CONDITIONAL.
//   rain_barrel is reached when has_garden = 1 and filtered by "water_how has 2".
//               water_how is presented exactly when has_garden = 1, so
//               "water_how has 2" already implies has_garden = 1: the minimal
//               universe is the single literal `water_how has 2`.
//   rain_days   both paths (the goto and the fall-through) reach it: everyone.
//   thanks      a statement, reached by everyone; no variable.
// Items 6, variables 6 (1 + 1 + 2 + 1 + 1), conditional items 3, modules 2.

void TestDictionary::gardenEntries() {
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::Dictionary d = dictionaryOf(routing);

    struct Expected {
        QString variable;
        rb::ItemUniverse::Asked asked;
        QString askedIf;
        QStringList gates;
    };
    using A = rb::ItemUniverse::Asked;
    const QList<Expected> expected = {
        {u"has_garden"_s, A::Always, {}, {}},
        {u"beds"_s, A::Conditional, u"has_garden = 1"_s, {u"has_garden"_s}},
        {u"water_how_1"_s, A::Conditional, u"has_garden = 1"_s, {u"has_garden"_s}},
        {u"water_how_2"_s, A::Conditional, u"has_garden = 1"_s, {u"has_garden"_s}},
        {u"rain_barrel"_s, A::Conditional, u"water_how has 2"_s, {u"water_how"_s}},
        {u"rain_days"_s, A::Always, {}, {}},
        {u"thanks"_s, A::Always, {}, {}},
    };
    QCOMPARE(d.entries.size(), expected.size());
    for (int i = 0; i < expected.size(); ++i) {
        const rb::DictionaryEntry& e = d.entries.at(i);
        QCOMPARE(e.variable, expected.at(i).variable);
        QCOMPARE(e.asked, expected.at(i).asked);
        QCOMPARE(e.askedIf, expected.at(i).askedIf);
        QStringList gates;
        for (const rb::DictionaryGate& g : e.gates) {
            gates.append(g.name);
            // Gate links land on the gate item's first entry.
            QVERIFY(g.entry >= 0);
            QCOMPARE(d.entries.at(g.entry).item, g.name);
        }
        QCOMPARE(gates, expected.at(i).gates);
    }
    QVERIFY(!d.entries.at(6).hasVariable); // thanks is a statement
    // The rule of has_garden: module weather is entered at its first item rain_days.
    QCOMPARE(d.entries.at(0).routing.size(), 1);
    QCOMPARE(d.entries.at(0).routing.at(0).targetItem, u"rain_days"_s);
    QCOMPARE(d.entries.at(d.entries.at(0).routing.at(0).targetEntry).variable, u"rain_days"_s);
    // beds: the implied value 0 for those who said No.
    QVERIFY(d.entries.at(1).implied);
    QCOMPARE(rb::impliedWords(*d.entries.at(1).implied), u"0 when not asked and has_garden = 2"_s);
    // The multi variable stands for its code; its data holds 1 chosen / 0 not.
    QCOMPARE(d.entries.at(3).indicatorOf->label, u"Watering can"_s);
    QCOMPARE(d.entries.at(3).codes.size(), 2);
    // Anchors are unique.
    QSet<QString> anchors;
    for (const rb::DictionaryEntry& e : d.entries)
        anchors.insert(e.anchor);
    QCOMPARE(anchors.size(), d.entries.size());
}

void TestDictionary::gardenCounts() {
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::Dictionary d = dictionaryOf(routing);
    QCOMPARE(d.counts.items, 6);
    QCOMPARE(d.counts.variables, 6);
    QCOMPARE(d.counts.conditionalItems, 3);
    QCOMPARE(d.counts.conditionalVariables, 4); // beds, water_how_1, water_how_2, rain_barrel
    QCOMPARE(d.counts.neverAskedItems, 0);
    QCOMPARE(d.counts.modules, 2);
    // The instrument was written without mistakes: nothing for check to report.
    QCOMPARE(d.counts.errors, 0);
    QCOMPARE(d.counts.warnings, 0);
    QCOMPARE(d.modules.at(0).entries, (QList<int>{0, 1, 2, 3, 4}));
    QCOMPARE(d.modules.at(1).entries, (QList<int>{5, 6}));
}

void TestDictionary::gardenCsvGolden() {
    // garden-expected.csv is written by hand from the reasoning above; the
    // universe_words column is "*" there (the analysis words it), checked below.
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const QByteArray csv = rb::exportCsvDictionary(dictionaryOf(routing));
    QVERIFY(csv.endsWith("\r\n"));
    QVERIFY(!csv.contains("\n\n"));
    const auto actual = parseCsv(csv, &error);
    QVERIFY2(actual, qPrintable(error));
    const auto expected = parseCsv(readFile(kGardenCsv), &error);
    QVERIFY2(expected, qPrintable(error));
    QCOMPARE(actual->size(), expected->size());
    QCOMPARE(actual->first(), rb::csvDictionaryColumns());
    const int words = int(rb::csvDictionaryColumns().indexOf(u"universe_words"_s));
    for (int r = 0; r < expected->size(); ++r) {
        QStringList a = actual->at(r), e = expected->at(r);
        QCOMPARE(a.size(), e.size());
        if (r == 0)
            continue;
        const QString plain = a.at(words);
        if (e.at(8) == u"conditional"_s) {
            // Plain words use the gate item's label (DESIGN.md "Data dictionary").
            const QString gate =
                e.at(11) == u"has_garden"_s ? u"Has a garden"_s : u"Ways of watering"_s;
            QVERIFY2(plain.contains(gate), qPrintable(plain));
        } else {
            QVERIFY2(plain.contains(u"everyone"_s), qPrintable(plain));
        }
        a[words] = e[words] = QString();
        QCOMPARE(a, e);
    }
}

void TestDictionary::gardenHtmlContent() {
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    rb::Dictionary d = dictionaryOf(routing);
    d.routeMapSvg = "<svg xmlns=\"http://www.w3.org/2000/svg\"/>";
    const QString html = QString::fromUtf8(rb::exportHtmlDictionary(d));
    QVERIFY(html.startsWith(u"<!DOCTYPE html>"_s));
    QVERIFY(!html.contains(u"<script"_s, Qt::CaseInsensitive)); // readable without scripts
    QVERIFY(!html.contains(u"<link"_s)); // self-contained: no outside style sheet
    QVERIFY(html.contains(u"@media print"_s));
    QVERIFY(html.contains(u"page-break-before: always"_s));
    QVERIFY(html.contains(u"2023-11-14T22:13:20Z"_s));
    QVERIFY(html.contains(u"<tr><th>Conditional items</th><td>3</td></tr>"_s));
    QVERIFY(html.contains(u"<tr><th>Items</th><td>6</td></tr>"_s));
    QVERIFY(html.contains(u"<tr><th>Modules</th><td>2</td></tr>"_s));
    QVERIFY(html.contains(u"data:image/svg+xml;base64,"_s));
    // Each entry's flag, and the gate link of rain_barrel to water_how's first variable.
    static const QRegularExpression article(
        u"<article class=\"entry (\\w+)\" id=\"(\\w+)\">(.*?)</article>"_s,
        QRegularExpression::DotMatchesEverythingOption);
    QHash<QString, QString> classById, bodyById;
    for (auto it = article.globalMatch(html); it.hasNext();) {
        const auto m = it.next();
        classById.insert(m.captured(2), m.captured(1));
        bodyById.insert(m.captured(2), m.captured(3));
    }
    QCOMPARE(classById.size(), 7);
    QCOMPARE(classById.value(u"V_has_garden"_s), u"always"_s);
    QCOMPARE(classById.value(u"V_beds"_s), u"conditional"_s);
    QCOMPARE(classById.value(u"V_water_how_1"_s), u"conditional"_s);
    QCOMPARE(classById.value(u"V_rain_barrel"_s), u"conditional"_s);
    QCOMPARE(classById.value(u"V_rain_days"_s), u"always"_s);
    QCOMPARE(classById.value(u"V_thanks"_s), u"statement"_s);
    QVERIFY(
        bodyById.value(u"V_rain_barrel"_s).contains(u"<a href=\"#V_water_how_1\">water_how</a>"_s));
    QVERIFY(bodyById.value(u"V_beds"_s).contains(u"<code>has_garden = 1</code>"_s));
    QVERIFY(bodyById.value(u"V_beds"_s).contains(u"the legitimate-skip code -1"_s));
    QVERIFY(!bodyById.value(u"V_has_garden"_s).contains(u"CONDITIONAL"_s));
    QVERIFY(!bodyById.value(u"V_rain_days"_s).contains(u"CONDITIONAL"_s));
    QVERIFY(
        bodyById.value(u"V_has_garden"_s)
            .contains(
                u"if <code>has_garden &lt;&gt; 1</code> go to weather (<a href=\"#V_rain_days\">rain_days</a>)"_s));
}

void TestDictionary::gardenMarkdownContent() {
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const QString md = QString::fromUtf8(rb::exportMarkdownDictionary(dictionaryOf(routing)));
    QVERIFY(md.startsWith(u"# Data dictionary: Garden Watering Check\n"_s));
    QVERIFY(md.contains(u"| Conditional items | 3 |"_s));
    QVERIFY(md.contains(u"### beds — Number of flower beds — CONDITIONAL"_s));
    QVERIFY(md.contains(u"### rain\\_days — Rainy days last week — Asked of everyone"_s));
    QVERIFY(md.contains(u"**CONDITIONAL**: asked only when **water\\_how has 2**"_s));
    QVERIFY(md.contains(u"Gate items: [has\\_garden](#v_has_garden)"_s));
    QVERIFY(md.contains(u"<a id=\"v_has_garden\"></a>"_s));
}

void TestDictionary::gardenDdiContent() {
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const QByteArray xml = rb::exportDdiDictionary(dictionaryOf(routing));
    const DdiIds ddi = readDdi(xml);
    QVERIFY2(ddi.error.isEmpty(), qPrintable(ddi.error));
    QCOMPARE(ddi.universeById.size(), 6); // the statement has no var
    QCOMPARE(ddi.universeById.value(u"V_has_garden"_s), u"Asked of everyone."_s);
    QVERIFY(ddi.universeById.value(u"V_beds"_s).startsWith(u"CONDITIONAL: "_s));
    QVERIFY(ddi.universeById.value(u"V_beds"_s).endsWith(u"Condition: has_garden = 1"_s));
    QVERIFY(ddi.universeById.value(u"V_rain_barrel"_s).endsWith(u"Condition: water_how has 2"_s));
    // Missing codes: refused 9 (code list), the legitimate skip -1 on
    // conditional variables only, don't know 8 on rain_days.
    QCOMPARE(ddi.missingById.value(u"V_has_garden"_s), QStringList{u"9:refused"_s});
    QCOMPARE(ddi.missingById.value(u"V_rain_barrel"_s),
             (QStringList{u"9:refused"_s, u"-1:legitimate_skip"_s}));
    QCOMPARE(ddi.missingById.value(u"V_beds"_s), QStringList{u"-1:legitimate_skip"_s});
    QCOMPARE(ddi.missingById.value(u"V_rain_days"_s), QStringList{u"8:dont_know"_s});
    QVERIFY(xml.contains("<forward qstn=\"Q_V_rain_days\">if has_garden &lt;&gt; 1 go to weather "
                         "(rain_days)</forward>"));
    QVERIFY(xml.contains("<range UNITS=\"INT\" min=\"0\" max=\"50\"/>"));
    QVERIFY(xml.contains("<ivuInstr>Count raised beds, borders and planters.</ivuInstr>"));
    for (const QString& ref : ddi.references)
        QVERIFY2(ddi.ids.contains(ref), qPrintable(ref));
    // varFormat/@schema names no statistical package: only ISO (dates) or "other".
    static const QRegularExpression schema(u"<varFormat[^>]*schema=\"([^\"]*)\""_s);
    for (auto it = schema.globalMatch(QString::fromUtf8(xml)); it.hasNext();) {
        const QString value = it.next().captured(1);
        QVERIFY2(value == u"ISO"_s || value == u"other"_s, qPrintable(value));
    }
}

void TestDictionary::generationTimeFromEnvironment() {
    const QByteArray saved = qgetenv("SOURCE_DATE_EPOCH");
    qputenv("SOURCE_DATE_EPOCH", "1700000000");
    const rb::GenerationTime good = rb::generationTime();
    qputenv("SOURCE_DATE_EPOCH", "yesterday");
    const rb::GenerationTime bad = rb::generationTime();
    if (saved.isNull())
        qunsetenv("SOURCE_DATE_EPOCH");
    else
        qputenv("SOURCE_DATE_EPOCH", saved);
    QVERIFY(!good.error);
    QCOMPARE(good.time.toString(Qt::ISODate), u"2023-11-14T22:13:20Z"_s);
    QVERIFY(bad.error);
    QVERIFY(bad.error->message.contains(u"yesterday"_s));
}

// ---------------------------------------------------------------------------

void TestDictionary::sampleUniverses_data() {
    QTest::addColumn<QString>("path");
    for (const QString& p : sampleProjects())
        QTest::newRow(qPrintable(QFileInfo(p).fileName())) << p;
    QTest::newRow("garden") << kGarden;
}

// For every variable: the universe shown (structure, CSV, DDI, HTML) equals
// the analysis's universe of its item; every conditional entry is flagged and
// no other is.
void TestDictionary::sampleUniverses() {
    QFETCH(QString, path);
    QString error;
    const auto instrument = loadInstrument(path, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::RoutingAnalysis analysis = rb::analyzeRouting(routing);
    const rb::Dictionary d = rb::buildDictionary(routing, analysis, {}, fixedTime(), QByteArray());
    QVERIFY(!d.entries.isEmpty());
    const auto rows = parseCsv(rb::exportCsvDictionary(d), &error);
    QVERIFY2(rows, qPrintable(error));
    QHash<QString, QStringList> csvByVariable;
    for (const QStringList& row : rows->mid(1))
        csvByVariable.insert(row.at(3) + u':' + row.at(0), row); // names may repeat

    const DdiIds ddi = readDdi(rb::exportDdiDictionary(d));
    QVERIFY2(ddi.error.isEmpty(), qPrintable(ddi.error));
    const QString html = QString::fromUtf8(rb::exportHtmlDictionary(d));
    for (const rb::DictionaryEntry& e : d.entries) {
        const rb::ItemUniverse& u = analysis.universes.at(e.position - 1);
        QCOMPARE(analysis.itemName(u.position), e.item);
        QCOMPARE(e.asked, u.asked);
        const QString expectedIf =
            u.asked == rb::ItemUniverse::Asked::Conditional ? u.askedIf : QString();
        QCOMPARE(e.askedIf, expectedIf);
        QCOMPARE(e.plain, u.plain);
        const QString flag = e.isConditional() ? u"CONDITIONAL"_s : QString();
        const QString id = u"id=\""_s + e.anchor + u"\">"_s;
        const qsizetype at = html.indexOf(id);
        QVERIFY2(at > 0, qPrintable(e.anchor));
        const QString body = html.mid(at, html.indexOf(u"</article>"_s, at) - at);
        QCOMPARE(body.contains(u"CONDITIONAL"_s), e.isConditional());
        if (!e.hasVariable)
            continue;
        const QStringList row =
            csvByVariable.value(QString::number(e.position) + u':' + e.variable);
        QVERIFY2(!row.isEmpty(), qPrintable(e.variable));
        QCOMPARE(row.at(8), rb::askedName(u.asked));
        QCOMPARE(row.at(9), expectedIf);
        const QString universe = ddi.universeById.value(e.anchor);
        QCOMPARE(universe.startsWith(u"CONDITIONAL"_s), e.isConditional());
        if (e.isConditional()) {
            QVERIFY(universe.endsWith(u"Condition: "_s + u.askedIf));
            QVERIFY(body.contains(rb::htmlEscaped(u.askedIf)));
        }
    }
}

void TestDictionary::sampleDdiValidates_data() {
    sampleUniverses_data();
    QTest::newRow("hostile") << QString();
}

void TestDictionary::sampleDdiValidates() {
    QFETCH(QString, path);
    const QString schema = ddiSchemaDir();
    if (schema.isEmpty() && schemaRequired())
        QFAIL("CI=true but the DDI Codebook 2.5 schema is missing: set ROUTEBOOK_SHARED_DIR");
    if (schema.isEmpty())
        QSKIP("DDI Codebook 2.5 schema not found under ROUTEBOOK_SHARED_DIR: SKIPPED, not passed");
    if (!toolExists(u"xmllint"_s)) {
        if (schemaRequired())
            QFAIL("CI=true but xmllint (Debian package libxml2-utils) is not installed");
        QSKIP("xmllint (libxml2-utils) is not installed: SKIPPED, not passed");
    }
    QString error;
    const auto instrument =
        path.isEmpty() ? std::optional(hostileInstrument()) : loadInstrument(path, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const QByteArray xml = rb::exportDdiDictionary(dictionaryOf(routing));
    QTemporaryDir dir;
    const QString out = dir.filePath(u"ddi.xml"_s);
    QVERIFY(writeFile(out, xml));
    const QString problems = ddiSchemaProblems(schema, out);
    QVERIFY2(problems.isEmpty(), qPrintable(problems));
    // The schema does not resolve these references (IDREFS): check every one.
    const DdiIds ddi = readDdi(xml);
    QVERIFY(!ddi.ids.isEmpty());
    for (const QString& ref : ddi.references)
        QVERIFY2(ddi.ids.contains(ref), qPrintable(ref));
}

void TestDictionary::sampleHtmlPassesTidy_data() {
    sampleDdiValidates_data();
}

void TestDictionary::sampleHtmlPassesTidy() {
    QFETCH(QString, path);
    if (!toolExists(u"tidy"_s)) {
        if (schemaRequired())
            QFAIL("CI=true but HTML Tidy (Debian package tidy) is not installed");
        QSKIP("HTML Tidy (Debian package tidy) is not installed: SKIPPED, not passed");
    }
    QString error;
    const auto instrument =
        path.isEmpty() ? std::optional(hostileInstrument()) : loadInstrument(path, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::Dictionary d = rb::buildDictionary(routing, fixedTime());
    QTemporaryDir dir;
    const QString out = dir.filePath(u"dictionary.html"_s);
    QVERIFY(writeFile(out, rb::exportHtmlDictionary(d)));
    // tidy exit codes (tidy(1)): 0 clean, 1 warnings only, 2 errors.
    const ToolRun run = runTool(u"tidy"_s, {u"-q"_s, u"-e"_s, u"-utf8"_s, out});
    QVERIFY2(run.exitCode == 0 || run.exitCode == 1, run.err.constData());
}

// ---------------------------------------------------------------------------

void TestDictionary::hostileNothingActive() {
    const rb::Instrument instrument = hostileInstrument();
    const rb::CompiledRouting routing(instrument);
    const rb::Dictionary d = dictionaryOf(routing);
    QCOMPARE(d.entries.size(), 2);
    QVERIFY(d.entries.at(1).isConditional()); // follow: asked if gate = 1

    const QByteArray html = rb::exportHtmlDictionary(d);
    const QByteArray md = rb::exportMarkdownDictionary(d);
    const QByteArray xml = rb::exportDdiDictionary(d);
    const QByteArray csv = rb::exportCsvDictionary(d);
    // No format carries the markup as markup.
    for (const QByteArray& text : {html, md, xml}) {
        QVERIFY(!text.contains("<script"));
        QVERIFY(!text.contains("<b>bold"));
        QVERIFY(text.contains("&lt;script&gt;"));
    }
    QVERIFY(!xml.contains("]]>"));
    QVERIFY(xml.contains("]]&gt;"));
    // Markdown: emphasis, code, links and table pipes are all escaped.
    QVERIFY(md.contains("\\*star\\* \\_under\\_ \\`tick\\` \\[link\\]"));
    QVERIFY(!md.contains("[link](http"));
    // HTML isolates right-to-left text so it cannot reorder the page around it.
    QVERIFY(html.contains(QStringLiteral("<bdi>\u05D2\u05D9\u05E0\u05D4").toUtf8()));
    // The long wording is there whole (nothing cut).
    QVERIFY(html.contains(QByteArray(9000, 'w')));
    // XML parses and gives the strings back exactly.
    QXmlStreamReader r(xml);
    QStringList labels;
    while (!r.atEnd())
        if (r.readNext() == QXmlStreamReader::StartElement && r.name() == u"labl"_s)
            labels.append(r.readElementText());
    QVERIFY2(!r.hasError(), qPrintable(r.errorString()));
    QVERIFY(labels.contains(hostileStrings().at(0)));
    QVERIFY(labels.contains(hostileStrings().at(3)));
    QVERIFY(labels.contains(hostileStrings().at(4)));
    // CSV: a reader gives back every hostile string unchanged.
    QString error;
    const auto rows = parseCsv(csv, &error);
    QVERIFY2(rows, qPrintable(error));
    QSet<QString> cells;
    for (const QStringList& row : *rows)
        for (const QString& c : row)
            cells.insert(c);
    for (const QString& s : hostileStrings().mid(0, 5))
        QVERIFY2(cells.contains(s), qPrintable(s));
    QCOMPARE(rows->at(1).size(), rb::csvDictionaryColumns().size());
}

// ---------------------------------------------------------------------------

void TestDictionary::pdfPageSizes_data() {
    QTest::addColumn<QString>("size");
    QTest::addColumn<QString>("points");
    // PDF user units are 1/72 inch. A4 is 210 x 297 mm (ISO 216):
    // 210 / 25.4 * 72 = 595.28, 297 / 25.4 * 72 = 841.89. US Letter is
    // 8.5 x 11 in: 612 x 792.
    QTest::newRow("a4") << u"a4"_s << u"595.28 x 841.89"_s;
    QTest::newRow("letter") << u"letter"_s << u"612 x 792"_s;
}

void TestDictionary::pdfPageSizes() {
    QFETCH(QString, size);
    QFETCH(QString, points);
    if (!toolExists(u"pdfinfo"_s))
        QSKIP("pdfinfo (poppler-utils) is not installed: SKIPPED, not passed");
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::PdfResult pdf =
        rb::exportPdfDictionary(dictionaryOf(routing), *rb::pdfPageSizeFromName(size));
    QVERIFY2(pdf.error.isEmpty(), qPrintable(pdf.error));
    QVERIFY(pdf.bytes.startsWith("%PDF-"));
    QTemporaryDir dir;
    const QString out = dir.filePath(u"d.pdf"_s);
    QVERIFY(writeFile(out, pdf.bytes));
    const QString info = QString::fromUtf8(runTool(u"pdfinfo"_s, {out}).out);
    static const QRegularExpression pageSize(u"Page size:\\s+([0-9.]+) x ([0-9.]+) pts"_s);
    const auto m = pageSize.match(info);
    QVERIFY2(m.hasMatch(), qPrintable(info));
    const QStringList want = points.split(u" x "_s);
    QVERIFY(qAbs(m.captured(1).toDouble() - want.at(0).toDouble()) < 0.5);
    QVERIFY(qAbs(m.captured(2).toDouble() - want.at(1).toDouble()) < 0.5);
}

void TestDictionary::pdfHoldsNamesAndUniverses_data() {
    sampleUniverses_data();
}

void TestDictionary::pdfHoldsNamesAndUniverses() {
    QFETCH(QString, path);
    if (!toolExists(u"pdftotext"_s))
        QSKIP("pdftotext (poppler-utils) is not installed: SKIPPED, not passed");
    QString error;
    const auto instrument = loadInstrument(path, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::Dictionary d = dictionaryOf(routing);
    const rb::PdfResult pdf = rb::exportPdfDictionary(d, rb::PdfPageSize::A4);
    QVERIFY2(pdf.error.isEmpty(), qPrintable(pdf.error));
    QTemporaryDir dir;
    const QString out = dir.filePath(u"d.pdf"_s);
    QVERIFY(writeFile(out, pdf.bytes));
    const ToolRun run = runTool(u"pdftotext"_s, {u"-enc"_s, u"UTF-8"_s, out, u"-"_s});
    QCOMPARE(run.exitCode, 0);
    const QString text = squeezed(QString::fromUtf8(run.out));
    for (const rb::DictionaryEntry& e : d.entries) {
        QVERIFY2(text.contains(squeezed(e.variable)), qPrintable(e.variable));
        if (e.isConditional())
            QVERIFY2(text.contains(squeezed(e.askedIf)), qPrintable(e.askedIf));
    }
}

namespace {

int pdfPages(const QString& path) {
    const QString info = QString::fromUtf8(runTool(u"pdfinfo"_s, {path}).out);
    static const QRegularExpression pages(u"Pages:\\s+(\\d+)"_s);
    const auto m = pages.match(info);
    return m.hasMatch() ? m.captured(1).toInt() : -1;
}

QString pdfPageText(const QString& path, int page) {
    const QString n = QString::number(page);
    return QString::fromUtf8(
        runTool(u"pdftotext"_s, {u"-f"_s, n, u"-l"_s, n, u"-enc"_s, u"UTF-8"_s, path, u"-"_s}).out);
}

} // namespace

void TestDictionary::pdfDrawsTheRouteMap() {
    if (!toolExists(u"pdfinfo"_s) || !toolExists(u"pdftotext"_s))
        QSKIP("pdfinfo / pdftotext (poppler-utils) are not installed: SKIPPED, not passed");
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    rb::Dictionary d = rb::buildDictionary(routing, fixedTime()); // with the map laid out
    QVERIFY(d.routeMap.has_value());
    QTemporaryDir dir;
    const QString with = dir.filePath(u"with.pdf"_s), without = dir.filePath(u"without.pdf"_s);
    QVERIFY(writeFile(with, rb::exportPdfDictionary(d, rb::PdfPageSize::A4).bytes));
    d.routeMap.reset();
    QVERIFY(writeFile(without, rb::exportPdfDictionary(d, rb::PdfPageSize::A4).bytes));
    // The garden map is 6 items + START + END in one column, well under one A4
    // page high at 96 px per inch: exactly one page more.
    const int pages = pdfPages(with);
    QCOMPARE(pages, pdfPages(without) + 1);
    // The last page is the map: its title, the START and END nodes, every item
    // name and the one rule's condition, drawn as (searchable) text.
    const QString map = pdfPageText(with, pages);
    for (const QString& word : {u"Route map"_s, u"START"_s, u"END"_s, u"has_garden"_s,
                                u"rain_barrel"_s, u"thanks"_s, u"has_garden <> 1"_s})
        QVERIFY2(map.contains(word), qPrintable(word + u" not in: "_s + map));
    QVERIFY(!pdfPageText(without, pages - 1).contains(u"START"_s));
}

void TestDictionary::pdfDatesAreStampedInPlace() {
    // 1700000000 s after 1970-01-01 UTC: 19675 days (to 2023-11-14) and
    // 80000 s (22:13:20), worked out by hand.
    const QDateTime time = QDateTime::fromSecsSinceEpoch(1700000000, Qt::UTC);
    const QByteArray pdf = "1 0 obj\n<< /CreationDate (D:20250102030405+01'00')\n"
                           "/ModDate (D:20250102030405Z) >>\nendobj\n"
                           "trailer << /ID [<0123456789abcdef0123456789abcdef> "
                           "<fedcba9876543210fedcba9876543210>] >>\n";
    const QByteArray stamped = rb::stampPdfDates(pdf, time);
    QCOMPARE(stamped.size(), pdf.size()); // nothing moves: xref offsets stay valid
    QVERIFY(stamped.contains("/CreationDate (D:20231114221320+00'00')"));
    QVERIFY(stamped.contains("/ModDate (D:20231114221320Z)"));
    static const QRegularExpression id(u"/ID \\[<([0-9a-f]{32})> <([0-9a-f]{32})>\\]"_s);
    const auto m = id.match(QString::fromLatin1(stamped));
    QVERIFY2(m.hasMatch(), stamped.constData());
    QVERIFY(m.captured(1) != u"0123456789abcdef0123456789abcdef"_s);
    // The identifier depends on the rest of the file only, not on the old random one.
    QByteArray otherId = pdf;
    otherId.replace("0123456789abcdef0123456789abcdef", "ffffffffffffffffffffffffffffffff");
    QCOMPARE(rb::stampPdfDates(otherId, time), stamped);
}

// Two runs of the command line (two processes, so two random hash seeds and
// two clock readings) write the same PDF bytes for one SOURCE_DATE_EPOCH.
void TestDictionary::pdfIsReproducible() {
    QTemporaryDir dir;
    QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
    env.insert(u"QT_QPA_PLATFORM"_s, u"offscreen"_s);
    env.insert(u"SOURCE_DATE_EPOCH"_s, QString::number(kEpoch));
    QList<QByteArray> runs;
    for (const QString& name : {u"first.pdf"_s, u"second.pdf"_s}) {
        const QString out = dir.filePath(name);
        const ToolRun run =
            runTool(QStringLiteral(ROUTEBOOK_BINARY),
                    {u"export"_s, kGarden, u"--format"_s, u"pdf"_s, u"-o"_s, out}, env);
        QVERIFY2(run.exitCode == 0, run.err.constData());
        runs.append(readFile(out));
        QTest::qWait(1100); // a different wall-clock second for the second run
    }
    QVERIFY(runs.at(0).startsWith("%PDF-"));
    QCOMPARE(runs.at(1), runs.at(0));
    QVERIFY(runs.at(0).contains("/CreationDate (D:20231114221320"));
    if (!toolExists(u"qpdf"_s))
        QSKIP("qpdf is not installed: structure check SKIPPED, not passed");
    const ToolRun check = runTool(u"qpdf"_s, {u"--check"_s, dir.filePath(u"first.pdf"_s)});
    QVERIFY2(check.exitCode == 0, check.out.constData());
    QVERIFY(check.out.contains("No syntax or stream encoding errors found"));
}

// ---------------------------------------------------------------------------

void TestDictionary::cliExportsEqualModel_data() {
    QTest::addColumn<QString>("format");
    for (const QString& f : {u"html"_s, u"md"_s, u"csv"_s, u"ddi"_s})
        QTest::newRow(qPrintable(f)) << f;
}

// `routebook export FILE --format F -o OUT` writes what the model renders for
// the same SOURCE_DATE_EPOCH (and so the same bytes twice).
void TestDictionary::cliExportsEqualModel() {
    QFETCH(QString, format);
    QString error;
    const auto instrument = loadInstrument(kGarden, &error);
    QVERIFY2(instrument, qPrintable(error));
    const rb::CompiledRouting routing(*instrument);
    const rb::Dictionary d = rb::buildDictionary(routing, fixedTime());
    const QByteArray expected = format == u"html"_s  ? rb::exportHtmlDictionary(d)
                                : format == u"md"_s  ? rb::exportMarkdownDictionary(d)
                                : format == u"csv"_s ? rb::exportCsvDictionary(d)
                                                     : rb::exportDdiDictionary(d);
    QTemporaryDir dir;
    const QString out = dir.filePath(u"out."_s + format);
    QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
    env.insert(u"SOURCE_DATE_EPOCH"_s, QString::number(kEpoch));
    const ToolRun run = runTool(QStringLiteral(ROUTEBOOK_BINARY),
                                {u"export"_s, kGarden, u"--format"_s, format, u"-o"_s, out}, env);
    QVERIFY2(run.exitCode == 0, run.err.constData());
    QCOMPARE(readFile(out), expected);
}

void TestDictionary::cliUniversesEqualGates_data() {
    sampleUniverses_data();
}

// The CLI's CSV dictionary against the CLI's `gates --json`, item by item.
void TestDictionary::cliUniversesEqualGates() {
    QFETCH(QString, path);
    const ToolRun gates =
        runTool(QStringLiteral(ROUTEBOOK_BINARY), {u"gates"_s, path, u"--json"_s});
    QVERIFY2(gates.exitCode == 0, gates.err.constData());
    // By position, not name: the mistakes sample holds duplicate names on purpose.
    const QJsonArray items =
        QJsonDocument::fromJson(gates.out).object().value(u"items"_s).toArray();
    QVERIFY(!items.isEmpty());
    const ToolRun csv =
        runTool(QStringLiteral(ROUTEBOOK_BINARY), {u"export"_s, path, u"--format"_s, u"csv"_s});
    QVERIFY2(csv.exitCode == 0, csv.err.constData());
    QString error;
    const auto rows = parseCsv(csv.out, &error);
    QVERIFY2(rows, qPrintable(error));
    QVERIFY(rows->size() > 1);
    for (const QStringList& row : rows->mid(1)) {
        const QJsonObject item = items.at(row.at(3).toInt() - 1).toObject();
        QCOMPARE(item.value(u"name"_s).toString(), row.at(1));
        QCOMPARE(row.at(8), item.value(u"asked"_s).toString());
        QCOMPARE(row.at(9), item.value(u"asked_if"_s).toString()); // null reads as ""
        QCOMPARE(row.at(10), item.value(u"plain"_s).toString());
        QStringList gateItems;
        for (const QJsonValue& g : item.value(u"gate_items"_s).toArray())
            gateItems.append(g.toString());
        QCOMPARE(row.at(11), gateItems.join(u' '));
    }
}

void TestDictionary::cliRejectsBadPageSize() {
    QTemporaryDir dir;
    const QString out = dir.filePath(u"x.pdf"_s);
    QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
    env.insert(u"QT_QPA_PLATFORM"_s, u"offscreen"_s);
    const ToolRun bad = runTool(QStringLiteral(ROUTEBOOK_BINARY),
                                {u"export"_s, kGarden, u"--format"_s, u"pdf"_s, u"--page-size"_s,
                                 u"tabloid"_s, u"-o"_s, out},
                                env);
    QCOMPARE(bad.exitCode, 2);
    QVERIFY(bad.err.contains("a4 or letter"));
    QVERIFY(!QFile::exists(out)); // nothing is written on failure
    const ToolRun good = runTool(QStringLiteral(ROUTEBOOK_BINARY),
                                 {u"export"_s, kGarden, u"--format"_s, u"pdf"_s, u"--page-size"_s,
                                  u"letter"_s, u"-o"_s, out},
                                 env);
    QVERIFY2(good.exitCode == 0, good.err.constData());
    QVERIFY(readFile(out).startsWith("%PDF-"));
}

QTEST_MAIN(TestDictionary)
#include "tst_dictionary.moc"
