// The editor driven through its real widgets on the offscreen platform:
// building an instrument from an empty project, findings that appear and
// disappear, undo/redo of every step, save and reopen, the trial run through a
// skip, jumping from a finding to its field, the condition field's live parse
// error, closing with unsaved changes, and (on request) screenshots.
#include "CodeListPanel.h"
#include "CodeTableModel.h"
#include "ConditionField.h"
#include "EditorWindow.h"
#include "FileExports.h"
#include "FindingsModel.h"
#include "ItemForm.h"
#include "OutlineModel.h"
#include "RulesModel.h"
#include "RulesPanel.h"
#include "TrialRunPanel.h"
#include "edit/AnalysisRunner.h"
#include "edit/Document.h"
#include "storage/InstrumentFile.h"
#include "storage/YamlFormat.h"

#include <QAction>
#include <QApplication>
#include <QComboBox>
#include <QDir>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QMimeData>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTableView>
#include <QTemporaryDir>
#include <QTest>
#include <QTreeView>

using namespace Qt::StringLiterals;
using namespace rb;

namespace {

// Written by hand: what the steps of buildFromEmpty() must produce.
const char* const kExpected = R"yaml(routebook: 1
instrument: {title: Untitled instrument, version: "0.1", language: en}
code_lists:
  yes_no:
    - {code: 1, label: "Yes"}
    - {code: 2, label: "No"}
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
          - {if: "has_garden = 2", goto: END}
      - name: garden_size
        text: How large is it?
        type: integer
        range: [1, 10000]
)yaml";

Instrument expectedInstrument() {
    LoadResult loaded = loadYamlText(QByteArray(kExpected), u"expected.yaml"_s);
    if (!loaded.ok())
        qFatal("expected YAML does not load: %s", qPrintable(formatDiagnostics(loaded.errors)));
    return *loaded.instrument;
}

bool analysisCurrent(EditorWindow& w) {
    return !w.analysisRunner()->isBusy() &&
           w.analysisRunner()->latest().revision == w.document()->revision();
}

bool hasFinding(EditorWindow& w, const QString& check, const QString& where) {
    for (const Finding& f : w.findingsModel()->findings())
        if (f.check == check && (f.item == where || f.module == where || f.subject == where))
            return true;
    return false;
}

QAction* action(EditorWindow& w, const char* name) {
    QAction* a = w.findChild<QAction*>(QLatin1String(name));
    if (!a)
        qFatal("no action %s", name);
    return a;
}

QPushButton* button(QWidget* panel, const QString& text) {
    for (QPushButton* b : panel->findChildren<QPushButton*>())
        if (b->text() == text)
            return b;
    qFatal("no button %s", qPrintable(text));
    return nullptr;
}

// Replaces a line edit's text by typing, then ends the edit with Enter.
void retype(QLineEdit* edit, const QString& text) {
    edit->setFocus();
    edit->selectAll();
    QTest::keyClicks(edit, text);
    QTest::keyClick(edit, Qt::Key_Return);
}

void typeInto(QPlainTextEdit* edit, const QString& text) {
    edit->setFocus();
    edit->selectAll();
    QTest::keyClicks(edit, text);
}

void selectRow(EditorWindow& w, const QString& name) {
    w.outlineView()->setCurrentIndex(w.outlineModel()->indexOfName(name));
}

#define WAIT_ANALYSIS(w) QTRY_VERIFY_WITH_TIMEOUT(analysisCurrent(w), 10000)

} // namespace

class TestGui : public QObject {
    Q_OBJECT
private slots:
    void initTestCase();
    void buildFromEmpty();
    void trialRunThroughSkip();
    void findingJumpsToField();
    void conditionFieldShowsParseError();
    void renameFromFormRewritesConditions();
    void dragReordersItems();
    void closingAsksAboutUnsavedChanges();
    void screenshots();

private:
    // The window after buildFromEmpty's steps (shared by later tests).
    void build(EditorWindow& w);
    QTemporaryDir m_dir;
};

void TestGui::initTestCase() {
    QStandardPaths::setTestModeEnabled(true); // QSettings (recent files) go to a test place
    QVERIFY(m_dir.isValid());
}

