#pragma once

#include <span>
#include <vector>

namespace rb::analysis {

// A directed graph in compressed rows, built vertex by vertex in order: one
// array for all edges instead of a list (an allocation) per vertex, which at
// tens of thousands of items is what the graph walks spent their time on.
class Digraph {
public:
    void addEdge(int to) { m_targets.push_back(to); } // from the vertex being built
    void closeVertex() { m_first.push_back(int(m_targets.size())); }
    int vertexCount() const { return int(m_first.size()) - 1; }
    std::span<const int> targets(int v) const {
        return {m_targets.data() + m_first[std::size_t(v)],
                m_targets.data() + m_first[std::size_t(v) + 1]};
    }
    static Digraph fromLists(const std::vector<std::vector<int>>& adj);

private:
    std::vector<int> m_first{0};
    std::vector<int> m_targets;
};

// Strongly connected components (Tarjan's algorithm, iterative so deep routing
// graphs cannot overflow the stack). Each component lists its vertices
// ascending; components are ordered by their smallest vertex.
std::vector<std::vector<int>> stronglyConnectedComponents(const Digraph& graph);
std::vector<std::vector<int>> stronglyConnectedComponents(const std::vector<std::vector<int>>& adj);

// Vertices reachable from `start` (breadth first), as a flag per vertex.
std::vector<bool> reachableFrom(const Digraph& graph, int start);
std::vector<bool> reachableFrom(const std::vector<std::vector<int>>& adj, int start);

} // namespace rb::analysis
