#include "Commands.h"

#include "Cli.h"
#include "JsonOutput.h"
#include "check/InstrumentCheck.h"
#include "dictionary/DictionaryExport.h"
#include "export/DotExport.h"
#include "export/SqlExport.h"
#include "export/SvgExport.h"
#include "routing/AnswerReplay.h"
#include "storage/InstrumentFile.h"
#include "storage/YamlFormat.h"

#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSaveFile>

#include <cmath>

namespace rb::cli {

namespace {

// Loads FILE or prints every problem; the caller returns BadInput on nullopt.
std::optional<Instrument> loadOrReport(const QString& path, QTextStream& err) {
    LoadResult loaded = loadInstrumentFile(path);
    if (!loaded.ok())
        err << formatDiagnostics(loaded.errors);
    return std::move(loaded.instrument);
}

bool expectPositional(const CommandArgs& args, int count, const QString& command,
                      QTextStream& err) {
    if (args.positional().size() == count)
        return true;
    err << "routebook " << command << ": expected " << count << " file argument"
        << (count == 1 ? "" : "s") << ", got " << args.positional().size() << '\n'
        << usage();
    return false;
}

// Writes bytes to -o OUT (atomically: nothing is written on failure) or stdout.
int writeOutput(const CommandArgs& args, const QByteArray& bytes, QTextStream& out,
                QTextStream& err) {
    if (!args.hasOption(QStringLiteral("-o"))) {
        out << QString::fromUtf8(bytes);
        return Ok;
    }
    const QString path = args.option(QStringLiteral("-o"));
    QSaveFile file(path);
    if (!file.open(QIODevice::WriteOnly) || file.write(bytes) != bytes.size() || !file.commit()) {
        err << path << ":0:0: cannot write: " << file.errorString() << '\n';
        return BadInput;
    }
    return Ok;
}

void printFindingsText(const QString& file, const Findings& findings, QTextStream& out) {
    for (const Finding& f : findings) {
        out << file << ": " << severityName(f.severity) << " [" << f.check << "] ";
        const QString where = !f.item.isEmpty()     ? f.item
                              : !f.module.isEmpty() ? f.module
                                                    : f.subject;
        out << where;
        if (!f.field.isEmpty())
            out << ' ' << f.field;
        if (f.column)
            out << ':' << *f.column;
        out << ": " << f.message << '\n';
    }
    const FindingCounts counts = countFindings(findings);
    out << counts.errors << (counts.errors == 1 ? " error, " : " errors, ") << counts.warnings
        << (counts.warnings == 1 ? " warning\n" : " warnings\n");
}

// Reads A.json of `route`: {"name": value}, multi items as [codes].
std::optional<QHash<QString, AnswerValue>> readAnswers(const QString& path, QTextStream& err) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly)) {
        err << path << ":0:0: cannot read: " << file.errorString() << '\n';
        return std::nullopt;
    }
    QJsonParseError parseError;
    const QJsonDocument doc = QJsonDocument::fromJson(file.readAll(), &parseError);
    if (parseError.error != QJsonParseError::NoError || !doc.isObject()) {
        err << path << ":1:" << parseError.offset + 1 << ": not a JSON object of answers"
            << (parseError.error != QJsonParseError::NoError
                    ? QStringLiteral(" (%1)").arg(parseError.errorString())
                    : QString())
            << '\n';
        return std::nullopt;
    }
    QHash<QString, AnswerValue> answers;
    const QJsonObject object = doc.object();
    for (auto it = object.begin(); it != object.end(); ++it) {
        AnswerValue value;
        if (it->isDouble()) {
            const double d = it->toDouble();
            value.text = std::floor(d) == d && std::abs(d) < 9e15 ? QString::number(qint64(d))
                                                                  : QString::number(d, 'g', 17);
        } else if (it->isString()) {
            value.kind = AnswerValue::Kind::Text;
            value.text = it->toString();
        } else if (it->isArray()) {
            value.kind = AnswerValue::Kind::List;
            for (const QJsonValue& code : it->toArray()) {
                if (!code.isDouble() || std::floor(code.toDouble()) != code.toDouble()) {
                    err << path << ":0:0: answer for '" << it.key()
                        << "': a list must hold whole-number codes\n";
                    return std::nullopt;
                }
                value.codes.append(qint64(code.toDouble()));
            }
        } else {
            err << path << ":0:0: answer for '" << it.key()
                << "' must be a number, text or a list of codes\n";
            return std::nullopt;
        }
        answers.insert(it.key().toLower(), value);
    }
    return answers;
}

} // namespace

int runCheck(const CommandArgs& args, QTextStream& out, QTextStream& err) {
    if (!expectPositional(args, 1, QStringLiteral("check"), err))
        return BadInput;
    const QString path = args.positional().first();
    const std::optional<Instrument> instrument = loadOrReport(path, err);
    if (!instrument)
        return BadInput;
    const CompiledRouting routing(*instrument);
    const Findings findings = checkInstrument(routing);
    if (args.flag(QStringLiteral("--json")))
        out << QString::fromUtf8(QJsonDocument(findingsToJson(findings)).toJson());
    else
        printFindingsText(path, findings, out);
    return countFindings(findings).errors > 0 ? Problems : Ok;
}

