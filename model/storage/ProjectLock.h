#pragma once

#include <QString>

#include <memory>

class QLockFile;

namespace rb {

// Marks a project as open in one editor: a lock file beside it,
// `.NAME.lock` (for /p/garden.routebook: /p/.garden.routebook.lock), held
// through QLockFile. A lock whose owner process is gone (crash, kill) on this
// host is stale and taken over, by QLockFile's own PID/host check; a lock held
// by a running editor, here or on another host sharing the folder, is not.
// Released on destruction.
class ProjectLock {
public:
    explicit ProjectLock(const QString& projectPath);
    ~ProjectLock();
    ProjectLock(const ProjectLock&) = delete;
    ProjectLock& operator=(const ProjectLock&) = delete;

    static QString lockPathFor(const QString& projectPath);

    enum class Outcome {
        Acquired,      // this editor holds the project
        HeldElsewhere, // another running editor holds it: open read-only
        Failed         // the lock file cannot be written (read-only folder...)
    };
    struct Result {
        Outcome outcome = Outcome::Failed;
        QString holder; // "process 1234 (routebook) on host", when held elsewhere
        QString error;  // for Failed
    };
    Result acquire();
    void release();
    bool isHeld() const;
    QString lockPath() const { return m_lockPath; }

private:
    QString m_lockPath;
    std::unique_ptr<QLockFile> m_lock;
};

} // namespace rb
