#pragma once

#include "CellReading.h"
#include "DataCheck.h"

namespace rb {

// Classifies the cells of one record at a time: runs the reference route on
// the record's own values, then applies DESIGN.md's table to every item, and
// builds the record's analysis-file row.
class RecordChecker {
public:
    RecordChecker(const CompiledRouting& routing, const HeaderMapping& mapping,
                  const QString& fileName, const DataCheckOptions& options,
                  const AnalysisOptions& analysisOptions);

    DataCheckResult emptyResult() const;
    QStringList analysisHeader() const;
    void check(const std::vector<QByteArrayView>& fields, qint64 record, qint64 line,
               DataCheckResult& into, QList<QByteArray>* analysisRow) const;

private:
    struct ItemPlan {
        bool hasVariable = false;
        QList<int> gates;           // positions read by conditions that can skip the item
        bool hasImplied = false;    // when_skipped set
        cond::ExprPtr impliedIf;    // null with hasImplied: whenever not presented
        bool impliedBroken = false; // the `if` does not compile: never filled
        QByteArray impliedValue;
        int resultIndex = -1; // index in DataCheckResult::items
        QHash<qint64, int> frequencyIndex;
    };

    void note(ProblemRecords& problems, const QString& id) const;
    QString recordId(const std::vector<QByteArrayView>& fields, qint64 record) const;
    void writeRow(const std::vector<QByteArrayView>& fields, const std::vector<CellClass>& classes,
                  const std::vector<char>& implied, QList<QByteArray>& row) const;

    const CompiledRouting& m_routing;
    const HeaderMapping& m_mapping;
    QString m_fileName;
    DataCheckOptions m_options;
    AnalysisOptions m_analysis;
    CellInterpreter m_cells;
    std::vector<ItemPlan> m_plans;
    QByteArray m_skipCode;
};

} // namespace rb
