#include "RulesPanel.h"

#include "ConditionField.h"
#include "Icons.h"
#include "OutlineModel.h"
#include "PlainText.h"
#include "RulesModel.h"
#include "edit/Document.h"

#include <QComboBox>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QPushButton>
#include <QTableView>
#include <QVBoxLayout>

namespace rb {

RulesPanel::RulesPanel(Document* document, OutlineModel* outline, QWidget* parent)
    : QWidget(parent), m_document(document), m_outline(outline),
      m_model(new RulesModel(document, this)), m_table(new QTableView),
      m_condition(new ConditionField), m_target(new QComboBox),
      m_add(new QPushButton(Icons::get(Icons::Add), tr("Add rule"))),
      m_remove(new QPushButton(Icons::get(Icons::Remove), tr("Delete"))),
      m_up(new QPushButton(Icons::get(Icons::Up), QString())),
      m_down(new QPushButton(Icons::get(Icons::Down), QString())), m_note(plainLabel(new QLabel)) {
    m_table->setObjectName(QStringLiteral("rulesTable"));
    m_table->setModel(m_model);
    m_table->setSelectionBehavior(QAbstractItemView::SelectRows);
    m_table->setSelectionMode(QAbstractItemView::SingleSelection);
    m_table->horizontalHeader()->setSectionResizeMode(RulesModel::ConditionColumn,
                                                      QHeaderView::Stretch);
    m_table->horizontalHeader()->setSectionResizeMode(RulesModel::TargetColumn,
                                                      QHeaderView::ResizeToContents);
    m_table->setEditTriggers(QAbstractItemView::NoEditTriggers); // edited below the table
    m_condition->setObjectName(QStringLiteral("ruleCondition"));
    m_condition->setInstrument(&document->instrument());
    m_target->setObjectName(QStringLiteral("ruleTarget"));
    m_target->setEditable(true); // any name may be typed; unknown ones become findings
    m_target->setInsertPolicy(QComboBox::NoInsert);
    m_up->setToolTip(tr("Move the rule up (evaluated earlier)"));
    m_down->setToolTip(tr("Move the rule down"));
    m_note->setObjectName(QStringLiteral("panelNote"));
    m_note->setWordWrap(true);

    auto* buttons = new QHBoxLayout;
    for (QPushButton* b : {m_add, m_remove, m_up, m_down})
        buttons->addWidget(b);
    buttons->addStretch();
    auto* editors = new QFormLayout;
    editors->addRow(tr("&If"), m_condition);
    editors->addRow(tr("&Go to"), m_target);
    auto* layout = new QVBoxLayout(this);
    layout->addWidget(m_note);
    layout->addWidget(m_table, 1);
    layout->addLayout(buttons);
    layout->addLayout(editors);

    connect(m_add, &QPushButton::clicked, this, [this] {
        const QStringList targets = m_model->targetChoices();
        m_model->addRule(targets.isEmpty() ? QStringLiteral("END") : targets.first());
        m_table->selectRow(m_model->rowCount() - 1);
    });
    connect(m_remove, &QPushButton::clicked, this, [this] { m_model->removeRule(currentRow()); });
    connect(m_up, &QPushButton::clicked, this, [this] {
        const int row = currentRow();
        m_model->moveRule(row, -1);
        m_table->selectRow(row - 1);
    });
    connect(m_down, &QPushButton::clicked, this, [this] {
        const int row = currentRow();
        m_model->moveRule(row, +1);
        m_table->selectRow(row + 1);
    });
    connect(m_table->selectionModel(), &QItemSelectionModel::currentRowChanged, this,
            &RulesPanel::syncEditors);
    connect(m_model, &QAbstractItemModel::modelAboutToBeReset, this,
            [this] { m_lastRow = currentRow(); });
    connect(m_model, &QAbstractItemModel::modelReset, this, [this] {
        // Keep the rule being edited selected across list changes.
        if (m_model->rowCount() > 0 && m_lastRow >= 0)
            m_table->selectRow(qMin(m_lastRow, m_model->rowCount() - 1));
        syncEditors();
    });
    connect(m_model, &QAbstractItemModel::dataChanged, this, &RulesPanel::syncEditors);
    connect(m_condition, &ConditionField::edited, this, [this](const QString& text) {
        if (!m_syncing && currentRow() >= 0)
            m_model->editRule(currentRow(), RulesModel::ConditionColumn, text);
    });
    connect(m_target, &QComboBox::currentTextChanged, this, [this](const QString& text) {
        if (!m_syncing && currentRow() >= 0 && !text.isEmpty())
            m_model->editRule(currentRow(), RulesModel::TargetColumn, text);
    });
    setCurrent({});
}

int RulesPanel::currentRow() const {
    const QModelIndex index = m_table->currentIndex();
    return index.isValid() ? index.row() : -1;
}

void RulesPanel::setCurrent(const QModelIndex& outlineIndex) {
    m_current = outlineIndex.siblingAtColumn(0);
    const auto [module, item] = m_outline->locate(m_current);
    m_lastRow = -1;
    m_model->setItem(module, item);
    const bool onItem = item >= 0;
    m_add->setEnabled(onItem);
    m_note->setText(onItem ? tr("Rules are tried in order after the item is answered; the first "
                                "that holds jumps. None holds: the next item.")
                           : tr("Select an item to see its routing."));
    if (onItem && m_model->rowCount() > 0)
        m_table->selectRow(0);
    syncEditors();
}

void RulesPanel::refreshTargets() {
    const QString current = m_target->currentText();
    m_target->clear();
    m_target->addItems(m_model->targetChoices());
    m_target->setCurrentText(current);
}

void RulesPanel::syncEditors() {
    // The outline index may have moved (rows inserted above): follow it.
    const auto [module, item] = m_outline->locate(m_current);
    if (module != m_model->module() || item != m_model->item()) {
        m_lastRow = -1;
        m_model->setItem(module, item);
        return; // modelReset brings us back here
    }
    m_syncing = true;
    const int row = currentRow();
    const bool haveRule = row >= 0 && row < m_model->rowCount();
    m_condition->setEnabled(haveRule);
    m_target->setEnabled(haveRule);
    m_remove->setEnabled(haveRule);
    m_up->setEnabled(haveRule && row > 0);
    m_down->setEnabled(haveRule && row + 1 < m_model->rowCount());
    refreshTargets();
    if (haveRule) {
        if (!m_condition->editor()->hasFocus())
            m_condition->setText(
                m_model->data(m_model->index(row, RulesModel::ConditionColumn), Qt::EditRole)
                    .toString());
        m_target->setCurrentText(
            m_model->data(m_model->index(row, RulesModel::TargetColumn), Qt::EditRole).toString());
    } else {
        m_condition->setText(QString());
        m_target->setCurrentText(QString());
    }
    m_syncing = false;
}

void RulesPanel::focusRule(int row, bool target, int column) {
    if (row < 0 || row >= m_model->rowCount())
        return;
    m_table->selectRow(row);
    if (target)
        m_target->setFocus(Qt::OtherFocusReason);
    else
        m_condition->focusColumn(column);
}

} // namespace rb
