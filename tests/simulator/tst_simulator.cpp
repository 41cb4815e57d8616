// The route simulator against DESIGN.md's pseudocode, on small invented
// instruments whose paths are worked out by hand in the comments, and on the
// sample projects' stored test respondents.
#include "routing/AnswerReplay.h"
#include "storage/YamlFormat.h"

#include <QDir>
#include <QtTest>

using namespace rb;

namespace {

std::optional<Instrument> load(const QByteArray& yaml) {
    LoadResult r = loadYamlText(yaml, QStringLiteral("test.yaml"));
    if (!r.ok())
        qWarning().noquote() << formatDiagnostics(r.errors);
    return r.instrument;
}

// "a b c" -> {"a", "b", "c"}
QStringList words(const char* text) {
    return QString::fromLatin1(text).split(QLatin1Char(' '));
}

QStringList names(const CompiledRouting& routing, const QList<int>& positions) {
    QStringList out;
    for (int p : positions)
        out.append(routing.index().at(p).item->name);
    return out;
}

// Numbers only: {name: value}.
QHash<QString, AnswerValue> numbers(std::initializer_list<std::pair<const char*, int>> values) {
    QHash<QString, AnswerValue> answers;
    for (const auto& [name, value] : values)
        answers.insert(QString::fromLatin1(name),
                       {AnswerValue::Kind::Number, QString::number(value), {}});
    return answers;
}

// Four items in two modules. `a` = 1 jumps to module `second` (its first item
// `c`); `b` is filtered to a <> 3; module `second` is filtered to a < 5; `c` =
// 7 ends the route.
const char* const kRouting =
    "routebook: 1\n"
    "instrument: {title: Trail counts}\n"
    "modules:\n"
    "  - name: first\n"
    "    items:\n"
    "      - name: a\n        text: A?\n        type: integer\n"
    "        routing:\n"
    "          - {if: \"a = 1\", goto: second}\n"
    "          - {if: \"a = 2\", goto: nowhere}\n" // unknown target: never fires
    "          - {if: \"a = \", goto: END}\n"      // broken condition: never fires
    "      - {name: b, text: \"B?\", type: integer, ask_if: \"a <> 3\"}\n"
    "  - name: second\n"
    "    ask_if: \"a < 5\"\n"
    "    items:\n"
    "      - name: c\n        text: C?\n        type: integer\n"
    "        routing: [{if: \"c = 7\", goto: END}]\n"
    "      - {name: d, text: \"D?\", type: integer, ask_if: \"not asked(b)\"}\n";

} // namespace

class TestSimulator : public QObject {
    Q_OBJECT
private slots:
    void paths_data();
    void paths();
    void loopGuardStops();
    void filteredItemIsEmpty();
    void sampleTestRespondents_data();
    void sampleTestRespondents();
};

void TestSimulator::paths_data() {
    QTest::addColumn<int>("a");
    QTest::addColumn<int>("c");
    QTest::addColumn<QStringList>("path");
    // a=1: rule 1 jumps to c (module second passes: 1 < 5); c=0: next is d,
    // whose filter `not asked(b)` holds (b was skipped by the jump).
    QTest::newRow("jump to module") << 1 << 0 << words("a c d");
    // a=2: the unknown target is ignored, a falls through to b (2 <> 3), then
    // c; d is filtered because b was asked.
    QTest::newRow("unknown target ignored") << 2 << 0 << words("a b c");
    // a=3: b filtered out (3 <> 3 is false); c; d presented (b not asked).
    QTest::newRow("filter fails") << 3 << 0 << words("a c d");
    // a=6: b presented; module second filtered (6 < 5 false): c and d not presented.
    QTest::newRow("module filter") << 6 << 0 << words("a b");
    // a=1, c=7: c's rule ends the route.
    QTest::newRow("goto END") << 1 << 7 << words("a c");
}

void TestSimulator::paths() {
    QFETCH(int, a);
    QFETCH(int, c);
    QFETCH(QStringList, path);
    const std::optional<Instrument> instrument = load(kRouting);
    QVERIFY(instrument);
    const CompiledRouting routing(*instrument);
    const ReplayResult r =
        replayAnswers(routing, numbers({{"a", a}, {"b", 5}, {"c", c}, {"d", 1}}));
    QCOMPARE(r.error, QString());
    QVERIFY(!r.route.loop);
    QCOMPARE(names(routing, r.route.path), path);
}

void TestSimulator::loopGuardStops() {
    // b always jumps back to a: the route never ends; the guard stops it after
    // 4 x 2 = 8 steps, so 8 items are presented: a b a b a b a b.
    const std::optional<Instrument> instrument =
        load("routebook: 1\ninstrument: {title: Loop}\nmodules:\n  - name: m\n    items:\n"
             "      - {name: a, text: \"A?\", type: integer}\n"
             "      - {name: b, text: \"B?\", type: integer, routing: [{goto: a}]}\n");
    QVERIFY(instrument);
    const CompiledRouting routing(*instrument);
    const ReplayResult r = replayAnswers(routing, numbers({{"a", 1}, {"b", 1}}));
    QVERIFY(r.route.loop);
    QCOMPARE(r.route.path.size(), 8);
    QCOMPARE(names(routing, r.route.path.mid(0, 2)), words("a b"));
}

void TestSimulator::filteredItemIsEmpty() {
    // a=3 filters b out; b's value at the end is empty (not presented).
    const std::optional<Instrument> instrument = load(kRouting);
    QVERIFY(instrument);
    const CompiledRouting routing(*instrument);
    const ReplayResult r =
        replayAnswers(routing, numbers({{"a", 3}, {"b", 5}, {"c", 0}, {"d", 1}}));
    QCOMPARE(r.route.values.at(1).state, cond::CellValue::State::NotPresented);
    QCOMPARE(r.route.values.at(0).number, 3.0);
}

void TestSimulator::sampleTestRespondents_data() {
    QTest::addColumn<QString>("file");
    const QDir samples(QStringLiteral(ROUTEBOOK_SAMPLES_DIR));
    for (const QString& name :
         {QStringLiteral("household-energy.yaml"), QStringLiteral("commuting.yaml")})
        QTest::newRow(qPrintable(name)) << samples.filePath(name);
}

void TestSimulator::sampleTestRespondents() {
    // The designers of the samples worked each stored path out by hand; the
    // simulator must reproduce every one.
    QFETCH(QString, file);
    LoadResult loaded = loadYamlFile(file);
    QVERIFY2(loaded.ok(), qPrintable(formatDiagnostics(loaded.errors)));
    const CompiledRouting routing(*loaded.instrument);
    QVERIFY(!loaded.instrument->testRespondents.isEmpty());
    for (const TestRespondent& t : loaded.instrument->testRespondents) {
        const ReplayResult r = replayAnswers(routing, answersByLowerName(t.answers));
        QCOMPARE(r.error, QString());
        QCOMPARE(names(routing, r.route.path), t.path);
    }
}

QTEST_GUILESS_MAIN(TestSimulator)
#include "tst_simulator.moc"
