#pragma once

#include <QObject>
#include <QTemporaryDir>

// Saving never loses or tears a project: a child saves a large project and is
// killed with SIGKILL at random moments; every time, the file opens and
// equals the old or the new version exactly. 20 cycles by default;
// ROUTEBOOK_KILL_ITERATIONS sets more (ctest label `long` runs 250),
// ROUTEBOOK_KILL_SEED fixes the random kill moments.
class TestKillSave : public QObject {
    Q_OBJECT
private slots:
    void initTestCase();
    void killDuringSave();

private:
    QTemporaryDir m_dir;
};
