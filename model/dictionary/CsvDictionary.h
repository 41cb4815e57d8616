#pragma once

#include "Dictionary.h"

#include <QByteArray>
#include <QStringList>

namespace rb {

// The dictionary as RFC 4180 CSV (UTF-8, CRLF): one row per variable-code pair,
// plus one row for each variable without codes. Statements have no variable
// and no row. The columns are documented in README ("Data dictionary CSV").
QByteArray exportCsvDictionary(const Dictionary& dictionary);

// The header row, in order.
QStringList csvDictionaryColumns();

} // namespace rb
