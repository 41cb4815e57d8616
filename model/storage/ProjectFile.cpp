#include "ProjectFile.h"

#include "ProjectReader.h"
#include "ProjectSchema.h"
#include "ProjectWriter.h"
#include "SqliteDatabase.h"
#include "SqliteStatement.h"
#include "SqliteTransaction.h"

#include <QFile>
#include <QFileInfo>

#include <sqlite3.h>

namespace rb {

namespace {

using project_schema::Identity;

// What the bytes on disk are, judged without SQLite: a non-SQLite file is
// never handed to SQLite, so it cannot be touched.
enum class FileState { Missing, NotRegular, Unreadable, Empty, NotSqlite, Sqlite };

FileState inspect(const QString& path) {
    const QFileInfo info(path);
    if (!info.exists())
        return FileState::Missing;
    if (!info.isFile())
        return FileState::NotRegular;
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return FileState::Unreadable;
    if (file.size() == 0)
        return FileState::Empty;
    // Every SQLite 3 database starts with this 16-byte header string (SQLite
    // "Database File Format", section 1.3) and is at least one 512-byte page.
    static const QByteArray magic("SQLite format 3\0", 16);
    return file.size() >= 512 && file.read(16) == magic ? FileState::Sqlite : FileState::NotSqlite;
}

Diagnostic diagnostic(const QString& path, const QString& message) {
    return {path, 0, 0, message};
}

QString notSqliteMessage(const QString& path) {
    return QStringLiteral("%1 is not a Routebook project (not an SQLite database)").arg(path);
}

QString foreignMessage(const QString& path) {
    return QStringLiteral("%1 is an SQLite database but not a Routebook project").arg(path);
}

QString newerMessage(const QString& path, qint64 version) {
    // One multi-argument arg(): a path holding "%2" must not swallow the version.
    return QStringLiteral("%1 was written by a newer Routebook (schema version %2; this build "
                          "reads up to %3)")
        .arg(path, QString::number(version), QString::number(kProjectSchemaVersion));
}

QString damagedMessage(const QString& path, const QString& detail) {
    return QStringLiteral("%1 is a damaged Routebook project: %2").arg(path, detail);
}

// The message for a file whose state or identity rules out reading it; nullopt
// when it is a project this build reads.
std::optional<QString> refusal(const QString& path, FileState state) {
    switch (state) {
    case FileState::Missing:
        return QStringLiteral("%1 does not exist").arg(path);
    case FileState::NotRegular:
        return QStringLiteral("%1 is not a regular file").arg(path);
    case FileState::Unreadable:
        return QStringLiteral("%1 cannot be read").arg(path);
    case FileState::Empty:
        return QStringLiteral("%1 is not a Routebook project (the file is empty)").arg(path);
    case FileState::NotSqlite:
        return notSqliteMessage(path);
    case FileState::Sqlite:
        break;
    }
    return std::nullopt;
}

std::optional<QString> refusal(const QString& path, const Identity& identity) {
    switch (identity.kind) {
    case Identity::Kind::Empty:
    case Identity::Kind::Foreign:
        return foreignMessage(path);
    case Identity::Kind::Damaged:
        return damagedMessage(path, identity.detail);
    case Identity::Kind::Ours:
        if (identity.version > kProjectSchemaVersion)
            return newerMessage(path, identity.version);
        break;
    }
    return std::nullopt;
}

// Turns an SQLite read failure into words about the file.
QString readFailure(const QString& path, const QString& error, int code) {
    if ((code & 0xff) == SQLITE_NOTADB)
        return notSqliteMessage(path);
    if ((code & 0xff) == SQLITE_CORRUPT)
        return damagedMessage(path, error);
    return QStringLiteral("cannot read %1: %2").arg(path, error);
}

// The first line `PRAGMA quick_check` reports, or nullopt when it says "ok".
// Catches truncated or overwritten pages before any row is trusted.
std::optional<QString> structureProblem(SqliteDatabase& db) {
    SqliteStatement check(db, "PRAGMA quick_check(1)");
    if (check.step() == SqliteStatement::Step::Error)
        return check.error();
    const QString verdict = check.columnText(0);
    if (verdict == QLatin1String("ok"))
        return std::nullopt;
    return verdict;
}

// Rows that refer to a row that is not there (only possible when a program
// wrote the file with foreign keys off).
std::optional<QString> danglingReference(SqliteDatabase& db) {
    SqliteStatement check(db, "PRAGMA foreign_key_check");
    const auto step = check.step();
    if (step == SqliteStatement::Step::Error)
        return check.error();
    if (step == SqliteStatement::Step::Done)
        return std::nullopt;
    return QStringLiteral("a row of table %1 (rowid %2) refers to a row of table %3 that does "
                          "not exist")
        .arg(check.columnText(0), QString::number(check.columnInt64(1)), check.columnText(2));
}

// Result of one read-only attempt; `recover` asks for crash recovery first.
struct ReadAttempt {
    LoadResult result;
    bool recover = false;
};

ReadAttempt readOnce(const QString& path) {
    ReadAttempt attempt;
    auto fail = [&](const QString& message) {
        attempt.result.errors.append(diagnostic(path, message));
        return attempt;
    };
    SqliteDatabase db;
    if (auto error = db.open(path, SqliteDatabase::Mode::ReadOnly))
        return fail(QStringLiteral("cannot open %1: %2").arg(path, *error));
    SqliteTransaction snapshot(db, SqliteTransaction::Kind::Read);
    if (auto error = snapshot.beginError())
        return fail(QStringLiteral("cannot read %1: %2").arg(path, *error));
    const project_schema::IdentifyResult identified = project_schema::identify(db);
    if (!identified.identity) {
        attempt.recover = identified.errorCode == SQLITE_READONLY_ROLLBACK;
        return fail(readFailure(path, identified.error, identified.errorCode));
    }
    if (auto message = refusal(path, *identified.identity))
        return fail(*message);
    if (auto problem = structureProblem(db))
        return fail(damagedMessage(path, *problem));
    if (auto problem = danglingReference(db))
        return fail(damagedMessage(path, *problem));
    auto rows = readProjectRows(db);
    if (const QString* problem = std::get_if<QString>(&rows))
        return fail(damagedMessage(path, *problem));
    attempt.result.instrument = std::get<Instrument>(std::move(rows));
    return attempt;
}

// A save that was cut off (crash, power loss) leaves a hot journal beside the
// file. A read-only connection may not apply it, so one read-write connection
// reads the file once, which makes SQLite restore the old pages from the
// journal - the file is then exactly the version before the interrupted save.
// This is the one case where loading writes to disk.
std::optional<QString> recoverInterruptedSave(const QString& path) {
    SqliteDatabase db;
    if (auto error = db.open(path, SqliteDatabase::Mode::ReadWrite))
        return error;
    const project_schema::IdentifyResult identified = project_schema::identify(db);
    if (!identified.identity)
        return identified.error;
    return std::nullopt;
}

// Saving replaces every row, so it may only replace a project this build fully
// understands, or nothing at all.
std::optional<QString> writeRefusal(const QString& path, const Identity& identity) {
    const QString unchanged = QStringLiteral("; it was left unchanged");
    switch (identity.kind) {
    case Identity::Kind::Empty:
        return std::nullopt;
    case Identity::Kind::Foreign:
        return foreignMessage(path) + unchanged;
    case Identity::Kind::Damaged:
        return damagedMessage(path, identity.detail) + unchanged;
    case Identity::Kind::Ours:
        // Version 1 is the only version so far; an upgrade of older versions
        // would go here, inside the save transaction.
        if (identity.version > kProjectSchemaVersion)
            return newerMessage(path, identity.version) + unchanged;
        break;
    }
    return std::nullopt;
}

// Checks, without writing, that saving may replace what PATH holds.
std::optional<QString> checkSaveTarget(const QString& path, FileState state) {
    switch (state) {
    case FileState::Missing:
    case FileState::Empty:
        return std::nullopt;
    case FileState::NotSqlite:
        return notSqliteMessage(path) + QStringLiteral("; it was left unchanged");
    case FileState::NotRegular:
    case FileState::Unreadable:
        return refusal(path, state);
    case FileState::Sqlite:
        break;
    }
    SqliteDatabase db;
    if (auto error = db.open(path, SqliteDatabase::Mode::ReadOnly))
        return QStringLiteral("cannot open %1: %2").arg(path, *error);
    const project_schema::IdentifyResult identified = project_schema::identify(db);
    if (!identified.identity) {
        // An interrupted save of ours: the writing connection recovers it first
        // and identifies the file again inside its transaction.
        if (identified.errorCode == SQLITE_READONLY_ROLLBACK)
            return std::nullopt;
        return readFailure(path, identified.error, identified.errorCode);
    }
    return writeRefusal(path, *identified.identity);
}

// Identifies again under the write lock (another program may have written the
// file since the check), then replaces every row in the same transaction.
std::optional<QString> writeInTransaction(SqliteDatabase& db, const QString& path,
                                          const Instrument& instrument) {
    if (auto error = project_schema::configureForWriting(db))
        return error;
    SqliteTransaction transaction(db);
    if (auto error = transaction.beginError())
        return error;
    const project_schema::IdentifyResult identified = project_schema::identify(db);
    if (!identified.identity)
        return readFailure(path, identified.error, identified.errorCode);
    if (auto refused = writeRefusal(path, *identified.identity))
        return refused;
    if (auto error = project_schema::create(db))
        return error;
    if (auto error = writeProjectRows(db, instrument))
        return error;
    return transaction.commit(); // on any early return the destructor rolls back
}

} // namespace

LoadResult loadProjectFile(const QString& path) {
    if (auto refused = refusal(path, inspect(path))) {
        LoadResult result;
        result.errors.append(diagnostic(path, *refused));
        return result;
    }
    ReadAttempt attempt = readOnce(path);
    if (attempt.recover) {
        if (auto error = recoverInterruptedSave(path)) {
            LoadResult result;
            result.errors.append(diagnostic(
                path,
                QStringLiteral("cannot recover the interrupted save of %1: %2").arg(path, *error)));
            return result;
        }
        attempt = readOnce(path);
    }
    return attempt.result;
}

std::optional<Diagnostic> saveProjectFile(const Instrument& instrument, const QString& path) {
    const FileState state = inspect(path);
    if (auto refused = checkSaveTarget(path, state))
        return diagnostic(path, *refused);
    std::optional<QString> error;
    {
        SqliteDatabase db;
        error = db.open(path, SqliteDatabase::Mode::ReadWrite);
        if (!error)
            error = writeInTransaction(db, path, instrument);
    } // closed here, so a file we created can be removed below
    if (!error)
        return std::nullopt;
    // A failed save leaves nothing behind: a file we created is removed, an
    // existing one was restored by the rollback.
    if (state == FileState::Missing)
        QFile::remove(path);
    if (error->startsWith(path))
        return diagnostic(path, *error);
    return diagnostic(path, QStringLiteral("cannot save %1: %2").arg(path, *error));
}

} // namespace rb
