#pragma once

#include "Finding.h"
#include "routing/CompiledRouting.h"

namespace rb {

// Every finding of `check`, sorted as DESIGN.md says.
Findings checkInstrument(const CompiledRouting& routing);

struct FindingCounts {
    int errors = 0;
    int warnings = 0;
};
FindingCounts countFindings(const Findings& findings);

} // namespace rb