void TestGui::build(EditorWindow& w) {
    // A module: the instrument has no items yet, so the module is empty.
    action(w, "actionAddModule")->trigger();
    WAIT_ANALYSIS(w);
    QVERIFY(hasFinding(w, u"empty-module"_s, u"module_1"_s));
    retype(w.itemForm()->moduleNameEdit(), u"garden"_s);
    w.itemForm()->moduleTitleEdit()->setFocus();
    QTest::keyClicks(w.itemForm()->moduleTitleEdit(), u"The garden"_s);

    // A shared code list with two codes, renamed through its list entry.
    CodeListPanel* lists = w.codeListPanel();
    button(lists, u"Add list"_s)->click();
    lists->lists()->item(0)->setText(u"yes_no"_s); // what the inline editor commits
    WAIT_ANALYSIS(w);
    QVERIFY(hasFinding(w, u"empty-code-list"_s, u"yes_no"_s));
    button(lists, u"Add code"_s)->click();
    button(lists, u"Add code"_s)->click();
    CodeTableModel* codes = lists->codesModel();
    QCOMPARE(codes->rowCount(), 2);
    codes->setData(codes->index(0, CodeTableModel::LabelColumn), u"Yes"_s);
    codes->setData(codes->index(1, CodeTableModel::LabelColumn), u"No"_s);
    WAIT_ANALYSIS(w);
    QVERIFY(!hasFinding(w, u"empty-code-list"_s, u"yes_no"_s));
    QVERIFY(hasFinding(w, u"unused-code-list"_s, u"yes_no"_s));

    // The first item: it has no codes until the shared list is chosen.
    selectRow(w, u"garden"_s);
    action(w, "actionAddItem")->trigger();
    WAIT_ANALYSIS(w);
    QVERIFY(!hasFinding(w, u"empty-module"_s, u"garden"_s));
    ItemForm* form = w.itemForm();
    retype(form->nameEdit(), u"has_garden"_s);
    WAIT_ANALYSIS(w);
    QVERIFY(hasFinding(w, u"empty-code-list"_s, u"has_garden"_s));
    retype(form->labelEdit(), u"Has a garden"_s);
    typeInto(form->textEdit(), u"Do you have a garden?"_s);
    form->codeSourceBox()->setFocus();
    QTest::keyClick(form->codeSourceBox(), Qt::Key_Down); // (its own codes) -> yes_no
    QCOMPARE(form->codeSourceBox()->currentText(), u"yes_no"_s);
    WAIT_ANALYSIS(w);
    QVERIFY(!hasFinding(w, u"empty-code-list"_s, u"has_garden"_s));
    QVERIFY(!hasFinding(w, u"unused-code-list"_s, u"yes_no"_s));

    // The second item, a number with a range.
    action(w, "actionAddItem")->trigger();
    retype(form->nameEdit(), u"garden_size"_s);
    typeInto(form->textEdit(), u"How large is it?"_s);
    form->typeBox()->setFocus();
    QTest::keyClick(form->typeBox(), Qt::Key_Down); // single -> multi
    QTest::keyClick(form->typeBox(), Qt::Key_Down); // multi -> integer
    QCOMPARE(form->typeBox()->currentText(), u"integer"_s);
    retype(form->findChild<QLineEdit*>(u"rangeMin"_s), u"1"_s);
    retype(form->findChild<QLineEdit*>(u"rangeMax"_s), u"10000"_s);

    // A rule on has_garden. The first target offered is the next item: a
    // redundant goto; a code that is not in the list: an unknown code.
    selectRow(w, u"has_garden"_s);
    RulesPanel* rules = w.rulesPanel();
    rules->addButton()->click();
    QCOMPARE(rules->model()->rowCount(), 1);
    WAIT_ANALYSIS(w);
    QVERIFY(hasFinding(w, u"redundant-goto"_s, u"has_garden"_s));
    rules->conditionField()->editor()->setFocus();
    QTest::keyClicks(rules->conditionField()->editor(), u"has_garden = 5"_s);
    WAIT_ANALYSIS(w);
    QVERIFY(hasFinding(w, u"unknown-code"_s, u"has_garden"_s));
    QTest::keyClick(rules->conditionField()->editor(), Qt::Key_Backspace);
    QTest::keyClicks(rules->conditionField()->editor(), u"2"_s);
    rules->targetBox()->setFocus();
    rules->targetBox()->lineEdit()->selectAll();
    QTest::keyClicks(rules->targetBox()->lineEdit(), u"END"_s);
    WAIT_ANALYSIS(w);
    QVERIFY(!hasFinding(w, u"unknown-code"_s, u"has_garden"_s));
    QVERIFY(!hasFinding(w, u"redundant-goto"_s, u"has_garden"_s));
}

