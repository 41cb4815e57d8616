#include "ProjectLock.h"

#include <QFileInfo>
#include <QLockFile>

using namespace Qt::StringLiterals;

namespace rb {

ProjectLock::ProjectLock(const QString& projectPath)
    : m_lockPath(lockPathFor(projectPath)), m_lock(std::make_unique<QLockFile>(m_lockPath)) {
    // Never stale by age: an editor may stay open for days. Staleness comes
    // only from the owner's PID no longer running on this host.
    m_lock->setStaleLockTime(0);
}

ProjectLock::~ProjectLock() = default; // QLockFile unlocks in its destructor

QString ProjectLock::lockPathFor(const QString& projectPath) {
    const QFileInfo info(projectPath);
    return info.absolutePath() + u"/."_s + info.fileName() + u".lock"_s;
}

ProjectLock::Result ProjectLock::acquire() {
    if (m_lock->isLocked())
        return {Outcome::Acquired, {}, {}};
    if (m_lock->tryLock(0))
        return {Outcome::Acquired, {}, {}};
    switch (m_lock->error()) {
    case QLockFile::LockFailedError: {
        qint64 pid = 0;
        QString host, app;
        if (!m_lock->getLockInfo(&pid, &host, &app))
            return {Outcome::HeldElsewhere, u"another editor"_s, {}};
        return {Outcome::HeldElsewhere,
                u"process %1 (%2) on %3"_s.arg(pid).arg(app.isEmpty() ? u"unknown"_s : app,
                                                        host.isEmpty() ? u"this computer"_s : host),
                {}};
    }
    case QLockFile::PermissionError:
        return {
            Outcome::Failed, {}, u"%1: no permission to create the lock file"_s.arg(m_lockPath)};
    default:
        return {Outcome::Failed, {}, u"%1: cannot create the lock file"_s.arg(m_lockPath)};
    }
}

void ProjectLock::release() {
    m_lock->unlock();
}

bool ProjectLock::isHeld() const {
    return m_lock->isLocked();
}

} // namespace rb
