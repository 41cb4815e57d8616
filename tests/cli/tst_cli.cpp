// The command line as a user runs it: the real binary, exit codes, JSON
// shapes of DESIGN.md, errors on stderr as file:line:column, nothing written
// on failure.
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QProcess>
#include <QTemporaryDir>
#include <QtTest>

namespace {

struct Run {
    int exitCode = -1;
    QByteArray out;
    QByteArray err;
};

Run routebook(const QStringList& arguments) {
    QProcess process;
    QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
    env.remove(QStringLiteral("DISPLAY")); // the command line never needs a display
    env.remove(QStringLiteral("QT_QPA_PLATFORM"));
    process.setProcessEnvironment(env);
    process.start(QStringLiteral(ROUTEBOOK_BINARY), arguments);
    if (!process.waitForFinished(60000))
        return {};
    return {process.exitStatus() == QProcess::NormalExit ? process.exitCode() : -1,
            process.readAllStandardOutput(), process.readAllStandardError()};
}

// A small invented instrument: owns = 2 (No) jumps past the garden module.
const char* const kGarden =
    "routebook: 1\n"
    "instrument: {title: Garden survey}\n"
    "code_lists:\n"
    "  yes_no:\n"
    "    - {code: 1, label: \"Yes\"}\n"
    "    - {code: 2, label: \"No\"}\n"
    "modules:\n"
    "  - name: intro\n"
    "    items:\n"
    "      - name: owns\n"
    "        text: Do you have a garden?\n"
    "        type: single\n"
    "        codes: yes_no\n"
    "        routing: [{if: \"owns = 2\", goto: closing}]\n"
    "      - {name: size, text: \"Garden size in square metres?\", type: integer, range: [1, "
    "5000]}\n"
    "      - name: crops\n"
    "        text: What do you grow?\n"
    "        type: multi\n"
    "        codes: [{code: 1, label: Vegetables}, {code: 2, label: Flowers}]\n"
    "  - name: closing\n"
    "    items:\n"
    "      - {name: thanks, text: Thank you., type: statement}\n";

} // namespace

class TestCli : public QObject {
    Q_OBJECT
private slots:
    void initTestCase();
    void helpAndVersion();
    void checkCleanIsZero();
    void checkErrorsIsOneWithJsonShape();
    void badInputIsTwo_data();
    void badInputIsTwo();
    void malformedYamlReportsPosition();
    void routePaths_data();
    void routePaths();
    void routeRejectsBadAnswers_data();
    void routeRejectsBadAnswers();
    void exportYamlIsCanonical();
    void exportDotHasEveryItem();
    void convertRoundTrip();
    void nothingWrittenOnFailure();

private:
    QString write(const QString& name, const QByteArray& content);
    QTemporaryDir m_dir;
    QString m_garden;
};

QString TestCli::write(const QString& name, const QByteArray& content) {
    const QString path = m_dir.filePath(name);
    QFile file(path);
    if (!file.open(QIODevice::WriteOnly) || file.write(content) != content.size())
        qFatal("cannot write test file");
    return path;
}

void TestCli::initTestCase() {
    QVERIFY(m_dir.isValid());
    m_garden = write(QStringLiteral("garden.yaml"), kGarden);
}

void TestCli::helpAndVersion() {
    const Run help = routebook({QStringLiteral("--help")});
    QCOMPARE(help.exitCode, 0);
    QVERIFY(help.out.contains("routebook check FILE"));
    const Run version = routebook({QStringLiteral("--version")});
    QCOMPARE(version.exitCode, 0);
    QVERIFY(version.out.startsWith("routebook "));
}

void TestCli::checkCleanIsZero() {
    const Run run = routebook({QStringLiteral("check"), m_garden, QStringLiteral("--json")});
    QCOMPARE(run.exitCode, 0);
    const QJsonObject root = QJsonDocument::fromJson(run.out).object();
    QCOMPARE(root.value(QStringLiteral("findings")).toArray().size(), 0);
    QCOMPARE(
        root.value(QStringLiteral("summary")).toObject().value(QStringLiteral("errors")).toInt(-1),
        0);
}

