// The editor's window-level wiring on the offscreen platform: the route-map
// dock shares its selection with the outline and follows edits; File > Export
// writes every dictionary format and the route map with the same bytes as the
// command line's model functions; a second editor on the same project is
// read-only; a file changed on disk is not overwritten unasked; hostile text
// shows as text in every panel.
#include "ConditionField.h"
#include "EditorWindow.h"
#include "FileExports.h"
#include "FindingsModel.h"
#include "ItemForm.h"
#include "OutlineModel.h"
#include "PreviewPanel.h"
#include "TrialRunPanel.h"
#include "dictionary/DictionaryExport.h"
#include "edit/AnalysisRunner.h"
#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"
#include "export/SvgExport.h"
#include "routemap/RouteMapItems.h"
#include "routemap/RouteMapScene.h"
#include "routemap/RouteMapView.h"
#include "routing/CompiledRouting.h"
#include "storage/InstrumentFile.h"
#include "storage/YamlFormat.h"

#include <QAction>
#include <QApplication>
#include <QComboBox>
#include <QDockWidget>
#include <QFile>
#include <QImage>
#include <QLabel>
#include <QLineEdit>
#include <QPlainTextEdit>
#include <QSignalSpy>
#include <QSpinBox>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QTextBlock>
#include <QTextBrowser>
#include <QTextDocument>
#include <QTreeView>
#include <QXmlStreamReader>

using namespace Qt::StringLiterals;
using namespace rb;

namespace {

// tests/dictionary/garden.yaml, by hand: module garden holds has_garden (flat
// position 0), beds (1), water_how (2), rain_barrel (3); module weather holds
// rain_days (4) and thanks (5).
const QString kGarden = QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/dictionary/garden.yaml");

bool analysisCurrent(EditorWindow& w) {
    return !w.analysisRunner()->isBusy() &&
           w.analysisRunner()->latest().revision == w.document()->revision();
}

bool mapCurrent(EditorWindow& w) {
    return analysisCurrent(w) && w.routeMapRevision() == w.document()->revision();
}

QAction* action(EditorWindow& w, const QString& name) {
    QAction* a = w.findChild<QAction*>(name);
    if (!a)
        qFatal("no action %s", qPrintable(name));
    return a;
}

QByteArray readAll(const QString& path) {
    QFile file(path);
    return file.open(QIODevice::ReadOnly) ? file.readAll() : QByteArray();
}

// Opens the garden instrument in a shown window with the map dock raised.
void openGarden(EditorWindow& w) {
    w.resize(1200, 800);
    w.show();
    QVERIFY(QTest::qWaitForWindowExposed(&w));
    QVERIFY(w.openFile(kGarden));
    w.routeMapDock()->raise();
    QTRY_VERIFY_WITH_TIMEOUT(mapCurrent(w), 10000);
}

// A copy of the garden instrument as a .routebook project in `dir`.
QString gardenProject(const QTemporaryDir& dir, const QString& name) {
    const QString path = dir.filePath(name);
    LoadResult garden = loadYamlFile(kGarden);
    if (!garden.ok() || saveInstrumentFile(*garden.instrument, path))
        qFatal("cannot write %s", qPrintable(path));
    return path;
}

void setItemLabel(EditorWindow& w, int module, int item, const QString& label) {
    w.document()->push(new SetAttributeCommand(
        w.document(), AttributeKey::ofItem(module, item, Field::ItemLabel), label, u"label"_s));
}

// What a QLabel or tool tip left to guess (Qt::AutoText) would put on screen.
QString shownAsAutoText(const QString& text) {
    if (!Qt::mightBeRichText(text))
        return text;
    QTextDocument document;
    document.setHtml(text);
    return document.toPlainText();
}

} // namespace