int runGates(const CommandArgs& args, QTextStream& out, QTextStream& err) {
    if (!expectPositional(args, 1, QStringLiteral("gates"), err))
        return BadInput;
    const std::optional<Instrument> instrument = loadOrReport(args.positional().first(), err);
    if (!instrument)
        return BadInput;
    const CompiledRouting routing(*instrument);
    const RoutingAnalysis analysis = analyzeRouting(routing);
    if (args.flag(QStringLiteral("--json"))) {
        out << QString::fromUtf8(QJsonDocument(gatesToJson(analysis)).toJson());
        return Ok;
    }
    for (const ItemUniverse& u : analysis.universes) {
        out << analysis.itemName(u.position) << ": " << askedName(u.asked);
        if (u.asked == ItemUniverse::Asked::Conditional)
            out << " if " << u.askedIf << "\n    " << u.plain;
        out << '\n';
    }
    return Ok;
}

int runRoute(const CommandArgs& args, QTextStream& out, QTextStream& err) {
    if (!expectPositional(args, 1, QStringLiteral("route"), err))
        return BadInput;
    if (!args.hasOption(QStringLiteral("--answers"))) {
        err << "routebook route: --answers A.json is required\n";
        return BadInput;
    }
    const std::optional<Instrument> instrument = loadOrReport(args.positional().first(), err);
    if (!instrument)
        return BadInput;
    const QString answersPath = args.option(QStringLiteral("--answers"));
    const auto answers = readAnswers(answersPath, err);
    if (!answers)
        return BadInput;
    const CompiledRouting routing(*instrument);
    const ReplayResult replay = replayAnswers(routing, *answers);
    if (!replay.error.isEmpty()) {
        err << answersPath << ":0:0: " << replay.error << '\n';
        return BadInput;
    }
    out << QString::fromUtf8(QJsonDocument(routeToJson(routing, replay.route)).toJson());
    return Ok;
}

int runExport(const CommandArgs& args, QTextStream& out, QTextStream& err) {
    if (!expectPositional(args, 1, QStringLiteral("export"), err))
        return BadInput;
    const QString format = args.option(QStringLiteral("--format"));
    if (format != QLatin1String("yaml") && format != QLatin1String("dot") &&
        format != QLatin1String("svg") && format != QLatin1String("sql") &&
        !isDictionaryFormat(format)) {
        err << "routebook export: --format must be one of: yaml, dot, svg, sql, "
            << dictionaryFormats().join(QStringLiteral(", "))
            << (format.isEmpty() ? QString() : QStringLiteral(" (got '%1')").arg(format)) << '\n';
        return BadInput;
    }
    const std::optional<Instrument> instrument = loadOrReport(args.positional().first(), err);
    if (!instrument)
        return BadInput;
    if (format == QLatin1String("yaml"))
        return writeOutput(args, saveYamlText(*instrument), out, err);
    const CompiledRouting routing(*instrument);
    if (format == QLatin1String("svg"))
        return writeOutput(args, exportSvg(routing), out, err);
    if (format == QLatin1String("sql")) {
        const SqlExport sql = exportSql(routing, args.option(QStringLiteral("--table")));
        if (sql.error) {
            err << "routebook export: " << *sql.error << '\n';
            return BadInput;
        }
        return writeOutput(args, sql.sql, out, err);
    }
    if (isDictionaryFormat(format)) {
        // PDF is binary: it goes to a file, never through the text stream.
        if (format == QLatin1String("pdf") && !args.hasOption(QStringLiteral("-o"))) {
            err << "routebook export: --format pdf needs -o OUT\n";
            return BadInput;
        }
        const DictionaryExportResult dictionary =
            exportDictionary(routing, format, args.option(QStringLiteral("--page-size")));
        if (!dictionary.error.isEmpty()) {
            err << "routebook export: " << dictionary.error << '\n';
            return BadInput;
        }
        return writeOutput(args, dictionary.bytes, out, err);
    }
    return writeOutput(args, exportDot(routing), out, err);
}

int runConvert(const CommandArgs& args, QTextStream&, QTextStream& err) {
    if (!expectPositional(args, 2, QStringLiteral("convert"), err))
        return BadInput;
    const QString in = args.positional().at(0), outPath = args.positional().at(1);
    if (fileKindOf(outPath) == FileKind::Unknown) {
        err << outPath << ":0:0: unknown file type: expected .routebook, .yaml or .yml\n";
        return BadInput;
    }
    const std::optional<Instrument> instrument = loadOrReport(in, err);
    if (!instrument)
        return BadInput;
    if (const std::optional<Diagnostic> problem = saveInstrumentFile(*instrument, outPath)) {
        err << problem->toString() << '\n';
        return BadInput;
    }
    return Ok;
}

} // namespace rb::cli
