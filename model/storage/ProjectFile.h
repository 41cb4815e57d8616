#pragma once

#include "LoadResult.h"

namespace rb {

// The SQLite project file (.routebook). Schema version table, foreign keys on,
// prepared statements only, one transaction per save.
inline constexpr int kProjectSchemaVersion = 1;

LoadResult loadProjectFile(const QString& path);
std::optional<Diagnostic> saveProjectFile(const Instrument& instrument, const QString& path);

} // namespace rb
