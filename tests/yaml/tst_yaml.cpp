// Tests of the YAML text format: structural errors with exact positions,
// canonical saving, round trips, and the committed sample projects.
//
// Every expected position below was worked out by hand from the fixture text
// (1-based line and column, columns counted in characters), before running.
#include "storage/YamlFormat.h"
#include "storage/YamlWriter.h"

#include <QFile>
#include <QTemporaryDir>
#include <QtTest>

using namespace Qt::StringLiterals;

namespace {

QString malformedPath(const QString& name) {
    return QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/yaml/malformed/") + name;
}

QString samplePath(const QString& name) {
    return QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/") + name;
}

QByteArray readBytes(const QString& path) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return {};
    return file.readAll();
}

// "line:column|message part" for each expected diagnostic.
QStringList describe(const rb::Diagnostics& errors) {
    QStringList out;
    for (const rb::Diagnostic& d : errors)
        out.append(u"%1:%2|%3"_s.arg(d.line).arg(d.column).arg(d.message));
    return out;
}

void compareDiagnostics(const rb::LoadResult& result, const QStringList& expected) {
    QVERIFY2(!result.ok(), "a structural problem must load nothing");
    const QStringList actual = describe(result.errors);
    QCOMPARE(actual.size(), expected.size());
    for (int i = 0; i < expected.size(); ++i) {
        const QString position = expected[i].section(QLatin1Char('|'), 0, 0);
        const QString part = expected[i].section(QLatin1Char('|'), 1);
        QCOMPARE(actual[i].section(QLatin1Char('|'), 0, 0), position);
        QVERIFY2(actual[i].contains(part), qPrintable(actual[i] + u" lacks "_s + part));
    }
}

const rb::Item* findItem(const rb::Instrument& instrument, const QString& name) {
    for (const rb::Module& module : instrument.modules)
        for (const rb::Item& item : module.items)
            if (item.name == name)
                return &item;
    return nullptr;
}

int itemCount(const rb::Instrument& instrument) {
    int count = 0;
    for (const rb::Module& module : instrument.modules)
        count += int(module.items.size());
    return count;
}

rb::LoadResult load(const QByteArray& text) {
    return rb::loadYamlText(text, u"t.yaml"_s);
}

// A small instrument in which one string can be put into every text field.
rb::Instrument instrumentWithText(const QString& s) {
    rb::Instrument in;
    in.title = s;
    in.version = s;
    in.language = s;
    in.settings.legitimateSkipCode = s;
    in.codeLists.append({u"list"_s, {{1, s, rb::MissingKind::None}}});
    rb::Item item;
    item.name = u"q1"_s;
    item.label = s;
    item.text = s;
    item.instruction = s;
    item.type = rb::ItemType::Single;
    item.hasInlineCodes = true;
    item.inlineCodes = {{1, s, rb::MissingKind::None}, {9, s, rb::MissingKind::Refused}};
    item.askIf = s;
    item.routing = {{s, u"END"_s}};
    item.whenSkipped = rb::WhenSkipped{s, true, s};
    item.notes = s;
    rb::Item numeric;
    numeric.name = u"q2"_s;
    numeric.type = rb::ItemType::Integer;
    numeric.codeListName = u"list"_s;
    in.modules.append({u"m"_s, s, s, {item, numeric}});
    rb::TestRespondent respondent;
    respondent.name = s;
    respondent.answers = {{u"q1"_s, {rb::AnswerValue::Kind::Text, s, {}}}};
    respondent.path = {u"q1"_s};
    in.testRespondents.append(respondent);
    return in;
}

} // namespace

class TestYaml : public QObject {
    Q_OBJECT

private slots:
    void malformedFile_data();
    void malformedFile();
    void generatedInput_data();
    void generatedInput();
    void unreadableFile();

    void designExampleLoads();
    void emptyValues();
    void numberOrText_data();
    void numberOrText();
    void nonStructuralProblemsLoad();

    void quoting_data();
    void quoting();
    void canonicalText();
    void trickyStrings_data();
    void trickyStrings();
    void trickyNames_data();
    void trickyNames();
    void boundWithoutSpelling();
    void saveFile();
    void saveFileFails();

    void sample_data();
    void sample();
    void householdValues();
    void commutingValues();
    void mistakesValues();
};

