#pragma once

#include "DataCheck.h"

#include <QJsonObject>

namespace rb {

// DESIGN.md's data-check JSON shape, with added keys: per item "type",
// "percent" (of records), "skip_after_missing_gate", "break_off_starts",
// "implied", frequency "missing", "percent_of_presented", "percent_of_records";
// top level "records_with_*" problem lists and "invalid_cells".
// suppressBelow > 0 replaces counts 1..N-1 with the text "<N" (and their
// percentages with null), for output that leaves the analyst's machine.
QJsonObject dataCheckToJson(const DataCheckResult& result, int suppressBelow = 0);

// The text a small count is shown as: the count itself, or "<N".
QString shownCount(qint64 count, int suppressBelow);
bool isSuppressed(qint64 count, int suppressBelow);

} // namespace rb
