#pragma once

#include "CellSet.h"
#include "Mdd.h"

#include <cstdint>
#include <vector>

namespace rb::analysis {

// A product: one cell set per variable it constrains (variables in the
// caller's order); a sum of products is exact in meaning.
struct SopLiteral {
    int var = 0;
    CellSet cells;
    bool operator==(const SopLiteral&) const = default;
};
struct SopProduct {
    std::vector<SopLiteral> literals; // empty product = true
    bool operator==(const SopProduct&) const = default;
};
struct Sop {
    std::vector<SopProduct> products; // no product = false
    bool exact = true;                // false: the heuristic was used (still equivalent)
    int literalCount() const;
};

// Minimal sum of products of the incompletely specified function with on-set
// `on` and care set `care` (on must imply care), over `vars` given in
// questionnaire order; `on` and `care` must depend on these variables only.
// Minimal = fewest products, then fewest literals (one literal per variable
// and product, whatever its cell set), ties broken by questionnaire order.
// Exact (prime implicants by recursive cofactor intersection, then an exact
// branch-and-bound cover) when `vars` has at most `exactLimit` variables and the
// problem stays small; otherwise the documented heuristic: the diagram's paths
// of `on`, each widened greedily (variables in questionnaire order, first to
// the full set, else cell by cell) while it stays inside on-or-don't-care,
// then absorbed cubes dropped.
Sop minimiseSop(Mdd& mdd, int on, int care, const std::vector<int>& vars, int exactLimit = 12);

} // namespace rb::analysis
