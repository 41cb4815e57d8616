#include "CrossingCounter.h"

#include <algorithm>
#include <vector>

namespace rb::layout {

qint64 CrossingCounter::bilayerCrossings(QList<BilayerEdge> edges, int southCount) {
    std::sort(edges.begin(), edges.end());
    // Complete binary accumulator tree with firstIndex leaves >= southCount.
    int firstIndex = 1;
    while (firstIndex < southCount)
        firstIndex *= 2;
    std::vector<qint64> tree(size_t(2 * firstIndex - 1), 0);
    --firstIndex;
    qint64 crossings = 0;
    for (const BilayerEdge& edge : edges) {
        // Insert the south end; every element already in a leaf to its right
        // (a larger south index with a smaller or equal north index) crosses it.
        int index = edge.second + firstIndex;
        ++tree[size_t(index)];
        while (index > 0) {
            if (index % 2)
                crossings += tree[size_t(index + 1)];
            index = (index - 1) / 2;
            ++tree[size_t(index)];
        }
    }
    return crossings;
}

namespace {

// Ranks of the distinct values of xs: equal coordinates share an index, so
// edges meeting at one node (or one point) are not counted as crossing.
QList<int> denseRanks(const QList<double>& xs, int* distinct) {
    QList<double> sorted = xs;
    std::sort(sorted.begin(), sorted.end());
    sorted.erase(std::unique(sorted.begin(), sorted.end()), sorted.end());
    QList<int> ranks;
    ranks.reserve(xs.size());
    for (double x : xs)
        ranks.append(int(std::lower_bound(sorted.begin(), sorted.end(), x) - sorted.begin()));
    *distinct = int(sorted.size());
    return ranks;
}

} // namespace

qint64 CrossingCounter::layeredCrossings(const QList<LayeredEdge>& edges, int layerCount) {
    // Segments between layer l and l+1, bucketed by l.
    std::vector<QList<std::pair<double, double>>> gaps(size_t(std::max(layerCount - 1, 0)));
    for (const LayeredEdge& e : edges)
        for (int k = 0; k + 1 < e.xs.size(); ++k) {
            const int layer = e.firstLayer + k;
            if (layer >= 0 && layer + 1 < layerCount)
                gaps[size_t(layer)].append({e.xs.at(k), e.xs.at(k + 1)});
        }
    qint64 total = 0;
    for (const QList<std::pair<double, double>>& segments : gaps) {
        if (segments.size() < 2)
            continue;
        QList<double> north, south;
        for (const auto& s : segments) {
            north.append(s.first);
            south.append(s.second);
        }
        int northCount = 0, southCount = 0;
        const QList<int> n = denseRanks(north, &northCount);
        const QList<int> s = denseRanks(south, &southCount);
        QList<BilayerEdge> bilayer;
        bilayer.reserve(segments.size());
        for (int i = 0; i < n.size(); ++i)
            bilayer.append({n.at(i), s.at(i)});
        total += bilayerCrossings(bilayer, southCount);
    }
    return total;
}

} // namespace rb::layout
