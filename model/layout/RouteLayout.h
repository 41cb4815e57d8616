#pragma once

#include "layout/CrossingCounter.h"
#include "layout/RouteGraph.h"

#include <QList>
#include <QPointF>
#include <QRectF>

namespace rb::layout {

// Sizes of the drawing, in scene units (pixels at 100 %).
struct LayoutMetrics {
    double nodeWidth = 190;
    double nodeHeight = 34;      // at least; grows when many edges attach
    double portGap = 7;          // between two edge ends on one side of a node
    double layerGap = 22;        // free space between two consecutive nodes
    double laneGap = 12;         // between two lanes
    double laneMargin = 18;      // between the node column and the first lane
    double moduleHeader = 20;    // title strip of a module band
    double bandMargin = 10;      // band frame beyond the outermost lane
    double spineEdgeOffset = 14; // x spacing of parallel short edges
};

// Where an edge runs. Spine edges join consecutive nodes straight down the
// node column; side edges leave a node sideways into a vertical lane left
// (side -1) or right (side +1) of the column and enter the other node sideways.
// A side edge may cross the spine once, in the gap below node crossGap: then it
// runs in one lane next to its source and in another on the other side next to
// its target (points: source stub, lane, across, lane, target stub).
struct EdgeRoute {
    int side = 0;          // at the source end: -1 left lane, 0 spine, +1 right lane
    int lane = 0;          // 1-based lane number on its side; 0 on the spine
    int crossGap = -1;     // crosses the spine below this node index; -1 never
    int targetSide = 0;    // side and lane at the target end (= side, lane unless
    int targetLane = 0;    // the edge crosses the spine)
    QList<QPointF> points; // polyline from the source end to the target end
    QPointF labelAnchor;   // where a label may start (left edge of its baseline)
};

struct RouteLayout {
    LayoutMetrics metrics;
    QList<QRectF> nodes;       // by node index (= layer)
    QList<EdgeRoute> edges;    // by edge index
    QList<QRectF> moduleBands; // by module index
    QRectF bounds;
    int leftLanes = 0;
    int rightLanes = 0;

    // The drawing in the layered form CrossingCounter takes: every edge as
    // the x at each layer from its upper to its lower end (node centre at the
    // ends, lane x in between).
    QList<CrossingCounter::LayeredEdge> layeredEdges(const RouteGraph& graph) const;
    qint64 crossings(const RouteGraph& graph) const;
};

RouteLayout layoutRouteGraph(const RouteGraph& graph, const LayoutMetrics& metrics = {});

} // namespace rb::layout
