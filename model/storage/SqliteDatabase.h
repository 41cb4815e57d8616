#pragma once

#include <QString>

#include <optional>

struct sqlite3;

namespace rb {

// One SQLite connection, closed on destruction. Every connection gets the same
// safety settings (foreign keys on, defensive mode, untrusted schema), so no
// caller can forget them. Errors are returned as text, never thrown.
class SqliteDatabase {
public:
    enum class Mode {
        ReadOnly, // never creates or writes the file
        ReadWrite // creates the file when it does not exist
    };

    SqliteDatabase() = default;
    ~SqliteDatabase();
    SqliteDatabase(const SqliteDatabase&) = delete;
    SqliteDatabase& operator=(const SqliteDatabase&) = delete;

    // Opens PATH (a local file name, not a URI). Returns the error text on failure.
    std::optional<QString> open(const QString& path, Mode mode);
    void close();
    bool isOpen() const { return m_db != nullptr; }

    // Runs fixed SQL without values (pragmas, DDL, BEGIN/COMMIT), stepping every
    // statement to completion and ignoring result rows.
    std::optional<QString> exec(const char* sql);

    sqlite3* handle() const { return m_db; }
    QString errorText() const;
    int extendedErrorCode() const;

private:
    std::optional<QString> configure();

    sqlite3* m_db = nullptr;
};

} // namespace rb
