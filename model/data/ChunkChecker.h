#pragma once

#include "DataCheck.h"
#include "RecordProgram.h"

#include <array>

namespace rb {

// Counts of one block of records, numbered from the block's start (record 1,
// line 0); DataCheck merges the blocks in file order, adding the records and
// lines of the blocks before, so the result is the same for any split.
struct ChunkTally {
    // Per variable: RecordProgram's counters (one per CellClass, then the rest).
    enum Counter {
        Answered = int(CellClass::Answered),
        Blank = int(CellClass::Blank),
        Invalid = int(CellClass::Invalid),
        LegitimateSkip = int(CellClass::LegitimateSkip),
        Violation = int(CellClass::RoutingViolation),
        SkipAfterMissingGate = RecordProgram::SkipAfterMissingGate,
        BreakOffStarts = RecordProgram::BreakOffStarts,
        Implied = RecordProgram::Implied,
        kCounters = RecordProgram::kCounters
    };
    enum Problem { Violations, InvalidRecords, BreakOffs, EmptyRecords, Loops, kProblems };
    struct Problems {
        qint64 count = 0;
        std::vector<qint64> firstRecords; // block-relative numbers (no --id-column)
        QStringList firstIds;             // --id-column values
    };
    struct InvalidCell {
        qint64 record = 0, line = 0;
        int position = 0, column = -1;
        QString value;
    };
    struct Error {
        qint64 line = 0;
        int column = 0;
        QString message;    // parse errors
        qint64 record = -1; // >= 0: a ragged record (message built on merge)
        qint64 fields = 0;
    };

    std::vector<qint64> counters;    // variables x kCounters
    std::vector<qint64> frequencies; // RecordProgram frequency slots
    std::array<Problems, kProblems> problems;
    std::vector<InvalidCell> invalidCells;
    QByteArray analysisRows; // the block's analysis-file rows, when asked for
    qint64 records = 0, lines = 0;
    std::optional<Error> error;
};

// Checks the records of one block with a RecordProgram; one checker per thread.
class ChunkChecker {
public:
    ChunkChecker(const CompiledRouting& routing, const RecordProgram& program,
                 const HeaderMapping& mapping, const DataCheckOptions& options,
                 const AnalysisOptions& analysisOptions, bool analysisRows);

    // `truncated`: the block is the start of a record longer than the guard.
    void run(const char* begin, const char* end, bool truncated, ChunkTally& tally);

private:
    void count(qint64 record, qint64 line, RecordFields fields, ChunkTally& tally) const;
    void note(ChunkTally::Problems& problems, qint64 record, RecordFields fields) const;
    void writeRow(RecordFields fields, QByteArray& out);

    const CompiledRouting& m_routing;
    const RecordProgram& m_program;
    const HeaderMapping& m_mapping;
    DataCheckOptions m_options;
    AnalysisOptions m_analysis;
    bool m_analysisRows;
    RecordProgram::Scratch m_scratch;
    std::vector<QByteArray> m_impliedValues; // per position
    QByteArray m_skipCode;
    std::vector<const QByteArray*> m_override; // per column: the analysis value, or null
    std::vector<int> m_overridden;             // the columns set in m_override
};

} // namespace rb
