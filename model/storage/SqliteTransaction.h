#pragma once

#include <QString>

#include <optional>

namespace rb {

class SqliteDatabase;

// BEGIN IMMEDIATE ... COMMIT for writing: IMMEDIATE takes the write lock up
// front, so a second writer fails at the start instead of halfway through a
// save. A read transaction (plain BEGIN) reads every table from one snapshot.
// Rolls back on destruction unless commit() succeeded.
class SqliteTransaction {
public:
    enum class Kind { Write, Read };
    explicit SqliteTransaction(SqliteDatabase& db, Kind kind = Kind::Write);
    ~SqliteTransaction();
    SqliteTransaction(const SqliteTransaction&) = delete;
    SqliteTransaction& operator=(const SqliteTransaction&) = delete;

    // Why BEGIN failed; nullopt when the transaction is open.
    const std::optional<QString>& beginError() const { return m_beginError; }
    std::optional<QString> commit();
    void rollback();

private:
    SqliteDatabase& m_db;
    std::optional<QString> m_beginError;
    bool m_active = false;
};

} // namespace rb
