// Tests of the data check (model/data): every class of DESIGN.md's table on a
// hand-reasoned response file, the analysis file, suppression, the report, and
// bad files. Expected counts are reasoned by hand from garden.yaml and
// garden-responses.csv (see the comments), never taken from the program's output.
#include "PostgresServer.h"
#include "RandomInstrument.h"
#include "SqlReplay.h"
#include "cli/Cli.h"
#include "data/AnalysisFile.h"
#include "data/CsvRange.h"
#include "data/CsvReader.h"
#include "data/DataCheck.h"
#include "data/DataCheckJson.h"
#include "data/RecordChecker.h"
#include "data/RecordProgram.h"
#include "export/SqlExport.h"
#include "storage/YamlFormat.h"

#include <QBuffer>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QRandomGenerator>
#include <QSet>
#include <QTemporaryDir>
#include <QTemporaryFile>
#include <QTest>

using namespace Qt::StringLiterals;
using namespace rb;

namespace {

const QString kDir = QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/datacheck/");

Instrument garden() {
    LoadResult loaded = loadYamlFile(kDir + u"garden.yaml"_s);
    if (!loaded.ok())
        qFatal("garden.yaml does not load: %s", qPrintable(formatDiagnostics(loaded.errors)));
    return *loaded.instrument;
}

DataCheckOutcome check(const Instrument& instrument, const QByteArray& csv,
                       DataCheckOptions options = {}) {
    const CompiledRouting routing(instrument);
    QBuffer buffer;
    buffer.setData(csv);
    buffer.open(QIODevice::ReadOnly);
    return runDataCheck(routing, buffer, u"data.csv"_s, options);
}

QByteArray readFile(const QString& path) {
    QFile f(path);
    return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
}

struct CliRun {
    int code;
    QString out, err;
};
CliRun runCli(const QStringList& arguments) {
    QString out, err;
    QTextStream o(&out), e(&err);
    const int code = cli::run(arguments, o, e);
    o.flush();
    e.flush();
    return {code, out, err};
}

const ItemCounts* item(const DataCheckResult& r, const QString& name) {
    for (const ItemCounts& c : r.items)
        if (c.name == name)
            return &c;
    return nullptr;
}

qint64 frequency(const ItemCounts& c, qint64 code) {
    for (const CodeCount& f : c.frequencies)
        if (f.code == code)
            return f.count;
    return -1;
}

} // namespace

class TestDataCheck : public QObject {
    Q_OBJECT
private slots:
    void classifiesEveryCellByHand_data();
    void classifiesEveryCellByHand();
    void frequenciesByHand();
    void recordLevelProblems();
    void columnsMatchIgnoringCaseAndAreReported();
    void analysisFileCodesSkipsAndImpliedValues();
    void jsonShapeAndSuppression();
    void htmlReportIsSelfContainedAndSuppresses();
    void invalidValuesAreListedWithLines();
    void badFilesFailWithLinesAndNoOutput_data();
    void badFilesFailWithLinesAndNoOutput();
    void lineLengthGuardStopsTheCheck();
    void sqlReplayMatchesOnSqlite_data();
    void sqlReplayMatchesOnSqlite();
    void sqlRefusesLoops();
    void sqlReplayMatchesOnPostgres();
    void compiledProgramMatchesReference_data();
    void compiledProgramMatchesReference();
    void blocksAndThreadsGiveTheSameResult_data();
    void blocksAndThreadsGiveTheSameResult();
    void rangeParserMatchesStreamingReader();
    void byteOrderMarkIsNotPartOfTheFirstField();
    void threeDigitCellsByHand();
    void runsUnderOneFilterByHand();
};

// Routing of garden.yaml: has_garden, then (if has_garden <> 1, i.e. 2, 8, 9 or
// blank) straight to comments; otherwise beds, tools, last_watered, comments.
// So beds/tools/last_watered are presented exactly in a1, a5, a6, a8 (has_garden = 1).
//   a1 1: beds 3 ok; tools {1,3}; date ok; "fine"
//   a2 2: beds/tools/date blank -> skips (beds implied 0: has_garden = 2); comments blank
//   a3 9: -1 everywhere (the skip code) -> skips after a refused gate; comments "x"
//   a4 2: beds 4 although skipped -> violation; tools 0s and date blank -> skips; "ok"
//   a5 1: beds "abc" invalid; tools none -> blank; 2026-02-30 invalid; comments blank
//   a6 1: beds 98 don't know; tools {2}; date and comments blank (break-off)
//   a7 blank: everything blank; has_garden blank so the skips follow a blank gate
//   a8 1: beds 51 > 50 invalid; tools {9} refused only; date ok; comments text
void TestDataCheck::classifiesEveryCellByHand_data() {
    QTest::addColumn<QString>("name");
    // presented, answered, blank, dont_know, refused, not_applicable, invalid,
    // legitimate skip, violation, skips after a missing gate, implied
    QTest::addColumn<QList<qint64>>("expected");
    QTest::newRow("has_garden") << u"has_garden"_s
                                << QList<qint64>{8, 6, 1, 0, 1, 0, 0, 0, 0, 0, 0};
    // presented a1 a5 a6 a8; answered a1; dk a6; invalid a5 a8; skips a2 a3 a7
    // (a3, a7 after refused / blank gate); violation a4; implied a2.
    QTest::newRow("beds") << u"beds"_s << QList<qint64>{4, 1, 0, 1, 0, 0, 2, 3, 1, 2, 1};
    // answered a1 a6; blank a5; refused a8; skips a2 a3 a4 a7 (a3, a7 unknown gate).
    QTest::newRow("tools") << u"tools"_s << QList<qint64>{4, 2, 1, 0, 1, 0, 0, 4, 0, 2, 0};
    // answered a1 a8; invalid a5; blank a6; skips a2 a3 a4 a7.
    QTest::newRow("last_watered") << u"last_watered"_s
                                  << QList<qint64>{4, 2, 1, 0, 0, 0, 1, 4, 0, 2, 0};
    // presented everywhere; text a1 a3 a4 a8; blank a2 a5 a6 a7.
    QTest::newRow("comments") << u"comments"_s << QList<qint64>{8, 4, 4, 0, 0, 0, 0, 0, 0, 0, 0};
}

