#include "OutlineModel.h"

#include "Icons.h"
#include "PlainText.h"
#include "edit/Cascades.h"
#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"
#include "edit/StructureCommands.h"

#include <QMimeData>

#include <algorithm>

namespace rb {

namespace {
const QString kItemMime = QStringLiteral("application/x-routebook-item");
}

OutlineModel::OutlineModel(Document* document, QObject* parent)
    : QAbstractItemModel(parent), m_document(document) {
    connect(document, &Document::aboutToChange, this, &OutlineModel::before);
    connect(document, &Document::changed, this, &OutlineModel::after);
    rebuildStarts();
}

void OutlineModel::rebuildStarts() {
    m_moduleStart.clear();
    int position = 0;
    for (const Module& module : m_document->instrument().modules) {
        m_moduleStart.append(position);
        position += int(module.items.size());
    }
}

int OutlineModel::flatPosition(int module, int item) const {
    return module < 0 || module >= m_moduleStart.size() ? -1 : m_moduleStart.at(module) + item;
}

std::pair<int, int> OutlineModel::rowOfPosition(int position) const {
    if (position < 0)
        return {-1, -1};
    // The last module starting at or before `position` (empty modules share a start).
    const auto after = std::upper_bound(m_moduleStart.begin(), m_moduleStart.end(), position);
    for (int module = int(after - m_moduleStart.begin()) - 1; module >= 0; --module) {
        const int item = position - m_moduleStart.at(module);
        if (item < m_document->instrument().modules.at(module).items.size())
            return {module, item};
        if (item > 0)
            break;
    }
    return {-1, -1};
}

void OutlineModel::setMarks(const QList<ItemMarks>& marks) {
    m_marks = marks;
    const QList<Module>& modules = m_document->instrument().modules;
    for (int m = 0; m < modules.size(); ++m)
        if (!modules.at(m).items.isEmpty())
            emit dataChanged(itemIndex(m, 0), itemIndex(m, int(modules.at(m).items.size()) - 1),
                             {Qt::DecorationRole, Qt::ToolTipRole});
}

// Module rows carry kModuleRow as internal id; item rows carry their module's row.
QModelIndex OutlineModel::index(int row, int column, const QModelIndex& parent) const {
    if (!hasIndex(row, column, parent))
        return {};
    if (!parent.isValid())
        return createIndex(row, column, kModuleRow);
    return createIndex(row, column, quintptr(parent.row()));
}

QModelIndex OutlineModel::parent(const QModelIndex& child) const {
    if (!child.isValid() || child.internalId() == kModuleRow)
        return {};
    return createIndex(int(child.internalId()), 0, kModuleRow);
}

int OutlineModel::rowCount(const QModelIndex& parent) const {
    if (parent.column() > 0)
        return 0;
    const QList<Module>& modules = m_document->instrument().modules;
    if (!parent.isValid())
        return int(modules.size());
    if (parent.internalId() == kModuleRow)
        return int(modules.at(parent.row()).items.size());
    return 0;
}

int OutlineModel::columnCount(const QModelIndex&) const {
    return ColumnCount;
}

std::pair<int, int> OutlineModel::locate(const QModelIndex& index) const {
    if (!index.isValid())
        return {-1, -1};
    if (index.internalId() == kModuleRow)
        return {index.row(), -1};
    return {int(index.internalId()), index.row()};
}

QModelIndex OutlineModel::moduleIndex(int module, int column) const {
    return index(module, column);
}

QModelIndex OutlineModel::itemIndex(int module, int item, int column) const {
    return index(item, column, moduleIndex(module));
}

QModelIndex OutlineModel::indexOfName(const QString& name) const {
    const QList<Module>& modules = m_document->instrument().modules;
    for (int m = 0; m < modules.size(); ++m)
        for (int i = 0; i < modules.at(m).items.size(); ++i)
            if (modules.at(m).items.at(i).name.compare(name, Qt::CaseInsensitive) == 0)
                return itemIndex(m, i);
    for (int m = 0; m < modules.size(); ++m)
        if (modules.at(m).name.compare(name, Qt::CaseInsensitive) == 0)
            return moduleIndex(m);
    return {};
}

QVariant OutlineModel::data(const QModelIndex& index, int role) const {
    const auto [module, item] = locate(index);
    if (module < 0)
        return {};
    return item < 0 ? moduleData(module, index.column(), role)
                    : itemData(module, item, index.column(), role);
}

QVariant OutlineModel::moduleData(int module, int column, int role) const {
    const Module& m = m_document->instrument().modules.at(module);
    if (role == Qt::DisplayRole || role == Qt::EditRole)
        return column == NameColumn ? m.name : m.title;
    if (role == Qt::DecorationRole && column == NameColumn)
        return Icons::get(Icons::Module);
    if (role == Qt::ToolTipRole && m.askIf)
        return plainToolTip(tr("Module asked if %1").arg(*m.askIf));
    return {};
}

QVariant OutlineModel::itemIcon(int position) const {
    if (position < 0 || position >= m_marks.size())
        return Icons::get(Icons::Item);
    const ItemMarks& marks = m_marks.at(position);
    if (marks.asked == ItemUniverse::Asked::Never)
        return Icons::get(Icons::Unreachable);
    if (marks.inLoop)
        return Icons::get(Icons::Loop);
    if (marks.asked == ItemUniverse::Asked::Conditional)
        return Icons::get(Icons::Conditional);
    return Icons::get(Icons::Item);
}

QVariant OutlineModel::itemData(int module, int item, int column, int role) const {
    const Item& it = m_document->instrument().modules.at(module).items.at(item);
    const int position = flatPosition(module, item);
    switch (role) {
    case Qt::DisplayRole:
    case Qt::EditRole:
        return column == NameColumn ? it.name : it.label;
    case Qt::DecorationRole:
        return column == NameColumn ? itemIcon(position) : QVariant();
    case Qt::ToolTipRole: {
        QString tip = it.text.isEmpty() ? it.name : it.text;
        if (position >= 0 && position < m_marks.size()) {
            const ItemMarks& marks = m_marks.at(position);
            if (marks.asked == ItemUniverse::Asked::Never)
                tip += u'\n' + tr("Never asked: no respondent reaches this item");
            else if (marks.asked == ItemUniverse::Asked::Conditional)
                tip += u'\n' + tr("Asked if %1").arg(marks.askedIf);
            if (marks.inLoop)
                tip += u'\n' + tr("Part of a routing loop");
        }
        return plainToolTip(tip);
    }
    case Qt::ForegroundRole:
        if (position >= 0 && position < m_marks.size() && m_marks.at(position).hasError)
            return QColor(0xc0, 0x39, 0x2b);
        return {};
    default:
        return {};
    }
}

bool OutlineModel::setData(const QModelIndex& index, const QVariant& value, int role) {
    if (role != Qt::EditRole)
        return false;
    const auto [module, item] = locate(index);
    if (module < 0 || data(index, Qt::EditRole) == value)
        return false;
    const QString text = value.toString();
    if (index.column() == NameColumn) {
        m_document->push(item < 0 ? renameModuleCommand(m_document, module, text)
                                  : renameItemCommand(m_document, module, item, text));
    } else if (item < 0) {
        m_document->push(new SetAttributeCommand(m_document,
                                                 AttributeKey::ofModule(module, Field::ModuleTitle),
                                                 text, tr("Edit module title")));
    } else {
        m_document->push(new SetAttributeCommand(
            m_document, AttributeKey::ofItem(module, item, Field::ItemLabel), text,
            tr("Edit label")));
    }
    return true;
}

Qt::ItemFlags OutlineModel::flags(const QModelIndex& index) const {
    if (!index.isValid())
        return Qt::ItemIsDropEnabled;
    Qt::ItemFlags f = Qt::ItemIsEnabled | Qt::ItemIsSelectable | Qt::ItemIsEditable;
    if (index.internalId() == kModuleRow)
        return f | Qt::ItemIsDropEnabled;
    return f | Qt::ItemIsDragEnabled | Qt::ItemIsDropEnabled;
}

QVariant OutlineModel::headerData(int section, Qt::Orientation orientation, int role) const {
    if (orientation != Qt::Horizontal || role != Qt::DisplayRole)
        return {};
    return section == NameColumn ? tr("Name") : tr("Label / title");
}

QStringList OutlineModel::mimeTypes() const {
    return {kItemMime};
}

QMimeData* OutlineModel::mimeData(const QModelIndexList& indexes) const {
    for (const QModelIndex& index : indexes) {
        const auto [module, item] = locate(index);
        if (item < 0)
            continue;
        auto* data = new QMimeData;
        data->setData(kItemMime, QStringLiteral("%1 %2").arg(module).arg(item).toLatin1());
        return data; // one item at a time
    }
    return nullptr;
}

bool OutlineModel::dropMimeData(const QMimeData* data, Qt::DropAction action, int row, int,
                                const QModelIndex& parent) {
    if (action != Qt::MoveAction || !data->hasFormat(kItemMime))
        return false;
    const QList<QByteArray> parts = data->data(kItemMime).split(' ');
    if (parts.size() != 2)
        return false;
    const int fromModule = parts.at(0).toInt(), fromItem = parts.at(1).toInt();
    auto [toModule, onItem] = locate(parent);
    int toItem = row;
    if (toModule < 0) // between modules: to the end of the module above
        toModule = qMax(0, row - 1), toItem = -1;
    else if (onItem >= 0) // onto an item: before it
        toItem = onItem;
    const QList<Module>& modules = m_document->instrument().modules;
    if (toModule >= modules.size() || fromModule >= modules.size())
        return false;
    if (toItem < 0)
        toItem = int(modules.at(toModule).items.size());
    if (toModule == fromModule && toItem > fromItem)
        --toItem; // index after the item has been taken out
    if (toModule == fromModule && toItem == fromItem)
        return false;
    m_document->push(new MoveItemCommand(m_document, fromModule, fromItem, toModule, toItem));
    return true;
}

void OutlineModel::before(const ChangeEvent& e) {
    using K = ChangeEvent::Kind;
    switch (e.kind) {
    case K::Reset:
    case K::ModuleInserted:
    case K::ModuleRemoved:
    case K::ModuleMoved:
        beginResetModel(); // item indices carry module rows: rebuild
        break;
    case K::ItemInserted:
        beginInsertRows(moduleIndex(e.module), e.item, e.item);
        break;
    case K::ItemRemoved:
        beginRemoveRows(moduleIndex(e.module), e.item, e.item);
        break;
    case K::ItemMoved: {
        // Qt counts the destination row before the removal.
        const int destination =
            (e.module == e.toModule && e.toItem >= e.item) ? e.toItem + 1 : e.toItem;
        m_moving = beginMoveRows(moduleIndex(e.module), e.item, e.item, moduleIndex(e.toModule),
                                 destination);
        if (!m_moving)
            beginResetModel();
        break;
    }
    default:
        break;
    }
}

void OutlineModel::after(const ChangeEvent& e) {
    using K = ChangeEvent::Kind;
    rebuildStarts();
    switch (e.kind) {
    case K::Reset:
    case K::ModuleInserted:
    case K::ModuleRemoved:
    case K::ModuleMoved:
        endResetModel();
        break;
    case K::ItemInserted:
        endInsertRows();
        break;
    case K::ItemRemoved:
        endRemoveRows();
        break;
    case K::ItemMoved:
        m_moving ? endMoveRows() : endResetModel();
        m_moving = false;
        break;
    case K::Attribute: {
        const Field f = e.key.field;
        if (f == Field::ItemName || f == Field::ItemLabel || f == Field::ItemText) {
            const QModelIndex i = itemIndex(e.key.module, e.key.item);
            emit dataChanged(i, i.siblingAtColumn(LabelColumn));
        } else if (f == Field::ModuleName || f == Field::ModuleTitle || f == Field::ModuleAskIf) {
            const QModelIndex i = moduleIndex(e.key.module);
            emit dataChanged(i, i.siblingAtColumn(LabelColumn));
        }
        break;
    }
    default:
        break;
    }
}

} // namespace rb
