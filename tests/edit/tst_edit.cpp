// Document and undo commands (model/edit): every command's undo/redo round
// trip, merging, the rename / delete / recode cascades as one undo step, the
// trial run against the reference simulator, and the background analysis.
#include "check/InstrumentCheck.h"
#include "condition/Parser.h"
#include "edit/AnalysisRunner.h"
#include "edit/Cascades.h"
#include "edit/ConditionRewrite.h"
#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"
#include "edit/StructureCommands.h"
#include "edit/TrialRun.h"
#include "routing/AnswerReplay.h"
#include "storage/YamlFormat.h"

#include <QSignalSpy>
#include <QTest>

using namespace Qt::StringLiterals;
using namespace rb;

namespace {

// An invented gardening instrument. Routing by hand:
//   has_garden = 1 -> garden_size, grows_food, (grows_food = 1) food_kind, owns_mower
//   has_garden in (2, 9) -> goto tools -> owns_mower
// owns_mower's ask_if does not parse (left alone by renames).
const char* const kGarden = R"yaml(routebook: 1
instrument: {title: Garden habits, version: "1", language: en}
code_lists:
  yes_no:
    - {code: 1, label: "Yes"}
    - {code: 2, label: "No"}
    - {code: 9, label: "Refused", missing: refused}
  unused:
    - {code: 1, label: "One"}
modules:
  - name: garden
    title: The garden
    items:
      - name: has_garden
        label: Has a garden
        text: Do you have a garden?
        type: single
        codes: yes_no
        routing:
          - {if: "has_garden in (2, 9)", goto: tools}
      - name: garden_size
        label: Garden size
        text: How large is the garden in square metres?
        type: integer
        range: [1, 10000]
        when_skipped: {value: 0, if: "has_garden = 2"}
      - name: grows_food
        label: Grows food
        text: Do you grow any food?
        type: single
        codes: yes_no
        routing:
          - {if: "grows_food <> 1", goto: tools}
      - name: food_kind
        label: Kind of food
        text: What do you grow?
        type: single
        codes:
          - {code: 1, label: "Vegetables"}
          - {code: 2, label: "Fruit"}
  - name: tools
    title: Tools
    items:
      - name: owns_mower
        label: Owns a mower
        text: Do you own a lawn mower?
        type: single
        codes: yes_no
        ask_if: "has_garden = 1 and ("
test_respondents:
  - name: no garden
    answers: {has_garden: 2, owns_mower: 1}
    path: [has_garden]
)yaml";

Instrument garden() {
    LoadResult loaded = loadYamlText(QByteArray(kGarden), u"garden.yaml"_s);
    if (!loaded.ok())
        qFatal("fixture does not load: %s", qPrintable(formatDiagnostics(loaded.errors)));
    return *loaded.instrument;
}

const Item& itemAt(const Document& d, int m, int i) {
    return d.instrument().modules.at(m).items.at(i);
}

bool sameCondition(const QString& a, const QString& b) {
    const cond::ParseResult pa = cond::parseCondition(a), pb = cond::parseCondition(b);
    return pa.ok() && pb.ok() && pa.expr->sameTree(*pb.expr);
}

AnswerValue number(int v) {
    return {AnswerValue::Kind::Number, QString::number(v), {}};
}

// Undoes everything on the stack, checks the instrument equals `before`, redoes
// everything, checks it equals `after`.
void roundTrip(Document& d, const Instrument& before, const Instrument& after) {
    while (d.undoStack()->canUndo())
        d.undoStack()->undo();
    QCOMPARE(d.instrument(), before);
    while (d.undoStack()->canRedo())
        d.undoStack()->redo();
    QCOMPARE(d.instrument(), after);
}

} // namespace

class TestEdit : public QObject {
    Q_OBJECT
private slots:
    void attributeRoundTrip_data();
    void attributeRoundTrip();
    void typingMerges();
    void mergeBackToStartIsObsolete();
    void namesDoNotMerge();
    void eventsBracketChanges();
    void insertRemoveItem();
    void insertRemoveModuleAndList();
    void moveItemAcrossModules();
    void renameRewritesConditionsAndGotos();
    void renameLeavesUnparsableConditions();
    void renameModuleRewritesGotos();
    void deleteItemDropsRulesToIt();
    void deleteCodeListKeepsCodesInline();
    void renameCodeList();
    void recodeRewritesEqualityOnly();
    void rewriteKeepsUntouchedText();
    void trialRunThroughSkip();
    void trialRunStepsBack();
    void trialRunMatchesSimulator();
    void trialRunRejectsBadAnswer();
    void analysisRunsInBackground();
    void modifiedFollowsCleanState();
};

