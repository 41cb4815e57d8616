#include "DataCheckCommand.h"

#include "Cli.h"
#include "analysis/RoutingAnalysis.h"
#include "data/AnalysisFile.h"
#include "data/DataCheck.h"
#include "data/DataCheckJson.h"
#include "data/DataCheckReport.h"
#include "storage/InstrumentFile.h"

#include <QElapsedTimer>
#include <QFile>
#include <QFileInfo>
#include <QJsonDocument>
#include <QSaveFile>

namespace rb::cli {

namespace {

// Percent of bytes and rate on stderr, only once the run has taken a second.
class ProgressPrinter {
public:
    ProgressPrinter(QTextStream& err, qint64 total) : m_err(err), m_total(total) {
        m_clock.start();
    }
    ~ProgressPrinter() {
        if (m_shown)
            m_err << '\n';
    }
    bool operator()(qint64 done) {
        const qint64 ms = m_clock.elapsed();
        if (ms < 1000 || ms - m_lastShown < 250)
            return true;
        m_lastShown = ms;
        m_shown = true;
        const double percent = m_total > 0 ? 100.0 * double(done) / double(m_total) : 0.0;
        const double rate = double(done) / 1e6 / (double(ms) / 1000.0);
        m_err << "\rdata-check: " << QString::number(percent, 'f', 0) << "% ("
              << QString::number(rate, 'f', 1) << " MB/s)";
        m_err.flush();
        return true;
    }

private:
    QTextStream& m_err;
    qint64 m_total;
    QElapsedTimer m_clock;
    qint64 m_lastShown = 0;
    bool m_shown = false;
};

struct Settings {
    int suppressBelow = 0; // JSON and text: exact unless given
    bool suppressGiven = false;
    QString report, analysisFile, idColumn;
};

std::optional<Settings> readSettings(const CommandArgs& args, QTextStream& err) {
    Settings s;
    s.report = args.option(QStringLiteral("--report"));
    s.analysisFile = args.option(QStringLiteral("--analysis-file"));
    s.idColumn = args.option(QStringLiteral("--id-column"));
    if (args.hasOption(QStringLiteral("--suppress-below"))) {
        bool ok = false;
        s.suppressBelow = args.option(QStringLiteral("--suppress-below")).toInt(&ok);
        if (!ok || s.suppressBelow < 0) {
            err << "routebook data-check: --suppress-below needs a whole number >= 0\n";
            return std::nullopt;
        }
        s.suppressGiven = true;
    }
    if (args.flag(QStringLiteral("--flags")) && s.analysisFile.isEmpty()) {
        err << "routebook data-check: --flags needs --analysis-file OUT.csv\n";
        return std::nullopt;
    }
    return s;
}

void printText(const DataCheckResult& r, int s, QTextStream& out) {
    out << r.records << " records, " << r.items.size() << " items\n";
    out << "item: presented answered nonresponse invalid legitimate_skip routing_violation\n";
    for (const ItemCounts& c : r.items)
        out << c.name << ": " << shownCount(c.presented, s) << ' ' << shownCount(c.answered, s)
            << ' ' << shownCount(c.nonresponse(), s) << ' ' << shownCount(c.invalid, s) << ' '
            << shownCount(c.legitimateSkip, s) << ' ' << shownCount(c.routingViolation, s) << '\n';
    auto problems = [&](const char* what, const ProblemRecords& p) {
        out << what << ": " << shownCount(p.count, s);
        if (p.count > 0 && s <= 0)
            out << " (first: " << p.first.join(QStringLiteral(", ")) << ')';
        out << '\n';
    };
    problems("records with routing violations", r.violations);
    problems("records with invalid values", r.invalid);
    problems("break-offs", r.breakOffs);
    problems("records without any value", r.emptyRecords);
    if (r.loops.count)
        problems("records whose route loops", r.loops);
    if (!r.unknownColumns.isEmpty())
        out << "unknown columns (ignored): " << r.unknownColumns.join(QStringLiteral(", ")) << '\n';
    if (!r.missingColumns.isEmpty())
        out << "missing columns (read as blank): " << r.missingColumns.join(QStringLiteral(", "))
            << '\n';
}

bool writeFile(const QString& path, const QByteArray& bytes, QTextStream& err) {
    QSaveFile file(path);
    if (!file.open(QIODevice::WriteOnly) || file.write(bytes) != bytes.size() || !file.commit()) {
        err << path << ":0:0: cannot write: " << file.errorString() << '\n';
        return false;
    }
    return true;
}

} // namespace

int runDataCheckCommand(const CommandArgs& args, QTextStream& out, QTextStream& err) {
    if (args.positional().size() != 2) {
        err << "routebook data-check: expected FILE and DATA.csv, got " << args.positional().size()
            << " file arguments\n"
            << usage();
        return BadInput;
    }
    const std::optional<Settings> settings = readSettings(args, err);
    if (!settings)
        return BadInput;
    LoadResult loaded = loadInstrumentFile(args.positional().at(0));
    if (!loaded.ok()) {
        err << formatDiagnostics(loaded.errors);
        return BadInput;
    }
    const CompiledRouting routing(*loaded.instrument);
    const QString dataPath = args.positional().at(1);
    QFile data(dataPath);
    if (!data.open(QIODevice::ReadOnly)) {
        err << dataPath << ":0:0: cannot read: " << data.errorString() << '\n';
        return BadInput;
    }
    // The analysis file is written to a temporary file and only committed when
    // the whole response file was read: no partial output.
    QSaveFile analysisFile(settings->analysisFile);
    std::optional<CsvAnalysisWriter> writer;
    if (!settings->analysisFile.isEmpty()) {
        if (!analysisFile.open(QIODevice::WriteOnly)) {
            err << settings->analysisFile << ":0:0: cannot write: " << analysisFile.errorString()
                << '\n';
            return BadInput;
        }
        writer.emplace(analysisFile);
    }
    ProgressPrinter progress(err, QFileInfo(dataPath).size());
    DataCheckOptions options;
    options.idColumn = settings->idColumn;
    options.mapRegularFiles = true; // a one-off run: nothing to lose if the file is cut under it
    options.progress = [&progress](qint64 done) { return progress(done); };
    AnalysisOptions analysisOptions;
    analysisOptions.flags = args.flag(QStringLiteral("--flags"));
    const DataCheckOutcome outcome = runDataCheck(routing, data, dataPath, options,
                                                  writer ? &*writer : nullptr, analysisOptions);
    if (!outcome.result) {
        err << outcome.error->toString() << '\n';
        analysisFile.cancelWriting();
        return BadInput;
    }
    const DataCheckResult& result = *outcome.result;
    if (writer && (!writer->flush() || !analysisFile.commit())) {
        err << settings->analysisFile << ":0:0: cannot write: " << analysisFile.errorString()
            << '\n';
        return BadInput;
    }
    for (const Diagnostic& d : result.invalidCells)
        err << d.toString() << '\n';
    if (result.invalid.count > result.invalidCells.size())
        err << dataPath << ": more invalid values not listed (see the counts)\n";
    if (!settings->report.isEmpty()) {
        ReportOptions report;
        report.dataFileName = QFileInfo(dataPath).fileName();
        report.suppressBelow = settings->suppressGiven ? settings->suppressBelow : 5;
        const RoutingAnalysis analysis = analyzeRouting(routing);
        report.universes = &analysis.universes;
        if (!writeFile(settings->report, dataCheckReportHtml(routing, result, report), err))
            return BadInput;
    }
    if (args.flag(QStringLiteral("--json")))
        out << QString::fromUtf8(
            QJsonDocument(dataCheckToJson(result, settings->suppressBelow)).toJson());
    else
        printText(result, settings->suppressBelow, out);
    return result.hasProblems() ? Problems : Ok;
}

} // namespace rb::cli
