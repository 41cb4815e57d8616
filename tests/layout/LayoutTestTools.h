#pragma once

#include "instrument/Instrument.h"
#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"

#include <QRandomGenerator>

namespace rb::layouttest {

// One module per `moduleSizes` entry, items q1, q2, ... of type single with
// codes 1 and 2; `rules` lists (from position, target name, condition or "").
struct RuleSpec {
    int from;
    QString target;
    QString condition;
};
Instrument makeInstrument(const QList<int>& moduleSizes, const QList<RuleSpec>& rules);

// A random questionnaire-like instrument: forward skips on about a third of the
// items, a few loops back, gotos to END and to modules, some filters.
Instrument randomInstrument(QRandomGenerator& random, int items);

// Proper crossings of two drawn polylines (interior points of segments only;
// touching ends do not count). Independent of the layered count.
qint64 geometricCrossings(const layout::RouteLayout& layout);

// True when some edge segment passes through the inside of a node box.
bool edgeThroughNode(const layout::RouteLayout& layout, QString* where);

} // namespace rb::layouttest
