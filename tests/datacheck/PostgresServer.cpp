#include "PostgresServer.h"

#include <QCoreApplication>
#include <QDir>
#include <QProcess>
#include <QStandardPaths>

#include <pwd.h>
#include <unistd.h>

// The server's programs: `pg_config --bindir`, else Debian's versioned folders
// (pg_config may be missing when only the server package is installed).
static QString postgresBinDir() {
    QProcess config;
    config.start(QStringLiteral("pg_config"), {QStringLiteral("--bindir")});
    if (config.waitForFinished(10000) && config.exitCode() == 0) {
        const QString bin = QString::fromUtf8(config.readAllStandardOutput()).trimmed();
        if (QFile::exists(bin + QStringLiteral("/initdb")))
            return bin;
    }
    QDir versions(QStringLiteral("/usr/lib/postgresql"));
    const QStringList found = versions.entryList(QDir::Dirs | QDir::NoDotAndDotDot, QDir::Name);
    for (auto it = found.crbegin(); it != found.crend(); ++it)
        if (QFile::exists(versions.filePath(*it + QStringLiteral("/bin/initdb"))))
            return versions.filePath(*it + QStringLiteral("/bin"));
    return {};
}

PostgresServer::PostgresServer() {
    m_bin = postgresBinDir();
    if (m_bin.isEmpty()) {
        m_problem = QStringLiteral("no initdb through pg_config or in /usr/lib/postgresql "
                                   "(Debian package postgresql)");
        return;
    }
    m_available = true;
    m_dropRoot = geteuid() == 0;
    if (m_dropRoot) {
        const passwd* nobody = getpwnam("nobody");
        if (!nobody || chown(QFile::encodeName(m_dir.path()).constData(), nobody->pw_uid,
                             nobody->pw_gid) != 0) {
            m_problem = QStringLiteral("cannot hand the folder to user nobody");
            return;
        }
    }
    m_port = 20000 + int(QCoreApplication::applicationPid() % 20000);
    const QString data = m_dir.filePath(QStringLiteral("data"));
    if (!run(m_bin + QStringLiteral("/initdb"),
             {QStringLiteral("-D"), data, QStringLiteral("-A"), QStringLiteral("trust"),
              QStringLiteral("-U"), QStringLiteral("rb"), QStringLiteral("--no-sync")},
             true)) {
        m_problem = QStringLiteral("initdb failed");
        return;
    }
    const QString options = QStringLiteral("-p %1 -k %2 -c listen_addresses=127.0.0.1 -c fsync=off")
                                .arg(m_port)
                                .arg(m_dir.path());
    if (!run(m_bin + QStringLiteral("/pg_ctl"),
             {QStringLiteral("-D"), data, QStringLiteral("-o"), options, QStringLiteral("-l"),
              m_dir.filePath(QStringLiteral("server.log")), QStringLiteral("-w"),
              QStringLiteral("start")},
             true)) {
        m_problem = QStringLiteral("the server did not start (see its log)");
        return;
    }
    m_started = true;
}

PostgresServer::~PostgresServer() {
    if (m_started)
        run(m_bin + QStringLiteral("/pg_ctl"),
            {QStringLiteral("-D"), m_dir.filePath(QStringLiteral("data")), QStringLiteral("-m"),
             QStringLiteral("fast"), QStringLiteral("-w"), QStringLiteral("stop")},
            true);
}

bool PostgresServer::run(const QString& program, const QStringList& arguments, bool asServerUser,
                         QString* output) {
    QProcess p;
    p.setWorkingDirectory(m_dir.path());
    if (asServerUser && m_dropRoot)
        p.start(QStringLiteral("runuser"),
                QStringList{QStringLiteral("-u"), QStringLiteral("nobody"), QStringLiteral("--"),
                            program} +
                    arguments);
    else
        p.start(program, arguments);
    if (!p.waitForFinished(120000))
        return false;
    if (output)
        *output = QString::fromUtf8(p.readAllStandardOutput()) +
                  QString::fromUtf8(p.readAllStandardError());
    return p.exitStatus() == QProcess::NormalExit && p.exitCode() == 0;
}

QString PostgresServer::runScript(const QString& scriptPath, QString& error) const {
    QProcess p;
    p.start(m_bin + QStringLiteral("/psql"),
            {QStringLiteral("-h"), QStringLiteral("127.0.0.1"), QStringLiteral("-p"),
             QString::number(m_port), QStringLiteral("-U"), QStringLiteral("rb"),
             QStringLiteral("-d"), QStringLiteral("postgres"), QStringLiteral("-q"),
             QStringLiteral("-A"), QStringLiteral("-t"), QStringLiteral("-F"), QStringLiteral(","),
             QStringLiteral("-v"), QStringLiteral("ON_ERROR_STOP=1"), QStringLiteral("-f"),
             scriptPath});
    if (!p.waitForFinished(300000) || p.exitCode() != 0)
        error = QString::fromUtf8(p.readAllStandardError());
    return QString::fromUtf8(p.readAllStandardOutput());
}
