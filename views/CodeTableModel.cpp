#include "CodeTableModel.h"

#include "edit/Cascades.h"
#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"

namespace rb {

CodeTableModel::CodeTableModel(Document* document, QObject* parent)
    : QAbstractTableModel(parent), m_document(document) {
    connect(document, &Document::changed, this, &CodeTableModel::documentChanged);
}

void CodeTableModel::setLocation(std::optional<CodeLocation> where) {
    beginResetModel();
    m_where = where;
    endResetModel();
}

QList<Code> CodeTableModel::codes() const {
    if (!m_where || !isValidLocation(m_document->instrument(), *m_where))
        return {};
    return codesAt(m_document->instrument(), *m_where);
}

void CodeTableModel::documentChanged(const ChangeEvent& event) {
    // Edits elsewhere (typing a question text) leave this table alone.
    if (event.kind == ChangeEvent::Kind::Attribute && m_where && !event.changesStructure() &&
        !(event.key == codesKey(*m_where)))
        return;
    // Code lists are short: a reset is exact enough and keeps this simple.
    beginResetModel();
    endResetModel();
}

void CodeTableModel::pushCodes(const QList<Code>& codes, const QString& text) {
    if (!m_where)
        return;
    m_document->push(
        new SetAttributeCommand(m_document, codesKey(*m_where), codesValue(*m_where, codes), text));
}

void CodeTableModel::addCode() {
    QList<Code> list = codes();
    if (!m_where)
        return;
    qint64 next = 1;
    for (const Code& code : list)
        if (code.code >= next && !code.isMissing())
            next = code.code + 1;
    list.append({next, QString(), MissingKind::None});
    pushCodes(list, tr("Add code %1").arg(next));
}

void CodeTableModel::removeCode(int row) {
    QList<Code> list = codes();
    if (row < 0 || row >= list.size())
        return;
    const qint64 code = list.takeAt(row).code;
    pushCodes(list, tr("Delete code %1").arg(code));
}

void CodeTableModel::moveCode(int row, int delta) {
    QList<Code> list = codes();
    const int to = row + delta;
    if (row < 0 || row >= list.size() || to < 0 || to >= list.size())
        return;
    list.swapItemsAt(row, to);
    pushCodes(list, tr("Move code %1").arg(list.at(to).code));
}

int CodeTableModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(codes().size());
}

int CodeTableModel::columnCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : ColumnCount;
}

QStringList CodeTableModel::missingChoices() {
    return {QString(), missingKindName(MissingKind::DontKnow),
            missingKindName(MissingKind::Refused), missingKindName(MissingKind::NotApplicable)};
}

QVariant CodeTableModel::data(const QModelIndex& index, int role) const {
    const QList<Code> list = codes();
    if (!index.isValid() || index.row() >= list.size())
        return {};
    const Code& code = list.at(index.row());
    if (role != Qt::DisplayRole && role != Qt::EditRole)
        return {};
    switch (index.column()) {
    case CodeColumn:
        return role == Qt::EditRole ? QVariant(code.code) : QVariant(QString::number(code.code));
    case LabelColumn:
        return code.label;
    default:
        return missingKindName(code.missing);
    }
}

bool CodeTableModel::setData(const QModelIndex& index, const QVariant& value, int role) {
    QList<Code> list = codes();
    if (role != Qt::EditRole || !index.isValid() || index.row() >= list.size() || !m_where)
        return false;
    Code& code = list[index.row()];
    switch (index.column()) {
    case CodeColumn: {
        bool ok = false;
        const qint64 number = value.toString().toLongLong(&ok);
        if (!ok || number == code.code)
            return false;
        m_document->push(recodeCommand(m_document, *m_where, index.row(), number));
        return true;
    }
    case LabelColumn:
        if (code.label == value.toString())
            return false;
        code.label = value.toString();
        pushCodes(list, tr("Edit code label"));
        return true;
    default: {
        const QString name = value.toString();
        const MissingKind kind =
            name.isEmpty() ? MissingKind::None : missingKindFromName(name).value_or(code.missing);
        if (kind == code.missing)
            return false;
        code.missing = kind;
        pushCodes(list, tr("Edit missing kind"));
        return true;
    }
    }
}

Qt::ItemFlags CodeTableModel::flags(const QModelIndex& index) const {
    if (!index.isValid())
        return Qt::NoItemFlags;
    return Qt::ItemIsEnabled | Qt::ItemIsSelectable | Qt::ItemIsEditable;
}

QVariant CodeTableModel::headerData(int section, Qt::Orientation orientation, int role) const {
    if (role != Qt::DisplayRole)
        return {};
    if (orientation == Qt::Vertical)
        return section + 1;
    switch (section) {
    case CodeColumn:
        return tr("Code");
    case LabelColumn:
        return tr("Label");
    default:
        return tr("Missing kind");
    }
}

} // namespace rb
