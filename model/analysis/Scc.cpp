#include "Scc.h"

#include <algorithm>
#include <deque>

namespace rb::analysis {

std::vector<std::vector<int>>
stronglyConnectedComponents(const std::vector<std::vector<int>>& adj) {
    const int n = int(adj.size());
    std::vector<int> index(n, -1), low(n, 0), stack;
    std::vector<bool> onStack(n, false);
    std::vector<std::vector<int>> components;
    int counter = 0;
    struct Frame {
        int vertex;
        std::size_t next;
    };
    for (int root = 0; root < n; ++root) {
        if (index[root] >= 0)
            continue;
        std::vector<Frame> frames{{root, 0}};
        index[root] = low[root] = counter++;
        stack.push_back(root);
        onStack[root] = true;
        while (!frames.empty()) {
            Frame& f = frames.back();
            const int v = f.vertex;
            if (f.next < adj[v].size()) {
                const int w = adj[v][f.next++];
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
                components.push_back(component);
            }
            frames.pop_back();
            if (!frames.empty())
                low[frames.back().vertex] = std::min(low[frames.back().vertex], low[v]);
        }
    }
    std::sort(components.begin(), components.end());
    return components;
}

std::vector<bool> reachableFrom(const std::vector<std::vector<int>>& adj, int start) {
    std::vector<bool> seen(adj.size(), false);
    if (start < 0 || start >= int(adj.size()))
        return seen;
    std::deque<int> queue{start};
    seen[start] = true;
    while (!queue.empty()) {
        const int v = queue.front();
        queue.pop_front();
        for (int w : adj[v])
            if (!seen[w]) {
                seen[w] = true;
                queue.push_back(w);
            }
    }
    return seen;
}

} // namespace rb::analysis