void TestYaml::malformedFile_data() {
    QTest::addColumn<QString>("file");
    QTest::addColumn<QStringList>("expected");

    // Line 6 "   title" is indented 3: neither the module map (column 5) nor the
    // sequence (column 3) can take it; yaml-cpp stops at the token, column 4.
    QTest::newRow("bad indentation")
        << u"bad-indentation.yaml"_s << QStringList{u"6:4|malformed YAML"_s};
    // `  title: "Unclosed`: the quote is column 10 and never closes.
    QTest::newRow("unclosed quote")
        << u"unclosed-quote.yaml"_s << QStringList{u"3:10|unclosed quoted text"_s};
    // Line 5 starts with a tab.
    QTest::newRow("tab indentation")
        << u"tab-indentation.yaml"_s << QStringList{u"5:1|tab character is used for indentation"_s};
    QTest::newRow("unknown top-level key")
        << u"unknown-top-key.yaml"_s
        << QStringList{u"5:1|unknown key 'extras' at the top level; allowed: routebook, "
                       u"instrument, settings, code_lists, modules, test_respondents"_s};
    // "        lable": 8 spaces, key at column 9.
    QTest::newRow("unknown item key")
        << u"unknown-item-key.yaml"_s
        << QStringList{u"8:9|unknown key 'lable' in item; allowed: name, label, text, "
                       u"instruction, type, codes, range, missing, ask_if, routing, "
                       u"when_skipped, notes"_s};
    // "      - type: text": the item map starts at its first key, column 9.
    QTest::newRow("missing item name")
        << u"missing-item-name.yaml"_s << QStringList{u"7:9|missing required key 'name' in item"_s};
    QTest::newRow("missing routebook")
        << u"missing-routebook.yaml"_s
        << QStringList{u"1:1|missing required key 'routebook' at the top level"_s};
    // "routebook: 2": the value is column 12.
    QTest::newRow("wrong version")
        << u"wrong-version.yaml"_s << QStringList{u"1:12|unsupported format version"_s};
    // "        type: choice": 8 + "type: " = 14, value at 15.
    QTest::newRow("unknown type")
        << u"unknown-type.yaml"_s
        << QStringList{u"8:15|unknown item type 'choice'; types: single, multi, integer, "
                       u"decimal, text, date, statement"_s};
    // "        codes: yesno": 8 + "codes: " = 15, value at 16.
    QTest::newRow("unknown code list")
        << u"unknown-code-list.yaml"_s
        << QStringList{u"12:16|unknown code list 'yesno'; code lists: yes_no"_s};
    // "    - {code: abc, ...": "{" column 7, "code" 8, "abc" 14.
    QTest::newRow("code is not a number")
        << u"code-not-integer.yaml"_s << QStringList{u"6:14|'code' must be a whole number"_s};
    // "        range: [5]": "[" at column 16.
    QTest::newRow("range with one number")
        << u"range-one-number.yaml"_s << QStringList{u"9:16|'range' must be two numbers"_s};
    // "        range: [1, \"20\"]": the quoted bound starts at column 20.
    QTest::newRow("range bound quoted")
        << u"range-quoted-bound.yaml"_s << QStringList{u"9:20|bound must be a number"_s};
    // "          - {if: ...}": "{" at column 13.
    QTest::newRow("rule without goto")
        << u"rule-without-goto.yaml"_s
        << QStringList{u"10:13|missing required key 'goto' in routing rule"_s};
    // "        when_skipped: {if: ...}": 8 + "when_skipped: " = 22, "{" at 23.
    QTest::newRow("when_skipped without value")
        << u"when-skipped-without-value.yaml"_s
        << QStringList{u"9:23|missing required key 'value' in when_skipped"_s};
    // "  - name: *t": the alias is column 11.
    QTest::newRow("alias") << u"alias.yaml"_s << QStringList{u"5:11|aliases are not supported"_s};
    // All problems, sorted by position; the nameless item lacks name and type.
    QTest::newRow("several problems")
        << u"several-problems.yaml"_s
        << QStringList{u"4:3|unknown key 'colour' in instrument; allowed: title, version, "
                       u"language"_s,
                       u"9:15|unknown item type 'choice'"_s,
                       u"10:16|unknown code list 'nowhere'; no code lists are defined"_s,
                       u"13:16|'range' must be two numbers"_s,
                       u"14:9|missing required key 'name' in item"_s,
                       u"14:9|missing required key 'type' in item"_s};
    QTest::newRow("scalar top level")
        << u"scalar-top-level.yaml"_s << QStringList{u"1:1|the top level must be a map"_s};
    QTest::newRow("comment only") << u"comment-only.yaml"_s
                                  << QStringList{u"1:1|the file is empty"_s};
    // The second "title" key is on line 4, column 3.
    QTest::newRow("duplicate key")
        << u"duplicate-key.yaml"_s << QStringList{u"4:3|duplicate key 'title'"_s};
    // "---" opens a second document on line 5.
    QTest::newRow("two documents")
        << u"two-documents.yaml"_s << QStringList{u"5:1|only one YAML document"_s};
    // "        label: [a, b]": "[" at column 16.
    QTest::newRow("sequence where text is expected")
        << u"label-is-list.yaml"_s << QStringList{u"8:16|'label' must be text, not a list"_s};
    // "  title: !!str 5": the tag starts at column 10.
    QTest::newRow("tag") << u"tag.yaml"_s << QStringList{u"3:10|YAML tags are not supported"_s};
    // "    - {code: 8, label: \"DK\", missing: dk}": "dk" at column 39.
    QTest::newRow("unknown missing kind")
        << u"unknown-missing-kind.yaml"_s
        << QStringList{u"6:39|unknown missing kind 'dk'; allowed: dont_know, refused, "
                       u"not_applicable"_s};
}

