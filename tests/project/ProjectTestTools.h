#pragma once

#include "instrument/Instrument.h"

#include <QByteArray>
#include <QDateTime>
#include <QString>

// Helpers of the project-file tests. Raw SQLite access goes through the C API
// directly (not the code under test), so a broken wrapper cannot hide itself.
namespace projecttest {

// Runs SQL on PATH with a plain read-write connection; foreign keys as asked.
// Returns the SQLite error text, empty on success.
QString rawExec(const QString& path, const char* sql, bool foreignKeys = false);
// The first column of the first row of SQL, as text.
QString rawQuery(const QString& path, const char* sql);

QByteArray readBytes(const QString& path);
void writeBytes(const QString& path, const QByteArray& bytes);
QDateTime modified(const QString& path);
// Names of the files in DIR, sorted (to see journals or WAL files appear).
QStringList filesIn(const QString& dir);

// Field-by-field comparison: the path of the first difference ("modules[0].
// items[1].askIf"), empty when equal. Makes a failed round trip readable.
QString firstDifference(const rb::Instrument& a, const rb::Instrument& b);

// Invented instruments (household gardening, commuting).
rb::Instrument minimalInstrument();
rb::Instrument fullInstrument();
rb::Instrument bigInstrument(int items);

} // namespace projecttest
