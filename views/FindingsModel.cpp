#include "FindingsModel.h"

#include "Icons.h"
#include "PlainText.h"

namespace rb {

FindingsModel::FindingsModel(QObject* parent) : QAbstractTableModel(parent) {}

void FindingsModel::setFindings(const Findings& findings) {
    // Same list (the usual case after an edit elsewhere): keep selection and scroll.
    if (findings.size() == m_findings.size()) {
        bool same = true;
        for (int i = 0; i < findings.size() && same; ++i)
            same = findings.at(i).id() == m_findings.at(i).id() &&
                   findings.at(i).message == m_findings.at(i).message &&
                   findings.at(i).column == m_findings.at(i).column;
        if (same)
            return;
    }
    beginResetModel();
    m_findings = findings;
    endResetModel();
}

int FindingsModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(m_findings.size());
}

int FindingsModel::columnCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : ColumnCount;
}

static QString whereOf(const Finding& f) {
    if (!f.item.isEmpty())
        return f.item;
    if (!f.module.isEmpty())
        return f.module;
    return f.subject;
}

QVariant FindingsModel::data(const QModelIndex& index, int role) const {
    if (!index.isValid())
        return {};
    const Finding& f = m_findings.at(index.row());
    if (role == Qt::DecorationRole && index.column() == MessageColumn)
        return Icons::get(f.severity == Severity::Error ? Icons::Error : Icons::Warning);
    if (role == Qt::ToolTipRole)
        return plainToolTip(QStringLiteral("%1 (%2)").arg(f.message, f.id()));
    if (role != Qt::DisplayRole)
        return {};
    switch (index.column()) {
    case MessageColumn:
        return f.message;
    case WhereColumn:
        return whereOf(f);
    case FieldColumn:
        return f.column ? tr("%1, column %2").arg(f.field).arg(*f.column) : f.field;
    default:
        return f.check;
    }
}

QVariant FindingsModel::headerData(int section, Qt::Orientation orientation, int role) const {
    if (orientation != Qt::Horizontal || role != Qt::DisplayRole)
        return {};
    switch (section) {
    case MessageColumn:
        return tr("Finding");
    case WhereColumn:
        return tr("Where");
    case FieldColumn:
        return tr("Field");
    default:
        return tr("Check");
    }
}

} // namespace rb
