#include "Cli.h"

#include "CommandArgs.h"
#include "Commands.h"
#include "DataCheckCommand.h"
#include "storage/InstrumentFile.h"

namespace rb::cli {

namespace {
struct CommandEntry {
    const char* name;
    int (*run)(const CommandArgs&, QTextStream&, QTextStream&);
};
const CommandEntry kCommands[] = {
    {"check", runCheck},   {"gates", runGates},     {"route", runRoute},
    {"export", runExport}, {"convert", runConvert}, {"data-check", runDataCheckCommand},
};
} // namespace

QString usage() {
    return QStringLiteral(
        "Usage: routebook [FILE]                      open the editor\n"
        "       routebook check FILE [--json]         findings (exit 0 no errors, 1 errors, 2 bad "
        "input)\n"
        "       routebook gates FILE [--json]         universe of every item\n"
        "       routebook route FILE --answers A.json path of one respondent (JSON)\n"
        "       routebook export FILE --format yaml|dot|svg|html|pdf|md|csv|ddi [-o OUT]\n"
        "                 [--page-size a4|letter]     pdf needs -o OUT\n"
        "       routebook convert IN OUT              YAML <-> .routebook by extension\n"
        "       routebook data-check FILE DATA.csv [--json] [--report R.html]\n"
        "                 [--analysis-file OUT.csv [--flags]] [--suppress-below N] [--id-column "
        "NAME]\n"
        "                                             classify every cell (exit 0 clean, 1 "
        "problems)\n"
        "       routebook --help | --version\n"
        "FILE is a .routebook project or a .yaml instrument.\n");
}

bool isCommand(const QStringList& arguments) {
    // The editor takes nothing or one project file; anything else is a command
    // (and an unknown one gets a clear message instead of a window).
    if (arguments.isEmpty())
        return false;
    return arguments.size() > 1 || fileKindOf(arguments.first()) == FileKind::Unknown;
}

int run(const QStringList& arguments, QTextStream& out, QTextStream& err) {
    if (arguments.isEmpty() || arguments.first() == QLatin1String("--help") ||
        arguments.first() == QLatin1String("-h")) {
        out << usage();
        return arguments.isEmpty() ? BadInput : Ok;
    }
    if (arguments.first() == QLatin1String("--version")) {
        out << "routebook " << ROUTEBOOK_VERSION << '\n';
        return Ok;
    }
    for (const CommandEntry& c : kCommands) {
        if (arguments.first() != QLatin1String(c.name))
            continue;
        CommandArgs args;
        if (const QString problem = args.parse(arguments.mid(1)); !problem.isEmpty()) {
            err << "routebook " << c.name << ": " << problem << '\n' << usage();
            return BadInput;
        }
        return c.run(args, out, err);
    }
    err << "routebook: unknown command '" << arguments.first() << "'\n" << usage();
    return BadInput;
}

} // namespace rb::cli
