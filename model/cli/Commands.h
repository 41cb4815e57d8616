#pragma once

#include "CommandArgs.h"

#include <QTextStream>

namespace rb::cli {

int runCheck(const CommandArgs& args, QTextStream& out, QTextStream& err);
int runGates(const CommandArgs& args, QTextStream& out, QTextStream& err);
int runRoute(const CommandArgs& args, QTextStream& out, QTextStream& err);
int runExport(const CommandArgs& args, QTextStream& out, QTextStream& err);
int runConvert(const CommandArgs& args, QTextStream& out, QTextStream& err);

} // namespace rb::cli
