#pragma once

#include "instrument/Instrument.h"

#include <QString>

#include <optional>

namespace rb {

class SqliteDatabase;

// Replaces every row of an open project with INSTRUMENT. Call inside the save
// transaction, after the schema exists. Returns what went wrong (e.g. an item
// that names a code list the instrument does not have); the caller rolls back.
std::optional<QString> writeProjectRows(SqliteDatabase& db, const Instrument& instrument);

} // namespace rb
