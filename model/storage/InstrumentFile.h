#pragma once

#include "LoadResult.h"

namespace rb {

// Opens or saves by extension: .routebook is the SQLite project, .yaml/.yml
// the text format. Any other extension is an error value.
enum class FileKind { Project, Yaml, Unknown };
FileKind fileKindOf(const QString& path);

LoadResult loadInstrumentFile(const QString& path);
std::optional<Diagnostic> saveInstrumentFile(const Instrument& instrument, const QString& path);

} // namespace rb
