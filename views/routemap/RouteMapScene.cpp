#include "RouteMapScene.h"

#include "RouteMapItems.h"
#include "layout/SvgWriter.h"

#include <algorithm>

namespace rb {

RouteMapScene::RouteMapScene(QObject* parent) : QGraphicsScene(parent) {}

void RouteMapScene::setRouting(const CompiledRouting& routing, const RoutingAnalysis* analysis) {
    clear();
    m_nodes.clear();
    m_edges.clear();
    m_title = routing.instrument().title;
    m_graph = layout::RouteGraph::fromRouting(routing);
    if (analysis)
        m_graph.applyUniverses(analysis->universes);
    m_layout = layout::layoutRouteGraph(m_graph);
    m_bandCount = int(m_graph.modules.size());
    for (int m = 0; m < m_graph.modules.size(); ++m)
        addItem(new ModuleBandItem(m_graph.modules.at(m), m_layout.moduleBands.at(m)));
    for (int e = 0; e < m_graph.edges.size(); ++e) {
        const layout::RouteEdge& edge = m_graph.edges.at(e);
        auto* item =
            new RouteEdgeItem(e, edge, m_layout.edges.at(e), m_graph.nodes.at(edge.from).name,
                              m_graph.nodes.at(edge.to).name);
        addItem(item);
        m_edges.insert(e, item);
    }
    for (int n = 0; n < m_graph.nodes.size(); ++n) {
        auto* item = new RouteNodeItem(n, m_graph.nodes.at(n), m_layout.nodes.at(n));
        addItem(item);
        m_nodes.insert(n, item);
    }
    setSceneRect(m_layout.bounds);
}

RouteNodeItem* RouteMapScene::itemAtPosition(int position) const {
    return m_nodes.value(layout::RouteGraph::nodeOfPosition(position));
}

void RouteMapScene::highlightPathsTo(int node) {
    QList<int> on;
    if (node >= 0 && node < m_graph.nodes.size())
        on = m_graph.edgesLeadingTo(node);
    for (auto it = m_edges.begin(); it != m_edges.end(); ++it)
        it.value()->setHighlighted(std::binary_search(on.begin(), on.end(), it.key()));
}

QList<int> RouteMapScene::highlightedEdges() const {
    QList<int> on;
    for (auto it = m_edges.begin(); it != m_edges.end(); ++it)
        if (it.value()->isHighlighted())
            on.append(it.key());
    std::sort(on.begin(), on.end());
    return on;
}

QByteArray RouteMapScene::toSvg() const {
    return layout::writeRouteMapSvg(m_graph, m_layout, m_title);
}

} // namespace rb