void TestCli::checkErrorsIsOneWithJsonShape() {
    QByteArray broken(kGarden);
    broken.replace("goto: closing", "goto: nowhere");
    const Run run =
        routebook({QStringLiteral("check"), write(QStringLiteral("broken.yaml"), broken),
                   QStringLiteral("--json")});
    QCOMPARE(run.exitCode, 1);
    const QJsonObject root = QJsonDocument::fromJson(run.out).object();
    const QJsonArray findings = root.value(QStringLiteral("findings")).toArray();
    QCOMPARE(findings.size(), 1);
    const QJsonObject f = findings.first().toObject();
    for (const char* key : {"id", "check", "severity", "item", "message", "field", "column"})
        QVERIFY2(f.contains(QLatin1String(key)), key);
    QCOMPARE(f.value(QStringLiteral("id")).toString(),
             QStringLiteral("unknown-target:owns:routing[0].goto"));
    QCOMPARE(f.value(QStringLiteral("severity")).toString(), QStringLiteral("error"));
    QVERIFY(f.value(QStringLiteral("column")).isNull()); // not about a condition
    QCOMPARE(
        root.value(QStringLiteral("summary")).toObject().value(QStringLiteral("errors")).toInt(),
        1);
}

void TestCli::badInputIsTwo_data() {
    QTest::addColumn<QStringList>("arguments");
    const QString missing = QStringLiteral("/nonexistent/none.yaml");
    QTest::newRow("no file") << QStringList{QStringLiteral("check")};
    QTest::newRow("missing file") << QStringList{QStringLiteral("check"), missing};
    QTest::newRow("unknown command") << QStringList{QStringLiteral("frobnicate")};
    QTest::newRow("unknown option")
        << QStringList{QStringLiteral("check"), missing, QStringLiteral("--colour")};
    QTest::newRow("unknown extension")
        << QStringList{QStringLiteral("check"), QStringLiteral("x.txt")};
    QTest::newRow("export without format") << QStringList{QStringLiteral("export"), missing};
    QTest::newRow("route without answers") << QStringList{QStringLiteral("route"), missing};
    QTest::newRow("convert one file") << QStringList{QStringLiteral("convert"), missing};
}

void TestCli::badInputIsTwo() {
    QFETCH(QStringList, arguments);
    const Run run = routebook(arguments);
    QCOMPARE(run.exitCode, 2);
    QVERIFY(!run.err.isEmpty());
}

void TestCli::malformedYamlReportsPosition() {
    // Line 3 holds an unknown key `colour` of `instrument`.
    const QString path = write(QStringLiteral("bad.yaml"),
                               "routebook: 1\nmodules: []\ninstrument: {title: T, colour: red}\n");
    const Run run = routebook({QStringLiteral("check"), path});
    QCOMPARE(run.exitCode, 2);
    QVERIFY2(run.err.startsWith((path + QStringLiteral(":3:")).toUtf8()), run.err.constData());
    QVERIFY(run.err.contains("colour"));
}

void TestCli::routePaths_data() {
    QTest::addColumn<QByteArray>("answers");
    QTest::addColumn<QStringList>("path");
    // By hand: owns = 2 jumps to module `closing`, i.e. to its first item `thanks`.
    QTest::newRow("no garden") << QByteArray(R"({"owns": 2})")
                               << QStringList{QStringLiteral("owns"), QStringLiteral("thanks")};
    // owns = 1 falls through every item; the statement needs no answer.
    QTest::newRow("garden") << QByteArray(R"({"owns": 1, "size": 30, "crops": [1, 2]})")
                            << QStringList{QStringLiteral("owns"), QStringLiteral("size"),
                                           QStringLiteral("crops"), QStringLiteral("thanks")};
}

void TestCli::routePaths() {
    QFETCH(QByteArray, answers);
    QFETCH(QStringList, path);
    const Run run = routebook({QStringLiteral("route"), m_garden, QStringLiteral("--answers"),
                               write(QStringLiteral("answers.json"), answers)});
    QCOMPARE(run.exitCode, 0);
    const QJsonObject root = QJsonDocument::fromJson(run.out).object();
    QCOMPARE(root.value(QStringLiteral("path")).toVariant().toStringList(), path);
    QCOMPARE(root.value(QStringLiteral("end")).toString(), QStringLiteral("END"));
    QCOMPARE(root.value(QStringLiteral("not_presented")).toArray().size(), 4 - path.size());
}