void TestEdit::attributeRoundTrip_data() {
    QTest::addColumn<int>("field");
    QTest::addColumn<int>("module");
    QTest::addColumn<int>("item");
    QTest::addColumn<int>("list");
    auto row = [](const char* name, Field f, int m, int i, int l) {
        QTest::newRow(name) << int(f) << m << i << l;
    };
    row("title", Field::InstrumentTitle, -1, -1, -1);
    row("skip code", Field::LegitimateSkipCode, -1, -1, -1);
    row("respondents", Field::TestRespondents, -1, -1, -1);
    row("module title", Field::ModuleTitle, 0, -1, -1);
    row("module ask_if", Field::ModuleAskIf, 1, -1, -1);
    row("label", Field::ItemLabel, 0, 1, -1);
    row("text", Field::ItemText, 0, 1, -1);
    row("instruction", Field::ItemInstruction, 0, 1, -1);
    row("type", Field::ItemType, 0, 1, -1);
    row("codes", Field::ItemCodes, 0, 3, -1);
    row("range", Field::ItemRange, 0, 1, -1);
    row("missing", Field::ItemMissing, 0, 1, -1);
    row("ask_if", Field::ItemAskIf, 0, 1, -1);
    row("routing", Field::ItemRouting, 0, 0, -1);
    row("when_skipped", Field::ItemWhenSkipped, 0, 1, -1);
    row("notes", Field::ItemNotes, 0, 1, -1);
    row("list codes", Field::CodeListCodes, -1, -1, 0);
}

// A value different from the current one for each kind of attribute.
static AttributeValue changed(const AttributeValue& v) {
    if (auto s = std::get_if<QString>(&v))
        return *s + u" (edited)"_s;
    if (auto o = std::get_if<std::optional<QString>>(&v))
        return std::optional<QString>(o->has_value() ? std::nullopt
                                                     : std::optional<QString>(u"true"_s));
    if (auto t = std::get_if<ItemType>(&v))
        return *t == ItemType::Text ? ItemType::Date : ItemType::Text;
    if (auto c = std::get_if<CodeSource>(&v))
        return CodeSource{u"yes_no"_s, false, {}} == *c ? CodeSource{u"unused"_s, false, {}}
                                                        : CodeSource{u"yes_no"_s, false, {}};
    if (auto r = std::get_if<ItemRange>(&v))
        return r->has_value() ? ItemRange() : ItemRange({{u"1"_s, 1}, {u"5"_s, 5}});
    if (auto codes = std::get_if<QList<Code>>(&v))
        return *codes + QList<Code>{{98, u"Don't know"_s, MissingKind::DontKnow}};
    if (auto rules = std::get_if<QList<Rule>>(&v))
        return *rules + QList<Rule>{{std::nullopt, u"END"_s}};
    if (auto w = std::get_if<std::optional<WhenSkipped>>(&v))
        return w->has_value() ? std::optional<WhenSkipped>()
                              : std::optional<WhenSkipped>(WhenSkipped{u"0"_s, false, {}});
    auto people = std::get<QList<TestRespondent>>(v);
    people.append({u"extra"_s, {}, {}});
    return people;
}

void TestEdit::attributeRoundTrip() {
    QFETCH(int, field);
    QFETCH(int, module);
    QFETCH(int, item);
    QFETCH(int, list);
    Document d;
    d.reset(garden(), {});
    const AttributeKey key{Field(field), module, item, list};
    const Instrument before = d.instrument();
    const AttributeValue next = changed(d.attribute(key));
    QVERIFY(next != d.attribute(key));
    d.push(new SetAttributeCommand(&d, key, next, u"edit"_s));
    QCOMPARE(d.attribute(key) == next, true);
    QVERIFY(d.instrument() != before);
    const Instrument after = d.instrument();
    roundTrip(d, before, after);
}

