#pragma once

#include <QString>

#include <optional>

struct sqlite3_stmt;

namespace rb {

class SqliteDatabase;

// A prepared statement, finalized on destruction. Values only ever travel
// through bind*(), never through the SQL text. The first failure (prepare,
// bind or step) sticks: later steps report it, so a caller may bind a whole
// row and check once.
class SqliteStatement {
public:
    // Prepares the first statement of SQL; TAIL (if given) receives the rest.
    SqliteStatement(SqliteDatabase& db, const char* sql, const char** tail = nullptr);
    ~SqliteStatement();
    SqliteStatement(const SqliteStatement&) = delete;
    SqliteStatement& operator=(const SqliteStatement&) = delete;

    bool ok() const { return !m_error.has_value(); }
    QString error() const { return m_error.value_or(QString()); }
    // Extended result code of the first failure (SQLITE_OK when none).
    int errorCode() const { return m_errorCode; }
    bool isEmpty() const { return m_stmt == nullptr; }

    // Parameters are 1-based, as in SQLite.
    void bind(int index, const QString& value);
    void bind(int index, const std::optional<QString>& value); // nullopt -> NULL
    void bind(int index, qint64 value);
    void bind(int index, int value) { bind(index, qint64(value)); }
    void bind(int index, bool value) { bind(index, qint64(value ? 1 : 0)); }
    void bind(int index, double value);
    void bindNull(int index);

    enum class Step { Row, Done, Error };
    Step step();
    // Steps a statement that returns no rows; false (see error()) on failure.
    bool run();
    // Ready for the next row: resets and clears the bindings.
    void reset();

    // Columns are 0-based, as in SQLite.
    enum class Type { Integer, Real, Text, Blob, Null };
    Type columnType(int column) const;
    qint64 columnInt64(int column) const;
    double columnDouble(int column) const;
    QString columnText(int column) const;
    QString columnName(int column) const;

private:
    void fail(int rc);

    SqliteDatabase& m_db;
    sqlite3_stmt* m_stmt = nullptr;
    std::optional<QString> m_error;
    int m_errorCode = 0;
};

} // namespace rb
