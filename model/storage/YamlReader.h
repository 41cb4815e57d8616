#pragma once

#include "LoadResult.h"
#include "YamlTree.h"

namespace rb::yaml {

// Maps a parsed YAML document onto the instrument types (DESIGN.md "YAML text
// format"). Every structural problem is reported, sorted by position, and then
// no instrument is returned; anything else loads exactly as written.
LoadResult readInstrument(const Node& root, const QString& fileName);

// The number spellings the format accepts for range bounds, implied values and
// answers: an optional sign, digits with an optional fraction, an optional
// exponent ("3", "-2.5", ".5", "1e3"). Hex, octal, ".inf" and ".nan" are text.
bool isNumberText(const QString& text);
bool isIntegerText(const QString& text);

} // namespace rb::yaml