void TestCli::routeRejectsBadAnswers_data() {
    QTest::addColumn<QByteArray>("answers");
    QTest::addColumn<QByteArray>("message");
    QTest::newRow("missing answer") << QByteArray(R"({"owns": 1})") << QByteArray("size");
    QTest::newRow("not a code") << QByteArray(R"({"owns": 3})")
                                << QByteArray("not one of its codes");
    QTest::newRow("out of range") << QByteArray(R"({"owns": 1, "size": 0, "crops": [1]})")
                                  << QByteArray("outside the range");
    QTest::newRow("not json") << QByteArray("{owns") << QByteArray("JSON");
}

void TestCli::routeRejectsBadAnswers() {
    QFETCH(QByteArray, answers);
    QFETCH(QByteArray, message);
    const Run run = routebook({QStringLiteral("route"), m_garden, QStringLiteral("--answers"),
                               write(QStringLiteral("bad-answers.json"), answers)});
    QCOMPARE(run.exitCode, 2);
    QVERIFY2(run.err.contains(message), run.err.constData());
    QVERIFY(run.out.isEmpty());
}

void TestCli::exportYamlIsCanonical() {
    const QString once = m_dir.filePath(QStringLiteral("once.yaml"));
    const QString twice = m_dir.filePath(QStringLiteral("twice.yaml"));
    QCOMPARE(routebook({QStringLiteral("export"), m_garden, QStringLiteral("--format"),
                        QStringLiteral("yaml"), QStringLiteral("-o"), once})
                 .exitCode,
             0);
    QCOMPARE(routebook({QStringLiteral("export"), once, QStringLiteral("--format"),
                        QStringLiteral("yaml"), QStringLiteral("-o"), twice})
                 .exitCode,
             0);
    QFile a(once), b(twice);
    QVERIFY(a.open(QIODevice::ReadOnly) && b.open(QIODevice::ReadOnly));
    const QByteArray first = a.readAll();
    QVERIFY(first.contains("name: owns"));
    QCOMPARE(b.readAll(), first);
}

void TestCli::exportDotHasEveryItem() {
    const Run run = routebook(
        {QStringLiteral("export"), m_garden, QStringLiteral("--format"), QStringLiteral("dot")});
    QCOMPARE(run.exitCode, 0);
    QVERIFY(run.out.startsWith("digraph"));
    // The rule edge carries its condition, quotes escaped.
    QVERIFY(run.out.contains("\"owns\" -> \"thanks\" [xlabel=\"owns = 2\""));
    for (const char* name : {"\"owns\"", "\"size\"", "\"crops\"", "\"thanks\"", "START", "END"})
        QVERIFY2(run.out.contains(name), name);
}

void TestCli::convertRoundTrip() {
    const QString project = m_dir.filePath(QStringLiteral("garden.routebook"));
    const QString back = m_dir.filePath(QStringLiteral("back.yaml"));
    const QString canonical = m_dir.filePath(QStringLiteral("canonical.yaml"));
    QCOMPARE(routebook({QStringLiteral("convert"), m_garden, project}).exitCode, 0);
    QCOMPARE(routebook({QStringLiteral("convert"), project, back}).exitCode, 0);
    QCOMPARE(routebook({QStringLiteral("export"), m_garden, QStringLiteral("--format"),
                        QStringLiteral("yaml"), QStringLiteral("-o"), canonical})
                 .exitCode,
             0);
    QFile a(back), b(canonical);
    QVERIFY(a.open(QIODevice::ReadOnly) && b.open(QIODevice::ReadOnly));
    QCOMPARE(a.readAll(), b.readAll());
}

void TestCli::nothingWrittenOnFailure() {
    const QString bad = write(QStringLiteral("bad2.yaml"), "routebook: [\n");
    const QString out = m_dir.filePath(QStringLiteral("never.yaml"));
    QCOMPARE(routebook({QStringLiteral("export"), bad, QStringLiteral("--format"),
                        QStringLiteral("yaml"), QStringLiteral("-o"), out})
                 .exitCode,
             2);
    QVERIFY(!QFile::exists(out));
    QCOMPARE(routebook({QStringLiteral("convert"), bad, out}).exitCode, 2);
    QVERIFY(!QFile::exists(out));
}

QTEST_GUILESS_MAIN(TestCli)
#include "tst_cli.moc"
