#include "ProjectLockTests.h"

#include "storage/DiskState.h"
#include "storage/ProjectLock.h"

#include <QCoreApplication>
#include <QCryptographicHash>
#include <QDir>
#include <QFile>
#include <QTemporaryDir>
#include <QTest>

#include <sys/wait.h>
#include <unistd.h>

using namespace Qt::StringLiterals;
using rb::DiskState;
using rb::ProjectLock;

namespace {

void write(const QString& path, const QByteArray& bytes) {
    QFile file(path);
    QVERIFY(file.open(QIODevice::WriteOnly | QIODevice::Truncate));
    QCOMPARE(file.write(bytes), bytes.size());
}

} // namespace

class TestProjectLock : public QObject {
    Q_OBJECT
private slots:
    void init() { QVERIFY(m_dir.isValid()); }
    void lockSitsBesideTheProject();
    void secondLockIsHeldElsewhere();
    void releaseLetsTheNextEditorIn();
    void deadOwnersLockIsTakenOver();
    void unwritableFolderFails();
    void diskStateOfMissingFile();
    void diskStateSeesOtherBytesOnly();

private:
    QTemporaryDir m_dir;
};

void TestProjectLock::lockSitsBesideTheProject() {
    QCOMPARE(ProjectLock::lockPathFor(u"/p/q/garden.routebook"_s),
             u"/p/q/.garden.routebook.lock"_s);
    const QString project = m_dir.filePath(u"beside.routebook"_s);
    ProjectLock lock(project);
    QCOMPARE(lock.acquire().outcome, ProjectLock::Outcome::Acquired);
    QVERIFY(QFile::exists(m_dir.filePath(u".beside.routebook.lock"_s)));
    QVERIFY(lock.isHeld());
    QCOMPARE(lock.acquire().outcome, ProjectLock::Outcome::Acquired); // again: still ours
}

void TestProjectLock::secondLockIsHeldElsewhere() {
    const QString project = m_dir.filePath(u"twice.routebook"_s);
    ProjectLock first(project);
    QCOMPARE(first.acquire().outcome, ProjectLock::Outcome::Acquired);
    ProjectLock second(project); // a second editor window in this very process
    const ProjectLock::Result result = second.acquire();
    QCOMPARE(result.outcome, ProjectLock::Outcome::HeldElsewhere);
    // The holder names the owning process: this one, which is running.
    QVERIFY2(result.holder.contains(QString::number(QCoreApplication::applicationPid())),
             qPrintable(result.holder));
    QVERIFY(!second.isHeld());
}

void TestProjectLock::releaseLetsTheNextEditorIn() {
    const QString project = m_dir.filePath(u"handover.routebook"_s);
    ProjectLock second(project);
    {
        ProjectLock first(project);
        QCOMPARE(first.acquire().outcome, ProjectLock::Outcome::Acquired);
        QCOMPARE(second.acquire().outcome, ProjectLock::Outcome::HeldElsewhere);
        first.release();
        QVERIFY(!QFile::exists(ProjectLock::lockPathFor(project)));
        QCOMPARE(second.acquire().outcome, ProjectLock::Outcome::Acquired);
    }
    QVERIFY(second.isHeld());
}

void TestProjectLock::deadOwnersLockIsTakenOver() {
    // A child process takes the lock and dies without releasing it (as after
    // a crash or SIGKILL): its lock file stays, naming a PID that is gone.
    const QString project = m_dir.filePath(u"crashed.routebook"_s);
    const pid_t child = fork();
    QVERIFY(child >= 0);
    if (child == 0) {
        auto* lock = new ProjectLock(project); // never destroyed: no unlock
        _exit(lock->acquire().outcome == ProjectLock::Outcome::Acquired ? 0 : 3);
    }
    int status = 0;
    QCOMPARE(waitpid(child, &status, 0), child);
    QVERIFY(WIFEXITED(status));
    QCOMPARE(WEXITSTATUS(status), 0);
    QVERIFY(QFile::exists(ProjectLock::lockPathFor(project)));
    ProjectLock lock(project);
    QCOMPARE(lock.acquire().outcome, ProjectLock::Outcome::Acquired);
}

void TestProjectLock::unwritableFolderFails() {
    if (geteuid() == 0)
        QSKIP("running as root: permissions do not stop us, SKIPPED");
    const QString folder = m_dir.filePath(u"locked-folder"_s);
    QVERIFY(QDir().mkpath(folder));
    QVERIFY(QFile::setPermissions(folder, QFile::ReadOwner | QFile::ExeOwner));
    ProjectLock lock(folder + u"/p.routebook"_s);
    const ProjectLock::Result result = lock.acquire();
    QFile::setPermissions(folder, QFile::ReadOwner | QFile::WriteOwner | QFile::ExeOwner);
    QCOMPARE(result.outcome, ProjectLock::Outcome::Failed);
    QVERIFY(result.error.contains(u".p.routebook.lock"_s));
}

void TestProjectLock::diskStateOfMissingFile() {
    const DiskState missing = DiskState::of(m_dir.filePath(u"none.routebook"_s));
    QVERIFY(!missing.exists);
    QVERIFY(!missing.differsFrom(DiskState::of(m_dir.filePath(u"other-none"_s))));
}

void TestProjectLock::diskStateSeesOtherBytesOnly() {
    const QString path = m_dir.filePath(u"state.routebook"_s);
    write(path, "0123456789");
    const DiskState saved = DiskState::of(path);
    QVERIFY(saved.exists);
    QCOMPARE(saved.size, 10);
    // SHA-256 of the ASCII text "0123456789", computed here independently.
    QCOMPARE(saved.sha256, QCryptographicHash::hash("0123456789", QCryptographicHash::Sha256));

    // Touched: a new time, the same bytes -> not a change.
    {
        QFile file(path);
        QVERIFY(file.open(QIODevice::ReadWrite));
        QVERIFY(file.setFileTime(saved.modified.addSecs(-3600), QFileDevice::FileModificationTime));
    }
    const DiskState touched = DiskState::of(path);
    QVERIFY(touched.modified != saved.modified);
    QVERIFY(!saved.differsFrom(touched));

    write(path, "0123456780"); // same size, one byte different
    QVERIFY(saved.differsFrom(DiskState::of(path)));
    write(path, "01234567890"); // longer
    QVERIFY(saved.differsFrom(DiskState::of(path)));
    QVERIFY(QFile::remove(path));
    QVERIFY(saved.differsFrom(DiskState::of(path)));
}

int runProjectLockTests(int argc, char** argv) {
    TestProjectLock test;
    return QTest::qExec(&test, argc, argv);
}

#include "ProjectLockTests.moc"
