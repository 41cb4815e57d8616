#pragma once

#include "CompiledRouting.h"
#include "condition/Evaluator.h"

#include <functional>

namespace rb {

// One condition the route evaluated: a filter (index into the item's
// `filters`, module's first) or a rule's `if` (index into its `rules`).
struct Evaluation {
    int position = 0;
    int filter = -1;
    int rule = -1;
};

// The reference route of DESIGN.md "Routing semantics", step by step:
//   pos := first item; while pos is not END: if the filters fail, skip it;
//   else present it, then the first rule whose condition holds jumps, else next.
// `answerOf(position)` gives the value a presented item records. The loop
// guard stops after routeStepLimit(number of items) steps.
// DESIGN.md: a route that passes more than 4 x (number of items) steps is a
// loop. Every walker of the routing (simulator, trial run, data check) stops there.
inline qint64 routeStepLimit(int itemCount) {
    return 4 * qint64(itemCount);
}

struct RouteResult {
    QList<int> path;               // presented positions, in order (repeats possible in a loop)
    bool loop = false;             // true when the guard stopped the route
    QList<cond::CellValue> values; // per position: what the item holds at the end
    QList<Evaluation> evaluated;   // every condition evaluated, in order (when traced)
};

// With `trace`, `evaluated` lists the conditions in the order the route
// evaluated them: what the analysis's "reads" findings must agree with.
RouteResult simulateRoute(const CompiledRouting& routing,
                          const std::function<cond::CellValue(int position)>& answerOf,
                          bool trace = false);

// An evaluation environment over per-position values (names resolve through the routing).
cond::Environment environmentFor(const CompiledRouting& routing,
                                 const QList<cond::CellValue>& values);

} // namespace rb
