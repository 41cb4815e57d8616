#pragma once

#include <QString>

#include <optional>

namespace rb {

class SqliteDatabase;

// The layout of a .routebook file and how we recognise one. A file is ours when
// all three marks agree: the header's application_id, routebook_meta's
// format = routebook-project, and one row in routebook_schema.
namespace project_schema {

// "RtBk" in ASCII: a fixed value of our own for PRAGMA application_id (checked
// from memory against SQLite's published list of ids in use; no clash known).
inline constexpr qint32 kApplicationId = 0x5274426B;
inline constexpr const char* kFormatName = "routebook-project";

// What an open SQLite database holds, as far as Routebook is concerned.
struct Identity {
    enum class Kind {
        Empty,   // no tables and no application id: a fresh file we may fill
        Ours,    // a Routebook project; version is its schema version
        Foreign, // an SQLite database of another program
        Damaged  // marked as ours but the marks disagree; detail says how
    };
    Kind kind = Kind::Foreign;
    qint64 version = 0;
    QString detail;
};

// Reads the marks. Fails (error text) only when SQLite cannot read the file;
// the caller tells "not an SQLite file" apart by the error code.
struct IdentifyResult {
    std::optional<Identity> identity;
    QString error;
    int errorCode = 0;
};
IdentifyResult identify(SqliteDatabase& db);

// Creates the tables when missing and sets the marks. Call inside the save
// transaction, after identify() said Empty or Ours.
std::optional<QString> create(SqliteDatabase& db);

// Durability settings of a writing connection (see the comment in the .cpp).
// Call outside any transaction.
std::optional<QString> configureForWriting(SqliteDatabase& db);

} // namespace project_schema
} // namespace rb
