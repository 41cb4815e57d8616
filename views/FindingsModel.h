#pragma once

#include "check/Finding.h"

#include <QAbstractTableModel>

namespace rb {

// The findings of the checks and the routing analysis as a read-only table:
// message (with a severity icon), where (item or module), field, check.
class FindingsModel : public QAbstractTableModel {
    Q_OBJECT
public:
    enum Column { MessageColumn, WhereColumn, FieldColumn, CheckColumn, ColumnCount };

    explicit FindingsModel(QObject* parent = nullptr);

    void setFindings(const Findings& findings);
    const Findings& findings() const { return m_findings; }
    const Finding& findingAt(int row) const { return m_findings.at(row); }

    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    QVariant headerData(int section, Qt::Orientation orientation,
                        int role = Qt::DisplayRole) const override;

private:
    Findings m_findings;
};

} // namespace rb
