#include "ChunkChecker.h"

#include "CsvRange.h"

namespace rb {

namespace {

QByteArray flagOf(CellClass c, bool implied) {
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
                           const AnalysisOptions& analysisOptions)
    : m_routing(routing), m_program(program), m_mapping(mapping), m_options(options),
      m_analysis(analysisOptions),
      m_skipCode(routing.instrument().settings.legitimateSkipCode.toUtf8()) {
    m_options.progress = nullptr; // progress is the merging thread's business
    program.prepare(m_scratch);
    for (int p = 0; p < routing.itemCount(); ++p) {
        const Item& item = *routing.index().at(p).item;
        m_impliedValues.push_back(item.whenSkipped ? item.whenSkipped->value.toUtf8()
                                                   : QByteArray());
    }
}

void ChunkChecker::run(const char* begin, const char* end, bool truncated, ChunkTally& tally,
                       AnalysisSink* analysis) {
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
        const std::vector<QByteArrayView>& fields = range.fields();
        if (qsizetype(fields.size()) != m_mapping.columnCount) {
            tally.error =
                ChunkTally::Error{range.recordLine(), 1, {}, record, qint64(fields.size())};
            return;
        }
        m_program.classify(fields, m_scratch, &counts);
        count(record, range.recordLine(), fields, tally);
        if (analysis) {
            writeRow(fields);
            analysis->row(m_row);
        }
    }
    if (status == CsvRange::Status::Error) {
        const CsvRange::Error& e = range.error();
        tally.error = ChunkTally::Error{e.line, e.column, e.message};
    }
    tally.records = record;
    tally.lines = range.linesDone();
}

void ChunkChecker::note(ChunkTally::Problems& problems, qint64 record,
                        const std::vector<QByteArrayView>& fields) const {
    if (qsizetype(problems.firstRecords.size() + size_t(problems.firstIds.size())) <
        m_options.firstRecordsKept) {
        if (m_mapping.idColumn >= 0)
            problems.firstIds.append(QString::fromUtf8(fields[size_t(m_mapping.idColumn)]));
        else
            problems.firstRecords.push_back(record);
    }
    ++problems.count;
}

void ChunkChecker::count(qint64 record, qint64 line, const std::vector<QByteArrayView>& fields,
                         ChunkTally& tally) const {
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

void ChunkChecker::writeRow(const std::vector<QByteArrayView>& fields) {
    const RecordProgram::Scratch& s = m_scratch;
    m_row.clear();
    for (QByteArrayView f : fields)
        m_row.append(f.toByteArray());
    for (int p = 0; p < m_routing.itemCount(); ++p) {
        if (!m_program.hasVariable(p) || s.classes[size_t(p)] != CellClass::LegitimateSkip)
            continue;
        const QByteArray value = s.implied[size_t(p)] ? m_impliedValues[size_t(p)] : m_skipCode;
        if (m_routing.index().at(p).item->type == ItemType::Multi) {
            for (int c : m_mapping.multiColumns[size_t(p)])
                if (c >= 0)
                    m_row[c] = value;
        } else if (const int c = m_mapping.column[size_t(p)]; c >= 0) {
            m_row[c] = value;
        }
    }
    if (m_analysis.flags)
        for (int p = 0; p < m_routing.itemCount(); ++p)
            if (m_program.hasVariable(p))
                m_row.append(flagOf(s.classes[size_t(p)], s.implied[size_t(p)]));
}

} // namespace rb
