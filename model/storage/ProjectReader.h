#pragma once

#include "instrument/Instrument.h"

#include <QString>

#include <variant>

namespace rb {

class SqliteDatabase;

// Reads the instrument from an open project whose marks identify() accepted.
// Every row is checked (column types, enum names, references, row counts): the
// first problem is returned as text and nothing is kept.
std::variant<Instrument, QString> readProjectRows(SqliteDatabase& db);

} // namespace rb
