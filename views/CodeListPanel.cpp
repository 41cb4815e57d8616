#include "CodeListPanel.h"

#include "CodeTableModel.h"
#include "Icons.h"
#include "PlainText.h"
#include "edit/Cascades.h"
#include "edit/Document.h"
#include "edit/StructureCommands.h"

#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QListWidget>
#include <QPushButton>
#include <QSplitter>
#include <QTableView>
#include <QVBoxLayout>

namespace rb {

CodeListPanel::CodeListPanel(Document* document, QWidget* parent)
    : QWidget(parent), m_document(document), m_lists(new QListWidget),
      m_usedBy(plainLabel(new QLabel)), m_codes(new QTableView),
      m_model(new CodeTableModel(document, this)),
      m_removeList(new QPushButton(Icons::get(Icons::Remove), tr("Delete list"))) {
    m_lists->setObjectName(QStringLiteral("codeLists"));
    m_lists->setEditTriggers(QAbstractItemView::DoubleClicked | QAbstractItemView::EditKeyPressed);
    m_codes->setObjectName(QStringLiteral("sharedCodes"));
    m_codes->setModel(m_model);
    m_codes->horizontalHeader()->setSectionResizeMode(CodeTableModel::LabelColumn,
                                                      QHeaderView::Stretch);
    m_codes->verticalHeader()->hide();
    m_usedBy->setObjectName(QStringLiteral("usedBy"));
    m_usedBy->setWordWrap(true);

    auto* addList = new QPushButton(Icons::get(Icons::Add), tr("Add list"));
    auto* addCode = new QPushButton(Icons::get(Icons::Add), tr("Add code"));
    auto* removeCode = new QPushButton(Icons::get(Icons::Remove), tr("Delete code"));
    auto* up = new QPushButton(Icons::get(Icons::Up), QString());
    auto* down = new QPushButton(Icons::get(Icons::Down), QString());
    m_removeList->setToolTip(tr("Items that used the list keep a copy as their own codes"));

    auto* left = new QWidget;
    auto* leftLayout = new QVBoxLayout(left);
    leftLayout->setContentsMargins(0, 0, 0, 0);
    leftLayout->addWidget(m_lists);
    auto* listButtons = new QHBoxLayout;
    listButtons->addWidget(addList);
    listButtons->addWidget(m_removeList);
    leftLayout->addLayout(listButtons);
    auto* right = new QWidget;
    auto* rightLayout = new QVBoxLayout(right);
    rightLayout->setContentsMargins(0, 0, 0, 0);
    rightLayout->addWidget(m_usedBy);
    rightLayout->addWidget(m_codes);
    auto* codeButtons = new QHBoxLayout;
    for (QPushButton* b : {addCode, removeCode, up, down})
        codeButtons->addWidget(b);
    codeButtons->addStretch();
    rightLayout->addLayout(codeButtons);
    auto* splitter = new QSplitter;
    splitter->addWidget(left);
    splitter->addWidget(right);
    splitter->setStretchFactor(1, 2);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addWidget(splitter);

    connect(addList, &QPushButton::clicked, this, &CodeListPanel::addList);
    connect(m_removeList, &QPushButton::clicked, this, [this] {
        const int row = m_lists->currentRow();
        if (row >= 0)
            m_document->push(deleteCodeListCommand(m_document, row));
    });
    connect(addCode, &QPushButton::clicked, m_model, &CodeTableModel::addCode);
    connect(removeCode, &QPushButton::clicked, this,
            [this] { m_model->removeCode(m_codes->currentIndex().row()); });
    connect(up, &QPushButton::clicked, this, [this] {
        const int row = m_codes->currentIndex().row();
        m_model->moveCode(row, -1);
        m_codes->setCurrentIndex(m_model->index(row - 1, 0));
    });
    connect(down, &QPushButton::clicked, this, [this] {
        const int row = m_codes->currentIndex().row();
        m_model->moveCode(row, +1);
        m_codes->setCurrentIndex(m_model->index(row + 1, 0));
    });
    connect(m_lists, &QListWidget::currentRowChanged, this, &CodeListPanel::listChanged);
    connect(m_lists, &QListWidget::itemChanged, this, [this](QListWidgetItem* item) {
        if (m_rebuilding)
            return;
        const int row = m_lists->row(item);
        const QString name = item->text().trimmed();
        if (row >= 0 && name != m_document->instrument().codeLists.at(row).name)
            m_document->push(renameCodeListCommand(m_document, row, name));
    });
    connect(document, &Document::changed, this, &CodeListPanel::documentChanged);
    rebuild();
}

QStringList CodeListPanel::usersOf(const QString& listName) const {
    QStringList users;
    for (const Module& module : m_document->instrument().modules)
        for (const Item& item : module.items)
            if (!item.hasInlineCodes &&
                item.codeListName.compare(listName, Qt::CaseInsensitive) == 0)
                users.append(item.name);
    return users;
}

void CodeListPanel::documentChanged(const ChangeEvent& event) {
    // Typing in an item's text does not concern the lists.
    if (event.kind == ChangeEvent::Kind::Attribute && !event.changesStructure() &&
        event.key.field != Field::ItemCodes && event.key.field != Field::CodeListCodes)
        return;
    rebuild();
}

void CodeListPanel::rebuild() {
    m_rebuilding = true;
    const int keep = m_lists->currentRow();
    const QList<CodeList>& lists = m_document->instrument().codeLists;
    bool same = m_lists->count() == lists.size();
    for (int i = 0; same && i < lists.size(); ++i)
        same = m_lists->item(i)->text() == lists.at(i).name;
    if (!same) {
        m_lists->clear();
        for (const CodeList& list : lists) {
            auto* entry = new QListWidgetItem(list.name, m_lists);
            entry->setFlags(entry->flags() | Qt::ItemIsEditable);
        }
        m_lists->setCurrentRow(qMin(keep, int(lists.size()) - 1));
    }
    m_rebuilding = false;
    listChanged(m_lists->currentRow());
}

void CodeListPanel::listChanged(int row) {
    const QList<CodeList>& lists = m_document->instrument().codeLists;
    m_removeList->setEnabled(row >= 0);
    if (row < 0 || row >= lists.size()) {
        m_model->setLocation(std::nullopt);
        m_usedBy->setText(tr("No shared code list selected."));
        return;
    }
    const std::optional<CodeLocation> where = CodeLocation::shared(row);
    if (!(m_model->location() == where))
        m_model->setLocation(where);
    const QStringList users = usersOf(lists.at(row).name);
    m_usedBy->setText(users.isEmpty() ? tr("Used by no item.")
                                      : tr("Used by %n item(s): %1", nullptr, int(users.size()))
                                            .arg(users.join(QStringLiteral(", "))));
}

int CodeListPanel::addList() {
    const Instrument& instrument = m_document->instrument();
    QString name;
    for (int n = int(instrument.codeLists.size()) + 1;; ++n) {
        name = QStringLiteral("codes_%1").arg(n);
        if (!instrument.findCodeList(name))
            break;
    }
    const int index = int(instrument.codeLists.size());
    m_document->push(CodeListCommand::insert(m_document, index, CodeList{name, {}}));
    selectList(index);
    return index;
}

void CodeListPanel::selectList(int index) {
    m_lists->setCurrentRow(index);
}

} // namespace rb