class TestGuiEditor : public QObject {
    Q_OBJECT
private slots:
    void initTestCase();
    void routeMapShowsTheInstrument();
    void outlineSelectionReachesMap();
    void mapSelectionReachesOutline();
    void routeMapFollowsEdits();
    void exportsEveryDictionaryFormat_data();
    void exportsEveryDictionaryFormat();
    void exportsRouteMap();
    void failedExportWritesNothing();
    void secondEditorIsReadOnly();
    void changedOnDiskAsksBeforeSaving();
    void markupShowsAsText();
    void darkPaletteReachesFormFields();

private:
    QTemporaryDir m_dir;
};

void TestGuiEditor::initTestCase() {
    QStandardPaths::setTestModeEnabled(true);
    QVERIFY(m_dir.isValid());
    // Generation dates in the dictionaries come from here, so bytes are stable.
    qputenv("SOURCE_DATE_EPOCH", "1700000000");
}

void TestGuiEditor::routeMapShowsTheInstrument() {
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    openGarden(w);
    // Six items plus START and END.
    QCOMPARE(w.routeMapView()->routeScene()->nodeCount(), 8);
    QCOMPARE(w.routeMapView()->routeScene()->bandCount(), 2);
    QCOMPARE(w.routeMapView()->routeScene()->itemAtPosition(3)->data().name, u"rain_barrel"_s);
}

void TestGuiEditor::outlineSelectionReachesMap() {
    EditorWindow w;
    openGarden(w);
    QSignalSpy echoed(w.routeMapView(), &RouteMapView::itemSelected);
    w.outlineView()->setCurrentIndex(w.outlineModel()->itemIndex(1, 0)); // rain_days
    QCOMPARE(w.routeMapView()->selectedPosition(), 4);
    w.outlineView()->setCurrentIndex(w.outlineModel()->itemIndex(0, 2)); // water_how
    QCOMPARE(w.routeMapView()->selectedPosition(), 2);
    QCOMPARE(echoed.count(), 0); // the map does not send the selection back
    // A module row leaves the map's item selection alone.
    w.outlineView()->setCurrentIndex(w.outlineModel()->moduleIndex(1));
    QCOMPARE(w.routeMapView()->selectedPosition(), 2);
}

void TestGuiEditor::mapSelectionReachesOutline() {
    EditorWindow w;
    openGarden(w);
    RouteMapScene* scene = w.routeMapView()->routeScene();
    QSignalSpy selected(w.routeMapView(), &RouteMapView::itemSelected);
    scene->clearSelection();
    scene->itemAtPosition(5)->setSelected(true); // what a click does: thanks
    QCOMPARE(selected.count(), 1);
    QCOMPARE(w.outlineView()->currentIndex(), w.outlineModel()->itemIndex(1, 1));
    QCOMPARE(w.outlineModel()->data(w.outlineView()->currentIndex()).toString(), u"thanks"_s);
    QCOMPARE(w.routeMapView()->selectedPosition(), 5);
    QCOMPARE(selected.count(), 1); // no echo from the outline back to the map

    scene->clearSelection();
    scene->itemAtPosition(1)->setSelected(true); // beds
    QCOMPARE(w.outlineView()->currentIndex(), w.outlineModel()->itemIndex(0, 1));
    QCOMPARE(w.routeMapView()->find(u"RAINY DAYS"_s), 4); // rain_days by its label, any case
    QCOMPARE(w.outlineView()->currentIndex(), w.outlineModel()->itemIndex(1, 0));
}

void TestGuiEditor::routeMapFollowsEdits() {
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    openGarden(w);
    w.outlineView()->setCurrentIndex(w.outlineModel()->itemIndex(0, 3)); // rain_barrel
    action(w, u"actionAddItem"_s)->trigger(); // a new item after it: position 4
    QTRY_VERIFY_WITH_TIMEOUT(mapCurrent(w), 10000);
    QCOMPARE(w.routeMapView()->routeScene()->nodeCount(), 9);
    QCOMPARE(w.routeMapView()->routeScene()->itemAtPosition(4)->data().name, u"item_1"_s);
    // The new item is the outline's current row, and the map keeps it selected.
    QCOMPARE(w.routeMapView()->selectedPosition(), 4);
    action(w, u"actionUndo"_s)->trigger();
    QTRY_VERIFY_WITH_TIMEOUT(mapCurrent(w), 10000);
    QCOMPARE(w.routeMapView()->routeScene()->nodeCount(), 8);
    QCOMPARE(w.routeMapView()->routeScene()->itemAtPosition(4)->data().name, u"rain_days"_s);
}