void TestEdit::typingMerges() {
    Document d;
    d.reset(garden(), {});
    const QString original = itemAt(d, 0, 1).label;
    const AttributeKey key = AttributeKey::ofItem(0, 1, Field::ItemLabel);
    for (const QString& typed : {u"G"_s, u"Ga"_s, u"Gar"_s})
        d.push(SetAttributeCommand::typing(&d, key, typed, u"typing"_s));
    QCOMPARE(d.undoStack()->count(), 1); // three keystrokes, one undo step
    QCOMPARE(itemAt(d, 0, 1).label, u"Gar"_s);
    d.undoStack()->undo();
    QCOMPARE(itemAt(d, 0, 1).label, original);
    d.undoStack()->redo();
    QCOMPARE(itemAt(d, 0, 1).label, u"Gar"_s);
}

void TestEdit::mergeBackToStartIsObsolete() {
    Document d;
    d.reset(garden(), {});
    const AttributeKey key = AttributeKey::ofItem(0, 1, Field::ItemNotes);
    d.push(SetAttributeCommand::typing(&d, key, u"x"_s, u"typing"_s));
    d.push(SetAttributeCommand::typing(&d, key, QString(), u"typing"_s)); // back to empty
    QCOMPARE(d.undoStack()->count(), 0); // the net change is nothing
    QVERIFY(!d.isModified());
}

void TestEdit::namesDoNotMerge() {
    Document d;
    d.reset(garden(), {});
    const AttributeKey key = AttributeKey::ofItem(0, 3, Field::ItemName);
    // Even typed, names never merge (each rename is its own decision).
    d.push(SetAttributeCommand::typing(&d, key, u"a"_s, u"n"_s));
    d.push(SetAttributeCommand::typing(&d, key, u"b"_s, u"n"_s));
    QCOMPARE(d.undoStack()->count(), 2);
    // Discrete edits of a typed field do not merge either.
    const AttributeKey label = AttributeKey::ofItem(0, 3, Field::ItemLabel);
    d.push(new SetAttributeCommand(&d, label, u"x"_s, u"l"_s));
    d.push(new SetAttributeCommand(&d, label, u"y"_s, u"l"_s));
    QCOMPARE(d.undoStack()->count(), 4);
}

void TestEdit::eventsBracketChanges() {
    Document d;
    d.reset(garden(), {});
    QList<QString> log;
    connect(&d, &Document::aboutToChange, this, [&](const ChangeEvent& e) {
        log.append(
            u"about %1 items=%2"_s.arg(int(e.kind)).arg(d.instrument().modules[0].items.size()));
    });
    connect(&d, &Document::changed, this, [&](const ChangeEvent& e) {
        log.append(
            u"done %1 items=%2"_s.arg(int(e.kind)).arg(d.instrument().modules[0].items.size()));
    });
    Item intro;
    intro.name = u"intro"_s;
    d.push(ItemCommand::insert(&d, 0, 0, intro));
    const int inserted = int(ChangeEvent::Kind::ItemInserted);
    // Four items before the change, five after.
    QCOMPARE(log, (QList<QString>{u"about %1 items=4"_s.arg(inserted),
                                  u"done %1 items=5"_s.arg(inserted)}));
}

void TestEdit::insertRemoveItem() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    Item extra;
    extra.name = u"shed"_s;
    extra.type = ItemType::Statement;
    d.push(ItemCommand::insert(&d, 1, 1, extra));
    QCOMPARE(itemAt(d, 1, 1).name, u"shed"_s);
    d.push(ItemCommand::remove(&d, 0, 0)); // the removed item is owned by the command
    QCOMPARE(itemAt(d, 0, 0).name, u"garden_size"_s);
    roundTrip(d, before, d.instrument());
}

void TestEdit::insertRemoveModuleAndList() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    d.push(ModuleCommand::insert(&d, 2, Module{u"closing"_s, u"Thanks"_s, {}, {}}));
    d.push(CodeListCommand::insert(&d, 0, CodeList{u"scale"_s, {{1, u"Low"_s}}}));
    d.push(ModuleCommand::remove(&d, 0));
    d.push(CodeListCommand::remove(&d, 2));
    QCOMPARE(d.instrument().modules.size(), 2);
    QCOMPARE(d.instrument().modules.at(0).name, u"tools"_s);
    QCOMPARE(d.instrument().codeLists.size(), 2);
    QCOMPARE(d.instrument().codeLists.at(0).name, u"scale"_s);
    roundTrip(d, before, d.instrument());
}

