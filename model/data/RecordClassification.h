#pragma once

#include "CellReading.h"

#include <QList>

#include <vector>

namespace rb {

// Everything the data check concludes about one record, per item position: the
// route, each cell's class, and the record-level findings. The reference
// (RecordChecker, over the simulator) and the fast path (RecordProgram) both
// produce it, so tst_datacheck can compare them record by record.
struct RecordClassification {
    QList<int> path; // presented positions in route order
    bool loop = false;
    std::vector<CellClass> classes;     // items without a variable: Answered
    std::vector<char> presented;        // on the path at least once
    std::vector<char> unknownSkip;      // legitimate skip after a missing or blank gate
    std::vector<char> implied;          // legitimate skip where when_skipped applies
    std::vector<QList<qint64>> counted; // codes counted in the frequencies (presented)
    int breakOffStart = -1;             // position where the final blank run starts
    bool anyValue = false;              // some presented item holds a value
    bool operator==(const RecordClassification&) const = default;
};

// Gate items of the item at `position`: those read by its filters and by the
// rules of earlier items that can jump over it. A legitimate skip whose gate is
// nonresponse (or such a skip itself) has an unknown value, not an implied one.
QList<int> skipGates(const CompiledRouting& routing, int position);

} // namespace rb
