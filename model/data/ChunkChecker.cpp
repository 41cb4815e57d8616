#include "ChunkChecker.h"

#include "AnalysisFile.h"
#include "CsvRange.h"

namespace rb {

namespace {

QByteArrayView flagOf(CellClass c, bool implied) {
    switch (c) {
    case CellClass::Answered:
        return "answered";
    case CellClass::Invalid:
        return "invalid";
    case CellClass::LegitimateSkip:
        return implied ? "implied" : "skipped";
    case CellClass::RoutingViolation:
        return "violation";
    default:
        return "nonresponse";
    }
}

} // namespace

ChunkChecker::ChunkChecker(const CompiledRouting& routing, const RecordProgram& program,
                           const HeaderMapping& mapping, const DataCheckOptions& options,
                           const AnalysisOptions& analysisOptions, bool analysisRows)
    : m_routing(routing), m_program(program), m_mapping(mapping), m_options(options),
      m_analysis(analysisOptions), m_analysisRows(analysisRows),
      m_skipCode(routing.instrument().settings.legitimateSkipCode.toUtf8()) {
    m_options.progress = nullptr; // progress is the merging thread's business
    program.prepare(m_scratch);
    for (int p = 0; p < routing.itemCount(); ++p) {
        const Item& item = *routing.index().at(p).item;
        m_impliedValues.push_back(item.whenSkipped ? item.whenSkipped->value.toUtf8()
                                                   : QByteArray());
    }
    m_override.assign(size_t(mapping.columnCount), nullptr);
}

void ChunkChecker::run(const char* begin, const char* end, bool truncated, ChunkTally& tally) {
    tally.counters.assign(size_t(m_program.variables()) * ChunkTally::kCounters, 0);
    tally.frequencies.assign(size_t(m_program.frequencySlots()), 0);
    if (truncated) { // the block holds only the start of one overlong record
        tally.error = ChunkTally::Error{0, 1, CsvRange::guardMessage(m_options.maxRecordBytes)};
        return;
    }
    const RecordProgram::Tally counts{tally.counters.data(), tally.frequencies.data()};
    CsvRange range(begin, end, m_options.maxRecordBytes);
    qint64 record = 0;
    CsvRange::Status status;
    while ((status = range.next()) == CsvRange::Status::Record) {
        ++record;
        RecordFields fields = range.fields();
        if (qsizetype(fields.size()) != m_mapping.columnCount) {
            tally.error =
                ChunkTally::Error{range.recordLine(), 1, {}, record, qint64(fields.size())};
            return;
        }
        m_program.classify(fields, m_scratch, &counts);
        count(record, range.recordLine(), fields, tally);
        if (m_analysisRows)
            writeRow(fields, tally.analysisRows);
    }
    if (status == CsvRange::Status::Error) {
        const CsvRange::Error& e = range.error();
        tally.error = ChunkTally::Error{e.line, e.column, e.message};
    }
    tally.records = record;
    tally.lines = range.linesDone();
}

void ChunkChecker::note(ChunkTally::Problems& problems, qint64 record, RecordFields fields) const {
    if (qsizetype(problems.firstRecords.size() + size_t(problems.firstIds.size())) <
        m_options.firstRecordsKept) {
        if (m_mapping.idColumn >= 0)
            problems.firstIds.append(QString::fromUtf8(fields[size_t(m_mapping.idColumn)]));
        else
            problems.firstRecords.push_back(record);
    }
    ++problems.count;
}

void ChunkChecker::count(qint64 record, qint64 line, RecordFields fields, ChunkTally& tally) const {
    const RecordProgram::Scratch& s = m_scratch;
    if (s.anyInvalid) // the first few invalid cells, for the messages
        for (int p = 0; p < m_program.itemCount() &&
                        qsizetype(tally.invalidCells.size()) < m_options.invalidCellsKept;
             ++p)
            if (s.presented[size_t(p)] && m_program.hasVariable(p) &&
                s.classes[size_t(p)] == CellClass::Invalid) {
                const int column = m_mapping.column[size_t(p)];
                tally.invalidCells.push_back(
                    {record, line, p, column,
                     column >= 0 ? QString::fromUtf8(fields[size_t(column)]) : QString()});
            }
    auto& problems = tally.problems;
    if (!s.anyValue) {
        note(problems[ChunkTally::EmptyRecords], record, fields);
    } else if (s.breakOffStart >= 0) {
        note(problems[ChunkTally::BreakOffs], record, fields);
    }
    if (s.anyViolation)
        note(problems[ChunkTally::Violations], record, fields);
    if (s.anyInvalid)
        note(problems[ChunkTally::InvalidRecords], record, fields);
    if (s.loop)
        note(problems[ChunkTally::Loops], record, fields);
}

// The record as it came, with legitimate skips coded (the skip code, or the
// implied value where it holds), then the flags; no allocation per cell.
void ChunkChecker::writeRow(RecordFields fields, QByteArray& out) {
    const RecordProgram::Scratch& s = m_scratch;
    auto override = [&](int column, const QByteArray& value) {
        if (column < 0)
            return;
        if (!m_override[size_t(column)])
            m_overridden.push_back(column);
        m_override[size_t(column)] = &value;
    };
    for (int p = 0; p < m_routing.itemCount(); ++p) {
        if (!m_program.hasVariable(p) || s.classes[size_t(p)] != CellClass::LegitimateSkip)
            continue;
        const QByteArray& value = s.implied[size_t(p)] ? m_impliedValues[size_t(p)] : m_skipCode;
        if (m_routing.index().at(p).type == ItemType::Multi) {
            for (int c : m_mapping.multiColumns[size_t(p)])
                override(c, value);
        } else {
            override(m_mapping.column[size_t(p)], value);
        }
    }
    for (size_t c = 0; c < fields.size(); ++c) {
        if (c)
            out += ',';
        const QByteArray* value = m_override[c];
        appendCsvField(out, value ? QByteArrayView(*value) : fields[c]);
    }
    for (int c : m_overridden)
        m_override[size_t(c)] = nullptr;
    m_overridden.clear();
    if (m_analysis.flags)
        for (int p = 0; p < m_routing.itemCount(); ++p)
            if (m_program.hasVariable(p)) {
                out += ',';
                out.append(flagOf(s.classes[size_t(p)], s.implied[size_t(p)]));
            }
    out += "\r\n";
}

} // namespace rb