void TestYaml::malformedFile() {
    QFETCH(QString, file);
    QFETCH(QStringList, expected);
    const rb::LoadResult result = rb::loadYamlFile(malformedPath(file));
    compareDiagnostics(result, expected);
    for (const rb::Diagnostic& d : result.errors)
        QCOMPARE(d.file, malformedPath(file));
}

void TestYaml::generatedInput_data() {
    QTest::addColumn<QByteArray>("text");
    QTest::addColumn<QStringList>("expected");

    // The root map is nesting level 1 and the k-th "[" opens level k + 1, so
    // the 100th "[" opens level 101, one past the limit of 100. "modules: "
    // fills columns 1-9, so the 100th "[" is column 109.
    QTest::newRow("10000-deep flow nesting")
        << QByteArray("routebook: 1\nmodules: " + QByteArray(10000, '[') + QByteArray(10000, ']') +
                      "\n")
        << QStringList{u"2:109|nesting deeper than 100 levels"_s};
    // Block nesting: line n (n >= 2) holds n - 2 spaces and "-", opening level n
    // under the root map; level 101 is line 101, its "-" at column 100.
    QByteArray block = "modules:\n";
    for (int i = 0; i < 3000; ++i)
        block += QByteArray(i, ' ') + "-\n";
    QTest::newRow("3000-deep block nesting")
        << block << QStringList{u"101:100|nesting deeper than 100 levels"_s};
    QTest::newRow("empty text") << QByteArray() << QStringList{u"1:1|the file is empty"_s};
    // "  title: \"caf" is 13 characters; the lone byte 0xE9 is column 14.
    QTest::newRow("invalid UTF-8")
        << QByteArray("routebook: 1\ninstrument:\n  title: \"caf\xE9\"\nmodules: []\n")
        << QStringList{u"3:14|not valid UTF-8"_s};
    // Columns count characters: "  title: \"été\" [" has the "[" at column 16
    // (yaml-cpp reports byte 18); a flow sequence after a quoted scalar is invalid.
    QTest::newRow("column in characters after UTF-8 text")
        << QByteArray("routebook: 1\ninstrument:\n  title: \"\xC3\xA9t\xC3\xA9\" [\nmodules: []\n")
        << QStringList{u"3:16|malformed YAML"_s};
}

void TestYaml::generatedInput() {
    QFETCH(QByteArray, text);
    QFETCH(QStringList, expected);
    compareDiagnostics(load(text), expected);
}

void TestYaml::unreadableFile() {
    const QString path = malformedPath(u"no-such-file.yaml"_s);
    const rb::LoadResult result = rb::loadYamlFile(path);
    QVERIFY(!result.ok());
    QCOMPARE(result.errors.size(), 1);
    QCOMPARE(result.errors[0].file, path);
    QVERIFY(result.errors[0].message.contains(u"cannot read"_s));
}

