#pragma once

#include <QString>

// The SIGKILL save harness: a child process saves a large project and is
// killed at a random moment; the file must then open and equal exactly the old
// or the new version.
namespace reliability {

// Argument that turns the test executable into the saving child:
//   tst_reliability --save-child PATH VARIANT
inline constexpr const char* kSaveChildFlag = "--save-child";

// Child mode: prints "ready", saves variant VARIANT of the large instrument to
// PATH, prints "saved" once saveProjectFile has returned success. Exit 0 on
// success, 3 on a failed save.
int runSaveChild(const QString& path, int variant);

struct KillReport {
    int kills = 0;          // child processes killed with SIGKILL
    int cutBeforeSaved = 0; // kills that landed before the child said "saved"
    int hotJournals = 0;    // kills that left PATH-journal behind (mid-transaction)
    int openedOld = 0;      // reopened file equalled the version before the save
    int openedNew = 0;      // ... the version being saved
    QString failure;        // first violation, empty when every iteration held
};

// Runs ITERATIONS kill cycles on a project at PATH with the test executable
// EXECUTABLE as the child. SEED makes the kill moments reproducible.
KillReport runKillCycles(const QString& executable, const QString& path, int iterations,
                         quint32 seed);

} // namespace reliability
