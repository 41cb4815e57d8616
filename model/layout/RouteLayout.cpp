#include "RouteLayout.h"

#include <algorithm>
#include <string>
#include <unordered_map>
#include <utility>
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
//  4. Crossing the spine: an edge may change sides once, halfway down a gap
//     between two nodes, at the price of one crossing per spine edge in that
//     gap. In half-layer units its two parts are intervals again and rule 3
//     still counts their crossings, so a local search moves one edge at a time
//     to its cheapest form (whole on either side, or either side on top with a
//     change in some gap no other edge uses) while that strictly lowers the
//     count; a few sweeps. This is the freedom a general layered layout has
//     (an edge may pass a node on either side) that two pages lack.
//  5. Lanes: per side, parts in order of increasing length take the lane just
//     outside every lane already used over their extent (a skyline over
//     half-layers), which puts nested parts inside and keeps lanes disjoint.
//  6. Ports: the ends of side edges on one side of a node are spread down that
//     side: ends whose other end lies above first (inner lanes on top), then
//     self loops, then ends going down (outer lanes on top) — the one order in
//     which the short horizontal stubs do not cross each other's lanes.
// Cost: O(E log E + S + C + E*W*K) for the sides (E edges, S total span, C
// interleaving pairs, beam width W, K edges open at once), plus O(P * S/E) per
// sweep of step 4 for P overlapping pairs (skipped beyond 4 million pairs,
// stopped after 10^8 part comparisons).
// Not done, on purpose: branches side by side (a skipped block beside the
// path that skips it) would give up one node per layer, which keeps the main
// axis in questionnaire order and lets every edge reach its lane without
// passing a node; see DEVELOPERS.md.

namespace rb::layout {

namespace {

struct SideEdge {
    int edge = 0;
    int lo = 0, hi = 0;
    bool backward = false;
    int side = 1; // of the upper part (from layer lo)
    int lane = 0;
    int gap = -1;  // crosses the spine between layers gap and gap + 1; -1 never
    int side2 = 1; // of the lower part (down to layer hi); = side when gap < 0
    int lane2 = 0;

    int sideAt(int layer) const { return gap >= 0 && layer > gap ? side2 : side; }
    int laneAt(int layer) const { return gap >= 0 && layer > gap ? lane2 : lane; }
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
// exactly; keeping the cheapest (kBeamWidth, fewer when very many edges are
// open) is the only approximation.
constexpr int kBeamWidth = 128;
// States cost O(open edges) each to copy and merge; when very many edges are
// open at once (long skips everywhere) the beam narrows to keep the step cost
// near kBeamWidth * 64, never below 8 states.
constexpr size_t kBeamBudget = 8192;

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
        const size_t open = next.empty() ? 1 : std::max<size_t>(1, next.front().open.size());
        const size_t width = std::clamp(kBeamBudget / open, size_t(8), size_t(kBeamWidth));
        if (next.size() > width)
            next.resize(width);
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
        side[i].side = side[i].side2 = sides[size_t(i)];
    // Polish: single-edge moves while one lowers the count (each strictly
    // lowers it, so this ends).
    const std::vector<std::vector<int>> conflicts = interleavings(side);
    for (bool moved = true; moved;) {
        moved = false;
        for (int i = 0; i < side.size(); ++i) {
            const int s = side.at(i).side;
            if (sameSideConflicts(side, conflicts[size_t(i)], -s) <
                sameSideConflicts(side, conflicts[size_t(i)], s)) {
                side[i].side = side[i].side2 = -s;
                moved = true;
            }
        }
    }
}

// --- Crossing the spine ------------------------------------------------------
// A side edge may change sides once, in a gap between two nodes: its upper part
// runs in a lane on one side, its lower part on the other. In half-layer units
// (node l at 2l, the gap below it at 2l + 1) the parts are intervals again, and
// two parts on one side cross exactly when they interleave strictly, as whole
// edges do; the change itself crosses every spine edge of that gap. One change
// per gap keeps the horizontal runs apart.
struct Part {
    int lo = 0, hi = 0; // half-layer units
    int side = 1;
};

bool interleave(const Part& a, const Part& b) {
    return (a.lo < b.lo && b.lo < a.hi && a.hi < b.hi) ||
           (b.lo < a.lo && a.lo < b.hi && b.hi < a.hi);
}

int partsOf(const SideEdge& e, Part* out) {
    if (e.gap < 0) {
        out[0] = {2 * e.lo, 2 * e.hi, e.side};
        return 1;
    }
    out[0] = {2 * e.lo, 2 * e.gap + 1, e.side};
    out[1] = {2 * e.gap + 1, 2 * e.hi, e.side2};
    return 2;
}

// Edges whose intervals overlap (share more than an end): the only ones whose
// parts can interleave. Empty when there are more pairs than `budget`.
std::vector<std::vector<int>> overlaps(const QList<SideEdge>& side, qint64 budget) {
    std::vector<std::vector<int>> result(size_t(side.size()));
    for (int i = 0; i < side.size(); ++i)
        for (int j = i + 1; j < side.size() && side.at(j).lo < side.at(i).hi; ++j) {
            if (side.at(j).hi <= side.at(i).lo)
                continue;
            if (--budget < 0)
                return {};
            result[size_t(i)].push_back(j);
            result[size_t(j)].push_back(i);
        }
    return result;
}

class CrossOvers {
public:
    CrossOvers(QList<SideEdge>& side, std::vector<int> spineEdges)
        : m_side(side), m_spine(std::move(spineEdges)), m_used(m_spine.size(), false) {}