void TestGui::buildFromEmpty() {
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    w.show();
    QVERIFY(QTest::qWaitForWindowExposed(&w));
    const Instrument empty = w.document()->instrument();
    QVERIFY(empty.modules.isEmpty());
    build(w);
    const Instrument expected = expectedInstrument();
    // The canonical text first (a readable difference), then the values.
    QCOMPARE(saveYamlText(w.document()->instrument()), saveYamlText(expected));
    QCOMPARE(w.document()->instrument(), expected);
    QVERIFY(w.isWindowModified());

    // Undo every step back to empty, then redo every step.
    QUndoStack* stack = w.document()->undoStack();
    const int steps = stack->count();
    // Counted by hand from build(): add module, rename it, title (typing: 1),
    // add list, rename it, add code x2, two labels, add item, rename, label
    // (typing), text (typing), code source, add item, rename, text (typing),
    // type twice (two key presses), range min, range max, add rule, and the
    // rule typed (condition and target, one merged typing step) = 23.
    QCOMPARE(steps, 23);
    QAction* undo = action(w, "actionUndo");
    QAction* redo = action(w, "actionRedo");
    for (int i = 0; i < steps; ++i) {
        QVERIFY(undo->isEnabled());
        undo->trigger();
    }
    QVERIFY(!undo->isEnabled());
    QCOMPARE(w.document()->instrument(), empty);
    QCOMPARE(w.outlineModel()->rowCount(), 0);
    WAIT_ANALYSIS(w);
    QCOMPARE(w.findingsModel()->rowCount(), 0); // an empty instrument has nothing to report
    QVERIFY(!w.isWindowModified());
    for (int i = 0; i < steps; ++i)
        redo->trigger();
    QVERIFY(!redo->isEnabled());
    QCOMPARE(w.document()->instrument(), expected);
    QCOMPARE(w.outlineModel()->rowCount(w.outlineModel()->moduleIndex(0)), 2);

    // Save as YAML and as a project; both reopen to the expected instrument.
    for (const QString& name : {u"built.yaml"_s, u"built.routebook"_s}) {
        const QString path = m_dir.filePath(name);
        QVERIFY(w.saveTo(path));
        QVERIFY(!w.isWindowModified());
        QVERIFY(w.windowTitle().startsWith(name));
        EditorWindow reopened;
        // `w` still holds the file: the second window says so and opens it read-only.
        QStringList messages;
        reopened.fileExports()->setErrorReporter(
            [&](const QString&, const QString& message) { messages.append(message); });
        QVERIFY(reopened.openFile(path));
        QCOMPARE(messages.size(), 1);
        QVERIFY(reopened.isReadOnly());
        QCOMPARE(reopened.document()->instrument(), expected);
        QCOMPARE(reopened.outlineModel()->rowCount(), 1);
    }
    // The YAML on disk is canonical: saving what was loaded gives the same bytes.
    QFile saved(m_dir.filePath(u"built.yaml"_s));
    QVERIFY(saved.open(QIODevice::ReadOnly));
    QCOMPARE(saved.readAll(), saveYamlText(expected));
}

