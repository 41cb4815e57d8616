// Structural checks of `check`: each finding on a small invented instrument,
// with the item, field and column reasoned by hand from the YAML text.
#include "check/InstrumentCheck.h"
#include "storage/YamlFormat.h"

#include <QtTest>

using namespace rb;
using namespace Qt::StringLiterals;

namespace {

// Wraps item YAML (already indented for an item list) into a whole instrument
// with one shared yes/no list.
QByteArray instrumentYaml(const QByteArray& items, const QByteArray& extra = {}) {
    return QByteArrayLiteral("routebook: 1\n"
                             "instrument: {title: Garden survey}\n"
                             "code_lists:\n"
                             "  yes_no:\n"
                             "    - {code: 1, label: \"Yes\"}\n"
                             "    - {code: 2, label: \"No\"}\n"
                             "    - {code: 9, label: \"Refused\", missing: refused}\n") +
           extra +
           QByteArrayLiteral("modules:\n"
                             "  - name: garden\n"
                             "    items:\n") +
           items;
}

Findings findingsOf(const QByteArray& yaml) {
    LoadResult loaded = loadYamlText(yaml, QStringLiteral("test.yaml"));
    if (!loaded.ok()) {
        qWarning().noquote() << formatDiagnostics(loaded.errors);
        return {};
    }
    const Instrument instrument = *loaded.instrument;
    const CompiledRouting routing(instrument);
    return checkInstrument(routing);
}

// One-line summary "check item field column" of every finding, to compare lists.
QStringList summarize(const Findings& findings) {
    QStringList lines;
    for (const Finding& f : findings)
        lines.append(QStringLiteral("%1 %2 %3 %4")
                         .arg(f.check, f.item.isEmpty() ? f.module : f.item, f.field)
                         .arg(f.column ? QString::number(*f.column) : QStringLiteral("-")));
    return lines;
}

} // namespace

class TestCheck : public QObject {
    Q_OBJECT
private slots:
    void findings_data();
    void findings();
    void cleanInstrumentHasNoFindings();
    void findingIdsAndOrder();
    void duplicateNameMessages();
    void codeListFindings();
    void testRespondentReplay();
    void routingMistakesFullList();
    void cleanSamples();
};

