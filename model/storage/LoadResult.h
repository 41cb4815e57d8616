#pragma once

#include "instrument/Instrument.h"
#include "util/Diagnostic.h"

#include <optional>

namespace rb {

// The outcome of reading an instrument: either an instrument or every problem
// that stopped loading (then nothing is loaded).
struct LoadResult {
    std::optional<Instrument> instrument;
    Diagnostics errors;
    bool ok() const { return instrument.has_value(); }
};

} // namespace rb
