#include "RouteLayout.h"

#include <algorithm>
#include <string>
#include <unordered_map>
#include <vector>

// The route-map layout ("spine and lanes"), a layered drawing specialised to
// questionnaires:
//  1. Layers: one per node, in questionnaire order (START, items, END), so the
//     main axis reads exactly like the instrument.
//  2. Spine: edges between consecutive nodes (fall-through, a goto to the next
//     item, filtered-out) run straight down the node column.
//  3. Side: every other edge (skips, loops back, self loops) is a closed
//     interval [lo, hi] of layers routed in a vertical lane beside the column.
//     With fixed node order two such edges on one side cross exactly once when
//     their intervals interleave (lo1 < lo2 < hi1 < hi2) and never otherwise,
//     provided nested edges take inner lanes; edges on opposite sides never
//     cross. Choosing sides is therefore two-page crossing minimisation
//     (NP-hard in general): a beam search over the edges in order of their
//     upper end, whose states are the sides of the edges still open (exact
//     merging, bounded width), then single-edge moves while one lowers the
//     count.
//  4. Lanes: per side, edges in order of increasing span take the lane just
//     outside every lane already used over their interval (a skyline), which
//     puts nested edges inside and keeps lanes disjoint.
//  5. Ports: the ends of side edges on one side of a node are spread down that
//     side: ends whose other end lies above first (inner lanes on top), then
//     self loops, then ends going down (outer lanes on top) — the one order in
//     which the short horizontal stubs do not cross each other's lanes.
// Cost: O(E log E + S + C + E*W*K) for E edges, S total span, C interleaving
// pairs, beam width W and K edges open at once.

