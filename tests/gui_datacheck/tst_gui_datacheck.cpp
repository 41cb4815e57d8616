// The editor's "Check a response file..." run on the offscreen platform: the
// model's data check in a worker thread behind a progress dialog, the report
// dialog with its summary, and cancelling. Counts reasoned by hand below.
#include "DataCheckDialog.h"
#include "EditorWindow.h"
#include "storage/YamlFormat.h"

#include <QAction>
#include <QApplication>
#include <QDir>
#include <QFile>
#include <QLabel>
#include <QMenuBar>
#include <QProgressDialog>
#include <QPushButton>
#include <QSignalSpy>
#include <QTemporaryDir>
#include <QTest>
#include <QTextBrowser>

using namespace Qt::StringLiterals;
using namespace rb;

namespace {

Instrument garden() {
    LoadResult loaded =
        loadYamlFile(QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/datacheck/garden.yaml"));
    if (!loaded.ok())
        qFatal("garden.yaml does not load");
    return *loaded.instrument;
}

QString writeFile(const QTemporaryDir& dir, const QByteArray& bytes) {
    const QString path = dir.filePath(u"responses.csv"_s);
    QFile f(path);
    if (!f.open(QIODevice::WriteOnly) || f.write(bytes) != bytes.size())
        qFatal("cannot write the test file");
    return path;
}

const QByteArray kHeader =
    "has_garden,beds,tools_1,tools_2,tools_3,tools_9,last_watered,comments\n";
// garden.yaml: has_garden <> 1 jumps to comments, else beds, tools, last_watered, comments.
const QByteArray kComplete = "1,2,1,0,0,0,2026-04-01,ok\n"; // all answered, no problem
const QByteArray kSkipped = "2,,,,,,,fine\n";               // skips blank: legitimate
const QByteArray kViolation = "2,5,,,,,,\n";                // beds 5 although skipped: violation
const QByteArray kBreakOff = "1,7,0,0,0,0,,\n"; // tools, last_watered, comments blank to the end
const QByteArray kInvalid =
    "1,x,,,,,2026-01-01,hi\n"; // beds "x": invalid (tools blank, then answers)

} // namespace

class TestGuiDataCheck : public QObject {
    Q_OBJECT
private slots:
    void reportShowsTheCounts();
    void cancelStopsAndShowsNothing();
    void editorOffersTheAction();
};

void TestGuiDataCheck::reportShowsTheCounts() {
    // 3 complete + 2 skipped + 5 violations + 1 break-off + 6 invalid = 17 records.
    const QByteArray csv = kHeader + kComplete.repeated(3) + kSkipped.repeated(2) +
                           kViolation.repeated(5) + kBreakOff + kInvalid.repeated(6);
    QTemporaryDir dir;
    const QString path = writeFile(dir, csv);
    QWidget parent;
    DataCheckRun run(garden(), path, &parent);
    QSignalSpy finished(&run, &DataCheckRun::finished);
    run.start();
    QVERIFY(finished.wait(30000));
    QVERIFY2(run.outcome().result,
             qPrintable(run.outcome().error ? run.outcome().error->toString() : QString()));
    const DataCheckResult& r = *run.outcome().result;
    QCOMPARE(r.records, 17);
    QCOMPARE(r.violations.count, 5);
    QCOMPARE(r.invalid.count, 6);
    QCOMPARE(r.breakOffs.count, 1);
    DataCheckReportDialog dialog(r, run.reportHtml(), u"responses.csv"_s, &parent);
    // Five items with a variable; the single break-off is below the threshold of 5.
    QCOMPARE(dialog.summary()->text(),
             u"17 records, 5 items: 5 with routing violations, 6 with invalid values, <5 "
             "break-offs"_s);
    const QString page = dialog.browser()->toPlainText();
    QVERIFY(page.contains(u"beds"_s));
    QVERIFY(page.contains(u"last_watered"_s));
    QVERIFY(!page.contains(u"fine"_s)); // aggregate output only: no cell text
    QVERIFY(!run.progressDialog()->isVisible());
}

void TestGuiDataCheck::cancelStopsAndShowsNothing() {
    // About 8 MB: several 1 MB blocks, so the cancel lands before the end.
    const QByteArray csv = kHeader + kComplete.repeated(300000);
    QTemporaryDir dir;
    const QString path = writeFile(dir, csv);
    QWidget parent;
    DataCheckRun run(garden(), path, &parent);
    QSignalSpy finished(&run, &DataCheckRun::finished);
    QSignalSpy progressed(&run, &DataCheckRun::progressed);
    run.start();
    QPushButton* cancel = run.progressDialog()->findChild<QPushButton*>();
    QVERIFY(cancel);
    cancel->click(); // the dialog's Cancel button
    QVERIFY(finished.wait(30000));
    QVERIFY(!run.outcome().result);
    QVERIFY(run.outcome().error->message.contains(u"cancelled"_s));
    QVERIFY(run.reportHtml().isEmpty());
    // Stopped early: at most the first block was reported, never the whole file.
    for (const QList<QVariant>& p : progressed)
        QVERIFY(p.at(0).toInt() < 1000);
    QCOMPARE(QDir(dir.path()).entryList(QDir::Files), QStringList{u"responses.csv"_s});
    QVERIFY(!run.progressDialog()->isVisible());
}

void TestGuiDataCheck::editorOffersTheAction() {
    EditorWindow w;
    bool found = false;
    for (QAction* a : w.menuBar()->findChildren<QAction*>())
        found |= a->text() == u"Check a &response file..."_s;
    QVERIFY(found);
}

QTEST_MAIN(TestGuiDataCheck)
#include "tst_gui_datacheck.moc"