void TestCheck::findings_data() {
    QTest::addColumn<QByteArray>("items");
    QTest::addColumn<QStringList>("expected");

    const QByteArray owns =
        "      - {name: owns, text: \"Own a garden?\", type: single, codes: yes_no}\n";

    // "owns =" has 6 characters: the missing value is reported at the end, column 7.
    QTest::newRow("syntax")
        << owns + "      - {name: size, text: \"Size?\", type: integer, ask_if: \"owns =\"}\n"
        << QStringList{QStringLiteral("syntax size ask_if 7")};
    // "ownz" starts at column 1.
    QTest::newRow("unknown-variable")
        << owns + "      - {name: size, text: \"Size?\", type: integer, ask_if: \"ownz = 1\"}\n"
        << QStringList{QStringLiteral("unknown-variable size ask_if 1")};
    // `has` on a single item is a type mismatch; the atom starts at column 1.
    QTest::newRow("type-mismatch")
        << owns + "      - {name: size, text: \"Size?\", type: integer, ask_if: \"owns has 1\"}\n"
        << QStringList{QStringLiteral("type-mismatch size ask_if 1")};
    // A filter reading its own item; "size" starts at column 1.
    QTest::newRow("forward-reference own")
        << owns + "      - {name: size, text: \"Size?\", type: integer, ask_if: \"size > 3\"}\n"
        // ... and since `size` is empty when its own filter runs, `size > 3`
        // never holds: the item is unreachable (field empty: about the item).
        // (Findings sort by field: the item-level one, field "", comes first.)
        << QStringList{QStringLiteral("unreachable-item size  -"),
                       QStringLiteral("forward-reference size ask_if 1")};
    // A rule reading a later item: "owns = 1 and size > 2", `size` at column 14.
    QTest::newRow("forward-reference later")
        << QByteArray("      - name: owns\n        text: Own a garden?\n        type: single\n     "
                      "   codes: yes_no\n"
                      "        routing: [{if: \"owns = 1 and size > 2\", goto: END}]\n"
                      "      - {name: size, text: \"Size?\", type: integer}\n")
        // `size` is empty when the rule runs, so `size > 2` never holds and the rule never fires.
        << QStringList{QStringLiteral("forward-reference owns routing[0].if 14"),
                       QStringLiteral("rule-never-fires owns routing[0].if 1")};
    QTest::newRow("unknown-target")
        << QByteArray("      - {name: owns, text: \"Own?\", type: single, codes: yes_no, routing: "
                      "[{if: \"owns = 2\", goto: nowhere}]}\n"
                      "      - {name: size, text: \"Size?\", type: integer}\n")
        << QStringList{QStringLiteral("unknown-target owns routing[0].goto -")};
    // goto the very next item does nothing the questionnaire would not do anyway.
    QTest::newRow("redundant-goto")
        << QByteArray("      - {name: owns, text: \"Own?\", type: single, codes: yes_no, routing: "
                      "[{if: \"owns = 2\", goto: size}]}\n"
                      "      - {name: size, text: \"Size?\", type: integer}\n")
        << QStringList{QStringLiteral("redundant-goto owns routing[0].goto -")};
    QTest::newRow("duplicate-name ignoring case")
        << owns + "      - {name: OWNS, text: \"Again?\", type: integer}\n"
        << QStringList{QStringLiteral("duplicate-name OWNS name -")};
    // A multi item's variable beds_2 collides with a later item of that name.
    QTest::newRow("duplicate-name multi variable")
        << QByteArray("      - name: beds\n        text: Which beds?\n        type: multi\n        "
                      "codes:\n"
                      "          - {code: 1, label: Roses}\n          - {code: 2, label: Herbs}\n"
                      "      - {name: beds_2, text: \"How many herb beds?\", type: integer}\n")
        << QStringList{QStringLiteral("duplicate-name beds_2 name -")};
    QTest::newRow("invalid-name")
        << QByteArray("      - {name: 2nd_plot, text: \"Second plot?\", type: integer}\n")
        << QStringList{QStringLiteral("invalid-name 2nd_plot name -")};
    QTest::newRow("invalid-name keyword")
        << QByteArray("      - {name: asked, text: \"Asked?\", type: integer}\n")
        << QStringList{QStringLiteral("invalid-name asked name -")};
    QTest::newRow("duplicate-code inline")
        << QByteArray("      - name: soil\n        text: Soil type?\n        type: single\n        "
                      "codes:\n"
                      "          - {code: 1, label: Clay}\n          - {code: 1, label: Sand}\n")
        << QStringList{QStringLiteral("duplicate-code soil codes[1] -")};
    QTest::newRow("empty-code-list inline")
        << QByteArray("      - {name: soil, text: \"Soil type?\", type: single, codes: []}\n")
        << QStringList{QStringLiteral("empty-code-list soil codes -")};
    QTest::newRow("bad-range reversed")
        << QByteArray("      - {name: size, text: \"Size?\", type: integer, range: [10, 1]}\n")
        << QStringList{QStringLiteral("bad-range size range -")};
    QTest::newRow("bad-range on text")
        << QByteArray("      - {name: note, text: \"Note?\", type: text, range: [1, 2]}\n")
        << QStringList{QStringLiteral("bad-range note range -")};
    QTest::newRow("missing-text") << QByteArray("      - {name: size, type: integer}\n")
                                  << QStringList{QStringLiteral("missing-text size text -")};
    // yes_no holds 1, 2, 9: 5 is none of them. The atom starts at column 1.
    QTest::newRow("unknown-code")
        << owns + "      - {name: size, text: \"Size?\", type: integer, ask_if: \"owns = 5\"}\n"
        // `owns = 5` never holds, so `size` is never asked.
        << QStringList{QStringLiteral("unreachable-item size  -"),
                       QStringLiteral("unknown-code size ask_if 1")};
    // 3..4 holds none of 1, 2, 9; the `in` atom starts at column 1.
    QTest::newRow("unknown-code range")
        << owns + "      - {name: size, text: \"Size?\", type: integer, ask_if: \"owns in (1, "
                  "3..4)\"}\n"
        << QStringList{QStringLiteral("unknown-code size ask_if 1")};
    // The range 1..50 holds no value above 100; `size > 100` starts at column 1.
    QTest::newRow("unknown-code numeric")
        << QByteArray("      - {name: size, text: \"Size?\", type: integer, range: [1, 50]}\n"
                      "      - {name: big, text: \"Big?\", type: text, ask_if: \"size > 100\"}\n")
        // No presented size exceeds 50, so `big` is never asked.
        << QStringList{QStringLiteral("unreachable-item big  -"),
                       QStringLiteral("unknown-code big ask_if 1")};
}