// The example of DESIGN.md "YAML text format", with its comment.
void TestYaml::designExampleLoads() {
    const QByteArray text = R"yaml(routebook: 1
instrument: {title: Home Energy Panel, version: "0.3", language: en}
settings: {legitimate_skip_code: ""}
code_lists:
  yes_no:
    - {code: 1, label: "Yes"}
    - {code: 2, label: "No"}
    - {code: 8, label: "Don't know", missing: dont_know}
    - {code: 9, label: "Refused", missing: refused}
modules:
  - name: transport
    title: Household vehicles
    items:
      - name: has_vehicle
        label: Household has a motor vehicle
        text: Does anyone in your household own or lease a motor vehicle?
        type: single
        codes: yes_no
        routing:
          - {if: "has_vehicle in (2, 8, 9)", goto: heating}   # module name = its first item
      - name: vehicle_count
        text: How many vehicles does the household have?
        type: integer
        range: [1, 20]
        missing: [{code: 98, label: "Don't know", missing: dont_know}]
        when_skipped: {value: 0, if: "has_vehicle = 2"}
  - name: heating
    items: []
)yaml";
    const rb::LoadResult result = load(text);
    QVERIFY2(result.ok(), qPrintable(rb::formatDiagnostics(result.errors)));
    const rb::Instrument& in = *result.instrument;
    QCOMPARE(in.title, u"Home Energy Panel"_s);
    QCOMPARE(in.version, u"0.3"_s); // quoted in the file: text, not the number 0.3
    QCOMPARE(in.language, u"en"_s);
    QCOMPARE(in.settings.legitimateSkipCode, QString());
    QCOMPARE(in.codeLists.size(), 1);
    QCOMPARE(in.codeLists[0].codes.size(), 4);
    QCOMPARE(in.codeLists[0].codes[2], (rb::Code{8, u"Don't know"_s, rb::MissingKind::DontKnow}));
    QCOMPARE(in.modules.size(), 2);
    QCOMPARE(in.modules[1].name, u"heating"_s);
    QVERIFY(in.modules[1].items.isEmpty());
    const rb::Item& gate = in.modules[0].items[0];
    QCOMPARE(gate.type, rb::ItemType::Single);
    QCOMPARE(gate.codeListName, u"yes_no"_s);
    QVERIFY(!gate.hasInlineCodes);
    QCOMPARE(gate.routing.size(), 1);
    QCOMPARE(gate.routing[0].condition, std::optional(u"has_vehicle in (2, 8, 9)"_s));
    QCOMPARE(gate.routing[0].target, u"heating"_s);
    const rb::Item& count = in.modules[0].items[1];
    QCOMPARE(count.type, rb::ItemType::Integer);
    QVERIFY(count.label.isEmpty());
    QVERIFY(count.range.has_value());
    QCOMPARE(count.range->first.text, u"1"_s);
    QCOMPARE(count.range->second.value, 20.0);
    QCOMPARE(count.missing.size(), 1);
    QCOMPARE(count.missing[0].missing, rb::MissingKind::DontKnow);
    QVERIFY(count.whenSkipped.has_value());
    QCOMPARE(count.whenSkipped->value, u"0"_s);
    QVERIFY(!count.whenSkipped->valueIsText);
    QCOMPARE(count.whenSkipped->condition, std::optional(u"has_vehicle = 2"_s));
    QVERIFY(!count.askIf.has_value());
}

// `key:` with nothing after it is empty text, an empty list or an empty map
// where one of those is allowed (the rule stated in YamlReader.cpp).
void TestYaml::emptyValues() {
    const QByteArray text = "routebook: 1\n"
                            "instrument:\n  title: \"T\"\n  version:\n"
                            "settings:\n  legitimate_skip_code:\n"
                            "modules:\n"
                            "  - name: m\n    ask_if:\n    items:\n"
                            "  - name: n\n    items:\n"
                            "      - name: q\n        type: single\n        codes:\n"
                            "        label:\n        routing:\n";
    const rb::LoadResult result = load(text);
    QVERIFY2(result.ok(), qPrintable(rb::formatDiagnostics(result.errors)));
    const rb::Instrument& in = *result.instrument;
    QCOMPARE(in.version, QString());
    QCOMPARE(in.settings.legitimateSkipCode, QString());
    QCOMPARE(in.modules[0].askIf, std::optional(QString())); // present but empty: a finding
    QVERIFY(in.modules[0].items.isEmpty());
    const rb::Item& q = in.modules[1].items[0];
    QVERIFY(q.hasInlineCodes);
    QVERIFY(q.inlineCodes.isEmpty());
    QVERIFY(q.routing.isEmpty());

    // Where empty is not allowed it is a structural problem, reported at its key:
    // in "  - {name: m, items: [{name: q, type: integer, range: }]}" the key
    // "range" starts at column 48.
    compareDiagnostics(load("routebook: 1\ninstrument: {title: T}\nmodules:\n"
                            "  - {name: m, items: [{name: q, type: integer, range: }]}\n"),
                       {u"4:48|'range' must be two numbers"_s});
}

void TestYaml::numberOrText_data() {
    QTest::addColumn<QByteArray>("written");
    QTest::addColumn<QString>("text");
    QTest::addColumn<bool>("isText");
    // Plain numbers are numbers; anything quoted, and plain words, are text.
    // The number spelling is the one documented in YamlReader.h (our rule).
    QTest::newRow("integer") << QByteArray("0") << u"0"_s << false;
    QTest::newRow("negative decimal") << QByteArray("-2.5") << u"-2.5"_s << false;
    QTest::newRow("exponent") << QByteArray("1e3") << u"1e3"_s << false;
    QTest::newRow("quoted digits") << QByteArray("\"0\"") << u"0"_s << true;
    QTest::newRow("plain word") << QByteArray("none") << u"none"_s << true;
    QTest::newRow("yaml infinity is text") << QByteArray(".inf") << u".inf"_s << true;
    QTest::newRow("hex is text") << QByteArray("0x10") << u"0x10"_s << true;
}