void TestEdit::moveItemAcrossModules() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    d.push(new MoveItemCommand(&d, 0, 3, 1, 1)); // food_kind after owns_mower
    QCOMPARE(d.instrument().modules.at(0).items.size(), 3);
    QCOMPARE(itemAt(d, 1, 1).name, u"food_kind"_s);
    d.push(new MoveModuleCommand(&d, 1, 0));
    QCOMPARE(d.instrument().modules.at(0).name, u"tools"_s);
    roundTrip(d, before, d.instrument());
}

void TestEdit::renameRewritesConditionsAndGotos() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    CascadeReport report;
    d.push(renameItemCommand(&d, 0, 0, u"garden_owner"_s, &report));
    QCOMPARE(d.undoStack()->count(), 1);
    QCOMPARE(itemAt(d, 0, 0).name, u"garden_owner"_s);
    // has_garden is read by: its own rule, garden_size's when_skipped.if and
    // owns_mower's ask_if (which does not parse): two rewritten, one left.
    QVERIFY(sameCondition(*itemAt(d, 0, 0).routing.at(0).condition, u"garden_owner in (2, 9)"_s));
    QVERIFY(sameCondition(*itemAt(d, 0, 1).whenSkipped->condition, u"garden_owner = 2"_s));
    QCOMPARE(*itemAt(d, 1, 0).askIf, u"has_garden = 1 and ("_s);
    QCOMPARE(report.conditionsRewritten, 2);
    QCOMPARE(report.leftAsWritten, QStringList{u"owns_mower: ask_if"_s});
    // The test respondent's answers and path name it too.
    const TestRespondent& r = d.instrument().testRespondents.at(0);
    QCOMPARE(r.answers.at(0).item, u"garden_owner"_s);
    QCOMPARE(r.path, QStringList{u"garden_owner"_s});
    QCOMPARE(report.respondentsRewritten, 1);
    roundTrip(d, before, d.instrument());
}

void TestEdit::renameLeavesUnparsableConditions() {
    Document d;
    d.reset(garden(), {});
    d.push(renameItemCommand(&d, 0, 2, u"food"_s));
    QVERIFY(sameCondition(*itemAt(d, 0, 2).routing.at(0).condition, u"food <> 1"_s));
    QCOMPARE(*itemAt(d, 1, 0).askIf, u"has_garden = 1 and ("_s);
}

void TestEdit::renameModuleRewritesGotos() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    CascadeReport report;
    d.push(renameModuleCommand(&d, 1, u"equipment"_s, &report));
    QCOMPARE(itemAt(d, 0, 0).routing.at(0).target, u"equipment"_s);
    QCOMPARE(itemAt(d, 0, 2).routing.at(0).target, u"equipment"_s);
    QCOMPARE(report.targetsRewritten, 2);
    QCOMPARE(d.undoStack()->count(), 1);
    roundTrip(d, before, d.instrument());
}

void TestEdit::deleteItemDropsRulesToIt() {
    Instrument start = garden();
    start.modules[0].items[0].routing.append({std::nullopt, u"FOOD_KIND"_s}); // any case
    Document d;
    d.reset(start, {});
    d.push(deleteItemCommand(&d, 0, 3));
    QCOMPARE(d.undoStack()->count(), 1);
    QCOMPARE(d.instrument().modules.at(0).items.size(), 3);
    QCOMPARE(itemAt(d, 0, 0).routing.size(), 1); // the goto to tools stays
    QCOMPARE(itemAt(d, 0, 0).routing.at(0).target, u"tools"_s);
    roundTrip(d, start, d.instrument());
}

void TestEdit::deleteCodeListKeepsCodesInline() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    const QList<Code> yesNo = d.instrument().codeLists.at(0).codes;
    d.push(deleteCodeListCommand(&d, 0));
    QCOMPARE(d.instrument().codeLists.size(), 1);
    for (auto [m, i] : {std::pair{0, 0}, {0, 2}, {1, 0}}) {
        QVERIFY(itemAt(d, m, i).hasInlineCodes);
        QCOMPARE(itemAt(d, m, i).inlineCodes, yesNo);
    }
    // Still loads after a save (no item names a list that is gone).
    QVERIFY(loadYamlText(saveYamlText(d.instrument()), u"x.yaml"_s).ok());
    roundTrip(d, before, d.instrument());
}

