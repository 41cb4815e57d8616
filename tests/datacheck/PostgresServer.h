#pragma once

#include <QString>
#include <QTemporaryDir>

// A throw-away PostgreSQL server for one test: initdb in a temporary folder and
// the server on a loopback port, run as an unprivileged user when the test runs as
// root (both refuse root), found through `pg_config --bindir`; stopped on destruction.
class PostgresServer {
public:
    PostgresServer();
    ~PostgresServer();
    // Empty when the server runs; otherwise why not (the test then skips or fails).
    QString problem() const { return m_problem; }
    bool available() const { return m_available; } // false: PostgreSQL not installed
    // Runs a psql script; returns stdout (unaligned, tuples only, comma-separated).
    QString runScript(const QString& scriptPath, QString& error) const;
    QString folder() const { return m_dir.path(); }

private:
    bool run(const QString& program, const QStringList& arguments, bool asServerUser,
             QString* output = nullptr);

    QTemporaryDir m_dir;
    QString m_bin;
    int m_port = 0;
    bool m_available = false, m_started = false, m_dropRoot = false;
    QString m_problem;
};
