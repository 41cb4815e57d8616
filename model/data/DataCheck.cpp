#include "DataCheck.h"

#include "CsvReader.h"
#include "RecordChecker.h"

namespace rb {

qint64 ItemCounts::nonresponse() const {
    return nonresponseByKind[0] + nonresponseByKind[1] + nonresponseByKind[2] +
           nonresponseByKind[3];
}

QString cellClassName(CellClass c) {
    switch (c) {
    case CellClass::Answered:
        return QStringLiteral("answered");
    case CellClass::Blank:
        return QStringLiteral("blank");
    case CellClass::DontKnow:
        return QStringLiteral("dont_know");
    case CellClass::Refused:
        return QStringLiteral("refused");
    case CellClass::NotApplicable:
        return QStringLiteral("not_applicable");
    case CellClass::Invalid:
        return QStringLiteral("invalid");
    case CellClass::LegitimateSkip:
        return QStringLiteral("legitimate_skip");
    case CellClass::RoutingViolation:
        return QStringLiteral("routing_violation");
    }
    return {};
}

DataCheckOutcome runDataCheck(const CompiledRouting& routing, QIODevice& csv,
                              const QString& fileName, const DataCheckOptions& options,
                              AnalysisSink* analysis, const AnalysisOptions& analysisOptions) {
    DataCheckOutcome outcome;
    CsvReader reader(csv, fileName, options.maxRecordBytes);
    CsvReader::Status status = reader.next();
    if (status == CsvReader::Status::Error) {
        outcome.error = reader.error();
        return outcome;
    }
    if (status == CsvReader::Status::End) {
        outcome.error = Diagnostic{
            fileName, 1, 1,
            QStringLiteral("the file is empty: expected a header row of variable names")};
        return outcome;
    }
    HeaderMappingResult mapped = mapHeader(routing, reader.fields(), fileName, options.idColumn);
    if (mapped.error) {
        outcome.error = mapped.error;
        return outcome;
    }
    RecordChecker checker(routing, mapped.mapping, fileName, options, analysisOptions);
    DataCheckResult result = checker.emptyResult();
    if (analysis)
        analysis->header(checker.analysisHeader());
    QList<QByteArray> row;
    qint64 record = 0;
    while ((status = reader.next()) == CsvReader::Status::Record) {
        ++record;
        const std::vector<QByteArrayView>& fields = reader.fields();
        if (int(fields.size()) != mapped.mapping.columnCount) {
            outcome.error = Diagnostic{fileName, int(reader.recordLine()), 1,
                                       QStringLiteral("record %1 has %2 fields; the header has %3")
                                           .arg(record)
                                           .arg(fields.size())
                                           .arg(mapped.mapping.columnCount)};
            return outcome;
        }
        checker.check(fields, record, reader.recordLine(), result, analysis ? &row : nullptr);
        if (analysis)
            analysis->row(row);
        if (options.progress && (record & 1023) == 0 && !options.progress(reader.bytesConsumed())) {
            outcome.error = Diagnostic{fileName, int(reader.recordLine()), 0,
                                       QStringLiteral("the data check was cancelled")};
            return outcome;
        }
    }
    if (status == CsvReader::Status::Error) {
        outcome.error = reader.error();
        return outcome;
    }
    if (options.progress)
        options.progress(reader.bytesConsumed());
    result.records = record;
    outcome.result = std::move(result);
    return outcome;
}

} // namespace rb