void TestYaml::numberOrText() {
    QFETCH(QByteArray, written);
    QFETCH(QString, text);
    QFETCH(bool, isText);
    const QByteArray yaml =
        "routebook: 1\ninstrument: {title: T}\nmodules:\n  - name: m\n"
        "    items:\n      - name: q\n        type: integer\n"
        "        when_skipped: {value: " +
        written + "}\ntest_respondents:\n  - name: r\n    answers: {q: " + written + "}\n";
    const rb::LoadResult result = load(yaml);
    QVERIFY2(result.ok(), qPrintable(rb::formatDiagnostics(result.errors)));
    const rb::Item& q = result.instrument->modules[0].items[0];
    QCOMPARE(q.whenSkipped->value, text);
    QCOMPARE(q.whenSkipped->valueIsText, isText);
    const rb::AnswerValue& answer = result.instrument->testRespondents[0].answers[0].value;
    QCOMPARE(answer.text, text);
    QCOMPARE(answer.kind, isText ? rb::AnswerValue::Kind::Text : rb::AnswerValue::Kind::Number);
    // And it comes back the same way.
    QCOMPARE(load(rb::saveYamlText(*result.instrument)).instrument, result.instrument);
}

// DESIGN.md: bad names, duplicate codes, broken conditions and unknown targets
// are findings of `check`, not load errors.
void TestYaml::nonStructuralProblemsLoad() {
    const QByteArray text = "routebook: 1\ninstrument: {title: T}\n"
                            "code_lists:\n  scale: []\n"
                            "modules:\n  - name: m\n    items:\n"
                            "      - name: 9 bad name\n        type: single\n"
                            "        codes: [{code: 1, label: A}, {code: 1, label: B}]\n"
                            "        ask_if: \"((( =\"\n"
                            "        routing: [{goto: nowhere}]\n"
                            "      - {name: Q, type: integer, codes: SCALE, range: [10, 1]}\n";
    const rb::LoadResult result = load(text);
    QVERIFY2(result.ok(), qPrintable(rb::formatDiagnostics(result.errors)));
    const rb::Item& bad = result.instrument->modules[0].items[0];
    QCOMPARE(bad.name, u"9 bad name"_s);
    QCOMPARE(bad.inlineCodes.size(), 2);
    QCOMPARE(bad.askIf, std::optional(u"((( ="_s));
    QCOMPARE(bad.routing[0].target, u"nowhere"_s);
    QVERIFY(!bad.routing[0].condition.has_value());
    const rb::Item& numeric = result.instrument->modules[0].items[1];
    QCOMPARE(numeric.codeListName, u"SCALE"_s); // code list names match ignoring case
    QCOMPARE(numeric.range->first.text, u"10"_s);
}

void TestYaml::quoting_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<QString>("expected");
    // YAML 1.2 double-quoted escapes (YAML 1.2 spec, section 5.7 "Escaped
    // Characters", section number from memory): \" \\ \n \t \r \xXX \uXXXX.
    QTest::newRow("quote") << u"say \"hi\""_s << u"\"say \\\"hi\\\"\""_s;
    QTest::newRow("backslash") << u"a\\b"_s << u"\"a\\\\b\""_s;
    QTest::newRow("newline") << u"a\nb"_s << u"\"a\\nb\""_s;
    QTest::newRow("tab and return") << u"a\tb\r"_s << u"\"a\\tb\\r\""_s;
    QTest::newRow("control") << QString(QChar(0x01)) << u"\"\\x01\""_s;
    QTest::newRow("line separator") << QString(QChar(0x2028)) << u"\"\\u2028\""_s;
    QTest::newRow("unicode stays") << u"été 😀"_s << u"\"été 😀\""_s;
    QTest::newRow("empty") << QString() << u"\"\""_s;
}

void TestYaml::quoting() {
    QFETCH(QString, text);
    QFETCH(QString, expected);
    QCOMPARE(rb::yaml::quoted(text), expected);
}

