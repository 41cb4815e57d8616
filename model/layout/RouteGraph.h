#pragma once

#include "analysis/RoutingAnalysis.h"
#include "routing/CompiledRouting.h"

#include <QList>
#include <QString>

namespace rb::layout {

// The routing as a drawable graph: START, one node per item in questionnaire
// order, END. Node index = questionnaire layer: START is 0, the item at flat
// position p is p + 1, END is itemCount + 1. Edges are fall-through ("next"),
// rule edges (condition as written, "always" for an unconditional goto) and a
// "filtered out" edge past every item that has a filter — the same edges as the
// DOT export, so both drawings of one instrument can be compared.
struct RouteNode {
    enum class Kind { Start, Item, End };
    Kind kind = Kind::Item;
    int position = -1; // flat item position; -1 for START and END
    QString name;      // item name, "START" or "END"
    QString label;     // variable label (items only)
    QString module;    // module name (items only)
    QString filter;    // the item's and its module's ask_if, joined with " and "
    // Markers. Structural until the routing analysis provides exact ones:
    // conditional = has a filter or some path from START passes it by;
    // unreachable = no path from START; looping = on a cycle of edges.
    bool conditional = false;
    bool unreachable = false;
    bool looping = false;
    QString universe; // exact universe text once applyUniverses() ran
};

struct RouteEdge {
    enum class Kind { Next, Rule, Filtered };
    Kind kind = Kind::Next;
    int from = 0; // node indices
    int to = 0;
    QString condition; // full text; empty for Next
};

// A module as a band of consecutive item nodes [firstNode, lastNode].
struct ModuleSpan {
    QString name;
    QString title;
    int firstNode = 0;
    int lastNode = 0;
};

struct RouteGraph {
    QList<RouteNode> nodes;
    QList<RouteEdge> edges;
    QList<ModuleSpan> modules; // non-empty modules, in order

    static RouteGraph fromRouting(const CompiledRouting& routing);

    // Replaces the structural conditional / unreachable markers by the exact
    // ones of the routing analysis (asked conditional / never) and keeps each
    // item's universe for its tooltip. Universes of unknown positions are ignored.
    void applyUniverses(const QList<ItemUniverse>& universes);

    int startNode() const { return 0; }
    int endNode() const { return int(nodes.size()) - 1; }
    static int nodeOfPosition(int position) { return position + 1; }

    // Edges that lie on some path from START to `node`: the edges a respondent
    // may follow on the way to it, which is how its universe is drawn.
    QList<int> edgesLeadingTo(int node) const;
};

// A condition shortened for a label: whitespace collapsed, cut at maxChars
// with an ellipsis; the full text goes to the tooltip / <title>.
QString shortCondition(const QString& condition, int maxChars = 28);

} // namespace rb::layout
