#pragma once

#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"
#include "routing/CompiledRouting.h"

#include <QGraphicsScene>
#include <QHash>

namespace rb {

class RouteEdgeItem;
class RouteNodeItem;

// The route map as a scene: one RouteNodeItem per node (START, items, END),
// one RouteEdgeItem per edge, one band per module, placed by the model's
// layout. Keeps index -> item maps and rebuilds everything on setRouting().
class RouteMapScene : public QGraphicsScene {
    Q_OBJECT

public:
    explicit RouteMapScene(QObject* parent = nullptr);

    // With an analysis, markers and tooltips use its exact universes.
    void setRouting(const CompiledRouting& routing, const RoutingAnalysis* analysis = nullptr);
    const layout::RouteGraph& graph() const { return m_graph; }
    const layout::RouteLayout& routeLayout() const { return m_layout; }

    RouteNodeItem* nodeItem(int node) const { return m_nodes.value(node); }
    RouteNodeItem* itemAtPosition(int position) const;
    RouteEdgeItem* edgeItem(int edge) const { return m_edges.value(edge); }
    int nodeCount() const { return int(m_nodes.size()); }
    int edgeCount() const { return int(m_edges.size()); }
    int bandCount() const { return m_bandCount; }

    // Highlights every edge on some path from START to `node` (its universe);
    // -1 clears the highlight.
    void highlightPathsTo(int node);
    QList<int> highlightedEdges() const;

    QByteArray toSvg() const;

private:
    layout::RouteGraph m_graph;
    layout::RouteLayout m_layout;
    QString m_title;
    QHash<int, RouteNodeItem*> m_nodes;
    QHash<int, RouteEdgeItem*> m_edges;
    int m_bandCount = 0;
};

} // namespace rb