// The exact canonical bytes of a small instrument, written out by hand from
// the rules in YamlWriter.cpp.
void TestYaml::canonicalText() {
    rb::Instrument in;
    in.title = u"Garden \"Plots\""_s;
    in.codeLists.append(
        {u"yes_no"_s,
         {{1, u"Yes"_s, rb::MissingKind::None}, {9, u"Refused"_s, rb::MissingKind::Refused}}});
    in.codeLists.append({u"empty"_s, {}});
    rb::Item a;
    a.name = u"has_plot"_s;
    a.label = u"Has a plot"_s;
    a.type = rb::ItemType::Single;
    a.codeListName = u"yes_no"_s;
    a.routing = {{u"has_plot <> 1"_s, u"END"_s}, {std::nullopt, u"null"_s}};
    rb::Item b;
    b.name = u"plot_m2"_s;
    b.type = rb::ItemType::Decimal;
    b.range = std::pair(rb::RangeBound{u"0.5"_s, 0.5}, rb::RangeBound{u"1e3"_s, 1000});
    b.missing = {{999, u"Don't know"_s, rb::MissingKind::DontKnow}};
    b.askIf = u""_s;
    b.whenSkipped = rb::WhenSkipped{u"0"_s, false, u"has_plot = 2"_s};
    in.modules.append({u"plots"_s, QString(), std::nullopt, {a, b}});
    in.modules.append({u"empty_module"_s, u"Nothing"_s, u"true"_s, {}});
    rb::TestRespondent r;
    r.name = u"one"_s;
    r.answers = {{u"has_plot"_s, {rb::AnswerValue::Kind::Number, u"1"_s, {}}},
                 {u"plot_m2"_s, {rb::AnswerValue::Kind::Text, u"2.5"_s, {}}},
                 {u"tools"_s, {rb::AnswerValue::Kind::List, {}, {1, 3}}}};
    r.path = {u"has_plot"_s, u"plot_m2"_s};
    in.testRespondents.append(r);

    const QByteArray expected =
        "routebook: 1\n"
        "instrument:\n"
        "  title: \"Garden \\\"Plots\\\"\"\n"
        "settings:\n"
        "  legitimate_skip_code: \"\"\n"
        "code_lists:\n"
        "  yes_no:\n"
        "    - {code: 1, label: \"Yes\"}\n"
        "    - {code: 9, label: \"Refused\", missing: refused}\n"
        "  empty: []\n"
        "modules:\n"
        "  - name: plots\n"
        "    items:\n"
        "      - name: has_plot\n"
        "        label: \"Has a plot\"\n"
        "        type: single\n"
        "        codes: yes_no\n"
        "        routing:\n"
        "          - {if: \"has_plot <> 1\", goto: END}\n"
        "          - {goto: \"null\"}\n"
        "      - name: plot_m2\n"
        "        type: decimal\n"
        "        range: [0.5, 1e3]\n"
        "        missing:\n"
        "          - {code: 999, label: \"Don't know\", missing: dont_know}\n"
        "        ask_if: \"\"\n"
        "        when_skipped: {value: 0, if: \"has_plot = 2\"}\n"
        "  - name: empty_module\n"
        "    title: \"Nothing\"\n"
        "    ask_if: \"true\"\n"
        "test_respondents:\n"
        "  - name: \"one\"\n"
        "    answers:\n"
        "      has_plot: 1\n"
        "      plot_m2: \"2.5\"\n"
        "      tools: [1, 3]\n"
        "    path: [has_plot, plot_m2]\n";
    const QByteArray saved = rb::saveYamlText(in);
    QCOMPARE(saved, expected);
    const rb::LoadResult back = load(saved);
    QVERIFY2(back.ok(), qPrintable(rb::formatDiagnostics(back.errors)));
    QCOMPARE(*back.instrument, in);
}

void TestYaml::trickyStrings_data() {
    QTest::addColumn<QString>("text");
    QTest::newRow("quotes") << u"He said \"yes\" and 'no'"_s;
    QTest::newRow("backslashes") << u"C:\\path\\ and \\n literally"_s;
    QTest::newRow("newlines") << u"line one\nline two\r\nline three\n"_s;
    QTest::newRow("unicode") << u"Grüße, 日本語, emoji 😀, NEL\u0085, LS\u2028, BOM\uFEFF"_s;
    QTest::newRow("leading and trailing spaces") << u"   padded   "_s;
    QTest::newRow("hash") << u"# not a comment"_s;
    QTest::newRow("colon space") << u"key: value"_s;
    QTest::newRow("indicators") << u"- [a] {b} & * ! | > % @ ` ? , "_s;
    QTest::newRow("document markers") << u"---\n..."_s;
    QTest::newRow("yaml keywords") << u"null"_s;
    QTest::newRow("tilde") << u"~"_s;
    QTest::newRow("number-like") << u"0.30"_s;
    QTest::newRow("tabs and controls") << u"\ta\x01\x1f\x7f"_s;
    QTest::newRow("empty") << QString();
}

void TestYaml::trickyStrings() {
    QFETCH(QString, text);
    const rb::Instrument in = instrumentWithText(text);
    const QByteArray saved = rb::saveYamlText(in);
    const rb::LoadResult back = load(saved);
    QVERIFY2(back.ok(), qPrintable(rb::formatDiagnostics(back.errors) + QString::fromUtf8(saved)));
    QCOMPARE(back.instrument->modules[0].items[0].text, text);
    QCOMPARE(back.instrument->testRespondents[0].answers[0].value.text, text);
    QCOMPARE(*back.instrument, in);
    QCOMPARE(rb::saveYamlText(*back.instrument), saved);
}