void TestDataCheck::classifiesEveryCellByHand() {
    QFETCH(QString, name);
    QFETCH(QList<qint64>, expected);
    const DataCheckOutcome outcome = check(garden(), readFile(kDir + u"garden-responses.csv"_s));
    QVERIFY2(outcome.result, qPrintable(outcome.error ? outcome.error->toString() : QString()));
    QCOMPARE(outcome.result->records, 8);
    const ItemCounts* c = item(*outcome.result, name);
    QVERIFY(c);
    const QList<qint64> actual = {c->presented,
                                  c->answered,
                                  c->nonresponseByKind[0],
                                  c->nonresponseByKind[1],
                                  c->nonresponseByKind[2],
                                  c->nonresponseByKind[3],
                                  c->invalid,
                                  c->legitimateSkip,
                                  c->routingViolation,
                                  c->skipAfterMissingGate,
                                  c->implied};
    QCOMPARE(actual, expected);
    // DESIGN.md's identities.
    QCOMPARE(c->presented, c->answered + c->nonresponse() + c->invalid);
    QCOMPARE(outcome.result->records, c->presented + c->legitimateSkip + c->routingViolation);
}

void TestDataCheck::frequenciesByHand() {
    const DataCheckOutcome outcome = check(garden(), readFile(kDir + u"garden-responses.csv"_s));
    QVERIFY(outcome.result);
    const ItemCounts* g = item(*outcome.result, u"has_garden"_s);
    // 1: a1 a5 a6 a8; 2: a2 a4; 8: none; 9: a3.
    QCOMPARE(frequency(*g, 1), 4);
    QCOMPARE(frequency(*g, 2), 2);
    QCOMPARE(frequency(*g, 8), 0);
    QCOMPARE(frequency(*g, 9), 1);
    const ItemCounts* t = item(*outcome.result, u"tools"_s);
    // chosen among presented: a1 {1,3}, a6 {2}, a8 {9}.
    QCOMPARE(frequency(*t, 1), 1);
    QCOMPARE(frequency(*t, 2), 1);
    QCOMPARE(frequency(*t, 3), 1);
    QCOMPARE(frequency(*t, 9), 1);
    // beds has only its missing code 98 as a code: a6.
    QCOMPARE(frequency(*item(*outcome.result, u"beds"_s), 98), 1);
}

void TestDataCheck::recordLevelProblems() {
    DataCheckOptions options;
    options.idColumn = u"ID"_s; // matched ignoring case
    const DataCheckOutcome outcome =
        check(garden(), readFile(kDir + u"garden-responses.csv"_s), options);
    QVERIFY(outcome.result);
    const DataCheckResult& r = *outcome.result;
    QCOMPARE(r.violations.count, 1);
    QCOMPARE(r.violations.first, QStringList{u"a4"_s});
    QCOMPARE(r.invalid.count, 2);
    QCOMPARE(r.invalid.first, (QStringList{u"a5"_s, u"a8"_s}));
    // a6: last_watered and comments blank to the end after answers. a5 ends with one
    // blank only, a2 too (has_garden answered, comments blank): not break-offs.
    QCOMPARE(r.breakOffs.count, 1);
    QCOMPARE(r.breakOffs.first, QStringList{u"a6"_s});
    QCOMPARE(item(r, u"last_watered"_s)->breakOffStarts, 1);
    QCOMPARE(r.emptyRecords.first, QStringList{u"a7"_s});
    QCOMPARE(r.loops.count, 0);
    QVERIFY(r.hasProblems());
    // Without --id-column the first data row is record 1, so a4 is record 4.
    const DataCheckOutcome plain = check(garden(), readFile(kDir + u"garden-responses.csv"_s));
    QCOMPARE(plain.result->violations.first, QStringList{u"4"_s});
}

void TestDataCheck::columnsMatchIgnoringCaseAndAreReported() {
    // "Has_Garden" matched has_garden; "id" and "extra" are no variables.
    const DataCheckOutcome full = check(garden(), readFile(kDir + u"garden-responses.csv"_s));
    QCOMPARE(full.result->unknownColumns, (QStringList{u"id"_s, u"extra"_s}));
    QVERIFY(full.result->missingColumns.isEmpty());
    // Without tools_9 and comments: both reported missing (questionnaire order), read blank.
    const DataCheckOutcome partial =
        check(garden(), "has_garden,BEDS,tools_1,tools_2,tools_3,last_watered\n2,,,,,\n");
    QVERIFY(partial.result);
    QCOMPARE(partial.result->missingColumns, (QStringList{u"tools_9"_s, u"comments"_s}));
    QCOMPARE(item(*partial.result, u"comments"_s)->nonresponseByKind[0], 1);
    QCOMPARE(item(*partial.result, u"beds"_s)->implied, 1);
}

