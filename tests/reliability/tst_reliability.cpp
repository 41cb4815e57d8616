// Reliability and security (issue 8): the SIGKILL save harness, corrupted and
// hostile input files, hostile exports. One executable, three Qt Test classes;
// it is also the saving child of the kill harness (--save-child).
#include "HostileExport.h"
#include "HostileFiles.h"
#include "KillHarness.h"
#include "KillSave.h"

#include <QCoreApplication>
#include <QTest>

#include <cstring>

int main(int argc, char** argv) {
    if (argc == 4 && std::strcmp(argv[1], reliability::kSaveChildFlag) == 0)
        return reliability::runSaveChild(QString::fromLocal8Bit(argv[2]), std::atoi(argv[3]));
    QCoreApplication app(argc, argv);
    // ROUTEBOOK_RELIABILITY_SUITE=kill runs only the kill harness (the long ctest).
    const QByteArray suite = qgetenv("ROUTEBOOK_RELIABILITY_SUITE");
    int status = 0;
    if (suite.isEmpty() || suite == "kill") {
        TestKillSave kill;
        status |= QTest::qExec(&kill, argc, argv);
    }
    if (suite.isEmpty() || suite == "files") {
        TestHostileFiles files;
        status |= QTest::qExec(&files, argc, argv);
    }
    if (suite.isEmpty() || suite == "export") {
        TestHostileExport exports;
        status |= QTest::qExec(&exports, argc, argv);
    }
    return status;
}
