#pragma once

#include <QAbstractTableModel>

namespace rb {

class Document;
struct ChangeEvent;
struct Rule;

// The routing rules of one item as an ordered table: "if CONDITION" and
// "go to TARGET". An empty condition is an unconditional goto. Every edit
// swaps the item's rule list through one attribute command.
class RulesModel : public QAbstractTableModel {
    Q_OBJECT
public:
    enum Column { ConditionColumn, TargetColumn, ColumnCount };

    explicit RulesModel(Document* document, QObject* parent = nullptr);

    void setItem(int module, int item); // -1, -1: none
    int module() const { return m_module; }
    int item() const { return m_item; }

    // Typing in the rule editors: consecutive edits of the rules merge.
    void editRule(int row, int column, const QString& text);
    void addRule(const QString& target);
    void removeRule(int row);
    void moveRule(int row, int delta);
    // Targets a rule of this item may name: the items after it, modules, END.
    QStringList targetChoices() const;

    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    bool setData(const QModelIndex& index, const QVariant& value, int role = Qt::EditRole) override;
    Qt::ItemFlags flags(const QModelIndex& index) const override;
    QVariant headerData(int section, Qt::Orientation orientation,
                        int role = Qt::DisplayRole) const override;

private:
    bool valid() const;
    QList<Rule> rules() const;
    void pushRules(const QList<Rule>& rules, const QString& text, bool typing = false);
    bool applyEdit(int row, int column, const QString& text, bool typing);
    void documentChanged(const ChangeEvent& event);

    Document* m_document;
    int m_module = -1;
    int m_item = -1;
    int m_rows = 0; // row count last announced
};

} // namespace rb