void TestEdit::renameCodeList() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    d.push(renameCodeListCommand(&d, 0, u"agree"_s));
    QCOMPARE(itemAt(d, 0, 0).codeListName, u"agree"_s);
    QCOMPARE(itemAt(d, 1, 0).codeListName, u"agree"_s);
    QVERIFY(loadYamlText(saveYamlText(d.instrument()), u"x.yaml"_s).ok());
    roundTrip(d, before, d.instrument());
}

void TestEdit::recodeRewritesEqualityOnly() {
    Document d;
    d.reset(garden(), {});
    const Instrument before = d.instrument();
    CascadeReport report;
    // yes_no: 2 "No" becomes 3. Users: has_garden, grows_food, owns_mower.
    d.push(recodeCommand(&d, CodeLocation::shared(0), 1, 3, &report));
    QCOMPARE(d.instrument().codeLists.at(0).codes.at(1).code, 3);
    QVERIFY(sameCondition(*itemAt(d, 0, 0).routing.at(0).condition, u"has_garden in (3, 9)"_s));
    QVERIFY(sameCondition(*itemAt(d, 0, 1).whenSkipped->condition, u"has_garden = 3"_s));
    // `grows_food <> 1` does not hold 2: untouched.
    QCOMPARE(*itemAt(d, 0, 2).routing.at(0).condition, u"grows_food <> 1"_s);
    QCOMPARE(d.instrument().testRespondents.at(0).answers.at(0).value.text, u"3"_s);
    QCOMPARE(report.conditionsRewritten, 2);
    roundTrip(d, before, d.instrument());
}

void TestEdit::rewriteKeepsUntouchedText() {
    // Spacing as written survives when the name is not read.
    const ConditionRewrite r = renameInCondition(u"a   =  1"_s, u"b"_s, u"c"_s);
    QVERIFY(!r.changed);
    QCOMPARE(r.text, u"a   =  1"_s);
    // Names match ignoring case; other atoms keep their names.
    const ConditionRewrite s =
        renameInCondition(u"A = 1 or (b > 2 and asked(a))"_s, u"a"_s, u"z"_s);
    QVERIFY(s.changed);
    QVERIFY(sameCondition(s.text, u"z = 1 or (b > 2 and asked(z))"_s));
    // Ranges and orderings holding the old code are reported, not moved.
    const ConditionRewrite t = recodeInCondition(u"q in (1..3) or q < 2"_s, {u"q"_s}, 2, 7);
    QVERIFY(!t.changed);
    QVERIFY(t.rangeTouched);
}

void TestEdit::trialRunThroughSkip() {
    TrialRun run(garden());
    QCOMPARE(run.currentItem()->name, u"has_garden"_s);
    QVERIFY(run.answer(number(2)).isEmpty()); // no garden: goto tools
    // owns_mower's ask_if does not parse, so it always passes (DESIGN.md).
    QCOMPARE(run.currentItem()->name, u"owns_mower"_s);
    QVERIFY(run.answer(number(1)).isEmpty());
    QVERIFY(run.finished());
    QVERIFY(!run.looped());
    QCOMPARE(run.path(), (QStringList{u"has_garden"_s, u"owns_mower"_s}));
}

void TestEdit::trialRunStepsBack() {
    TrialRun run(garden());
    run.answer(number(1));
    run.answer(number(25));
    run.answer(number(2)); // grows_food <> 1: goto tools
    QCOMPARE(run.currentItem()->name, u"owns_mower"_s);
    run.back();
    QCOMPARE(run.currentItem()->name, u"grows_food"_s);
    run.answer(number(1)); // now food_kind is next
    QCOMPARE(run.currentItem()->name, u"food_kind"_s);
    run.back();
    run.back();
    run.back();
    QCOMPARE(run.currentItem()->name, u"has_garden"_s);
    QVERIFY(!run.canGoBack());
}