void TestGui::trialRunThroughSkip() {
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    w.show();
    build(w);
    TrialRunPanel* trial = w.trialRunPanel();
    trial->restart();
    // has_garden = 2 goes to END, skipping garden_size.
    QCOMPARE(trial->run()->currentItem()->name, u"has_garden"_s);
    QCOMPARE(trial->questionLabel()->text(), u"Do you have a garden?"_s);
    QComboBox* codes = trial->codeBox();
    QCOMPARE(codes->count(), 2);
    codes->setCurrentIndex(1); // "2  No"
    trial->answerButton()->click();
    QVERIFY(trial->run()->finished());
    QCOMPARE(trial->pathList()->count(), 1);
    // Step back and take the other branch.
    button(trial, u"Step &back"_s)->click();
    QCOMPARE(trial->run()->currentItem()->name, u"has_garden"_s);
    codes->setCurrentIndex(0); // "1  Yes"
    trial->answerButton()->click();
    QCOMPARE(trial->run()->currentItem()->name, u"garden_size"_s);
    QLineEdit* value = trial->findChild<QLineEdit*>(u"trialValue"_s);
    QTest::keyClicks(value, u"20000"_s); // outside [1, 10000]
    trial->answerButton()->click();
    QCOMPARE(trial->run()->currentItem()->name, u"garden_size"_s);
    value->clear();
    QTest::keyClicks(value, u"25"_s);
    QTest::keyClick(value, Qt::Key_Return);
    QVERIFY(trial->run()->finished());
    QCOMPARE(trial->run()->path(), (QStringList{u"has_garden"_s, u"garden_size"_s}));
    // Stored as a test respondent; `check` replays it without complaint.
    QTest::keyClicks(trial->findChild<QLineEdit*>(u"respondentName"_s), u"gardener"_s);
    button(trial, u"Save as test respondent"_s)->click();
    const QList<TestRespondent>& stored = w.document()->instrument().testRespondents;
    QCOMPARE(stored.size(), 1);
    QCOMPARE(stored.at(0).path, (QStringList{u"has_garden"_s, u"garden_size"_s}));
    WAIT_ANALYSIS(w);
    QVERIFY(!hasFinding(w, u"test-respondent-fails"_s, u"gardener"_s));
    // Change the routing under it: the stored path no longer holds.
    w.document()->undoStack()->undo(); // drop the respondent...
    QVERIFY(w.document()->instrument().testRespondents.isEmpty());
    w.document()->undoStack()->redo(); // ...and bring it back
    QCOMPARE(w.document()->instrument().testRespondents.size(), 1);
}

void TestGui::findingJumpsToField() {
    const QString path = m_dir.filePath(u"broken.yaml"_s);
    QFile file(path);
    QVERIFY(file.open(QIODevice::WriteOnly));
    file.write(R"yaml(routebook: 1
instrument: {title: Sheds, version: "1", language: en}
modules:
  - name: shed
    items:
      - name: has_shed
        text: Is there a shed?
        type: single
        codes:
          - {code: 1, label: "Yes"}
          - {code: 2, label: "No"}
      - name: shed_size
        text: How big is the shed?
        type: integer
        ask_if: "has_shed = = 1"
)yaml");
    file.close();
    EditorWindow w;
    w.show();
    QVERIFY(QTest::qWaitForWindowExposed(&w));
    QVERIFY(w.openFile(path));
    WAIT_ANALYSIS(w);
    int row = -1;
    for (int r = 0; r < w.findingsModel()->rowCount(); ++r)
        if (w.findingsModel()->findingAt(r).check == u"syntax"_s)
            row = r;
    QVERIFY(row >= 0);
    const Finding finding = w.findingsModel()->findingAt(row);
    QCOMPARE(finding.item, u"shed_size"_s);
    QCOMPARE(finding.field, u"ask_if"_s);
    QCOMPARE(finding.column.value_or(0), 12); // the second "=" (by hand: h=1 ... space=11, '='=12)
    // Keyboard: select the finding and press Enter (activation, as a double-click).
    QTableView* view = w.findingsView();
    view->setFocus();
    view->setCurrentIndex(w.findingsModel()->index(row, 0));
    QTest::keyClick(view, Qt::Key_Return);
    const QModelIndex current = w.outlineView()->currentIndex();
    QCOMPARE(w.outlineModel()->data(current).toString(), u"shed_size"_s);
    QPlainTextEdit* askIf = w.itemForm()->askIfField()->editor();
    QTRY_VERIFY(askIf->hasFocus());
    QCOMPARE(askIf->textCursor().position(), 11); // before column 12
}

void TestGui::conditionFieldShowsParseError() {
    ConditionField field;
    field.show();
    QTest::keyClicks(field.editor(), u"a = "_s);
    // The condition ends after "a = " (4 characters): the error is at column 5.
    QVERIFY2(field.errorText().startsWith(u"Column 5:"_s), qPrintable(field.errorText()));
    QTest::keyClicks(field.editor(), u"1"_s);
    QCOMPARE(field.errorText(), QString());
}

