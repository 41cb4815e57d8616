#pragma once

#include "LoadResult.h"

#include <QByteArray>

namespace rb {

// The YAML text format of DESIGN.md. Structural problems (malformed YAML, wrong
// type, unknown key - the message lists the allowed keys -, missing required
// key, unknown item type or code list) are all reported with file:line:column
// and nothing is loaded. Everything else loads and is left to `check`.
LoadResult loadYamlText(const QByteArray& text, const QString& fileName);
LoadResult loadYamlFile(const QString& path);

// Canonical text: fixed key order, fixed quoting, so saving what was loaded
// gives the same bytes every time.
QByteArray saveYamlText(const Instrument& instrument);
// Written through QSaveFile: the old file stays whole if anything fails.
std::optional<Diagnostic> saveYamlFile(const Instrument& instrument, const QString& path);

} // namespace rb
