#pragma once

#include <QList>
#include <QPointF>

#include <utility>

namespace rb::layout {

// Edge crossings of layered drawings.
//
// bilayerCrossings() is the accumulator-tree count of Barth, Juenger and Mutzel
// ("Simple and Efficient Bilayer Cross Counting", JGAA 8(2), 2004): sort the
// edges by north position, then south position, and count the inversions of
// the resulting south sequence; O(E log S). Edges that share an end do not cross.
//
// layeredCrossings() applies it to a whole drawing: every edge is given as the
// x coordinate at each layer it meets (consecutive layers, first layer index),
// so both our layout and a foreign one (Graphviz dot's `-Tplain` splines,
// sampled at its rank lines) are counted by exactly the same rule.
class CrossingCounter {
public:
    // One edge between two adjacent layers: (north index, south index).
    using BilayerEdge = std::pair<int, int>;
    static qint64 bilayerCrossings(QList<BilayerEdge> edges, int southCount);

    // One edge of a layered drawing: its x at layers firstLayer, firstLayer+1, ...
    struct LayeredEdge {
        int firstLayer = 0;
        QList<double> xs;
    };
    static qint64 layeredCrossings(const QList<LayeredEdge>& edges, int layerCount);
};

} // namespace rb::layout