void TestGuiEditor::exportsEveryDictionaryFormat_data() {
    QTest::addColumn<QString>("action");
    QTest::addColumn<QString>("format");
    QTest::addColumn<QString>("pageSize");
    QTest::addColumn<QString>("file");
    QTest::newRow("html") << u"actionExport_html"_s << u"html"_s << QString() << u"d.html"_s;
    QTest::newRow("pdf a4") << u"actionExport_pdf"_s << u"pdf"_s << u"a4"_s << u"d-a4.pdf"_s;
    QTest::newRow("pdf letter") << u"actionExport_pdf_letter"_s << u"pdf"_s << u"letter"_s
                                << u"d-letter.pdf"_s;
    QTest::newRow("md") << u"actionExport_md"_s << u"md"_s << QString() << u"d.md"_s;
    QTest::newRow("csv") << u"actionExport_csv"_s << u"csv"_s << QString() << u"d.csv"_s;
    QTest::newRow("ddi") << u"actionExport_ddi"_s << u"ddi"_s << QString() << u"d.xml"_s;
}

void TestGuiEditor::exportsEveryDictionaryFormat() {
    QFETCH(QString, action);
    QFETCH(QString, format);
    QFETCH(QString, pageSize);
    QFETCH(QString, file);
    EditorWindow w;
    QVERIFY(w.openFile(kGarden));
    const QString path = m_dir.filePath(file);
    QString offeredName;
    w.fileExports()->setPathChooser([&](const QString&, const QString&, const QString& suggested) {
        offeredName = suggested;
        return path;
    });
    QStringList errors;
    w.fileExports()->setErrorReporter(
        [&](const QString&, const QString& message) { errors.append(message); });
    ::action(w, action)->trigger();
    QVERIFY2(errors.isEmpty(), qPrintable(errors.join(u'\n')));
    QVERIFY(offeredName.endsWith(u"/garden."_s + QFileInfo(file).suffix()));
    // What `routebook export garden.yaml --format F` writes (model/cli/Commands.cpp
    // calls exportDictionary on the loaded instrument).
    const DictionaryExportResult expected =
        exportDictionary(CompiledRouting(w.document()->instrument()), format, pageSize);
    QVERIFY(expected.error.isEmpty());
    const QByteArray written = readAll(path);
    QVERIFY(!written.isEmpty());
    QCOMPARE(written, expected.bytes); // PDF too: SOURCE_DATE_EPOCH fixes its dates
    QVERIFY(written.contains(format == u"pdf"_s ? "%%EOF" : "rain_barrel"));
}

void TestGuiEditor::exportsRouteMap() {
    EditorWindow w;
    QVERIFY(w.openFile(kGarden));
    QString target;
    w.fileExports()->setPathChooser(
        [&](const QString&, const QString&, const QString&) { return target; });
    target = m_dir.filePath(u"map.svg"_s);
    action(w, u"actionExport_map_svg"_s)->trigger();
    const QByteArray svg = readAll(target);
    QCOMPARE(svg, exportSvg(CompiledRouting(w.document()->instrument())));

    target = m_dir.filePath(u"map.png"_s);
    action(w, u"actionExport_map_png"_s)->trigger();
    QImage png;
    QVERIFY(png.loadFromData(readAll(target), "PNG"));
    // The picture has the SVG's own size: read the root element's width and height.
    QXmlStreamReader xml(svg);
    while (!xml.atEnd() && !(xml.isStartElement() && xml.name() == u"svg"_s))
        xml.readNext();
    QCOMPARE(png.width(), qRound(xml.attributes().value(u"width"_s).toDouble()));
    QCOMPARE(png.height(), qRound(xml.attributes().value(u"height"_s).toDouble()));
    QCOMPARE(png.pixelColor(0, 0), QColor(Qt::white)); // drawn on white, not transparent
}