void TestDataCheck::analysisFileCodesSkipsAndImpliedValues() {
    QTemporaryDir dir;
    const QString out = dir.filePath(u"analysis.csv"_s);
    const CliRun run =
        runCli({u"data-check"_s, kDir + u"garden.yaml"_s, kDir + u"garden-responses.csv"_s,
                u"--analysis-file"_s, out, u"--flags"_s});
    QCOMPARE(run.code, 1); // a violation and invalid values
    const QList<QByteArray> lines = readFile(out).split('\n');
    QCOMPARE(lines.size(), 10); // header, 8 records, "" after the last CRLF
    QCOMPARE(lines.at(0), "id,Has_Garden,beds,tools_1,tools_2,tools_3,tools_9,last_watered,"
                          "comments,extra,has_garden_flag,beds_flag,tools_flag,last_watered_flag,"
                          "comments_flag\r");
    // a2: beds implied 0 (has_garden = 2); tools and date get the skip code -1;
    // the blank comment is nonresponse and stays blank.
    QCOMPARE(lines.at(2),
             "a2,2,0,-1,-1,-1,-1,-1,,x,answered,implied,skipped,skipped,nonresponse\r");
    // a3: refused gate: no implied value, the skip code stays.
    QCOMPARE(lines.at(3),
             "a3,9,-1,-1,-1,-1,-1,-1,x,x,nonresponse,skipped,skipped,skipped,answered\r");
    // a4: the violating 4 is kept as recorded and flagged.
    QCOMPARE(lines.at(4),
             "a4,2,4,-1,-1,-1,-1,-1,ok,x,answered,violation,skipped,skipped,answered\r");
    // a5: invalid values kept as they stand.
    QCOMPARE(lines.at(5),
             "a5,1,abc,,,,,2026-02-30,,x,answered,invalid,nonresponse,invalid,nonresponse\r");
    // a8: a field with a comma and quotes is quoted again.
    QCOMPARE(lines.at(8), "a8,1,51,0,0,0,1,2026-06-15,\"a, \"\"quoted\"\"\",x,answered,invalid,"
                          "nonresponse,answered,answered\r");
}

void TestDataCheck::jsonShapeAndSuppression() {
    const CliRun exact = runCli(
        {u"data-check"_s, kDir + u"garden.yaml"_s, kDir + u"garden-responses.csv"_s, u"--json"_s});
    QCOMPARE(exact.code, 1);
    const QJsonObject o = QJsonDocument::fromJson(exact.out.toUtf8()).object();
    QCOMPARE(o.value(u"records"_s).toInt(), 8);
    const QJsonArray items = o.value(u"items"_s).toArray();
    QCOMPARE(items.size(), 5);
    const QJsonObject beds = items.at(1).toObject();
    QCOMPARE(beds.value(u"name"_s).toString(), u"beds"_s);
    for (const char* key : {"presented", "answered", "nonresponse", "nonresponse_by_kind",
                            "invalid", "legitimate_skip", "routing_violation", "frequencies"})
        QVERIFY2(beds.contains(QLatin1String(key)), key);
    QCOMPARE(beds.value(u"nonresponse"_s).toInt(), 1);
    QCOMPARE(beds.value(u"nonresponse_by_kind"_s).toObject().value(u"dont_know"_s).toInt(), 1);
    QCOMPARE(beds.value(u"routing_violation"_s).toInt(), 1);
    // 3 legitimate skips of 8 records = 37.5 %.
    QCOMPARE(beds.value(u"percent"_s).toObject().value(u"legitimate_skip"_s).toDouble(), 37.5);
    QCOMPARE(o.value(u"unknown_columns"_s).toArray().size(), 2);
    QCOMPARE(o.value(u"records_with_violations"_s)
                 .toObject()
                 .value(u"first"_s)
                 .toArray()
                 .at(0)
                 .toString(),
             u"4"_s);

    // --suppress-below 3: counts 1 and 2 become "<3"; 0 and 3+ stay numbers.
    const CliRun suppressed =
        runCli({u"data-check"_s, kDir + u"garden.yaml"_s, kDir + u"garden-responses.csv"_s,
                u"--json"_s, u"--suppress-below"_s, u"3"_s});
    const QJsonObject s = QJsonDocument::fromJson(suppressed.out.toUtf8()).object();
    const QJsonObject sbeds = s.value(u"items"_s).toArray().at(1).toObject();
    QCOMPARE(sbeds.value(u"answered"_s).toString(), u"<3"_s); // 1
    QCOMPARE(sbeds.value(u"invalid"_s).toString(), u"<3"_s);  // 2
    QCOMPARE(sbeds.value(u"legitimate_skip"_s).toInt(), 3);   // 3
    QCOMPARE(sbeds.value(u"nonresponse_by_kind"_s).toObject().value(u"refused"_s).toInt(-1), 0);
    QVERIFY(sbeds.value(u"percent"_s).toObject().value(u"answered"_s).isNull());
    // Record numbers identify people: not listed under suppression.
    QVERIFY(!s.value(u"records_with_violations"_s).toObject().contains(u"first"_s));
    QVERIFY(runCli({u"data-check"_s, kDir + u"garden.yaml"_s, kDir + u"garden-responses.csv"_s,
                    u"--suppress-below"_s, u"x"_s})
                .code == cli::BadInput);
}

void TestDataCheck::htmlReportIsSelfContainedAndSuppresses() {
    QTemporaryDir dir;
    const QString report = dir.filePath(u"r.html"_s);
    const CliRun run = runCli({u"data-check"_s, kDir + u"garden.yaml"_s,
                               kDir + u"garden-responses.csv"_s, u"--report"_s, report});
    QCOMPARE(run.code, 1);
    const QString html = QString::fromUtf8(readFile(report));
    QVERIFY(html.startsWith(u"<!DOCTYPE html>"_s));
    QVERIFY(html.contains(u"<svg"_s));
    QVERIFY(!html.contains(u"<script"_s));
    QVERIFY(!html.contains(u"src=\""_s) && !html.contains(u"href=\"http"_s)); // nothing external
    QVERIFY(html.contains(u"Personal data"_s));
    QVERIFY(html.contains(u"ethics board"_s));
    // Default threshold 5 (common practice, no source): beds' 3 skips show as "<5".
    QVERIFY(html.contains(u"<td class=\"n\">&lt;5</td>"_s));
    // Question text is escaped ("Don't know" labels carry an apostrophe; the
    // comment cell with quotes never appears: aggregate output only).
    QVERIFY(!html.contains(u"quoted"_s));
    // The universe beside beds: conditional on has_garden.
    QVERIFY(html.contains(u"CONDITIONAL"_s));
}

