#include "SqliteDatabase.h"

#include "SqliteStatement.h"

#include <QFile>
#include <QFileInfo>

#include <sqlite3.h>

namespace rb {

SqliteDatabase::~SqliteDatabase() {
    close();
}

std::optional<QString> SqliteDatabase::open(const QString& path, Mode mode) {
    close();
    // An absolute path never starts with "file:", so it is never read as a URI.
    const QByteArray name = QFile::encodeName(QFileInfo(path).absoluteFilePath());
    const int flags = (mode == Mode::ReadOnly ? SQLITE_OPEN_READONLY
                                              : SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE) |
                      SQLITE_OPEN_EXRESCODE;
    const int rc = sqlite3_open_v2(name.constData(), &m_db, flags, nullptr);
    if (rc != SQLITE_OK) {
        // sqlite3_open_v2 may hand back a handle even on failure; it must still be closed.
        const QString error = m_db ? errorText() : QString::fromUtf8(sqlite3_errstr(rc));
        close();
        return error;
    }
    if (auto error = configure()) {
        close();
        return error;
    }
    return std::nullopt;
}

// Settings of every connection. Defensive mode and an untrusted schema keep a
// crafted file from running functions through views or triggers; foreign keys
// are off by default in SQLite and must be switched on per connection. The busy
// timeout lets a save wait briefly for another program's transaction to end
// instead of failing at once with "database is locked".
std::optional<QString> SqliteDatabase::configure() {
    sqlite3_busy_timeout(m_db, 2000);
    sqlite3_db_config(m_db, SQLITE_DBCONFIG_DEFENSIVE, 1, nullptr);
    sqlite3_db_config(m_db, SQLITE_DBCONFIG_TRUSTED_SCHEMA, 0, nullptr);
    return exec("PRAGMA foreign_keys = ON");
}

void SqliteDatabase::close() {
    if (m_db) {
        // Statements are RAII objects that die before their database, so plain
        // close cannot meet an unfinalized statement.
        sqlite3_close(m_db);
        m_db = nullptr;
    }
}

std::optional<QString> SqliteDatabase::exec(const char* sql) {
    const char* rest = sql;
    while (rest && *rest) {
        const char* tail = nullptr;
        SqliteStatement statement(*this, rest, &tail);
        if (!statement.ok())
            return statement.error();
        if (statement.isEmpty()) // only whitespace or a comment was left
            break;
        SqliteStatement::Step step;
        while ((step = statement.step()) == SqliteStatement::Step::Row) {
        }
        if (step == SqliteStatement::Step::Error)
            return statement.error();
        rest = tail;
    }
    return std::nullopt;
}

QString SqliteDatabase::errorText() const {
    return m_db ? QString::fromUtf8(sqlite3_errmsg(m_db)) : QStringLiteral("database not open");
}

int SqliteDatabase::extendedErrorCode() const {
    return m_db ? sqlite3_extended_errcode(m_db) : SQLITE_MISUSE;
}

} // namespace rb