void TestGuiEditor::failedExportWritesNothing() {
    EditorWindow w;
    QVERIFY(w.openFile(kGarden));
    const QString path = m_dir.filePath(u"no-such-folder/d.html"_s);
    w.fileExports()->setPathChooser(
        [&](const QString&, const QString&, const QString&) { return path; });
    QStringList errors;
    w.fileExports()->setErrorReporter(
        [&](const QString&, const QString& message) { errors.append(message); });
    action(w, u"actionExport_html"_s)->trigger();
    QCOMPARE(errors.size(), 1);
    QVERIFY(errors.first().contains(path));
    QVERIFY(!QFile::exists(path));
    // Cancelling the chooser writes nothing and reports nothing.
    w.fileExports()->setPathChooser(
        [](const QString&, const QString&, const QString&) { return QString(); });
    action(w, u"actionExport_csv"_s)->trigger();
    QCOMPARE(errors.size(), 1);
}

void TestGuiEditor::secondEditorIsReadOnly() {
    const QString project = gardenProject(m_dir, u"shared.routebook"_s);
    const QByteArray before = readAll(project);
    {
        EditorWindow first;
        QVERIFY(first.openFile(project));
        QVERIFY(!first.isReadOnly());

        EditorWindow second;
        QStringList messages;
        second.fileExports()->setErrorReporter(
            [&](const QString&, const QString& message) { messages.append(message); });
        QVERIFY(second.openFile(project));
        QVERIFY(second.isReadOnly());
        QCOMPARE(messages.size(), 1);
        QVERIFY2(messages.first().contains(u"already open in another editor"_s),
                 qPrintable(messages.first()));
        QVERIFY(second.windowTitle().contains(u"read-only"_s));
        QVERIFY(!action(second, u"actionSave"_s)->isEnabled());
        QVERIFY(action(second, u"actionSaveAs"_s)->isEnabled());
        QVERIFY(!action(second, u"actionAddItem"_s)->isEnabled());
        QVERIFY(!action(second, u"actionDelete"_s)->isEnabled());
        QVERIFY(!second.itemForm()->isEnabled());
        // A command that gets through anyway changes nothing.
        setItemLabel(second, 0, 0, u"Changed by the second editor"_s);
        QCOMPARE(second.document()->instrument().modules.at(0).items.at(0).label,
                 u"Has a garden"_s);
        QVERIFY(!second.document()->isModified());
        // Save As writes a copy under another name, which this window then holds.
        const QString copy = m_dir.filePath(u"shared-copy.routebook"_s);
        second.fileExports()->setPathChooser(
            [&](const QString&, const QString&, const QString&) { return copy; });
        action(second, u"actionSaveAs"_s)->trigger();
        QVERIFY(QFile::exists(copy));
        QVERIFY(!second.isReadOnly());
        QCOMPARE(second.document()->path(), copy);
        QVERIFY(action(second, u"actionSave"_s)->isEnabled());
        QCOMPARE(readAll(project), before); // the shared file is untouched
        QCOMPARE(messages.size(), 1);
    }
    // Both windows gone: the lock went with them, a third editor may edit.
    EditorWindow third;
    QVERIFY(third.openFile(project));
    QVERIFY(!third.isReadOnly());
}