void TestYaml::trickyNames_data() {
    QTest::addColumn<QString>("name");
    QTest::addColumn<bool>("plain");
    // Plain only for identifiers that YAML reads as text (our rule).
    QTest::newRow("identifier") << u"q_1"_s << true;
    QTest::newRow("END") << u"END"_s << true;
    QTest::newRow("null word") << u"Null"_s << false;
    QTest::newRow("boolean word") << u"yes"_s << false;
    QTest::newRow("digit first") << u"2nd"_s << false;
    QTest::newRow("space") << u"has space"_s << false;
    QTest::newRow("colon") << u"a: b"_s << false;
    QTest::newRow("empty") << QString() << false;
}

void TestYaml::trickyNames() {
    QFETCH(QString, name);
    QFETCH(bool, plain);
    QCOMPARE(rb::yaml::nameToken(name) == name, plain);
    rb::Instrument in = instrumentWithText(u"x"_s);
    in.codeLists[0].name = name;
    in.modules[0].name = name;
    in.modules[0].items[0].name = name;
    in.modules[0].items[0].routing[0].target = name;
    in.modules[0].items[1].codeListName = name;
    in.testRespondents[0].answers[0].item = name;
    in.testRespondents[0].path = {name};
    const QByteArray saved = rb::saveYamlText(in);
    const rb::LoadResult back = load(saved);
    QVERIFY2(back.ok(), qPrintable(rb::formatDiagnostics(back.errors) + QString::fromUtf8(saved)));
    QCOMPARE(*back.instrument, in);
    QCOMPARE(rb::saveYamlText(*back.instrument), saved);
}

// A bound made in code without its spelling is written from its value, so
// that the text still loads (0.1 is the shortest exact spelling of 0.1).
void TestYaml::boundWithoutSpelling() {
    rb::Instrument in = instrumentWithText(u"x"_s);
    in.modules[0].items[1].range =
        std::pair(rb::RangeBound{QString(), 0.1}, rb::RangeBound{QString(), 20});
    const rb::LoadResult back = load(rb::saveYamlText(in));
    QVERIFY2(back.ok(), qPrintable(rb::formatDiagnostics(back.errors)));
    QCOMPARE(back.instrument->modules[0].items[1].range->first.text, u"0.1"_s);
    QCOMPARE(back.instrument->modules[0].items[1].range->second.text, u"20"_s);
}

void TestYaml::saveFile() {
    QTemporaryDir dir;
    QVERIFY(dir.isValid());
    const rb::LoadResult sample = rb::loadYamlFile(samplePath(u"commuting.yaml"_s));
    QVERIFY(sample.ok());
    const QString path = dir.filePath(u"copy.yaml"_s);
    QCOMPARE(rb::saveYamlFile(*sample.instrument, path), std::nullopt);
    QCOMPARE(readBytes(path), readBytes(samplePath(u"commuting.yaml"_s)));
    QCOMPARE(rb::loadYamlFile(path).instrument, sample.instrument);
}

void TestYaml::saveFileFails() {
    QTemporaryDir dir;
    const QString path = dir.filePath(u"missing-folder/copy.yaml"_s);
    const std::optional<rb::Diagnostic> error = rb::saveYamlFile(rb::Instrument{}, path);
    QVERIFY(error.has_value());
    QCOMPARE(error->file, path);
    QVERIFY(!QFile::exists(path));
}

void TestYaml::sample_data() {
    QTest::addColumn<QString>("file");
    QTest::newRow("household energy") << u"household-energy.yaml"_s;
    QTest::newRow("commuting") << u"commuting.yaml"_s;
    QTest::newRow("routing mistakes") << u"routing-mistakes.yaml"_s;
}

void TestYaml::sample() {
    QFETCH(QString, file);
    const QByteArray bytes = readBytes(samplePath(file));
    QVERIFY(!bytes.isEmpty());
    const rb::LoadResult result = rb::loadYamlText(bytes, file);
    QVERIFY2(result.ok(), qPrintable(rb::formatDiagnostics(result.errors)));
    // Committed in canonical form: saving gives back the same bytes...
    QCOMPARE(rb::saveYamlText(*result.instrument), bytes);
    // ...and reading the saved text gives back the same instrument.
    QCOMPARE(load(rb::saveYamlText(*result.instrument)).instrument, result.instrument);
}