void TestEdit::trialRunMatchesSimulator() {
    const Instrument instrument = garden();
    TrialRun run(instrument);
    for (int v : {1, 40, 1, 2, 2})
        QVERIFY(run.answer(number(v)).isEmpty());
    QVERIFY(run.finished());
    const TestRespondent respondent = run.toTestRespondent(u"gardener"_s);
    // Hand-reasoned: all five items presented in order.
    const QStringList expected{u"has_garden"_s, u"garden_size"_s, u"grows_food"_s, u"food_kind"_s,
                               u"owns_mower"_s};
    QCOMPARE(respondent.path, expected);
    QCOMPARE(respondent.answers.size(), 5);
    // The reference simulator replays the stored answers to the same path.
    const CompiledRouting routing(instrument);
    const ReplayResult replay = replayAnswers(routing, answersByLowerName(respondent.answers));
    QVERIFY(replay.error.isEmpty());
    QStringList replayed;
    for (int p : replay.route.path)
        replayed.append(routing.index().at(p).item->name);
    QCOMPARE(replayed, expected);
}

void TestEdit::trialRunRejectsBadAnswer() {
    TrialRun run(garden());
    QVERIFY(!run.answer(number(5)).isEmpty()); // 5 is not a yes_no code
    QCOMPARE(run.currentItem()->name, u"has_garden"_s);
    run.answer(number(1));
    QVERIFY(!run.answer(number(20000)).isEmpty()); // outside [1, 10000]
    QCOMPARE(run.currentItem()->name, u"garden_size"_s);
}

void TestEdit::analysisRunsInBackground() {
    Document d;
    d.reset(garden(), {});
    AnalysisRunner runner(&d);
    QSignalSpy analysed(&runner, &AnalysisRunner::analysed);
    runner.runNow();
    QVERIFY(analysed.wait(10000));
    auto hasSyntax = [&] {
        for (const Finding& f : runner.latest().findings)
            if (f.check == u"syntax"_s && f.item == u"owns_mower"_s)
                return true;
        return false;
    };
    QVERIFY(hasSyntax()); // "has_garden = 1 and (" does not parse
    QCOMPARE(runner.latest().marks.size(), 5);
    // garden_size is presented only when has_garden = 1: conditional.
    QCOMPARE(runner.latest().marks.at(1).asked, ItemUniverse::Asked::Conditional);
    QCOMPARE(runner.latest().marks.at(0).asked, ItemUniverse::Asked::Always);
    // The live findings are exactly those of `check`.
    auto ids = [](const Findings& findings) {
        QStringList out;
        for (const Finding& f : findings)
            out.append(f.id());
        return out;
    };
    QCOMPARE(ids(runner.latest().findings), ids(checkInstrument(CompiledRouting(d.instrument()))));
    // Fix the condition: the finding goes away; two quick edits give one result
    // for the final revision (the first is coalesced or dropped as stale).
    analysed.clear();
    d.push(new SetAttributeCommand(&d, AttributeKey::ofItem(1, 0, Field::ItemAskIf),
                                   std::optional<QString>(u"has_garden = 1 and"_s), u"e"_s));
    d.push(new SetAttributeCommand(&d, AttributeKey::ofItem(1, 0, Field::ItemAskIf),
                                   std::optional<QString>(u"has_garden = 1"_s), u"e"_s));
    QVERIFY(analysed.wait(10000));
    QCOMPARE(runner.latest().revision, d.revision());
    QVERIFY(!hasSyntax());
}

void TestEdit::modifiedFollowsCleanState() {
    Document d;
    QSignalSpy modified(&d, &Document::modifiedChanged);
    d.reset(garden(), u"/tmp/garden.yaml"_s);
    QVERIFY(!d.isModified());
    d.push(new SetAttributeCommand(&d, AttributeKey::instrument(Field::InstrumentTitle), u"T"_s,
                                   u"t"_s));
    QVERIFY(d.isModified());
    d.markSaved();
    QVERIFY(!d.isModified());
    d.undoStack()->undo();
    QVERIFY(d.isModified()); // undoing past the save point is a change again
    // modified, saved, modified again: exactly three transitions.
    QCOMPARE(modified.count(), 3);
}

QTEST_GUILESS_MAIN(TestEdit)
#include "tst_edit.moc"
