#include "CliRun.h"

#include <QProcess>

#include <sys/resource.h>

using namespace Qt::StringLiterals;

namespace reliability {

bool sanitizerBuild() {
#if defined(__SANITIZE_ADDRESS__)
    return true;
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
    return true;
#else
    return false;
#endif
#else
    return false;
#endif
}

QString CliOutcome::describe() const {
    return u"exit %1%2%3; stderr: %4"_s.arg(exitCode)
        .arg(crashed ? u" (crashed)"_s : QString())
        .arg(timedOut ? u" (killed by the watchdog)"_s : QString())
        .arg(QString::fromUtf8(err.left(600)));
}

CliOutcome runCli(const QStringList& arguments, int watchdogSeconds) {
    QProcess process;
    process.setProgram(QStringLiteral(ROUTEBOOK_BINARY));
    process.setArguments(arguments);
    QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
    env.insert(u"QT_QPA_PLATFORM"_s, u"offscreen"_s);
    process.setProcessEnvironment(env);
    if (!sanitizerBuild()) {
        process.setChildProcessModifier([] {
            const rlimit limit{rlim_t(kCliAddressSpaceLimit), rlim_t(kCliAddressSpaceLimit)};
            setrlimit(RLIMIT_AS, &limit);
        });
    }
    process.start();
    CliOutcome outcome;
    if (!process.waitForStarted(60000)) {
        outcome.crashed = true;
        outcome.err = "the routebook binary did not start";
        return outcome;
    }
    if (!process.waitForFinished(watchdogSeconds * 1000)) {
        outcome.timedOut = true;
        process.kill();
        process.waitForFinished(10000);
    }
    outcome.crashed = process.exitStatus() == QProcess::CrashExit;
    outcome.exitCode = process.exitCode();
    outcome.out = process.readAllStandardOutput();
    outcome.err = process.readAllStandardError();
    return outcome;
}

} // namespace reliability
