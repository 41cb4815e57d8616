#include "ProjectSchema.h"

#include "ProjectFile.h"
#include "SqliteDatabase.h"
#include "SqliteStatement.h"

#include <sqlite3.h>

namespace rb::project_schema {

namespace {

// Version 1. Every list keeps its order in an `ord` column; optional text is
// NULL when absent and '' when present but empty. Ids are rewritten on every
// save (the save replaces all rows), so they carry no meaning across saves.
constexpr const char* kCreateTables = R"sql(
CREATE TABLE IF NOT EXISTS routebook_schema (version INTEGER NOT NULL);
CREATE TABLE IF NOT EXISTS routebook_meta (key TEXT PRIMARY KEY, value TEXT);
CREATE TABLE IF NOT EXISTS instrument (
  id INTEGER PRIMARY KEY CHECK (id = 1),
  title TEXT NOT NULL, version TEXT NOT NULL, language TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS settings (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS code_list (
  id INTEGER PRIMARY KEY, ord INTEGER NOT NULL UNIQUE, name TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS code (
  code_list_id INTEGER NOT NULL REFERENCES code_list(id) ON DELETE CASCADE,
  ord INTEGER NOT NULL, code INTEGER NOT NULL, label TEXT NOT NULL,
  missing TEXT,
  PRIMARY KEY (code_list_id, ord));
CREATE TABLE IF NOT EXISTS module (
  id INTEGER PRIMARY KEY, ord INTEGER NOT NULL UNIQUE, name TEXT NOT NULL,
  title TEXT NOT NULL, ask_if TEXT);
CREATE TABLE IF NOT EXISTS item (
  id INTEGER PRIMARY KEY,
  module_id INTEGER NOT NULL REFERENCES module(id) ON DELETE CASCADE,
  ord INTEGER NOT NULL,
  name TEXT NOT NULL, label TEXT NOT NULL, text TEXT NOT NULL,
  instruction TEXT NOT NULL, type TEXT NOT NULL,
  code_list_id INTEGER REFERENCES code_list(id),
  code_list_spelling TEXT,
  has_inline_codes INTEGER NOT NULL,
  range_min_text TEXT, range_min_value REAL,
  range_max_text TEXT, range_max_value REAL,
  ask_if TEXT, notes TEXT NOT NULL,
  has_when_skipped INTEGER NOT NULL,
  when_skipped_value TEXT, when_skipped_is_text INTEGER, when_skipped_if TEXT,
  UNIQUE (module_id, ord));
CREATE TABLE IF NOT EXISTS item_code (
  item_id INTEGER NOT NULL REFERENCES item(id) ON DELETE CASCADE,
  ord INTEGER NOT NULL, code INTEGER NOT NULL, label TEXT NOT NULL,
  missing TEXT, kind TEXT NOT NULL,
  PRIMARY KEY (item_id, ord));
CREATE TABLE IF NOT EXISTS rule (
  item_id INTEGER NOT NULL REFERENCES item(id) ON DELETE CASCADE,
  ord INTEGER NOT NULL, condition TEXT, target TEXT NOT NULL,
  PRIMARY KEY (item_id, ord));
CREATE TABLE IF NOT EXISTS test_respondent (
  id INTEGER PRIMARY KEY, ord INTEGER NOT NULL UNIQUE, name TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS test_answer (
  respondent_id INTEGER NOT NULL REFERENCES test_respondent(id) ON DELETE CASCADE,
  ord INTEGER NOT NULL, item TEXT NOT NULL, kind TEXT NOT NULL,
  text TEXT NOT NULL, codes TEXT NOT NULL,
  PRIMARY KEY (respondent_id, ord));
CREATE TABLE IF NOT EXISTS test_path (
  respondent_id INTEGER NOT NULL REFERENCES test_respondent(id) ON DELETE CASCADE,
  ord INTEGER NOT NULL, item TEXT NOT NULL,
  PRIMARY KEY (respondent_id, ord));
)sql";

// PRAGMA takes no bound parameters; the id is a compile-time constant, not a value
// from outside. Kept in step with kApplicationId by the static_assert below.
constexpr const char* kSetApplicationId = "PRAGMA application_id = 1383350891";
static_assert(kApplicationId == 1383350891);

// A single-value query; the first column of the first row, or an error.
struct Scalar {
    std::optional<qint64> integer;
    std::optional<QString> text;
    bool hasRow = false;
    std::optional<QString> error;
    int errorCode = 0;
};

Scalar queryScalar(SqliteDatabase& db, const char* sql, const QString& parameter = {}) {
    SqliteStatement statement(db, sql);
    if (!parameter.isNull())
        statement.bind(1, parameter);
    Scalar result;
    const auto step = statement.step();
    if (step == SqliteStatement::Step::Error) {
        result.error = statement.error();
        result.errorCode = statement.errorCode();
        return result;
    }
    result.hasRow = step == SqliteStatement::Step::Row;
    if (result.hasRow) {
        if (statement.columnType(0) == SqliteStatement::Type::Integer)
            result.integer = statement.columnInt64(0);
        if (statement.columnType(0) == SqliteStatement::Type::Text)
            result.text = statement.columnText(0);
    }
    return result;
}

bool hasTable(SqliteDatabase& db, const char* name) {
    const Scalar s =
        queryScalar(db, "SELECT count(*) FROM sqlite_schema WHERE type = 'table' AND name = ?1",
                    QString::fromLatin1(name));
    return s.integer.value_or(0) > 0;
}

Identity damaged(const QString& detail) {
    return {Identity::Kind::Damaged, 0, detail};
}

// The version row, once the file is known to carry our marks.
Identity readVersion(SqliteDatabase& db) {
    if (!hasTable(db, "routebook_schema"))
        return damaged(QStringLiteral("the routebook_schema table is missing"));
    const Scalar rows = queryScalar(db, "SELECT count(*) FROM routebook_schema");
    if (rows.integer.value_or(0) != 1)
        return damaged(QStringLiteral("routebook_schema must hold exactly one row, not %1")
                           .arg(rows.integer.value_or(0)));
    const Scalar version = queryScalar(db, "SELECT version FROM routebook_schema");
    if (!version.integer || *version.integer < 1)
        return damaged(QStringLiteral("the schema version is not a positive integer"));
    return {Identity::Kind::Ours, *version.integer, {}};
}

} // namespace

IdentifyResult identify(SqliteDatabase& db) {
    IdentifyResult result;
    // The first read of the file: this is where SQLite reports a file that is not
    // a database (SQLITE_NOTADB) or needs recovery (SQLITE_READONLY_ROLLBACK).
    const Scalar tables = queryScalar(db, "SELECT count(*) FROM sqlite_schema");
    if (tables.error) {
        result.error = *tables.error;
        result.errorCode = tables.errorCode;
        return result;
    }
    const Scalar appId = queryScalar(db, "PRAGMA application_id");
    const qint64 id = appId.integer.value_or(0);
    if (id == 0 && tables.integer.value_or(0) == 0) {
        result.identity = Identity{Identity::Kind::Empty, 0, {}};
        return result;
    }
    if (id != kApplicationId) {
        result.identity = Identity{Identity::Kind::Foreign, 0, {}};
        return result;
    }
    const bool hasMeta = hasTable(db, "routebook_meta");
    const Scalar format = hasMeta
                              ? queryScalar(db, "SELECT value FROM routebook_meta WHERE key = ?1",
                                            QStringLiteral("format"))
                              : Scalar{};
    if (format.text != QString::fromLatin1(kFormatName)) {
        // Same header mark, different content: most likely another program that
        // happened to choose our id. Treat it as theirs and leave it alone.
        result.identity = Identity{Identity::Kind::Foreign, 0, {}};
        return result;
    }
    result.identity = readVersion(db);
    return result;
}

std::optional<QString> create(SqliteDatabase& db) {
    if (auto error = db.exec(kCreateTables))
        return error;
    if (auto error = db.exec(kSetApplicationId))
        return error;
    SqliteStatement meta(db, "INSERT OR REPLACE INTO routebook_meta (key, value) VALUES (?1, ?2)");
    meta.bind(1, QStringLiteral("format"));
    meta.bind(2, QString::fromLatin1(kFormatName));
    if (!meta.run())
        return meta.error();
    if (auto error = db.exec("DELETE FROM routebook_schema"))
        return error;
    SqliteStatement version(db, "INSERT INTO routebook_schema (version) VALUES (?1)");
    version.bind(1, kProjectSchemaVersion);
    if (!version.run())
        return version.error();
    return std::nullopt;
}

// Durability: rollback journal (journal_mode = DELETE) with synchronous = FULL.
// SQLite copies every page it is about to change into PATH-journal and syncs
// that journal before touching PATH; COMMIT syncs PATH and then deletes the
// journal, which is the atomic commit point. A crash before that point leaves a
// "hot" journal and the next connection restores the old pages from it; after
// it, the new version is complete. Either way the file reads as the old or the
// new project, never a mix.
// Why not WAL: WAL keeps PATH-wal and PATH-shm beside the project, so the
// project is no longer one file a designer can copy, mail or commit; WAL does
// not work on network shares; and even a read-only WAL connection wants to
// create the -shm file, which would break "loading never writes anything".
// Saves are rare and small, so WAL's faster commits buy nothing here.
std::optional<QString> configureForWriting(SqliteDatabase& db) {
    if (auto error = db.exec("PRAGMA journal_mode = DELETE"))
        return error;
    return db.exec("PRAGMA synchronous = FULL");
}

} // namespace rb::project_schema
