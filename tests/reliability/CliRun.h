#pragma once

#include <QByteArray>
#include <QStringList>

// Runs the built `routebook` binary the way a user would, with a watchdog and
// (outside sanitizer builds) an address-space limit, so that a hang or runaway
// memory use is a test failure rather than a stuck machine.
namespace reliability {

// The child may use at most this much address space (ASan builds: no limit,
// ASan reserves terabytes of shadow memory up front).
inline constexpr qint64 kCliAddressSpaceLimit = qint64(2) * 1024 * 1024 * 1024;

struct CliOutcome {
    int exitCode = -1;
    bool crashed = false;  // ended by a signal (segfault, abort, out of memory kill)
    bool timedOut = false; // still running at the watchdog; it was killed
    QByteArray out;
    QByteArray err;
    QString describe() const; // for failure messages
};

CliOutcome runCli(const QStringList& arguments, int watchdogSeconds = 300);

// True in builds with AddressSanitizer (the address-space limit is skipped).
bool sanitizerBuild();

} // namespace reliability
