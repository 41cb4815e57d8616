#pragma once

#include <QStringList>
#include <QTextStream>

namespace rb::cli {

// Exit codes of every command (DESIGN.md "Command line").
enum ExitCode { Ok = 0, Problems = 1, BadInput = 2 };

// True when the arguments (after the program name) ask for a command rather
// than the editor: a subcommand, --help or --version.
bool isCommand(const QStringList& arguments);

// Runs one command. `arguments` excludes the program name. Output on `out`,
// messages `file:line:column: message` on `err`. Never needs a display.
int run(const QStringList& arguments, QTextStream& out, QTextStream& err);

QString usage();

} // namespace rb::cli