namespace rb::layout {

namespace {

struct SideEdge {
    int edge = 0;
    int lo = 0, hi = 0;
    bool backward = false;
    int side = 1;
    int lane = 0;
};

bool isSpine(const RouteEdge& e) {
    return e.to == e.from + 1;
}

QList<SideEdge> collectSideEdges(const RouteGraph& g) {
    QList<SideEdge> side;
    for (int i = 0; i < g.edges.size(); ++i) {
        const RouteEdge& e = g.edges.at(i);
        if (!isSpine(e))
            side.append({i, std::min(e.from, e.to), std::max(e.from, e.to), e.to <= e.from});
    }
    std::sort(side.begin(), side.end(), [](const SideEdge& a, const SideEdge& b) {
        return std::tie(a.lo, a.hi, a.edge) < std::tie(b.lo, b.hi, b.edge);
    });
    return side;
}

// Pairs (i, j) of side edges (indices into the lo-sorted list) whose
// intervals interleave strictly.
std::vector<std::vector<int>> interleavings(const QList<SideEdge>& side) {
    std::vector<std::vector<int>> conflicts(size_t(side.size()));
    for (int i = 0; i < side.size(); ++i) {
        const SideEdge& a = side.at(i);
        auto first = std::upper_bound(side.begin() + i, side.end(), a.lo,
                                      [](int lo, const SideEdge& s) { return lo < s.lo; });
        for (auto it = first; it != side.end() && it->lo < a.hi; ++it)
            if (it->hi > a.hi) {
                const int j = int(it - side.begin());
                conflicts[size_t(i)].push_back(j);
                conflicts[size_t(j)].push_back(i);
            }
    }
    return conflicts;
}

int sameSideConflicts(const QList<SideEdge>& side, const std::vector<int>& conflicts, int s) {
    int count = 0;
    for (int j : conflicts)
        if (side.at(j).side == s)
            ++count;
    return count;
}

// Beam search over side choices in order of the upper end. Only the sides of
// edges still open at the current layer matter for the future (a closed edge
// cannot interleave with a later one), so states with equal open sides merge
// exactly; keeping the kBeamWidth cheapest is the only approximation.
constexpr int kBeamWidth = 128;

struct BeamState {
    std::vector<std::pair<int, int>> open; // (side-edge index, side), in index order
    qint64 cost = 0;
    int parent = -1;
    int side = 1;
};

std::vector<int> beamSides(const QList<SideEdge>& side) {
    std::vector<BeamState> beam(1);
    std::vector<std::vector<std::pair<int, int>>> trace; // per step: (parent, side)
    trace.reserve(size_t(side.size()));
    for (int i = 0; i < side.size(); ++i) {
        const SideEdge& e = side.at(i);
        const int preferred = e.backward ? -1 : 1;
        std::vector<BeamState> next;
        std::unordered_map<std::string, size_t> seen;
        for (size_t k = 0; k < beam.size(); ++k) {
            std::vector<std::pair<int, int>> open;
            for (const auto& o : beam[k].open)
                if (side.at(o.first).hi > e.lo)
                    open.push_back(o);
            for (int s : {preferred, -preferred}) {
                qint64 cost = beam[k].cost;
                for (const auto& [f, fs] : open)
                    if (fs == s && side.at(f).lo < e.lo && side.at(f).hi < e.hi)
                        ++cost;
                BeamState state{open, cost, int(k), s};
                state.open.push_back({i, s});
                std::string key;
                for (const auto& o : state.open)
                    key += std::to_string(o.first * 2 + (o.second > 0)) + ',';
                const auto found = seen.find(key);
                if (found == seen.end()) {
                    seen.emplace(key, next.size());
                    next.push_back(std::move(state));
                } else if (cost < next[found->second].cost) {
                    next[found->second] = std::move(state);
                }
            }
        }
        std::stable_sort(next.begin(), next.end(),
                         [](const BeamState& a, const BeamState& b) { return a.cost < b.cost; });
        if (next.size() > size_t(kBeamWidth))
            next.resize(size_t(kBeamWidth));
        std::vector<std::pair<int, int>> step;
        for (const BeamState& st : next)
            step.push_back({st.parent, st.side});
        trace.push_back(std::move(step));
        beam = std::move(next);
    }
    std::vector<int> result(size_t(side.size()), 1);
    int k = 0; // the cheapest final state
    for (int i = int(side.size()) - 1; i >= 0; --i) {
        result[size_t(i)] = trace[size_t(i)][size_t(k)].second;
        k = trace[size_t(i)][size_t(k)].first;
    }
    return result;
}

void chooseSides(QList<SideEdge>& side) {
    const std::vector<int> sides = beamSides(side);
    for (int i = 0; i < side.size(); ++i)
        side[i].side = sides[size_t(i)];
    // Polish: single-edge moves while one lowers the count (each strictly
    // lowers it, so this ends).
    const std::vector<std::vector<int>> conflicts = interleavings(side);
    for (bool moved = true; moved;) {
        moved = false;
        for (int i = 0; i < side.size(); ++i) {
            const int s = side.at(i).side;
            if (sameSideConflicts(side, conflicts[size_t(i)], -s) <
                sameSideConflicts(side, conflicts[size_t(i)], s)) {
                side[i].side = -s;
                moved = true;
            }
        }
    }
}

void assignLanes(QList<SideEdge>& side, int layerCount) {
    QList<int> order(side.size());
    for (int i = 0; i < order.size(); ++i)
        order[i] = i;
    std::stable_sort(order.begin(), order.end(), [&](int a, int b) {
        return side.at(a).hi - side.at(a).lo < side.at(b).hi - side.at(b).lo;
    });
    std::vector<int> skyline[2] = {std::vector<int>(size_t(layerCount), 0),
                                   std::vector<int>(size_t(layerCount), 0)};
    for (int i : order) {
        SideEdge& e = side[i];
        std::vector<int>& sky = skyline[e.side > 0 ? 1 : 0];
        const int lane = 1 + *std::max_element(sky.begin() + e.lo, sky.begin() + e.hi + 1);
        std::fill(sky.begin() + e.lo, sky.begin() + e.hi + 1, lane);
        e.lane = lane;
    }
}

// One end of a side edge on one side of a node, for port ordering.
struct PortEnd {
    int sideEdge = 0;
    bool isSource = false;
    int group = 0; // 0 other end above, 1 self loop, 2 other end below
    int lane = 0;
};

bool portBefore(const PortEnd& a, const PortEnd& b) {
    if (a.group != b.group)
        return a.group < b.group;
    if (a.group == 0)
        return a.lane < b.lane;
    if (a.group == 2)
        return a.lane > b.lane;
    return std::tie(a.sideEdge, b.isSource) < std::tie(b.sideEdge, a.isSource);
}

class Builder {
public:
    Builder(const RouteGraph& g, const LayoutMetrics& m) : m_g(g), m_m(m) { m_layout.metrics = m; }

