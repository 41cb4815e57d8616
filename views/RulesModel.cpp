#include "RulesModel.h"

#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"

namespace rb {

RulesModel::RulesModel(Document* document, QObject* parent)
    : QAbstractTableModel(parent), m_document(document) {
    connect(document, &Document::changed, this, &RulesModel::documentChanged);
}

void RulesModel::setItem(int module, int item) {
    beginResetModel();
    m_module = module;
    m_item = item;
    m_rows = int(rules().size());
    endResetModel();
}

bool RulesModel::valid() const {
    const QList<Module>& modules = m_document->instrument().modules;
    return m_module >= 0 && m_module < modules.size() && m_item >= 0 &&
           m_item < modules.at(m_module).items.size();
}

QList<Rule> RulesModel::rules() const {
    return valid() ? m_document->instrument().modules.at(m_module).items.at(m_item).routing
                   : QList<Rule>();
}

void RulesModel::documentChanged(const ChangeEvent& event) {
    const bool ours = event.kind == ChangeEvent::Kind::Attribute &&
                      event.key == AttributeKey::ofItem(m_module, m_item, Field::ItemRouting);
    if (event.kind == ChangeEvent::Kind::Attribute && !event.changesStructure() && !ours)
        return;
    const int rows = int(rules().size());
    if (ours && rows == m_rows && rows > 0) {
        // Typing in a condition: same rows, new text. Keeps the selection.
        emit dataChanged(index(0, 0), index(rows - 1, ColumnCount - 1));
        return;
    }
    beginResetModel();
    m_rows = rows;
    endResetModel();
}

void RulesModel::pushRules(const QList<Rule>& rules, const QString& text, bool typing) {
    if (!valid())
        return;
    const AttributeKey key = AttributeKey::ofItem(m_module, m_item, Field::ItemRouting);
    m_document->push(typing ? SetAttributeCommand::typing(m_document, key, rules, text)
                            : new SetAttributeCommand(m_document, key, rules, text));
}

void RulesModel::editRule(int row, int column, const QString& text) {
    applyEdit(row, column, text, true);
}

void RulesModel::addRule(const QString& target) {
    QList<Rule> list = rules();
    list.append({QString(), target});
    pushRules(list, tr("Add rule"));
}

void RulesModel::removeRule(int row) {
    QList<Rule> list = rules();
    if (row < 0 || row >= list.size())
        return;
    list.removeAt(row);
    pushRules(list, tr("Delete rule"));
}

void RulesModel::moveRule(int row, int delta) {
    QList<Rule> list = rules();
    const int to = row + delta;
    if (row < 0 || to < 0 || row >= list.size() || to >= list.size())
        return;
    // Rebuilt rather than swapped in place (GCC 12 warns falsely on swapping
    // std::optional<QString> members).
    QList<Rule> reordered;
    for (int i = 0; i < list.size(); ++i)
        reordered.append(list.at(i == row ? to : i == to ? row : i));
    list = reordered;
    pushRules(list, tr("Move rule"));
}

QStringList RulesModel::targetChoices() const {
    QStringList choices;
    if (!valid())
        return choices;
    const QList<Module>& modules = m_document->instrument().modules;
    for (int m = 0; m < modules.size(); ++m) {
        // Forward targets first: later items of this module, then later modules.
        if (m > m_module)
            choices.append(modules.at(m).name);
        for (int i = 0; i < modules.at(m).items.size(); ++i)
            if (m > m_module || (m == m_module && i > m_item))
                choices.append(modules.at(m).items.at(i).name);
    }
    choices.append(QStringLiteral("END"));
    return choices;
}

int RulesModel::rowCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : int(rules().size());
}

int RulesModel::columnCount(const QModelIndex& parent) const {
    return parent.isValid() ? 0 : ColumnCount;
}

QVariant RulesModel::data(const QModelIndex& index, int role) const {
    const QList<Rule> list = rules();
    if (!index.isValid() || index.row() >= list.size())
        return {};
    const Rule& rule = list.at(index.row());
    if (role == Qt::DisplayRole) {
        if (index.column() == TargetColumn)
            return rule.target;
        return rule.condition ? *rule.condition : tr("(always)");
    }
    if (role == Qt::EditRole)
        return index.column() == TargetColumn ? rule.target : rule.condition.value_or(QString());
    return {};
}

bool RulesModel::setData(const QModelIndex& index, const QVariant& value, int role) {
    if (role != Qt::EditRole || !index.isValid())
        return false;
    return applyEdit(index.row(), index.column(), value.toString(), false);
}

bool RulesModel::applyEdit(int row, int column, const QString& text, bool typing) {
    QList<Rule> list = rules();
    if (row < 0 || row >= list.size())
        return false;
    Rule& rule = list[row];
    if (column == TargetColumn) {
        if (text == rule.target)
            return false;
        rule.target = text;
        pushRules(list, tr("Change goto target"), typing);
        return true;
    }
    const std::optional<QString> condition =
        text.trimmed().isEmpty() ? std::nullopt : std::optional<QString>(text);
    if (condition == rule.condition)
        return false;
    rule.condition = condition;
    pushRules(list, tr("Edit rule condition"), typing);
    return true;
}

Qt::ItemFlags RulesModel::flags(const QModelIndex& index) const {
    if (!index.isValid())
        return Qt::NoItemFlags;
    return Qt::ItemIsEnabled | Qt::ItemIsSelectable | Qt::ItemIsEditable;
}

QVariant RulesModel::headerData(int section, Qt::Orientation orientation, int role) const {
    if (role != Qt::DisplayRole)
        return {};
    if (orientation == Qt::Vertical)
        return section + 1;
    return section == ConditionColumn ? tr("If") : tr("Go to");
}

} // namespace rb