void TestDataCheck::invalidValuesAreListedWithLines() {
    const CliRun run =
        runCli({u"data-check"_s, kDir + u"garden.yaml"_s, kDir + u"garden-responses.csv"_s});
    QCOMPARE(run.code, 1);
    // a5 is on line 6 (header = line 1); beds is column 3, last_watered column 8.
    QVERIFY2(run.err.contains(kDir + u"garden-responses.csv:6:3: record 5: invalid value 'abc' "
                                     "for integer item 'beds'"_s),
             qPrintable(run.err));
    QVERIFY(run.err.contains(kDir + u"garden-responses.csv:6:8: record 5: invalid value "
                                    "'2026-02-30' for date item 'last_watered'"_s));
    QVERIFY(run.err.contains(u"garden-responses.csv:9:3: record 8: invalid value '51'"_s));
}

void TestDataCheck::badFilesFailWithLinesAndNoOutput_data() {
    QTest::addColumn<QByteArray>("csv");
    QTest::addColumn<QString>("where");
    QTest::addColumn<QString>("words");
    const QByteArray header =
        "has_garden,beds,tools_1,tools_2,tools_3,tools_9,last_watered,comments\n";
    QTest::newRow("ragged row") << header + "1,2,0,0,0,0,,\n1,2,0\n"
                                << u":3:1:"_s << u"record 2 has 3 fields; the header has 8"_s;
    QTest::newRow("unterminated quote") << header + "1,2,0,0,0,0,,\n2,,,,,,,\"no end\n"
                                        << u":3:9:"_s << u"unterminated quoted field"_s;
    QTest::newRow("duplicate column")
        << QByteArray("beds,BEDS\n1,1\n") << u":1:2:"_s << u"appears twice"_s;
    QTest::newRow("empty file") << QByteArray() << u":1:1:"_s << u"empty"_s;
}

void TestDataCheck::badFilesFailWithLinesAndNoOutput() {
    QFETCH(QByteArray, csv);
    QFETCH(QString, where);
    QFETCH(QString, words);
    QTemporaryDir dir;
    const QString data = dir.filePath(u"bad.csv"_s);
    QFile f(data);
    QVERIFY(f.open(QIODevice::WriteOnly));
    f.write(csv);
    f.close();
    const QString analysis = dir.filePath(u"out.csv"_s), report = dir.filePath(u"out.html"_s);
    const CliRun run = runCli({u"data-check"_s, kDir + u"garden.yaml"_s, data, u"--analysis-file"_s,
                               analysis, u"--report"_s, report});
    QCOMPARE(run.code, cli::BadInput);
    QVERIFY2(run.err.contains(data + where), qPrintable(run.err));
    QVERIFY2(run.err.contains(words), qPrintable(run.err));
    QVERIFY(!QFile::exists(analysis)); // no partial output file
    QVERIFY(!QFile::exists(report));
    QVERIFY(run.out.isEmpty());
}

void TestDataCheck::lineLengthGuardStopsTheCheck() {
    // The header "has_garden,beds" is 15 bytes, record 1 "1,2" 3 bytes, record 2
    // "1,12345678901234567" 19 bytes on line 3 (line ends not counted).
    DataCheckOptions options;
    options.maxRecordBytes = 10;
    const DataCheckOutcome outcome =
        check(garden(), "has_garden,beds\n1,2\n1,12345678901234567\n", options);
    QVERIFY(!outcome.result);
    // The header itself is 15 bytes: the guard already stops there (line 1).
    QCOMPARE(outcome.error->line, 1);
    options.maxRecordBytes = 16;
    const DataCheckOutcome second =
        check(garden(), "has_garden,beds\n1,2\n1,12345678901234567\n", options);
    QVERIFY(!second.result);
    QCOMPARE(second.error->line, 3);
    QVERIFY(second.error->message.contains(u"line-length guard of 16 bytes"_s));
}

// The SQL export run by SQLite on random responses (fixed seeds) must give exactly
// the per-item class counts of the in-process data check.
void TestDataCheck::sqlReplayMatchesOnSqlite_data() {
    QTest::addColumn<QString>("instrument");
    QTest::addColumn<quint32>("seed");
    QTest::newRow("garden") << kDir + u"garden.yaml"_s << 7u;
    QTest::newRow("household energy sample")
        << QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/household-energy.yaml") << 11u;
    QTest::newRow("household energy sample, other seed")
        << QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/household-energy.yaml") << 12u;
}

void TestDataCheck::sqlReplayMatchesOnSqlite() {
    QFETCH(QString, instrument);
    QFETCH(quint32, seed);
    LoadResult loaded = loadYamlFile(instrument);
    QVERIFY(loaded.ok());
    const CompiledRouting routing(*loaded.instrument);
    const GeneratedResponses data = generateResponses(routing, 400, seed);
    QBuffer buffer;
    buffer.setData(data.csv());
    buffer.open(QIODevice::ReadOnly);
    const DataCheckOutcome outcome = runDataCheck(routing, buffer, u"gen.csv"_s, {});
    QVERIFY2(outcome.result, qPrintable(outcome.error ? outcome.error->toString() : QString()));
    QVERIFY(outcome.result->violations.count > 0 && outcome.result->invalid.count > 0);
    const SqlExport sql = exportSql(routing);
    QVERIFY(!sql.error);
    QString error;
    const QStringList fromSql = runOnSqlite(data, sql.sql, error);
    QVERIFY2(error.isEmpty(), qPrintable(error));
    QCOMPARE(fromSql, countRows(*outcome.result));
}

void TestDataCheck::sqlRefusesLoops() {
    LoadResult loaded = loadYamlText(R"(routebook: 1
instrument: {title: "Loop", version: "1", language: "en"}
modules:
  - name: m
    items:
      - {name: a, text: "A?", type: integer, range: [0, 9]}
      - {name: b, text: "B?", type: integer, range: [0, 9], routing: [{if: "b = 1", goto: a}]}
)",
                                     u"loop.yaml"_s);
    QVERIFY2(loaded.ok(), qPrintable(formatDiagnostics(loaded.errors)));
    const SqlExport sql = exportSql(CompiledRouting(*loaded.instrument));
    QVERIFY(sql.error);
    QVERIFY(sql.error->contains(u"goto back"_s));
}

