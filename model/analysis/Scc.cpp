#include "Scc.h"

#include <algorithm>

namespace rb::analysis {

Digraph Digraph::fromLists(const std::vector<std::vector<int>>& adj) {
    Digraph g;
    for (const std::vector<int>& targets : adj) {
        for (int w : targets)
            g.addEdge(w);
        g.closeVertex();
    }
    return g;
}

std::vector<std::vector<int>> stronglyConnectedComponents(const Digraph& graph) {
    const int n = graph.vertexCount();
    std::vector<int> index(n, -1), low(n, 0), stack;
    std::vector<bool> onStack(n, false);
    std::vector<std::vector<int>> components;
    int counter = 0;
    struct Frame {
        int vertex;
        std::size_t next;
    };
    std::vector<Frame> frames;
    for (int root = 0; root < n; ++root) {
        if (index[root] >= 0)
            continue;
        frames.push_back({root, 0});
        index[root] = low[root] = counter++;
        stack.push_back(root);
        onStack[root] = true;
        while (!frames.empty()) {
            Frame& f = frames.back();
            const int v = f.vertex;
            const std::span<const int> targets = graph.targets(v);
            if (f.next < targets.size()) {
                const int w = targets[f.next++];
                if (index[w] < 0) {
                    index[w] = low[w] = counter++;
                    stack.push_back(w);
                    onStack[w] = true;
                    frames.push_back({w, 0});
                } else if (onStack[w]) {
                    low[v] = std::min(low[v], index[w]);
                }
                continue;
            }
            if (low[v] == index[v]) {
                std::vector<int> component;
                int w = -1;
                do {
                    w = stack.back();
                    stack.pop_back();
                    onStack[w] = false;
                    component.push_back(w);
                } while (w != v);
                std::sort(component.begin(), component.end());
                components.push_back(std::move(component));
            }
            frames.pop_back();
            if (!frames.empty())
                low[frames.back().vertex] = std::min(low[frames.back().vertex], low[v]);
        }
    }
    // Components are disjoint, so their smallest vertices alone order them.
    std::sort(
        components.begin(), components.end(),
        [](const std::vector<int>& a, const std::vector<int>& b) { return a.front() < b.front(); });
    return components;
}

std::vector<std::vector<int>>
stronglyConnectedComponents(const std::vector<std::vector<int>>& adj) {
    return stronglyConnectedComponents(Digraph::fromLists(adj));
}

std::vector<bool> reachableFrom(const Digraph& graph, int start) {
    const int n = graph.vertexCount();
    std::vector<bool> seen(std::size_t(n), false);
    if (start < 0 || start >= n)
        return seen;
    std::vector<int> queue{start}; // breadth first: a vector read from its front
    seen[std::size_t(start)] = true;
    for (std::size_t next = 0; next < queue.size(); ++next)
        for (int w : graph.targets(queue[next]))
            if (!seen[std::size_t(w)]) {
                seen[std::size_t(w)] = true;
                queue.push_back(w);
            }
    return seen;
}

std::vector<bool> reachableFrom(const std::vector<std::vector<int>>& adj, int start) {
    return reachableFrom(Digraph::fromLists(adj), start);
}

} // namespace rb::analysis
