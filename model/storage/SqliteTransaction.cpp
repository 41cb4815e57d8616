#include "SqliteTransaction.h"

#include "SqliteDatabase.h"

#include <sqlite3.h>

namespace rb {

SqliteTransaction::SqliteTransaction(SqliteDatabase& db, Kind kind) : m_db(db) {
    m_beginError = m_db.exec(kind == Kind::Write ? "BEGIN IMMEDIATE" : "BEGIN DEFERRED");
    m_active = !m_beginError;
}

SqliteTransaction::~SqliteTransaction() {
    rollback();
}

std::optional<QString> SqliteTransaction::commit() {
    if (!m_active)
        return m_beginError.value_or(QStringLiteral("no open transaction"));
    if (auto error = m_db.exec("COMMIT"))
        return error; // still active: the destructor rolls back
    m_active = false;
    return std::nullopt;
}

void SqliteTransaction::rollback() {
    if (!m_active)
        return;
    m_active = false;
    // SQLite may already have rolled back by itself (e.g. after SQLITE_FULL);
    // ROLLBACK then fails harmlessly, so its result is not needed.
    if (sqlite3_get_autocommit(m_db.handle()) == 0)
        m_db.exec("ROLLBACK");
}

} // namespace rb