void TestCheck::findings() {
    QFETCH(QByteArray, items);
    QFETCH(QStringList, expected);
    // yes_no is used by some rows only; leave unused-code-list out of the comparison.
    QStringList actual = summarize(findingsOf(instrumentYaml(items)));
    actual.removeIf(
        [](const QString& s) { return s.startsWith(QLatin1String("unused-code-list")); });
    QCOMPARE(actual, expected);
}

void TestCheck::cleanInstrumentHasNoFindings() {
    const QByteArray items =
        "      - name: owns\n        text: Own a garden?\n        type: single\n        codes: "
        "yes_no\n"
        "        routing: [{if: \"owns in (2, 9)\", goto: END}]\n"
        "      - {name: size, text: \"Size in square metres?\", type: integer, range: [1, 5000]}\n";
    QCOMPARE(summarize(findingsOf(instrumentYaml(items))), QStringList());
}

// The duplicate-name message names both holders. "tools" is multi with
// codes 1, 2, 9 (yes_no), so it claims tools_1, tools_2 and tools_9; the item
// TOOLS_2 clashes with the variable, and Owns with the item owns.
void TestCheck::duplicateNameMessages() {
    const Findings findings = findingsOf(instrumentYaml(
        "      - {name: owns, text: \"Own a garden?\", type: single, codes: yes_no}\n"
        "      - {name: tools, text: \"Tools?\", type: multi, codes: yes_no}\n"
        "      - {name: TOOLS_2, text: \"Second?\", type: single, codes: yes_no}\n"
        "      - {name: Owns, text: \"Again?\", type: single, codes: yes_no}\n"));
    QStringList messages;
    for (const Finding& f : findings)
        if (f.check == u"duplicate-name"_s)
            messages.append(f.message);
    QCOMPARE(messages,
             (QStringList{u"the name 'TOOLS_2' of item 'TOOLS_2' is already used by variable "
                          u"'tools_2' of multi item 'tools' (names must be unique ignoring case)"_s,
                          u"the name 'Owns' of item 'Owns' is already used by item 'owns' (names "
                          u"must be unique ignoring case)"_s}));
}

void TestCheck::findingIdsAndOrder() {
    // Two findings on the same item: sorted by field ("ask_if" < "text"), and
    // the id is check:item:field.
    const QByteArray items = "      - {name: owns, text: \"Own?\", type: single, codes: yes_no}\n"
                             "      - {name: size, type: integer, ask_if: \"nothing = 1\"}\n";
    const Findings f = findingsOf(instrumentYaml(items));
    QCOMPARE(f.size(), 2);
    QCOMPARE(f.at(0).id(), QStringLiteral("unknown-variable:size:ask_if"));
    QCOMPARE(f.at(1).id(), QStringLiteral("missing-text:size:text"));
    QCOMPARE(f.at(0).severity, Severity::Error);
    QCOMPARE(f.at(1).severity, Severity::Warning);
}

void TestCheck::codeListFindings() {
    const QByteArray yaml = instrumentYaml(
        "      - {name: owns, text: \"Own?\", type: single, codes: yes_no}\n", "  spare: []\n");
    const QStringList actual = summarize(findingsOf(yaml));
    // `spare` is empty and unused; both findings are about the list, before any item.
    QCOMPARE(actual, (QStringList{QStringLiteral("empty-code-list  code_lists.spare -"),
                                  QStringLiteral("unused-code-list  code_lists.spare -")}));
    const Findings f = findingsOf(yaml);
    QCOMPARE(f.at(0).id(), QStringLiteral("empty-code-list:spare:code_lists.spare"));
}

void TestCheck::testRespondentReplay() {
    // Route by hand: owns = 2 jumps to END, so the path is [owns] only.
    const QByteArray items =
        "      - name: owns\n        text: Own?\n        type: single\n        codes: yes_no\n"
        "        routing: [{if: \"owns = 2\", goto: END}]\n"
        "      - {name: size, text: \"Size?\", type: integer}\n";
    const QByteArray good =
        "test_respondents:\n"
        "  - {name: no_garden, answers: {owns: 2}, path: [owns]}\n"
        "  - {name: garden, answers: {owns: 1, size: 40}, path: [owns, size]}\n";
    const QByteArray bad = "test_respondents:\n"
                           "  - {name: wrong, answers: {owns: 2, size: 3}, path: [owns, size]}\n";
    QCOMPARE(summarize(findingsOf(instrumentYaml(items) + good)), QStringList());
    const Findings f = findingsOf(instrumentYaml(items) + bad);
    QCOMPARE(summarize(f),
             QStringList{QStringLiteral("test-respondent-fails  test_respondents[0] -")});
    QVERIFY(f.at(0).message.contains(QLatin1String("step 2")));
}

