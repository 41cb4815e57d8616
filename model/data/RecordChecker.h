#pragma once

#include "CellReading.h"
#include "RecordClassification.h"

namespace rb {

// The reference classification of one record, written for clarity over speed:
// reads every cell with CellInterpreter, runs the simulator (simulateRoute) on
// the record's own values and applies DESIGN.md's table to every item. The data
// check runs the compiled RecordProgram; tst_datacheck proves both agree on
// random instruments and records.
class RecordChecker {
public:
    RecordChecker(const CompiledRouting& routing, const HeaderMapping& mapping);

    RecordClassification classify(RecordFields fields) const;

private:
    struct ItemPlan {
        bool hasVariable = false;
        QList<int> gates;           // positions read by conditions that can skip the item
        bool hasImplied = false;    // when_skipped set
        cond::ExprPtr impliedIf;    // null with hasImplied: whenever not presented
        bool impliedBroken = false; // the `if` does not compile: never filled
    };

    const CompiledRouting& m_routing;
    CellInterpreter m_cells;
    std::vector<ItemPlan> m_plans;
};

} // namespace rb
