#include "SqliteStatement.h"

#include "SqliteDatabase.h"

#include <sqlite3.h>

namespace rb {

SqliteStatement::SqliteStatement(SqliteDatabase& db, const char* sql, const char** tail)
    : m_db(db) {
    if (!db.handle()) {
        m_error = QStringLiteral("database not open");
        m_errorCode = SQLITE_MISUSE;
        return;
    }
    const int rc = sqlite3_prepare_v2(db.handle(), sql, -1, &m_stmt, tail);
    if (rc != SQLITE_OK)
        fail(rc);
}

SqliteStatement::~SqliteStatement() {
    sqlite3_finalize(m_stmt);
}

void SqliteStatement::fail(int rc) {
    if (m_error)
        return; // keep the first failure: it is the cause
    m_errorCode = m_db.handle() ? sqlite3_extended_errcode(m_db.handle()) : rc;
    m_error = m_db.handle() ? m_db.errorText() : QString::fromUtf8(sqlite3_errstr(rc));
}

void SqliteStatement::bind(int index, const QString& value) {
    if (!m_stmt)
        return;
    // toUtf8() of an empty QString is "" (not NULL), so an empty value is stored
    // as empty text and stays distinct from an absent one.
    const QByteArray utf8 = value.toUtf8();
    const int rc =
        sqlite3_bind_text(m_stmt, index, utf8.constData(), int(utf8.size()), SQLITE_TRANSIENT);
    if (rc != SQLITE_OK)
        fail(rc);
}

void SqliteStatement::bind(int index, const std::optional<QString>& value) {
    if (value)
        bind(index, *value);
    else
        bindNull(index);
}

void SqliteStatement::bind(int index, qint64 value) {
    if (!m_stmt)
        return;
    const int rc = sqlite3_bind_int64(m_stmt, index, value);
    if (rc != SQLITE_OK)
        fail(rc);
}

void SqliteStatement::bind(int index, double value) {
    if (!m_stmt)
        return;
    const int rc = sqlite3_bind_double(m_stmt, index, value);
    if (rc != SQLITE_OK)
        fail(rc);
}

void SqliteStatement::bindNull(int index) {
    if (!m_stmt)
        return;
    const int rc = sqlite3_bind_null(m_stmt, index);
    if (rc != SQLITE_OK)
        fail(rc);
}

SqliteStatement::Step SqliteStatement::step() {
    if (m_error || !m_stmt)
        return m_error ? Step::Error : Step::Done;
    const int rc = sqlite3_step(m_stmt);
    if (rc == SQLITE_ROW)
        return Step::Row;
    if (rc == SQLITE_DONE)
        return Step::Done;
    fail(rc);
    return Step::Error;
}

bool SqliteStatement::run() {
    Step result;
    while ((result = step()) == Step::Row) {
    }
    return result == Step::Done;
}

void SqliteStatement::reset() {
    if (!m_stmt)
        return;
    sqlite3_reset(m_stmt);
    sqlite3_clear_bindings(m_stmt);
}

SqliteStatement::Type SqliteStatement::columnType(int column) const {
    switch (sqlite3_column_type(m_stmt, column)) {
    case SQLITE_INTEGER:
        return Type::Integer;
    case SQLITE_FLOAT:
        return Type::Real;
    case SQLITE_TEXT:
        return Type::Text;
    case SQLITE_BLOB:
        return Type::Blob;
    default:
        return Type::Null;
    }
}

qint64 SqliteStatement::columnInt64(int column) const {
    return sqlite3_column_int64(m_stmt, column);
}

double SqliteStatement::columnDouble(int column) const {
    return sqlite3_column_double(m_stmt, column);
}

QString SqliteStatement::columnText(int column) const {
    // Text first, then its length in bytes (the order SQLite documents).
    const auto* text = reinterpret_cast<const char*>(sqlite3_column_text(m_stmt, column));
    const int bytes = sqlite3_column_bytes(m_stmt, column);
    return text ? QString::fromUtf8(text, bytes) : QString();
}

QString SqliteStatement::columnName(int column) const {
    return QString::fromUtf8(sqlite3_column_name(m_stmt, column));
}

} // namespace rb