    // Moves one edge at a time to its cheapest form (either side whole, or
    // either side on top with a change in some free gap) while that strictly
    // lowers the count; a bounded number of sweeps.
    void run() {
        m_overlaps = overlaps(m_side, kPairBudget);
        if (m_overlaps.empty())
            return;
        for (int sweep = 0; sweep < kSweeps; ++sweep) {
            bool moved = false;
            for (int i = 0; i < m_side.size() && m_work < kWorkBudget; ++i)
                moved = improve(i) || moved;
            if (!moved)
                break;
        }
    }

private:
    // Bounds for instruments with many long, overlapping edges (a search that
    // stops early leaves a valid drawing with the count reached so far).
    static constexpr qint64 kPairBudget = 4'000'000;
    static constexpr qint64 kWorkBudget = 100'000'000; // part comparisons
    static constexpr int kSweeps = 6;

    qint64 cost(int i, const SideEdge& form) const {
        Part mine[2], theirs[2];
        const int n = partsOf(form, mine);
        m_work += qint64(m_overlaps[size_t(i)].size()) * 2 * n;
        qint64 c = form.gap >= 0 ? m_spine[size_t(form.gap)] : 0;
        for (int j : m_overlaps[size_t(i)]) {
            const int m = partsOf(m_side.at(j), theirs);
            for (int a = 0; a < n; ++a)
                for (int b = 0; b < m; ++b)
                    c += mine[a].side == theirs[b].side && interleave(mine[a], theirs[b]);
        }
        return c;
    }

    bool improve(int i) {
        const SideEdge current = m_side.at(i);
        SideEdge best = current;
        qint64 bestCost = cost(i, current);
        auto consider = [&](const SideEdge& form) {
            const qint64 c = cost(i, form);
            if (c < bestCost) {
                bestCost = c;
                best = form;
            }
        };
        for (int s : {-1, 1}) {
            SideEdge whole = current;
            whole.gap = -1;
            whole.side = whole.side2 = s;
            consider(whole);
            // A change needs a layer of each part between the ends.
            for (int g = current.lo + 1; g <= current.hi - 2; ++g) {
                if (m_used[size_t(g)] && g != current.gap)
                    continue;
                SideEdge split = current;
                split.gap = g;
                split.side = s;
                split.side2 = -s;
                consider(split);
            }
        }
        if (best.gap == current.gap && best.side == current.side && best.side2 == current.side2)
            return false;
        if (current.gap >= 0)
            m_used[size_t(current.gap)] = false;
        if (best.gap >= 0)
            m_used[size_t(best.gap)] = true;
        m_side[i] = best;
        return true;
    }