    RouteLayout run() {
        m_side = collectSideEdges(m_g);
        chooseSides(m_side);
        assignLanes(m_side, int(m_g.nodes.size()));
        for (const SideEdge& e : m_side)
            (e.side > 0 ? m_layout.rightLanes : m_layout.leftLanes) =
                std::max(e.lane, e.side > 0 ? m_layout.rightLanes : m_layout.leftLanes);
        collectPorts();
        placeNodes();
        routeSpineEdges();
        routeSideEdges();
        placeBands();
        return m_layout;
    }

private:
    void collectPorts() {
        m_ports.assign(size_t(m_g.nodes.size()) * 2, {});
        for (int i = 0; i < m_side.size(); ++i) {
            const SideEdge& s = m_side.at(i);
            const RouteEdge& e = m_g.edges.at(s.edge);
            const int self = e.from == e.to ? 1 : -1;
            portsOf(e.from, s.side)
                .push_back({i, true, self > 0 ? 1 : (e.to < e.from ? 0 : 2), s.lane});
            portsOf(e.to, s.side)
                .push_back({i, false, self > 0 ? 1 : (e.from < e.to ? 0 : 2), s.lane});
        }
        for (std::vector<PortEnd>& ports : m_ports)
            std::sort(ports.begin(), ports.end(), portBefore);
    }

    std::vector<PortEnd>& portsOf(int node, int side) {
        return m_ports[size_t(node) * 2 + (side > 0 ? 1 : 0)];
    }

    double nodeHeight(int node) {
        const size_t most = std::max(portsOf(node, -1).size(), portsOf(node, 1).size());
        return std::max(m_m.nodeHeight, double(most + 1) * m_m.portGap);
    }

    void placeNodes() {
        std::vector<bool> opensModule(size_t(m_g.nodes.size()), false);
        for (const ModuleSpan& span : m_g.modules)
            opensModule[size_t(span.firstNode)] = true;
        double y = 0;
        for (int n = 0; n < m_g.nodes.size(); ++n) {
            if (opensModule[size_t(n)])
                y += m_m.moduleHeader;
            const bool item = m_g.nodes.at(n).kind == RouteNode::Kind::Item;
            const double h = nodeHeight(n);
            // START and END stay circles, growing when many edges attach.
            const double w = item ? m_m.nodeWidth : h;
            m_layout.nodes.append(QRectF(-w / 2, y, w, h));
            y += h + m_m.layerGap;
        }
    }

    double laneX(int side, int lane) const {
        return side * (m_m.nodeWidth / 2 + m_m.laneMargin + (lane - 1) * m_m.laneGap);
    }

    void routeSpineEdges() {
        m_layout.edges.resize(m_g.edges.size());
        std::vector<std::vector<int>> byLayer(size_t(m_g.nodes.size()));
        for (int i = 0; i < m_g.edges.size(); ++i)
            if (isSpine(m_g.edges.at(i)))
                byLayer[size_t(m_g.edges.at(i).from)].push_back(i);
        for (const std::vector<int>& parallel : byLayer)
            for (size_t k = 0; k < parallel.size(); ++k) {
                const RouteEdge& e = m_g.edges.at(parallel[k]);
                const double x =
                    (double(k) - double(parallel.size() - 1) / 2) * m_m.spineEdgeOffset;
                const double top = m_layout.nodes.at(e.from).bottom();
                const double bottom = m_layout.nodes.at(e.to).top();
                EdgeRoute& r = m_layout.edges[parallel[k]];
                r.points = {QPointF(x, top), QPointF(x, bottom)};
                r.labelAnchor = QPointF(x + 4, (top + bottom) / 2 + 4);
            }
    }

