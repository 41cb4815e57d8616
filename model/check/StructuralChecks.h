#pragma once

#include "Finding.h"
#include "routing/CompiledRouting.h"

namespace rb {

// The checks that need no routing analysis: names, codes, ranges, texts, the
// syntax and types of every condition, targets, forward references, unknown
// codes, redundant gotos and unused code lists (DESIGN.md "Analysis").
Findings structuralFindings(const CompiledRouting& routing);

} // namespace rb