void TestGui::renameFromFormRewritesConditions() {
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    w.show();
    build(w);
    const int before = w.document()->undoStack()->count();
    selectRow(w, u"has_garden"_s);
    retype(w.itemForm()->nameEdit(), u"owns_garden"_s);
    QCOMPARE(w.document()->undoStack()->count(), before + 1); // one step
    const Item& item = w.document()->instrument().modules.at(0).items.at(0);
    QCOMPARE(item.name, u"owns_garden"_s);
    QCOMPARE(item.routing.at(0).condition.value_or(QString()), u"owns_garden = 2"_s);
    action(w, "actionUndo")->trigger();
    QCOMPARE(w.document()->instrument().modules.at(0).items.at(0).routing.at(0).condition,
             std::optional<QString>(u"has_garden = 2"_s));
}

void TestGui::dragReordersItems() {
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    build(w);
    OutlineModel* model = w.outlineModel();
    const QModelIndex garden = model->moduleIndex(0);
    // Drag garden_size (row 1) onto row 0 of the module: it becomes first.
    std::unique_ptr<QMimeData> data(model->mimeData({model->itemIndex(0, 1)}));
    QVERIFY(model->dropMimeData(data.get(), Qt::MoveAction, 0, 0, garden));
    QCOMPARE(model->data(model->itemIndex(0, 0)).toString(), u"garden_size"_s);
    QCOMPARE(model->data(model->itemIndex(0, 1)).toString(), u"has_garden"_s);
    action(w, "actionUndo")->trigger();
    QCOMPARE(model->data(model->itemIndex(0, 0)).toString(), u"has_garden"_s);
}

void TestGui::closingAsksAboutUnsavedChanges() {
    EditorWindow w;
    int asked = 0;
    QMessageBox::StandardButton answer = QMessageBox::Cancel;
    w.setSaveQuestion([&] {
        ++asked;
        return answer;
    });
    w.show();
    QVERIFY(w.close()); // nothing changed: no question
    QCOMPARE(asked, 0);
    w.show();
    action(w, "actionAddModule")->trigger();
    QVERIFY(w.windowTitle().contains(u"[*]"_s));
    QVERIFY(w.isWindowModified());
    QVERIFY(!w.close()); // Cancel keeps the window
    QCOMPARE(asked, 1);
    answer = QMessageBox::Discard;
    QVERIFY(w.close());
    QCOMPARE(asked, 2);
}

void TestGui::screenshots() {
    if (qEnvironmentVariable("ROUTEBOOK_SCREENSHOTS") != u"1")
        QSKIP("set ROUTEBOOK_SCREENSHOTS=1 to render resources/screenshots/");
    const QString sample = QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/household-energy.yaml");
    if (!QFile::exists(sample))
        QSKIP("sample_projects/household-energy.yaml is not there yet");
    const QString out = QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/../resources/screenshots");
    QVERIFY(QDir().mkpath(out));
    for (bool dark : {false, true}) {
        EditorWindow w;
        w.setDarkPalette(dark);
        w.resize(1440, 900);
        w.show();
        QVERIFY(QTest::qWaitForWindowExposed(&w));
        QVERIFY(w.openFile(sample));
        WAIT_ANALYSIS(w);
        // Show a conditional item: the second item of the first module.
        const QModelIndex item = w.outlineModel()->itemIndex(0, 1);
        if (item.isValid())
            w.outlineView()->setCurrentIndex(item);
        QTest::qWait(400); // the preview refresh is coalesced
        // The route map is drawn a little after the findings.
        QTRY_VERIFY_WITH_TIMEOUT(w.routeMapRevision() == w.document()->revision(), 10000);
        const QString file = out + (dark ? u"/main-window-dark.png"_s : u"/main-window.png"_s);
        QVERIFY(w.grab().save(file));
        w.setDarkPalette(false);
    }
}

int main(int argc, char** argv) {
    if (qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM"))
        qputenv("QT_QPA_PLATFORM", "offscreen");
    QApplication app(argc, argv);
    QApplication::setOrganizationName(QStringLiteral("RoutebookTests"));
    QApplication::setApplicationName(QStringLiteral("tst_gui"));
    TestGui test;
    return QTest::qExec(&test, argc, argv);
}

#include "tst_gui.moc"
