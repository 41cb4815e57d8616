#pragma once

#include "DataCheck.h"
#include "analysis/RoutingAnalysis.h"

#include <QByteArray>

namespace rb {

struct ReportOptions {
    QString dataFileName;
    int suppressBelow = 5; // common practice, no source: cells of 1-4 records are not shown
    const QList<ItemUniverse>* universes = nullptr; // universes beside each item, if known
};

// One self-contained HTML page (inline CSS and SVG bar charts, no scripts, every
// user string escaped): record-level problems, then per item the universe, the
// class counts and the code frequencies, small cells shown as "<N".
QByteArray dataCheckReportHtml(const CompiledRouting& routing, const DataCheckResult& result,
                               const ReportOptions& options);

} // namespace rb