void TestGuiEditor::changedOnDiskAsksBeforeSaving() {
    const QString project = gardenProject(m_dir, u"changing.routebook"_s);
    EditorWindow w;
    w.setSaveQuestion([] { return QMessageBox::Discard; });
    int asked = 0;
    bool answer = false;
    w.setOverwriteQuestion([&](const QString& path) {
        ++asked;
        return path == project && answer;
    });
    QVERIFY(w.openFile(project));

    // A touch (new time, same bytes) is not a change: no question.
    setItemLabel(w, 0, 0, u"Has a yard"_s);
    {
        QFile file(project);
        QVERIFY(file.open(QIODevice::ReadWrite));
        QVERIFY(file.setFileTime(QDateTime::currentDateTime().addSecs(-3600),
                                 QFileDevice::FileModificationTime));
    }
    action(w, u"actionSave"_s)->trigger();
    QCOMPARE(asked, 0);
    QVERIFY(!w.document()->isModified());
    QCOMPARE(loadInstrumentFile(project).instrument->modules.at(0).items.at(0).label,
             u"Has a yard"_s);

    // Another writer changes the file; our next save asks, and "no" writes nothing.
    setItemLabel(w, 0, 0, u"Has a lawn"_s);
    Instrument other = *loadInstrumentFile(project).instrument;
    other.title = u"Changed elsewhere"_s;
    QVERIFY(!saveInstrumentFile(other, project));
    const QByteArray theirs = readAll(project);
    action(w, u"actionSave"_s)->trigger();
    QCOMPARE(asked, 1);
    QCOMPARE(readAll(project), theirs);
    QVERIFY(w.document()->isModified());

    // "Yes" overwrites with this editor's version.
    answer = true;
    action(w, u"actionSave"_s)->trigger();
    QCOMPARE(asked, 2);
    const Instrument saved = *loadInstrumentFile(project).instrument;
    QCOMPARE(saved.title, u"Garden Watering Check"_s);
    QCOMPARE(saved.modules.at(0).items.at(0).label, u"Has a lawn"_s);
    QVERIFY(!w.document()->isModified());
    // Now in step with the disk again: the next save does not ask.
    setItemLabel(w, 0, 0, u"Has a meadow"_s);
    action(w, u"actionSave"_s)->trigger();
    QCOMPARE(asked, 2);
}