    QList<SideEdge>& m_side;
    std::vector<int> m_spine; // spine edges per gap (the price of crossing there)
    std::vector<bool> m_used;
    std::vector<std::vector<int>> m_overlaps;
    mutable qint64 m_work = 0;
};

// Lanes per side by a skyline over half-layer positions, parts in order of
// increasing length: each takes the lane just outside every lane already used
// over its extent, so nested parts lie inside and lanes never share a line.
void assignLanes(QList<SideEdge>& side, int layerCount) {
    struct Ref {
        int edge, part;
        Part p;
    };
    std::vector<Ref> parts;
    for (int i = 0; i < side.size(); ++i) {
        Part p[2];
        const int n = partsOf(side.at(i), p);
        for (int k = 0; k < n; ++k)
            parts.push_back({i, k, p[k]});
    }
    std::stable_sort(parts.begin(), parts.end(),
                     [](const Ref& a, const Ref& b) { return a.p.hi - a.p.lo < b.p.hi - b.p.lo; });
    std::vector<int> skyline[2] = {std::vector<int>(size_t(2 * layerCount), 0),
                                   std::vector<int>(size_t(2 * layerCount), 0)};
    for (const Ref& r : parts) {
        std::vector<int>& sky = skyline[r.p.side > 0 ? 1 : 0];
        const int lane = 1 + *std::max_element(sky.begin() + r.p.lo, sky.begin() + r.p.hi + 1);
        std::fill(sky.begin() + r.p.lo, sky.begin() + r.p.hi + 1, lane);
        SideEdge& e = side[r.edge];
        (r.part == 0 ? e.lane : e.lane2) = lane;
        if (e.gap < 0)
            e.lane2 = lane;
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
        CrossOvers(m_side, spineEdgesPerGap()).run();
        assignLanes(m_side, int(m_g.nodes.size()));
        for (const SideEdge& e : m_side)
            for (int layer : {e.lo, e.hi}) {
                int& lanes = e.sideAt(layer) > 0 ? m_layout.rightLanes : m_layout.leftLanes;
                lanes = std::max(lanes, e.laneAt(layer));
            }
        collectPorts();
        placeNodes();
        routeSpineEdges();
        routeSideEdges();
        placeBands();
        return m_layout;
    }

private:
    std::vector<int> spineEdgesPerGap() const {
        std::vector<int> count(size_t(m_g.nodes.size()), 0);
        for (const RouteEdge& e : m_g.edges)
            if (isSpine(e))
                ++count[size_t(e.from)];
        return count;
    }

    void collectPorts() {
        m_ports.assign(size_t(m_g.nodes.size()) * 2, {});
        for (int i = 0; i < m_side.size(); ++i) {
            const SideEdge& s = m_side.at(i);
            const RouteEdge& e = m_g.edges.at(s.edge);
            const int self = e.from == e.to ? 1 : -1;
            portsOf(e.from, s.sideAt(e.from))
                .push_back({i, true, self > 0 ? 1 : (e.to < e.from ? 0 : 2), s.laneAt(e.from)});
            portsOf(e.to, s.sideAt(e.to))
                .push_back({i, false, self > 0 ? 1 : (e.from < e.to ? 0 : 2), s.laneAt(e.to)});
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
            const int fromSide = s.sideAt(e.from), toSide = s.sideAt(e.to);
            const QRectF& from = m_layout.nodes.at(e.from);
            const QRectF& to = m_layout.nodes.at(e.to);
            const double fromX = fromSide > 0 ? from.right() : from.left();
            const double toX = toSide > 0 ? to.right() : to.left();
            const double x0 = laneX(fromSide, s.laneAt(e.from));
            const double x1 = laneX(toSide, s.laneAt(e.to));
            const double y0 = portY(e.from, fromSide, i, true);
            const double y1 = portY(e.to, toSide, i, false);
            EdgeRoute& r = m_layout.edges[s.edge];
            r.side = fromSide;
            r.lane = s.laneAt(e.from);
            r.targetSide = toSide;
            r.targetLane = s.laneAt(e.to);
            r.crossGap = s.gap;
            r.points = {QPointF(fromX, y0), QPointF(x0, y0)};
            if (s.gap >= 0) {
                // Across the spine halfway down the gap below node `gap`.
                const double y =
                    (m_layout.nodes.at(s.gap).bottom() + m_layout.nodes.at(s.gap + 1).top()) / 2;
                r.points << QPointF(x0, y) << QPointF(x1, y);
            }
            r.points << QPointF(x1, y1) << QPointF(toX, y1);
            r.labelAnchor = QPointF(fromX + fromSide * 3, y0 - 2);
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
        const EdgeRoute& r = edges.at(i);
        const int lo = std::min(e.from, e.to), hi = std::max(e.from, e.to);
        CrossingCounter::LayeredEdge l;
        l.firstLayer = lo;
        // Lane x next to the source and next to the target (equal unless the
        // edge crosses the spine); 0 for spine edges, which have no inner layer.
        const double sourceX = r.points.size() > 3 ? r.points.at(1).x() : 0;
        const double targetX = r.points.size() > 3 ? r.points.at(r.points.size() - 2).x() : 0;
        for (int layer = lo; layer <= hi; ++layer) {
            const bool nearSource =
                r.crossGap < 0 || (e.from < e.to ? layer <= r.crossGap : layer > r.crossGap);
            l.xs.append(layer == lo || layer == hi ? nodes.at(layer).center().x()
                                                   : (nearSource ? sourceX : targetX));
        }
        layered.append(l);
    }
    return layered;
}

qint64 RouteLayout::crossings(const RouteGraph& graph) const {
    return CrossingCounter::layeredCrossings(layeredEdges(graph), int(nodes.size()));
}

} // namespace rb::layout