// The same SQL on a real PostgreSQL server, data loaded with psql's \\copy (blank
// fields arrive as NULL). Skips when PostgreSQL is not installed, or when
// ROUTEBOOK_SKIP_POSTGRES is set (for quick runs).
void TestDataCheck::sqlReplayMatchesOnPostgres() {
    if (qEnvironmentVariableIsSet("ROUTEBOOK_SKIP_POSTGRES"))
        QSKIP("ROUTEBOOK_SKIP_POSTGRES is set");
    PostgresServer server;
    if (!server.available())
        QSKIP(qPrintable(server.problem()));
    QVERIFY2(server.problem().isEmpty(), qPrintable(server.problem()));
    LoadResult loaded =
        loadYamlFile(QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/household-energy.yaml"));
    QVERIFY(loaded.ok());
    const CompiledRouting routing(*loaded.instrument);
    const GeneratedResponses data = generateResponses(routing, 500, 21);
    QBuffer buffer;
    buffer.setData(data.csv());
    buffer.open(QIODevice::ReadOnly);
    const DataCheckOutcome outcome = runDataCheck(routing, buffer, u"gen.csv"_s, {});
    QVERIFY(outcome.result);
    const QString csvPath = server.folder() + u"/gen.csv"_s,
                  scriptPath = server.folder() + u"/check.sql"_s;
    QFile csv(csvPath);
    QVERIFY(csv.open(QIODevice::WriteOnly));
    csv.write(data.csv());
    csv.close();
    QStringList columns;
    for (const QString& c : data.columns)
        columns.append(u"\""_s + c + u"\" TEXT"_s);
    QFile script(scriptPath);
    QVERIFY(script.open(QIODevice::WriteOnly));
    script.write("DROP TABLE IF EXISTS responses;\nCREATE TABLE responses (" +
                 columns.join(u", "_s).toUtf8() + ");\n\\copy responses FROM '" + csvPath.toUtf8() +
                 "' WITH (FORMAT csv, HEADER true)\n" + exportSql(routing).sql);
    script.close();
    QString error;
    const QString output = server.runScript(scriptPath, error);
    QVERIFY2(error.isEmpty(), qPrintable(error));
    QStringList rows;
    for (const QString& line : output.split(u'\n', Qt::SkipEmptyParts))
        rows.append(line.section(u',', 1)); // drop the position column
    QCOMPARE(rows, countRows(*outcome.result));
}

namespace {

QList<QByteArrayView> views(const QList<QByteArray>& row) {
    return QList<QByteArrayView>(row.begin(), row.end());
}

QString describe(const RecordClassification& r) {
    QStringList classes;
    for (size_t p = 0; p < r.classes.size(); ++p)
        classes.append(
            QStringLiteral("%1:%2%3%4")
                .arg(p)
                .arg(cellClassName(r.classes[p]))
                .arg(r.unknownSkip[p] ? u"?"_s : QString(), r.implied[p] ? u"+"_s : QString()));
    QStringList path;
    for (int p : r.path)
        path.append(QString::number(p));
    return u"path "_s + path.join(u' ') + (r.loop ? u" (loop)"_s : QString()) + u" | "_s +
           classes.join(u' ') + u" | break-off "_s + QString::number(r.breakOffStart);
}

// Everything a result holds, as text, for comparing two runs.
QString everything(const DataCheckOutcome& o) {
    if (!o.result)
        return u"error "_s + o.error->toString();
    const DataCheckResult& r = *o.result;
    QString text = QString::fromUtf8(QJsonDocument(dataCheckToJson(r)).toJson());
    for (const ItemCounts& c : r.items)
        text += QStringLiteral("\n%1 %2 %3 %4")
                    .arg(c.name)
                    .arg(c.skipAfterMissingGate)
                    .arg(c.breakOffStarts)
                    .arg(c.implied);
    for (const ProblemRecords* p :
         {&r.violations, &r.invalid, &r.breakOffs, &r.emptyRecords, &r.loops})
        text += QStringLiteral("\n%1: %2").arg(p->count).arg(p->first.join(u','));
    for (const Diagnostic& d : r.invalidCells)
        text += u'\n' + d.toString();
    return text;
}

} // namespace

// The compiled RecordProgram against the reference (CellInterpreter + simulateRoute,
// RecordChecker): the same path, loop flag, class of every cell, unknown-gate and
// implied flags, counted codes and break-off for every record of random instruments.
void TestDataCheck::compiledProgramMatchesReference_data() {
    QTest::addColumn<quint32>("seed");
    for (quint32 seed = 1; seed <= 60; ++seed)
        QTest::addRow("instrument %u", seed) << seed;
}

void TestDataCheck::compiledProgramMatchesReference() {
    QFETCH(quint32, seed);
    const QByteArray yaml = randomInstrumentYaml(seed);
    LoadResult loaded = loadYamlText(yaml, u"random.yaml"_s);
    QVERIFY2(loaded.ok(), qPrintable(formatDiagnostics(loaded.errors) + QString::fromUtf8(yaml)));
    const CompiledRouting routing(*loaded.instrument);
    const GeneratedResponses data = generateResponses(routing, 400, seed * 7 + 1);
    std::vector<QByteArrayView> header;
    QList<QByteArray> names;
    for (const QString& c : data.columns)
        names.append(c.toUtf8());
    for (const QByteArray& n : names)
        header.push_back(n);
    const HeaderMappingResult mapped = mapHeader(routing, header, u"r.csv"_s, QString());
    QVERIFY(!mapped.error);
    const RecordChecker reference(routing, mapped.mapping);
    const RecordProgram program(routing, mapped.mapping);
    RecordProgram::Scratch scratch;
    program.prepare(scratch);
    static QSet<QString> seen; // classes met over all seeds (checked on the last one)
    // Both ways of the program: one pass (rules only jump forward) and route then classes.
    seen.insert(program.forwardOnly() ? u"one pass"_s : u"two passes"_s);
    for (qsizetype r = 0; r < data.rows.size(); ++r) {
        const QList<QByteArrayView> row = views(data.rows.at(r));
        const std::vector<QByteArrayView> fields(row.begin(), row.end());
        const RecordClassification expected = reference.classify(fields);
        program.classify(fields, scratch);
        const RecordClassification actual = program.toClassification(scratch);
        if (!(actual == expected))
            QFAIL(qPrintable(u"record %1 differs\nreference %2\ncompiled  %3\n%4"_s.arg(r + 1).arg(
                describe(expected), describe(actual), QString::fromUtf8(yaml))));
        for (CellClass c : expected.classes)
            seen.insert(cellClassName(c));
        if (expected.loop)
            seen.insert(u"loop"_s);
        if (expected.breakOffStart >= 0)
            seen.insert(u"break-off"_s);
        for (size_t p = 0; p < expected.classes.size(); ++p) {
            if (expected.implied[p])
                seen.insert(u"implied"_s);
            if (expected.unknownSkip[p])
                seen.insert(u"unknown skip"_s);
        }
    }
    if (seed == 60) // the random instruments reach every case at least once
        for (const QString& c :
             {u"answered"_s, u"blank"_s, u"dont_know"_s, u"refused"_s, u"not_applicable"_s,
              u"invalid"_s, u"legitimate_skip"_s, u"routing_violation"_s, u"loop"_s, u"break-off"_s,
              u"implied"_s, u"unknown skip"_s})
            QVERIFY2(seen.contains(c), qPrintable(c));
}

// Blocks cut anywhere (down to a few bytes) and any number of threads give the
// same result as one block in one thread: counts, first records, invalid cells
// with their lines, and the first error.
void TestDataCheck::blocksAndThreadsGiveTheSameResult_data() {
    QTest::addColumn<QString>("instrument");
    QTest::addColumn<QByteArray>("csv");
    QTest::addColumn<QString>("idColumn");
    QTest::addColumn<qint64>("guard"); // the line-length guard, 0: the default
    const QByteArray garden = readFile(kDir + u"garden-responses.csv"_s);
    QTest::newRow("garden") << kDir + u"garden.yaml"_s << garden << QString() << qint64(0);
    QTest::newRow("garden, ids") << kDir + u"garden.yaml"_s << garden << u"comments"_s << qint64(0);
    QTest::newRow("garden, ragged late") << kDir + u"garden.yaml"_s << garden + "1,2\n"
                                         << QString() << qint64(0);
    QTest::newRow("garden, CRLF") << kDir + u"garden.yaml"_s
                                  << QByteArray(garden).replace("\n", "\r\n") << QString()
                                  << qint64(0);
    // How the file starts and ends, and a record longer than small blocks (read:
    // carried over; mapped: a larger window), within the guard and over it.
    QTest::newRow("garden, BOM") << kDir + u"garden.yaml"_s << "\xEF\xBB\xBF" + garden << QString()
                                 << qint64(0);
    QTest::newRow("garden, no final line end")
        << kDir + u"garden.yaml"_s << garden.chopped(1) << QString() << qint64(0);
    const QByteArray longRecord = "a9,1,3,1,0,1,0,2026-05-01," + QByteArray(200, 'w') + ",x\n";
    QTest::newRow("garden, long record")
        << kDir + u"garden.yaml"_s << garden + longRecord << QString() << qint64(0);
    QTest::newRow("garden, record over the guard")
        << kDir + u"garden.yaml"_s << garden + longRecord << QString() << qint64(100);
    LoadResult loaded =
        loadYamlFile(QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/household-energy.yaml"));
    QVERIFY(loaded.ok());
    const CompiledRouting routing(*loaded.instrument);
    GeneratedResponses data = generateResponses(routing, 300, 5);
    // Quoted cells, some with commas, doubled quotes and line breaks inside.
    QRandomGenerator rng(9);
    for (QList<QByteArray>& row : data.rows)
        for (QByteArray& cell : row)
            if (rng.bounded(7) == 0)
                cell = '"' + cell + '"';
            else if (cell == "abc" && rng.bounded(2))
                cell = "\"a,\"\"b\"\"\nc\"";
    QTest::newRow("household energy, quotes")
        << QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/household-energy.yaml") << data.csv() << QString()
        << qint64(0);
}

void TestDataCheck::blocksAndThreadsGiveTheSameResult() {
    QFETCH(QString, instrument);
    QFETCH(QByteArray, csv);
    QFETCH(QString, idColumn);
    QFETCH(qint64, guard);
    LoadResult loaded = loadYamlFile(instrument);
    QVERIFY(loaded.ok());
    const CompiledRouting routing(*loaded.instrument);
    // The same bytes as a file, mapped window by window instead of read
    // (DataCheckOptions::mapRegularFiles, as the command line does): must not show.
    QTemporaryFile file;
    QVERIFY(file.open());
    QCOMPARE(file.write(csv), qint64(csv.size()));
    QVERIFY(file.flush());
    auto run = [&](qsizetype blockBytes, int threads, bool mapped = false) {
        QBuffer buffer;
        buffer.setData(csv);
        buffer.open(QIODevice::ReadOnly);
        QFile onDisk(file.fileName());
        if (mapped)
            onDisk.open(QIODevice::ReadOnly);
        QIODevice& device = mapped ? static_cast<QIODevice&>(onDisk) : buffer;
        DataCheckOptions options;
        options.idColumn = idColumn;
        if (guard > 0)
            options.maxRecordBytes = guard;
        options.blockBytes = blockBytes;
        options.threads = threads;
        options.invalidCellsKept = 1000;
        options.mapRegularFiles = mapped;
        // The analysis file too: its rows are written by the checking threads,
        // block by block, and must come out in file order whatever the split.
        QBuffer analysis;
        analysis.open(QIODevice::WriteOnly);
        CsvAnalysisWriter writer(analysis);
        AnalysisOptions flags;
        flags.flags = true;
        const QString result =
            everything(runDataCheck(routing, device, u"d.csv"_s, options, &writer, flags));
        writer.flush();
        // After an error the rows written so far depend on the split; callers
        // discard the file then (QSaveFile), so only the error is compared.
        return result.startsWith(u"error"_s) ? result : result + QString::fromUtf8(analysis.data());
    };
    const QString one = run(qsizetype(csv.size()) + 1, 1);
    QVERIFY(one.contains(u"\"records\""_s) || one.startsWith(u"error"_s));
    // Every record made it to the analysis file (header and rows, CRLF ends)
    // when the check succeeded; the line breaks inside quoted cells are LF only.
    if (one.contains(u"\"records\""_s) && !csv.contains('\r')) {
        const DataCheckOutcome outcome = [&] {
            QBuffer buffer;
            buffer.setData(csv);
            buffer.open(QIODevice::ReadOnly);
            DataCheckOptions options;
            options.idColumn = idColumn;
            if (guard > 0)
                options.maxRecordBytes = guard;
            return runDataCheck(routing, buffer, u"d.csv"_s, options);
        }();
        QVERIFY(outcome.result);
        QCOMPARE(one.count(u"\r\n"_s), outcome.result->records + 1);
    }
    for (qsizetype block : {1, 7, 64, 300, 4096})
        for (int threads : {1, 2, 3}) {
            QCOMPARE(run(block, threads), one);
            QCOMPARE(run(block, threads, true), one);
        }
    QCOMPARE(run(qsizetype(csv.size()) + 1, 2, true), one);
}

// CsvRange (the fast block parser) against CsvReader (the streaming reader
// checked against RFC 4180 and Python's csv module in tst_csv) on random bytes
// built from the characters that matter: same records, same error and place.
// The second half of the rounds has long plain runs, records of more than 32
// bytes and larger guards, so that CsvRange's 32-bytes-at-a-time path finds
// whole records, meets a quote or carriage return mid-record and hits the guard.
void TestDataCheck::rangeParserMatchesStreamingReader() {
    QRandomGenerator rng(4180);
    static const QList<QByteArray> pieces = {"a",    "12", ",",       ",",       "\n",
                                             "\r\n", "\"", "\"\"",    "\"x,y\"", "\"p\nq\"",
                                             "\r",   " ",  "\xC3\xA9"};
    static const QList<QByteArray> plain = {
        "7", "42", "", ",", ",", ",", ",", "123456789", "abcdefghijklmnopqrstu", "\n", "\xC3\xA9"};
    for (int round = 0; round < 6000; ++round) {
        const bool longRuns = round >= 3000;
        const qint64 guard = longRuns ? QList<qint64>{12, 40, 1000}.at(round % 3) : 12;
        QByteArray text;
        const int n = int(rng.bounded(longRuns ? 120 : 30));
        for (int k = 0; k < n; ++k)
            text += longRuns && rng.bounded(20) != 0
                        ? plain.at(int(rng.bounded(int(plain.size()))))
                        : pieces.at(int(rng.bounded(int(pieces.size()))));
        QBuffer buffer;
        buffer.setData(text);
        buffer.open(QIODevice::ReadOnly);
        CsvReader reader(buffer, u"t.csv"_s, guard);
        CsvRange range(text.constData(), text.constData() + text.size(), guard);
        for (;;) {
            const CsvReader::Status a = reader.next();
            const CsvRange::Status b = range.next();
            QCOMPARE(int(b), int(a));
            if (a == CsvReader::Status::End)
                break;
            if (a == CsvReader::Status::Error) {
                const Diagnostic& e = reader.error();
                QCOMPARE(range.error().line + 1, qint64(e.line));
                QCOMPARE(range.error().column, e.column);
                QCOMPARE(range.error().message, e.message);
                break;
            }
            QCOMPARE(range.recordLine() + 1, reader.recordLine());
            QList<QByteArray> fast, streaming;
            for (QByteArrayView f : range.fields())
                fast.append(f.toByteArray());
            for (QByteArrayView f : reader.fields())
                streaming.append(f.toByteArray());
            QCOMPARE(fast, streaming);
        }
    }
}

// A UTF-8 byte order mark is skipped before the header is parsed, whether the
// file is read (a buffer) or mapped (a regular file): an error in the first line
// is placed by the bytes after it. Column by hand: `id,ha"s_garden` has its quote
// at byte 6 of the line.
void TestDataCheck::byteOrderMarkIsNotPartOfTheFirstField() {
    const CompiledRouting routing(garden());
    const QByteArray csv = "\xEF\xBB\xBF"
                           "id,ha\"s_garden\na1,1\n";
    QBuffer buffer;
    buffer.setData(csv);
    buffer.open(QIODevice::ReadOnly);
    QTemporaryFile file;
    QVERIFY(file.open());
    file.write(csv);
    QVERIFY(file.flush());
    QFile mapped(file.fileName());
    QVERIFY(mapped.open(QIODevice::ReadOnly));
    DataCheckOptions options;
    options.mapRegularFiles = true;
    for (QIODevice* device : {static_cast<QIODevice*>(&buffer), static_cast<QIODevice*>(&mapped)}) {
        const DataCheckOutcome outcome = runDataCheck(routing, *device, u"d.csv"_s, options);
        QVERIFY(outcome.error);
        QCOMPARE(outcome.error->line, 1);
        QCOMPARE(outcome.error->column, 6);
    }
}

// Cells of one to three digits are decoded by table (RecordProgram::decodeSmall);
// here every digit of a three-digit cell decides a class, by hand: load has the
// range 0..500 and the refused code 999; unit is asked when load >= 120 (DESIGN.md:
// a missing code and an invalid value are compared as they stand).
//   r1 119: load answered, unit skipped     r2 120: answered, unit presented (blank)
//   r3 500: answered, unit presented (1)    r4 501: invalid, unit presented (blank)
//   r5 999: refused, unit presented (blank) r6 007: answered (7), unit skipped
//   r7 12:  answered, unit skipped          r8 210: answered, unit presented (1)
void TestDataCheck::threeDigitCellsByHand() {
    const QByteArray yaml = R"(routebook: 1
instrument: {title: "Loads", version: "1", language: "en"}
code_lists:
  yes: [{code: 1, label: "Yes"}]
modules:
  - name: m
    items:
      - {name: load, text: "Load?", type: integer, range: [0, 500],
         missing: [{code: 999, label: "Refused", missing: refused}]}
      - {name: unit, text: "Unit?", type: single, codes: yes, ask_if: "load >= 120"}
)";
    LoadResult loaded = loadYamlText(yaml, u"loads.yaml"_s);
    QVERIFY2(loaded.ok(), qPrintable(formatDiagnostics(loaded.errors)));
    const DataCheckOutcome outcome =
        check(*loaded.instrument, "load,unit\n119,\n120,\n500,1\n501,\n999,\n007,\n12,\n210,1\n");
    QVERIFY2(outcome.result, qPrintable(outcome.error ? outcome.error->toString() : QString()));
    const ItemCounts* load = item(*outcome.result, u"load"_s);
    const ItemCounts* unit = item(*outcome.result, u"unit"_s);
    QVERIFY(load && unit);
    QCOMPARE(load->presented, 8);
    QCOMPARE(load->answered, 6);
    QCOMPARE(load->invalid, 1);
    QCOMPARE(load->nonresponseByKind[2], 1); // refused
    QCOMPARE(unit->presented, 5);
    QCOMPARE(unit->answered, 2);
    QCOMPARE(unit->nonresponseByKind[0], 3); // blank
    QCOMPARE(unit->legitimateSkip, 3);
}

// Items under one filter of an earlier item are classed as a run, the filter
// answered once (RecordProgram::markRuns); a goto into the run and a filter
// that reads the run's own first item must still be followed item by item.
// r1..r4 are asked when h = 1, but g = 2 jumps to r3; s1 and s2 are asked when
// s1 <> 1, which for s1 itself reads an empty cell (true: `<>` is `not =`).
//   rec1 h=1 g=1: r1-r4 answered; s1=1; s2 skipped (blank)
//   rec2 h=1 g=2: r1 r2 jumped over (blank); r3 r4 answered; s1=2; s2=1 asked, answered
//   rec3 h=2 g=1: r1-r4 skipped; s1 blank; s2 asked (s1 blank <> 1), blank
//   rec4 h=1 g=2: r1=1 jumped over: violation; r2 skipped; r3 blank; r4=1; s1=1; s2=2 violation
void TestDataCheck::runsUnderOneFilterByHand() {
    const QByteArray yaml = R"(routebook: 1
instrument: {title: "Runs", version: "1", language: "en"}
code_lists:
  yn: [{code: 1, label: "Yes"}, {code: 2, label: "No"}]
modules:
  - name: m
    items:
      - {name: h, text: "H?", type: single, codes: yn}
      - {name: g, text: "G?", type: single, codes: yn, routing: [{if: "g = 2", goto: r3}]}
      - {name: r1, text: "R1?", type: single, codes: yn, ask_if: "h = 1"}
      - {name: r2, text: "R2?", type: single, codes: yn, ask_if: "h = 1"}
      - {name: r3, text: "R3?", type: single, codes: yn, ask_if: "h = 1"}
      - {name: r4, text: "R4?", type: single, codes: yn, ask_if: "h = 1"}
      - {name: s1, text: "S1?", type: single, codes: yn, ask_if: "s1 <> 1"}
      - {name: s2, text: "S2?", type: single, codes: yn, ask_if: "s1 <> 1"}
)";
    LoadResult loaded = loadYamlText(yaml, u"runs.yaml"_s);
    QVERIFY2(loaded.ok(), qPrintable(formatDiagnostics(loaded.errors)));
    const DataCheckOutcome outcome = check(*loaded.instrument, "h,g,r1,r2,r3,r4,s1,s2\n"
                                                               "1,1,1,1,1,1,1,\n"
                                                               "1,2,,,1,2,2,1\n"
                                                               "2,1,,,,,,\n"
                                                               "1,2,1,,,1,1,2\n");
    QVERIFY2(outcome.result, qPrintable(outcome.error ? outcome.error->toString() : QString()));
    // presented, answered, blank, legitimate skip, violation
    auto counts = [&](const QString& name) {
        const ItemCounts* c = item(*outcome.result, name);
        return c ? QList<qint64>{c->presented, c->answered, c->nonresponseByKind[0],
                                 c->legitimateSkip, c->routingViolation}
                 : QList<qint64>();
    };
    QCOMPARE(counts(u"r1"_s), (QList<qint64>{1, 1, 0, 2, 1}));
    QCOMPARE(counts(u"r2"_s), (QList<qint64>{1, 1, 0, 3, 0}));
    QCOMPARE(counts(u"r3"_s), (QList<qint64>{3, 2, 1, 1, 0}));
    QCOMPARE(counts(u"r4"_s), (QList<qint64>{3, 3, 0, 1, 0}));
    QCOMPARE(counts(u"s1"_s), (QList<qint64>{4, 3, 1, 0, 0}));
    QCOMPARE(counts(u"s2"_s), (QList<qint64>{2, 1, 1, 1, 1}));
}

QTEST_GUILESS_MAIN(TestDataCheck)
#include "tst_datacheck.moc"
