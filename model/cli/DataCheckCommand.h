#pragma once

#include "CommandArgs.h"

#include <QTextStream>

namespace rb::cli {

// routebook data-check FILE DATA.csv [--json] [--report R.html]
//     [--analysis-file OUT.csv [--flags]] [--suppress-below N] [--id-column NAME]
// Exit 0 clean, 1 routing violations or invalid values, 2 bad input; on bad
// input nothing is written.
int runDataCheckCommand(const CommandArgs& args, QTextStream& out, QTextStream& err);

} // namespace rb::cli
