#pragma once

#include "Finding.h"
#include "routing/CompiledRouting.h"

namespace rb {

// Replays every stored test respondent through the simulator and reports
// `test-respondent-fails` when the path differs from the expected one.
Findings testRespondentFindings(const CompiledRouting& routing);

} // namespace rb