void TestCheck::routingMistakesFullList() {
    // Every deliberate mistake of the sample, in check order (position, then
    // field, then check), as reasoned row by row in sample_projects/routing-mistakes.md.
    LoadResult loaded =
        loadYamlFile(QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/routing-mistakes.yaml"));
    QVERIFY2(loaded.ok(), qPrintable(formatDiagnostics(loaded.errors)));
    const CompiledRouting routing(*loaded.instrument);
    QStringList actual;
    for (const Finding& f : checkInstrument(routing))
        actual.append(QStringLiteral("%1 %2 %3 %4 %5")
                          .arg(severityName(f.severity), f.check, f.id(), f.field)
                          .arg(f.column ? QString::number(*f.column) : QStringLiteral("-")));
    const QStringList expected = {
        u"warning unused-code-list unused-code-list:spare_scale:code_lists.spare_scale code_lists.spare_scale -"_s,
        u"error syntax syntax:garden_size:ask_if ask_if 14"_s,
        u"error duplicate-name duplicate-name:Lawn:name name -"_s,
        u"error invalid-name invalid-name:2nd_bed:name name -"_s,
        u"error unknown-variable unknown-variable:compost_use:ask_if ask_if 1"_s,
        u"error duplicate-code duplicate-code:pot_size:codes[2] codes[2] -"_s,
        u"warning reads-unasked-item reads-unasked-item:shed_power:ask_if ask_if 1"_s,
        u"error unknown-target unknown-target:tree_count:routing[0].goto routing[0].goto -"_s,
        u"error type-mismatch type-mismatch:fruit_trees:ask_if ask_if 1"_s,
        u"error forward-reference forward-reference:hedge:ask_if ask_if 1"_s,
        u"error unreachable-item unreachable-item:path_type:  -"_s,
        u"warning rule-never-fires rule-never-fires:bird_feeder:routing[0].if routing[0].if 1"_s,
        u"warning redundant-goto redundant-goto:mower:routing[0].goto routing[0].goto -"_s,
        u"warning rule-always-fires rule-always-fires:watering_can:routing[0].if routing[0].if 1"_s,
        u"error unreachable-item unreachable-item:gnome:  -"_s,
        u"error routing-loop routing-loop:weed_method:routing[0].goto routing[0].goto -"_s,
        u"error bad-range bad-range:hedge_height:range range -"_s,
        u"error empty-code-list empty-code-list:watering_tool:codes codes -"_s,
        u"warning missing-text missing-text:balcony_plants:text text -"_s,
        u"warning unknown-code unknown-code:window_boxes:ask_if ask_if 1"_s,
        u"warning empty-module empty-module:allotment:items items -"_s,
        u"error test-respondent-fails test-respondent-fails:Refuses the garden question, expected "
        u"path wrong:test_respondents[1] test_respondents[1] -"_s,
    };
    QCOMPARE(actual, expected);
    // Which unreachable-item is which kind (DESIGN.md: say which).
    for (const Finding& f : checkInstrument(routing)) {
        if (f.check == QLatin1String("unreachable-item") && f.item == QLatin1String("gnome"))
            QVERIFY(f.message.contains(QLatin1String("no path")));
        if (f.check == QLatin1String("unreachable-item") && f.item == QLatin1String("path_type"))
            QVERIFY(f.message.contains(QLatin1String("contradict")));
    }
}

void TestCheck::cleanSamples() {
    // The two demo instruments are meant to be free of errors.
    for (const char* name : {"household-energy.yaml", "commuting.yaml"}) {
        LoadResult loaded =
            loadYamlFile(QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/") + QLatin1String(name));
        QVERIFY(loaded.ok());
        const CompiledRouting routing(*loaded.instrument);
        const Findings findings = checkInstrument(routing);
        QCOMPARE(countFindings(findings).errors, 0);
        // insulation_cost's filter reads insulation_done, which is empty only where the
        // plans module (ask_if tenure in (1, 2)) is skipped: inside the module both
        // has_solar branches reach it. The item's filter is evaluated only where the
        // module's holds (module filter first), so nothing reads an unasked item there.
        for (const Finding& f : findings)
            QVERIFY2(f.id() != u"reads-unasked-item:insulation_cost:ask_if"_s,
                     qPrintable(f.message));
    }
}

QTEST_GUILESS_MAIN(TestCheck)
#include "tst_check.moc"