void TestYaml::householdValues() {
    const rb::LoadResult result = rb::loadYamlFile(samplePath(u"household-energy.yaml"_s));
    QVERIFY(result.ok());
    const rb::Instrument& in = *result.instrument;
    // Counted from the design: 2 + 6 + 9 + 6 + 6 + 8 + 6 items in 7 modules.
    QCOMPARE(in.modules.size(), 7);
    QCOMPARE(itemCount(in), 43);
    QCOMPARE(in.codeLists.size(), 8);
    QCOMPARE(in.settings.legitimateSkipCode, u"-1"_s);
    QCOMPARE(in.testRespondents.size(), 3);
    QCOMPARE(in.modules[5].name, u"plans"_s);
    QCOMPARE(in.modules[5].askIf, std::optional(u"tenure in (1, 2)"_s));

    const rb::Item* count = findItem(in, u"vehicle_count"_s);
    QVERIFY(count);
    QCOMPARE(count->type, rb::ItemType::Integer);
    QCOMPARE(count->whenSkipped,
             (std::optional(rb::WhenSkipped{u"0"_s, false, u"has_vehicle = 2"_s})));
    const rb::Item* solar = findItem(in, u"solar_kw"_s);
    QVERIFY(solar);
    QCOMPARE(solar->type, rb::ItemType::Decimal);
    QCOMPARE(solar->range->first.text, u"0.5"_s);
    QCOMPARE(solar->range->first.value, 0.5);
    const rb::Item* vehicle = findItem(in, u"has_vehicle"_s);
    QCOMPARE(vehicle->routing[0].target, u"appliances"_s); // a module name
    QCOMPARE(findItem(in, u"follow_up"_s)->routing[0].target, u"END"_s);
    QVERIFY(!findItem(in, u"solar_interest"_s)->routing[0].condition.has_value());
    QCOMPARE(findItem(in, u"appliance_list"_s)->type, rb::ItemType::Multi);
    QCOMPARE(findItem(in, u"move_in_date"_s)->type, rb::ItemType::Date);
    QCOMPARE(findItem(in, u"intro_note"_s)->type, rb::ItemType::Statement);
    QCOMPARE(findItem(in, u"comments"_s)->type, rb::ItemType::Text);

    const rb::TestRespondent& first = in.testRespondents[0];
    QCOMPARE(first.path.size(), 41); // 43 items less oil_tank_litres and solar_interest
    const auto answer = [&](const QString& item) {
        for (const rb::Answer& a : first.answers)
            if (a.item == item)
                return a.value;
        return rb::AnswerValue{};
    };
    QCOMPARE(answer(u"floor_area"_s),
             (rb::AnswerValue{rb::AnswerValue::Kind::Number, u"142.5"_s, {}}));
    QCOMPARE(answer(u"move_in_date"_s).kind, rb::AnswerValue::Kind::Text);
    QCOMPARE(answer(u"appliance_list"_s).codes, (QList<qint64>{1, 2, 4}));
}

void TestYaml::commutingValues() {
    const rb::LoadResult result = rb::loadYamlFile(samplePath(u"commuting.yaml"_s));
    QVERIFY(result.ok());
    const rb::Instrument& in = *result.instrument;
    QCOMPARE(itemCount(in), 26); // 10 + 8 + 6 + 2
    QCOMPARE(in.testRespondents.size(), 3);
    int multi = 0;
    for (const rb::Module& module : in.modules)
        for (const rb::Item& item : module.items)
            multi += item.type == rb::ItemType::Multi;
    QCOMPARE(multi, 4); // modes_used, bike_types, cycle_barriers, long_trip_modes
    const rb::Item* km = findItem(in, u"commute_km"_s);
    QCOMPARE(km->range->second.text, u"300"_s);
    QCOMPARE(km->missing[0].code, 999);
    QCOMPARE(findItem(in, u"transit_pass"_s)->askIf,
             std::optional(u"modes_used has 4 or modes_used has 5"_s));
}

void TestYaml::mistakesValues() {
    const rb::LoadResult result = rb::loadYamlFile(samplePath(u"routing-mistakes.yaml"_s));
    QVERIFY(result.ok());
    const rb::Instrument& in = *result.instrument;
    QCOMPARE(itemCount(in), 31);
    QCOMPARE(in.modules.size(), 3);
    QVERIFY(in.modules[2].items.isEmpty());
    QVERIFY(findItem(in, u"2nd_bed"_s));
    QVERIFY(findItem(in, u"Lawn"_s));
    QCOMPARE(findItem(in, u"garden_size"_s)->askIf, std::optional(u"has_garden = = 1"_s));
    QCOMPARE(findItem(in, u"hedge_height"_s)->range->first.text, u"10"_s);
    QVERIFY(findItem(in, u"watering_tool"_s)->hasInlineCodes);
    QVERIFY(findItem(in, u"watering_tool"_s)->inlineCodes.isEmpty());
    QVERIFY(findItem(in, u"balcony_plants"_s)->text.isEmpty());
}

QTEST_GUILESS_MAIN(TestYaml)
#include "tst_yaml.moc"