void TestGuiEditor::markupShowsAsText() {
    // tests/hostile/markup.yaml, by hand: module hives holds keeps_bees (0),
    // hive_count (1), hive_name (2); hive_count's text is
    // "How many hives? <svg onload=alert(4)>".
    EditorWindow w;
    w.resize(1200, 800);
    w.show();
    QVERIFY(QTest::qWaitForWindowExposed(&w));
    QVERIFY(w.openFile(QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/hostile/markup.yaml")));
    w.routeMapDock()->raise();
    QTRY_VERIFY_WITH_TIMEOUT(mapCurrent(w), 10000);
    const QString hiveText = u"How many hives? <svg onload=alert(4)>"_s;

    // Outline: names and labels are plain display text; tool tips show the wording literally.
    const QModelIndex module = w.outlineModel()->moduleIndex(0, OutlineModel::LabelColumn);
    QCOMPARE(w.outlineModel()->data(module).toString(),
             u"Hives </title><script>alert('module')</script>"_s);
    const QModelIndex count = w.outlineModel()->itemIndex(0, 1);
    QVERIFY(shownAsAutoText(w.outlineModel()->data(count, Qt::ToolTipRole).toString())
                .contains(hiveText));

    // Item form: the text box holds the raw text, the universe label is plain.
    w.outlineView()->setCurrentIndex(w.outlineModel()->itemIndex(0, 2)); // hive_name
    QCOMPARE(w.itemForm()->findChild<QPlainTextEdit*>(u"itemText"_s)->toPlainText(),
             u"What is your first hive called? ${name} {{name}} %s %n"_s);
    for (QLabel* label : w.findChildren<QLabel*>()) {
        if (label->text().contains(u'<'))
            QVERIFY2(label->textFormat() == Qt::PlainText, qPrintable(label->text()));
    }
    bool conditionShown = false; // hive_name's ask_if, string literal and all
    for (ConditionField* field : w.itemForm()->findChildren<ConditionField*>())
        conditionShown =
            conditionShown ||
            field->editor()->toPlainText() ==
                u"keeps_bees = 1 and not (keeps_bees = \"<script>alert(5)</script>\")"_s;
    QVERIFY(conditionShown);

    // Findings: every tool tip shows its message literally.
    QVERIFY(w.findingsModel()->rowCount() > 0);
    for (int row = 0; row < w.findingsModel()->rowCount(); ++row) {
        const QModelIndex index = w.findingsModel()->index(row, FindingsModel::MessageColumn);
        QVERIFY(shownAsAutoText(w.findingsModel()->data(index, Qt::ToolTipRole).toString())
                    .contains(w.findingsModel()->data(index).toString()));
    }

    // Route map: node tool tips carry the label as typed.
    RouteNodeItem* first = w.routeMapView()->routeScene()->itemAtPosition(1);
    QVERIFY(shownAsAutoText(first->toolTip())
                .contains(u"Hive count =HYPERLINK(\"http://example.invalid\")"_s));
    bool bandShown = false; // the module band's tip holds the title with its tags as text
    for (QGraphicsItem* item : w.routeMapView()->routeScene()->items())
        bandShown = bandShown || shownAsAutoText(item->toolTip()) ==
                                     u"hives: Hives </title><script>alert('module')</script>"_s;
    QVERIFY(bandShown);

    // Trial run: the first question's wording is shown as typed.
    QLabel* question = w.trialRunPanel()->findChild<QLabel*>(u"trialQuestion"_s);
    QVERIFY(question);
    QCOMPARE(question->textFormat(), Qt::PlainText);
    QVERIFY(question->text().contains(u"<iframe src=\"javascript:alert(2)\"></iframe>"_s));

    // Dictionary preview: the markup arrives as text, none of it as elements.
    QTextBrowser* preview = w.previewPanel()->findChild<QTextBrowser*>();
    QVERIFY(preview);
    QTRY_VERIFY_WITH_TIMEOUT(preview->toPlainText().contains(hiveText), 5000);
    QVERIFY(preview->toPlainText().contains(u"Yes <b onmouseover=alert(1)>bold</b>"_s));
    for (QTextBlock block = preview->document()->begin(); block.isValid(); block = block.next())
        for (auto it = block.begin(); !it.atEnd(); ++it)
            QVERIFY(!it.fragment().charFormat().isImageFormat()); // no <img>/<svg> came alive
}

void TestGuiEditor::darkPaletteReachesFormFields() {
    EditorWindow w;
    w.resize(1200, 800);
    w.show();
    QVERIFY(QTest::qWaitForWindowExposed(&w));
    QVERIFY(w.openFile(kGarden));
    w.outlineView()->setCurrentIndex(w.outlineModel()->itemIndex(0, 1));
    w.setDarkPalette(true);
    QApplication::processEvents();
    // The dark palette's Base is #1f2124 (views/EditorWindow.cpp darkPalette()).
    const QColor darkBase(0x1f, 0x21, 0x24);
    QList<QWidget*> fields = {w.itemForm()->nameEdit()};
    for (QWidget* field : w.itemForm()->findChildren<QPlainTextEdit*>())
        fields.append(field);
    for (QWidget* field : w.itemForm()->findChildren<QComboBox*>())
        fields.append(field);
    for (QWidget* field : w.itemForm()->findChildren<QSpinBox*>())
        fields.append(field);
    QVERIFY(fields.size() > 4);
    for (QWidget* field : fields) {
        QCOMPARE(field->palette().color(QPalette::Base), darkBase);
        QVERIFY2(field->palette().color(QPalette::Button).lightness() < 100,
                 field->metaObject()->className());
    }
    // What is painted, not only what is set: the middle of the name field is dark.
    QLineEdit* name = w.itemForm()->nameEdit();
    name->clear();
    const QImage shot = name->grab().toImage();
    QVERIFY(shot.pixelColor(shot.width() / 2, shot.height() / 2).lightness() < 80);
    w.setDarkPalette(false);
    QVERIFY(name->palette().color(QPalette::Base).lightness() > 200);
}

int main(int argc, char** argv) {
    if (qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM"))
        qputenv("QT_QPA_PLATFORM", "offscreen");
    QApplication app(argc, argv);
    QApplication::setOrganizationName(QStringLiteral("RoutebookTests"));
    QApplication::setApplicationName(QStringLiteral("tst_gui_editor"));
    TestGuiEditor test;
    return QTest::qExec(&test, argc, argv);
}

#include "tst_gui_editor.moc"
