#pragma once

#include "CellReading.h"
#include "HeaderMapping.h"
#include "routing/CompiledRouting.h"
#include "util/Diagnostic.h"

#include <QIODevice>
#include <QStringList>

#include <array>
#include <functional>
#include <optional>

namespace rb {

struct CodeCount {
    qint64 code = 0;
    QString label;
    MissingKind missing = MissingKind::None;
    qint64 count = 0; // presented records holding (multi: choosing) the code
};

// Counts of one item over all records; presented = answered + nonresponse +
// invalid and records = presented + legitimateSkip + routingViolation.
struct ItemCounts {
    QString name;
    QString type;
    int position = 0;
    qint64 presented = 0;
    qint64 answered = 0;
    // blank, dont_know, refused, not_applicable
    std::array<qint64, 4> nonresponseByKind{};
    qint64 invalid = 0;
    qint64 legitimateSkip = 0;
    qint64 routingViolation = 0;
    // Legitimate skips whose gate item was presented and left blank or given a
    // missing code (or was itself such a skip): their value is unknown, not implied.
    qint64 skipAfterMissingGate = 0;
    qint64 breakOffStarts = 0; // break-offs whose blank run starts at this item
    qint64 implied = 0;        // legitimate skips where when_skipped applies
    QList<CodeCount> frequencies;

    qint64 nonresponse() const;
};

// Records with one kind of problem: how many and the first few (record numbers
// from 1 = the first data row, or --id-column values).
struct ProblemRecords {
    qint64 count = 0;
    QStringList first;
};

struct DataCheckResult {
    qint64 records = 0;
    QList<ItemCounts> items; // every item with a variable, questionnaire order
    QStringList unknownColumns;
    QStringList missingColumns;
    ProblemRecords violations;   // records with any routing violation
    ProblemRecords invalid;      // records with any invalid value
    ProblemRecords breakOffs;    // blank from some item to the end (2 or more items)
    ProblemRecords emptyRecords; // every presented item blank
    ProblemRecords loops;        // the route hit the loop guard
    Diagnostics invalidCells; // the first few invalid cells, line = file line, column = CSV column
    bool hasProblems() const { return violations.count > 0 || invalid.count > 0; }
};

struct DataCheckOptions {
    QString idColumn;
    qint64 maxRecordBytes = 4 * 1024 * 1024;
    int firstRecordsKept = 10;
    int invalidCellsKept = 20;
    // Worker threads for the records (0: one per core). The result does not
    // depend on it (nor does the analysis file's order).
    int threads = 0;
    // Records are read and checked in blocks of about this many bytes (tests use
    // tiny blocks to exercise the merge).
    qsizetype blockBytes = 4 << 20;
    // Map a regular file window by window instead of reading it (no copy out
    // of the page cache). Off by default: another program truncating the file
    // while it is mapped ends the process (SIGBUS), which the command line can
    // afford and the editor, holding unsaved work, cannot.
    bool mapRegularFiles = false;
    // Called now and then (on the calling thread) with the bytes checked so far;
    // returning false cancels.
    std::function<bool(qint64 bytesRead)> progress;
};

// A consumer of analysis-file rows: the header once, then one row per record.
class AnalysisSink {
public:
    virtual ~AnalysisSink() = default;
    virtual void header(const QStringList& columns) = 0;
    // Whole rows, already RFC 4180 CSV with CRLF line ends (appendCsvField), in
    // file order. The blocks are written by the checking threads; only the
    // ordered hand-over happens on the calling thread.
    virtual void rows(QByteArrayView csv) = 0;
};

struct AnalysisOptions {
    bool flags = false; // one NAME_flag column per item
};

// Reads the whole response file and classifies every cell. An error value
// (bad header, ragged row, broken CSV, cancelled) means no result.
struct DataCheckOutcome {
    std::optional<DataCheckResult> result;
    std::optional<Diagnostic> error;
};
DataCheckOutcome runDataCheck(const CompiledRouting& routing, QIODevice& csv,
                              const QString& fileName, const DataCheckOptions& options,
                              AnalysisSink* analysis = nullptr,
                              const AnalysisOptions& analysisOptions = {});

QString cellClassName(CellClass c); // "answered", "blank", ...

} // namespace rb
