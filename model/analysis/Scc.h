#pragma once

#include <vector>

namespace rb::analysis {

// Strongly connected components of a directed graph given as adjacency lists
// (Tarjan's algorithm, iterative so deep routing graphs cannot overflow the
// stack). Each component lists its vertices ascending; components are ordered
// by their smallest vertex.
std::vector<std::vector<int>> stronglyConnectedComponents(const std::vector<std::vector<int>>& adj);

// Vertices reachable from `start` (breadth first), as a flag per vertex.
std::vector<bool> reachableFrom(const std::vector<std::vector<int>>& adj, int start);

} // namespace rb::analysis
