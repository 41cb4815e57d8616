#include "KillSave.h"

#include "KillHarness.h"

#include <QCoreApplication>
#include <QDateTime>
#include <QTest>

using namespace Qt::StringLiterals;
using namespace reliability;

void TestKillSave::initTestCase() {
    QVERIFY(m_dir.isValid());
}

void TestKillSave::killDuringSave() {
    const int iterations = qEnvironmentVariableIsSet("ROUTEBOOK_KILL_ITERATIONS")
                               ? qEnvironmentVariableIntValue("ROUTEBOOK_KILL_ITERATIONS")
                               : 20;
    const quint32 seed = qEnvironmentVariableIsSet("ROUTEBOOK_KILL_SEED")
                             ? quint32(qEnvironmentVariableIntValue("ROUTEBOOK_KILL_SEED"))
                             : quint32(QDateTime::currentMSecsSinceEpoch());
    qInfo("kill harness: %d iterations, ROUTEBOOK_KILL_SEED=%u", iterations, seed);
    const KillReport report = runKillCycles(QCoreApplication::applicationFilePath(),
                                            m_dir.filePath(u"large.routebook"_s), iterations, seed);
    qInfo("kill harness: %d kills, %d before the save returned, %d left a journal, "
          "reopened as old %d, as new %d",
          report.kills, report.cutBeforeSaved, report.hotJournals, report.openedOld,
          report.openedNew);
    QVERIFY2(report.failure.isEmpty(), qPrintable(report.failure));
    QCOMPARE(report.kills, iterations);
    QCOMPARE(report.openedOld + report.openedNew, iterations);
    // Not a timing claim: with kills spread over 1.3 x a save, a run in which
    // no kill ever cut a save short would not have tested anything.
    if (iterations >= 20)
        QVERIFY2(report.cutBeforeSaved > 0, "no kill landed inside a save");
}
