#include "RouteGraph.h"

#include "analysis/Scc.h"

#include <vector>

namespace rb::layout {

namespace {

QString joinedFilter(const ItemIndex::Entry& e) {
    QStringList parts;
    for (const std::optional<QString>& f : {e.module->askIf, e.item->askIf})
        if (f)
            parts.append(*f);
    return parts.join(QStringLiteral(" and "));
}

RouteNode terminal(RouteNode::Kind kind, const QString& name) {
    RouteNode node;
    node.kind = kind;
    node.name = name;
    return node;
}

void addNodes(const CompiledRouting& routing, RouteGraph& g) {
    g.nodes.append(terminal(RouteNode::Kind::Start, QStringLiteral("START")));
    for (const ItemIndex::Entry& e : routing.index().entries()) {
        RouteNode node;
        node.position = e.position;
        node.name = e.item->name;
        node.label = e.item->label;
        node.module = e.module->name;
        node.filter = joinedFilter(e);
        g.nodes.append(node);
    }
    g.nodes.append(terminal(RouteNode::Kind::End, QStringLiteral("END")));
}

// Same edge set and order as exportDot(): usable rules in order until an
// unconditional one, then the fall-through, then the filtered-out edge.
void addEdges(const CompiledRouting& routing, RouteGraph& g) {
    g.edges.append({RouteEdge::Kind::Next, 0, 1, {}});
    for (int p = 0; p < routing.itemCount(); ++p) {
        const int from = RouteGraph::nodeOfPosition(p);
        const QList<Rule>& rules = routing.index().at(p).item->routing;
        bool always = false;
        for (int k = 0; k < rules.size() && !always; ++k) {
            const CompiledRouting::CompiledRule& rule = routing.item(p).rules.at(k);
            if (!rule.usable)
                continue;
            always = rule.condition == nullptr;
            g.edges.append({RouteEdge::Kind::Rule, from, RouteGraph::nodeOfPosition(rule.target),
                            always ? QStringLiteral("always") : *rules.at(k).condition});
        }
        if (!always)
            g.edges.append({RouteEdge::Kind::Next, from, from + 1, {}});
        if (!routing.item(p).filters.isEmpty())
            g.edges.append(
                {RouteEdge::Kind::Filtered, from, from + 1, QStringLiteral("filtered out")});
    }
}

std::vector<std::vector<int>> adjacency(const RouteGraph& g, bool reversed) {
    std::vector<std::vector<int>> adj(size_t(g.nodes.size()));
    for (const RouteEdge& e : g.edges)
        adj[size_t(reversed ? e.to : e.from)].push_back(reversed ? e.from : e.to);
    return adj;
}

void markStructure(RouteGraph& g) {
    const auto adj = adjacency(g, false);
    const std::vector<bool> reached = analysis::reachableFrom(adj, g.startNode());
    // A node is passed by when a reachable edge jumps over it (u < v < w) or
    // when it has a filter (its filtered-out edge); a difference array makes
    // this linear in the total edge span.
    std::vector<int> bypass(size_t(g.nodes.size()) + 1, 0);
    for (const RouteEdge& e : g.edges)
        if (reached[size_t(e.from)] && e.to > e.from + 1) {
            ++bypass[size_t(e.from) + 1];
            --bypass[size_t(e.to)];
        }
    int running = 0;
    for (int n = 0; n < g.nodes.size(); ++n) {
        running += bypass[size_t(n)];
        RouteNode& node = g.nodes[n];
        node.unreachable = !reached[size_t(n)];
        node.conditional = node.kind == RouteNode::Kind::Item && !node.unreachable &&
                           (running > 0 || !node.filter.isEmpty());
    }
    for (const std::vector<int>& scc : analysis::stronglyConnectedComponents(adj))
        if (scc.size() > 1)
            for (int n : scc)
                g.nodes[n].looping = true;
    for (const RouteEdge& e : g.edges)
        if (e.from == e.to)
            g.nodes[e.from].looping = true;
}

void addModules(const CompiledRouting& routing, RouteGraph& g) {
    const QList<ItemIndex::Entry>& entries = routing.index().entries();
    for (int p = 0; p < entries.size(); ++p) {
        if (p > 0 && entries.at(p).moduleIndex == entries.at(p - 1).moduleIndex) {
            g.modules.last().lastNode = RouteGraph::nodeOfPosition(p);
            continue;
        }
        const Module& m = *entries.at(p).module;
        g.modules.append(
            {m.name, m.title, RouteGraph::nodeOfPosition(p), RouteGraph::nodeOfPosition(p)});
    }
}

} // namespace

RouteGraph RouteGraph::fromRouting(const CompiledRouting& routing) {
    RouteGraph g;
    addNodes(routing, g);
    addEdges(routing, g);
    addModules(routing, g);
    markStructure(g);
    return g;
}

void RouteGraph::applyUniverses(const QList<ItemUniverse>& universes) {
    for (const ItemUniverse& u : universes) {
        const int n = nodeOfPosition(u.position);
        if (u.position < 0 || n >= endNode())
            continue;
        RouteNode& node = nodes[n];
        node.conditional = u.asked == ItemUniverse::Asked::Conditional;
        node.unreachable = u.asked == ItemUniverse::Asked::Never;
        node.universe = u.askedIf;
    }
}

QList<int> RouteGraph::edgesLeadingTo(int node) const {
    const std::vector<bool> fromStart =
        analysis::reachableFrom(adjacency(*this, false), startNode());
    const std::vector<bool> toNode = analysis::reachableFrom(adjacency(*this, true), node);
    QList<int> result;
    for (int i = 0; i < edges.size(); ++i)
        if (fromStart[size_t(edges.at(i).from)] && toNode[size_t(edges.at(i).to)])
            result.append(i);
    return result;
}

QString shortCondition(const QString& condition, int maxChars) {
    const QString simple = condition.simplified();
    if (simple.size() <= maxChars || maxChars < 2)
        return simple;
    return simple.left(maxChars - 1) + QChar(0x2026);
}

} // namespace rb::layout
