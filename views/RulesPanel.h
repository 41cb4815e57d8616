#pragma once

#include <QPersistentModelIndex>
#include <QWidget>

class QComboBox;
class QLabel;
class QPushButton;
class QTableView;

namespace rb {

class ConditionField;
class Document;
class OutlineModel;
class RulesModel;

// The routing rules of the selected item: an ordered table (if -> go to),
// buttons to add, delete and reorder, and under it the selected rule's
// condition (highlighted, completed, parse errors shown) and a target picker
// offering the items after this one, the modules and END.
class RulesPanel : public QWidget {
    Q_OBJECT
public:
    RulesPanel(Document* document, OutlineModel* outline, QWidget* parent = nullptr);

    void setCurrent(const QModelIndex& outlineIndex);
    // Selects rule `row` and focuses its condition (column) or its target.
    void focusRule(int row, bool target, int column);

    RulesModel* model() const { return m_model; }
    QTableView* table() const { return m_table; }
    ConditionField* conditionField() const { return m_condition; }
    QComboBox* targetBox() const { return m_target; }
    QPushButton* addButton() const { return m_add; }

private:
    void syncEditors();
    void refreshTargets();
    int currentRow() const;

    Document* m_document;
    OutlineModel* m_outline;
    QPersistentModelIndex m_current;
    RulesModel* m_model;
    QTableView* m_table;
    ConditionField* m_condition;
    QComboBox* m_target;
    QPushButton* m_add;
    QPushButton* m_remove;
    QPushButton* m_up;
    QPushButton* m_down;
    QLabel* m_note;
    bool m_syncing = false;
    int m_lastRow = -1;
};

} // namespace rb