    double portY(int node, int side, int sideEdge, bool isSource) {
        const std::vector<PortEnd>& ports = portsOf(node, side);
        const QRectF& rect = m_layout.nodes.at(node);
        for (size_t k = 0; k < ports.size(); ++k)
            if (ports[k].sideEdge == sideEdge && ports[k].isSource == isSource)
                return rect.top() + rect.height() * double(k + 1) / double(ports.size() + 1);
        return rect.center().y();
    }

    void routeSideEdges() {
        for (int i = 0; i < m_side.size(); ++i) {
            const SideEdge& s = m_side.at(i);
            const RouteEdge& e = m_g.edges.at(s.edge);
            const QRectF& from = m_layout.nodes.at(e.from);
            const QRectF& to = m_layout.nodes.at(e.to);
            const double fromX = s.side > 0 ? from.right() : from.left();
            const double toX = s.side > 0 ? to.right() : to.left();
            const double x = laneX(s.side, s.lane);
            const double y0 = portY(e.from, s.side, i, true);
            const double y1 = portY(e.to, s.side, i, false);
            EdgeRoute& r = m_layout.edges[s.edge];
            r.side = s.side;
            r.lane = s.lane;
            r.points = {QPointF(fromX, y0), QPointF(x, y0), QPointF(x, y1), QPointF(toX, y1)};
            r.labelAnchor = QPointF(fromX + s.side * 3, y0 - 2);
        }
    }

    void placeBands() {
        const double half = m_m.nodeWidth / 2;
        auto outer = [&](int lanes) {
            return lanes > 0 ? half + m_m.laneMargin + (lanes - 1) * m_m.laneGap + m_m.bandMargin
                             : half + m_m.bandMargin;
        };
        const double left = -outer(m_layout.leftLanes), right = outer(m_layout.rightLanes);
        for (const ModuleSpan& span : m_g.modules) {
            const double top = m_layout.nodes.at(span.firstNode).top() - m_m.moduleHeader;
            const double bottom = m_layout.nodes.at(span.lastNode).bottom() + 6;
            m_layout.moduleBands.append(QRectF(QPointF(left, top), QPointF(right, bottom)));
        }
        QRectF bounds;
        for (const QRectF& r : m_layout.nodes)
            bounds |= r;
        bounds |= QRectF(QPointF(left, bounds.top()), QPointF(right, bounds.bottom()));
        for (const QRectF& r : m_layout.moduleBands)
            bounds |= r;
        m_layout.bounds = bounds.adjusted(-8, -8, 8, 8);
    }

    const RouteGraph& m_g;
    const LayoutMetrics& m_m;
    RouteLayout m_layout;
    QList<SideEdge> m_side;
    std::vector<std::vector<PortEnd>> m_ports;
};

} // namespace

RouteLayout layoutRouteGraph(const RouteGraph& graph, const LayoutMetrics& metrics) {
    return Builder(graph, metrics).run();
}

QList<CrossingCounter::LayeredEdge> RouteLayout::layeredEdges(const RouteGraph& graph) const {
    QList<CrossingCounter::LayeredEdge> layered;
    layered.reserve(graph.edges.size());
    for (int i = 0; i < graph.edges.size(); ++i) {
        const RouteEdge& e = graph.edges.at(i);
        const int lo = std::min(e.from, e.to), hi = std::max(e.from, e.to);
        CrossingCounter::LayeredEdge l;
        l.firstLayer = lo;
        const double laneXValue = edges.at(i).points.size() > 1 ? edges.at(i).points.at(1).x() : 0;
        for (int layer = lo; layer <= hi; ++layer)
            l.xs.append(layer == lo || layer == hi ? nodes.at(layer).center().x() : laneXValue);
        layered.append(l);
    }
    return layered;
}

qint64 RouteLayout::crossings(const RouteGraph& graph) const {
    return CrossingCounter::layeredCrossings(layeredEdges(graph), int(nodes.size()));
}

} // namespace rb::layout
