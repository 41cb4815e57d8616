#include "KillHarness.h"

#include "Fixtures.h"
#include "storage/ProjectFile.h"

#include <QElapsedTimer>
#include <QFile>
#include <QProcess>
#include <QThread>

#include <cstdio>
#include <random>

using namespace Qt::StringLiterals;

namespace reliability {

int runSaveChild(const QString& path, int variant) {
    // Build before saying "ready", so the parent's clock covers the save only.
    const rb::Instrument instrument = largeInstrument(variant);
    std::fputs("ready\n", stdout);
    std::fflush(stdout);
    if (auto error = rb::saveProjectFile(instrument, path)) {
        std::fprintf(stderr, "%s\n", qPrintable(error->toString()));
        return 3;
    }
    std::fputs("saved\n", stdout);
    std::fflush(stdout);
    return 0;
}

namespace {

// Which of the two versions a file holds: 0, 1, or -1 for neither / unreadable.
struct Opened {
    int variant = -1;
    QString problem;
};

Opened openAs(const QString& path, const rb::Instrument& v0, const rb::Instrument& v1) {
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    if (!loaded.ok())
        return {-1, rb::formatDiagnostics(loaded.errors)};
    if (*loaded.instrument == v0)
        return {0, {}};
    if (*loaded.instrument == v1)
        return {1, {}};
    return {-1, u"the file opens but equals neither the old nor the new version"_s};
}

bool startChild(QProcess& child, const QString& executable, const QString& path, int variant) {
    child.setProgram(executable);
    child.setArguments({QString::fromLatin1(kSaveChildFlag), path, QString::number(variant)});
    child.setProcessChannelMode(QProcess::SeparateChannels);
    child.start();
    if (!child.waitForStarted(60000))
        return false;
    // Wait for "ready" (the instrument is built; the save starts now).
    while (!child.canReadLine())
        if (!child.waitForReadyRead(120000))
            return false;
    return child.readLine().trimmed() == "ready";
}

// One uncut save, timed: the kill moments are spread over about this long.
qint64 calibrate(const QString& executable, const QString& path, int variant) {
    QProcess child;
    if (!startChild(child, executable, path, variant))
        return -1;
    QElapsedTimer timer;
    timer.start();
    if (!child.waitForFinished(300000) || child.exitCode() != 0)
        return -1;
    return qMax<qint64>(timer.nsecsElapsed() / 1000, 1000);
}

} // namespace

KillReport runKillCycles(const QString& executable, const QString& path, int iterations,
                         quint32 seed) {
    KillReport report;
    const rb::Instrument versions[2] = {largeInstrument(0), largeInstrument(1)};
    QFile::remove(path);
    QFile::remove(path + u"-journal"_s);
    // Variant 0 on disk, then time a save of variant 1 and one back to 0.
    if (calibrate(executable, path, 0) < 0) {
        report.failure = u"the first, uncut save did not complete"_s;
        return report;
    }
    const qint64 micros = qMax(calibrate(executable, path, 1), calibrate(executable, path, 0));
    if (micros < 0) {
        report.failure = u"a calibration save did not complete"_s;
        return report;
    }
    std::mt19937 generator(seed);
    // Up to 1.3 x the measured save: most kills land inside the save, some
    // just after it (the "saved" side of the commit point must hold too).
    std::uniform_int_distribution<qint64> delay(0, micros * 13 / 10);
    int onDisk = 0;
    for (int i = 0; i < iterations; ++i) {
        const int saving = 1 - onDisk;
        QProcess child;
        if (!startChild(child, executable, path, saving)) {
            report.failure = u"iteration %1: the child did not start"_s.arg(i);
            return report;
        }
        QThread::usleep(quint64(delay(generator)));
        child.kill(); // SIGKILL on Unix
        child.waitForFinished(60000);
        ++report.kills;
        const bool saved = child.readAllStandardOutput().contains("saved");
        if (!saved)
            ++report.cutBeforeSaved;
        if (QFile::exists(path + u"-journal"_s))
            ++report.hotJournals;
        const Opened opened = openAs(path, versions[0], versions[1]);
        if (opened.variant < 0) {
            report.failure = u"iteration %1: %2"_s.arg(i).arg(opened.problem);
            return report;
        }
        // Once saveProjectFile returned, the new version must be the one on disk.
        if (saved && opened.variant != saving) {
            report.failure =
                u"iteration %1: the save returned but the old version is on disk"_s.arg(i);
            return report;
        }
        if (opened.variant == onDisk)
            ++report.openedOld;
        else
            ++report.openedNew;
        onDisk = opened.variant;
    }
    return report;
}

} // namespace reliability
