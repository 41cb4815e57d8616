#include "ItemForm.h"

#include "CodeTableModel.h"
#include "ConditionField.h"
#include "Icons.h"
#include "OutlineModel.h"
#include "PlainText.h"
#include "edit/Cascades.h"
#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"

#include <QComboBox>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QRegularExpression>
#include <QScrollArea>
#include <QStackedWidget>
#include <QTableView>
#include <QVBoxLayout>

namespace rb {

namespace {

const QList<ItemType> kTypes = {ItemType::Single,   ItemType::Multi, ItemType::Integer,
                                ItemType::Decimal,  ItemType::Text,  ItemType::Date,
                                ItemType::Statement};

QPlainTextEdit* textBox(int lines, const QString& objectName) {
    auto* box = new QPlainTextEdit;
    box->setObjectName(objectName);
    box->setTabChangesFocus(true);
    box->setFixedHeight(box->fontMetrics().lineSpacing() * lines + 12);
    return box;
}

QTableView* codeTable(CodeTableModel* model, const QString& objectName) {
    auto* view = new QTableView;
    view->setObjectName(objectName);
    view->setModel(model);
    view->horizontalHeader()->setStretchLastSection(true);
    view->horizontalHeader()->setSectionResizeMode(CodeTableModel::LabelColumn,
                                                   QHeaderView::Stretch);
    view->verticalHeader()->hide();
    view->setMinimumHeight(90);
    view->setMaximumHeight(160);
    return view;
}

// Replaces a text widget's content only when it differs, keeping the cursor
// of the widget being typed in.
void setIfDifferent(QLineEdit* edit, const QString& text) {
    if (edit->text() != text)
        edit->setText(text);
}
void setIfDifferent(QPlainTextEdit* edit, const QString& text) {
    if (edit->toPlainText() != text)
        edit->setPlainText(text);
}

// A row label for a layout (QFormLayout only sets buddies for widgets).
QLabel* buddyLabel(const QString& text, QWidget* buddy) {
    auto* label = new QLabel(text);
    label->setBuddy(buddy);
    return label;
}

bool isNumeric(ItemType type) {
    return type == ItemType::Integer || type == ItemType::Decimal;
}
bool hasCodes(ItemType type) {
    return type == ItemType::Single || type == ItemType::Multi;
}

} // namespace

ItemForm::ItemForm(Document* document, OutlineModel* outline, QWidget* parent)
    : QWidget(parent), m_document(document), m_outline(outline), m_pages(new QStackedWidget),
      m_empty(new QLabel(tr("Select a module or an item in the outline."))) {
    m_empty->setAlignment(Qt::AlignCenter);
    m_empty->setObjectName(QStringLiteral("panelNote"));
    m_pages->addWidget(m_empty);
    m_pages->addWidget(buildItemPage());
    m_pages->addWidget(buildModulePage());
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(0, 0, 0, 0);
    auto* scroll = new QScrollArea;
    scroll->setWidgetResizable(true);
    scroll->setFrameShape(QFrame::NoFrame);
    scroll->setWidget(m_pages);
    layout->addWidget(scroll);
    connect(document, &Document::changed, this, &ItemForm::documentChanged);
}

QWidget* ItemForm::buildItemPage() {
    auto* page = new QWidget;
    auto* form = new QFormLayout(page);
    form->setFieldGrowthPolicy(QFormLayout::AllNonFixedFieldsGrow);

    m_name = new QLineEdit;
    m_name->setObjectName(QStringLiteral("itemName"));
    m_name->setToolTip(tr("Renaming rewrites every condition and goto that refers to the item"));
    connect(m_name, &QLineEdit::editingFinished, this, &ItemForm::commitName);
    form->addRow(tr("&Name"), m_name);

    m_label = new QLineEdit;
    m_label->setObjectName(QStringLiteral("itemLabel"));
    connect(m_label, &QLineEdit::textEdited, this,
            [this](const QString& t) { pushItem(int(Field::ItemLabel), t); });
    form->addRow(tr("&Label"), m_label);

    m_text = textBox(3, QStringLiteral("itemText"));
    connect(m_text, &QPlainTextEdit::textChanged, this,
            [this] { pushItem(int(Field::ItemText), m_text->toPlainText()); });
    form->addRow(tr("Question &text"), m_text);

    m_instruction = textBox(2, QStringLiteral("itemInstruction"));
    connect(m_instruction, &QPlainTextEdit::textChanged, this,
            [this] { pushItem(int(Field::ItemInstruction), m_instruction->toPlainText()); });
    form->addRow(tr("&Instruction"), m_instruction);

    m_type = new QComboBox;
    m_type->setObjectName(QStringLiteral("itemType"));
    for (ItemType type : kTypes)
        m_type->addItem(itemTypeName(type));
    connect(m_type, &QComboBox::activated, this,
            [this](int index) { pushItem(int(Field::ItemType), index); });
    form->addRow(tr("T&ype"), m_type);

    m_codeSource = new QComboBox;
    m_codeSource->setObjectName(QStringLiteral("codeSource"));
    connect(m_codeSource, &QComboBox::activated, this, &ItemForm::codeSourceChosen);
    form->addRow(tr("&Codes from"), m_codeSource);

    m_codesModel = new CodeTableModel(m_document, this);
    m_codes = codeTable(m_codesModel, QStringLiteral("itemCodes"));
    m_addCode = new QPushButton(Icons::get(Icons::Add), tr("Add code"));
    m_removeCode = new QPushButton(Icons::get(Icons::Remove), tr("Delete code"));
    connect(m_addCode, &QPushButton::clicked, m_codesModel, &CodeTableModel::addCode);
    connect(m_removeCode, &QPushButton::clicked, this,
            [this] { m_codesModel->removeCode(m_codes->currentIndex().row()); });
    auto* codeButtons = new QHBoxLayout;
    codeButtons->addWidget(m_addCode);
    codeButtons->addWidget(m_removeCode);
    codeButtons->addStretch();
    auto* codesBox = new QVBoxLayout;
    codesBox->addWidget(m_codes);
    codesBox->addLayout(codeButtons);
    form->addRow(buddyLabel(tr("Co&de table"), m_codes), codesBox);

    m_rangeMin = new QLineEdit;
    m_rangeMin->setObjectName(QStringLiteral("rangeMin"));
    m_rangeMax = new QLineEdit;
    m_rangeMax->setObjectName(QStringLiteral("rangeMax"));
    m_rangeMin->setPlaceholderText(tr("min"));
    m_rangeMax->setPlaceholderText(tr("max"));
    connect(m_rangeMin, &QLineEdit::editingFinished, this, &ItemForm::commitRange);
    connect(m_rangeMax, &QLineEdit::editingFinished, this, &ItemForm::commitRange);
    auto* range = new QHBoxLayout;
    range->addWidget(m_rangeMin);
    range->addWidget(new QLabel(tr("to")));
    range->addWidget(m_rangeMax);
    form->addRow(buddyLabel(tr("&Range"), m_rangeMin), range);

    m_missingModel = new CodeTableModel(m_document, this);
    m_missing = codeTable(m_missingModel, QStringLiteral("itemMissing"));
    auto* addMissing = new QPushButton(Icons::get(Icons::Add), tr("Add missing code"));
    connect(addMissing, &QPushButton::clicked, m_missingModel, &CodeTableModel::addCode);
    auto* missingBox = new QVBoxLayout;
    missingBox->addWidget(m_missing);
    missingBox->addWidget(addMissing, 0, Qt::AlignLeft);
    form->addRow(buddyLabel(tr("&Missing codes"), m_missing), missingBox);

    m_askIf = new ConditionField;
    m_askIf->setObjectName(QStringLiteral("askIf"));
    m_askIf->setInstrument(&m_document->instrument());
    connect(m_askIf, &ConditionField::edited, this,
            [this](const QString& t) { pushItem(int(Field::ItemAskIf), t); });
    form->addRow(tr("&Asked if"), m_askIf);

    m_universe = plainLabel(new QLabel);
    m_universe->setObjectName(QStringLiteral("panelNote"));
    m_universe->setWordWrap(true);
    m_universe->setTextInteractionFlags(Qt::TextSelectableByMouse);
    form->addRow(tr("Universe"), m_universe);

    m_skipValue = new QLineEdit;
    m_skipValue->setObjectName(QStringLiteral("skipValue"));
    m_skipValue->setPlaceholderText(tr("implied value, e.g. 0"));
    connect(m_skipValue, &QLineEdit::editingFinished, this, &ItemForm::commitWhenSkipped);
    m_skipIf = new ConditionField;
    m_skipIf->setObjectName(QStringLiteral("skipIf"));
    m_skipIf->setInstrument(&m_document->instrument());
    connect(m_skipIf, &ConditionField::edited, this, &ItemForm::commitWhenSkipped);
    auto* skipped = new QVBoxLayout;
    skipped->addWidget(m_skipValue);
    skipped->addWidget(new QLabel(tr("when (empty: whenever not presented)")));
    skipped->addWidget(m_skipIf);
    form->addRow(buddyLabel(tr("When &skipped"), m_skipValue), skipped);

    m_notes = textBox(2, QStringLiteral("itemNotes"));
    connect(m_notes, &QPlainTextEdit::textChanged, this,
            [this] { pushItem(int(Field::ItemNotes), m_notes->toPlainText()); });
    form->addRow(tr("N&otes"), m_notes);
    return page;
}

QWidget* ItemForm::buildModulePage() {
    auto* page = new QWidget;
    auto* form = new QFormLayout(page);
    m_moduleName = new QLineEdit;
    m_moduleName->setObjectName(QStringLiteral("moduleName"));
    connect(m_moduleName, &QLineEdit::editingFinished, this, &ItemForm::commitModuleName);
    form->addRow(tr("&Name"), m_moduleName);
    m_moduleTitle = new QLineEdit;
    m_moduleTitle->setObjectName(QStringLiteral("moduleTitle"));
    connect(m_moduleTitle, &QLineEdit::textEdited, this, [this](const QString& t) {
        const auto [module, item] = current();
        if (module < 0 || m_refreshing)
            return;
        m_document->push(SetAttributeCommand::typing(
            m_document, AttributeKey::ofModule(module, Field::ModuleTitle), t,
            tr("Edit module title")));
    });
    form->addRow(tr("&Title"), m_moduleTitle);
    m_moduleAskIf = new ConditionField;
    m_moduleAskIf->setObjectName(QStringLiteral("moduleAskIf"));
    m_moduleAskIf->setInstrument(&m_document->instrument());
    connect(m_moduleAskIf, &ConditionField::edited, this, [this](const QString& t) {
        const auto [module, item] = current();
        if (module < 0 || m_refreshing)
            return;
        const std::optional<QString> value =
            t.trimmed().isEmpty() ? std::nullopt : std::optional<QString>(t);
        m_document->push(SetAttributeCommand::typing(
            m_document, AttributeKey::ofModule(module, Field::ModuleAskIf), value,
            tr("Edit module filter")));
    });
    form->addRow(tr("&Asked if"), m_moduleAskIf);
    auto* note = new QLabel(tr("A module only groups items; its filter applies to each of them."));
    note->setObjectName(QStringLiteral("panelNote"));
    note->setWordWrap(true);
    form->addRow(note);
    return page;
}

void ItemForm::setUniverseProvider(std::function<QString(int)> provider) {
    m_universeOf = std::move(provider);
    refreshUniverse();
}

void ItemForm::refreshUniverse() {
    const auto [module, item] = current();
    if (item < 0 || !m_universeOf)
        return;
    m_universe->setText(m_universeOf(m_outline->flatPosition(module, item)));
}

std::pair<int, int> ItemForm::current() const {
    if (!m_current.isValid())
        return {-1, -1};
    return m_outline->locate(m_current);
}

void ItemForm::setCurrent(const QModelIndex& index) {
    m_current = index.siblingAtColumn(0);
    refresh();
}

void ItemForm::documentChanged(const ChangeEvent&) {
    refresh();
}

void ItemForm::refresh() {
    const auto [module, item] = current();
    m_refreshing = true;
    if (module < 0)
        m_pages->setCurrentIndex(0);
    else if (item < 0)
        refreshModule(module);
    else
        refreshItem(module, item);
    m_refreshing = false;
}

void ItemForm::refreshModule(int module) {
    const Module& m = m_document->instrument().modules.at(module);
    m_pages->setCurrentIndex(2);
    if (!m_moduleName->hasFocus())
        setIfDifferent(m_moduleName, m.name);
    setIfDifferent(m_moduleTitle, m.title);
    if (!m_moduleAskIf->editor()->hasFocus())
        m_moduleAskIf->setText(m.askIf.value_or(QString()));
}

void ItemForm::refreshItem(int module, int item) {
    const Instrument& instrument = m_document->instrument();
    const Item& it = instrument.modules.at(module).items.at(item);
    m_pages->setCurrentIndex(1);
    if (!m_name->hasFocus())
        setIfDifferent(m_name, it.name);
    setIfDifferent(m_label, it.label);
    setIfDifferent(m_text, it.text);
    setIfDifferent(m_instruction, it.instruction);
    m_type->setCurrentIndex(int(kTypes.indexOf(it.type)));

    m_codeSource->clear();
    m_codeSource->addItem(tr("(its own codes)"));
    for (const CodeList& list : instrument.codeLists)
        m_codeSource->addItem(list.name);
    int source = 0;
    if (!it.hasInlineCodes)
        for (int l = 0; l < instrument.codeLists.size(); ++l)
            if (instrument.codeLists.at(l).name.compare(it.codeListName, Qt::CaseInsensitive) == 0)
                source = l + 1;
    m_codeSource->setCurrentIndex(source);
    const bool codes = hasCodes(it.type);
    m_codeSource->setEnabled(codes);
    const std::optional<CodeLocation> where =
        source > 0 ? std::optional(CodeLocation::shared(source - 1))
                   : std::optional(CodeLocation::inlineOf(module, item));
    if (!(m_codesModel->location() == where))
        m_codesModel->setLocation(where);
    m_codes->setEnabled(codes);
    m_addCode->setEnabled(codes);
    m_removeCode->setEnabled(codes);

    const bool numeric = isNumeric(it.type);
    m_rangeMin->setEnabled(numeric);
    m_rangeMax->setEnabled(numeric);
    if (!m_rangeMin->hasFocus())
        setIfDifferent(m_rangeMin, it.range ? it.range->first.text : QString());
    if (!m_rangeMax->hasFocus())
        setIfDifferent(m_rangeMax, it.range ? it.range->second.text : QString());
    const std::optional<CodeLocation> missing = CodeLocation::missingOf(module, item);
    if (!(m_missingModel->location() == missing))
        m_missingModel->setLocation(missing);
    m_missing->setEnabled(numeric);

    // A condition being typed is not overwritten (the stored form trims "  " to none).
    if (!m_askIf->editor()->hasFocus())
        m_askIf->setText(it.askIf.value_or(QString()));
    if (!m_skipValue->hasFocus())
        setIfDifferent(m_skipValue, it.whenSkipped ? it.whenSkipped->value : QString());
    if (!m_skipIf->editor()->hasFocus())
        m_skipIf->setText(it.whenSkipped ? it.whenSkipped->condition.value_or(QString())
                                         : QString());
    setIfDifferent(m_notes, it.notes);
    refreshUniverse();
}

void ItemForm::pushItem(int fieldNumber, const QVariant& value) {
    const auto [module, item] = current();
    if (m_refreshing || module < 0 || item < 0)
        return;
    const Field field = Field(fieldNumber);
    const AttributeKey key = AttributeKey::ofItem(module, item, field);
    AttributeValue next;
    QString text;
    switch (field) {
    case Field::ItemType:
        next = kTypes.value(value.toInt());
        text = tr("Change type");
        break;
    case Field::ItemAskIf: {
        const QString condition = value.toString();
        next = condition.trimmed().isEmpty() ? std::nullopt : std::optional<QString>(condition);
        text = tr("Edit filter");
        break;
    }
    default:
        next = value.toString();
        text = tr("Edit %1").arg(field == Field::ItemLabel   ? tr("label")
                                 : field == Field::ItemText  ? tr("question text")
                                 : field == Field::ItemNotes ? tr("notes")
                                                             : tr("instruction"));
    }
    if (m_document->attribute(key) == next)
        return;
    m_document->push(SetAttributeCommand::typing(m_document, key, next, text));
}

void ItemForm::commitName() {
    const auto [module, item] = current();
    if (m_refreshing || module < 0 || item < 0)
        return;
    const QString name = m_name->text().trimmed();
    if (name == m_document->instrument().modules.at(module).items.at(item).name)
        return;
    m_document->push(renameItemCommand(m_document, module, item, name));
}

void ItemForm::commitModuleName() {
    const auto [module, item] = current();
    if (m_refreshing || module < 0 || item >= 0)
        return;
    const QString name = m_moduleName->text().trimmed();
    if (name == m_document->instrument().modules.at(module).name)
        return;
    m_document->push(renameModuleCommand(m_document, module, name));
}

void ItemForm::commitRange() {
    const auto [module, item] = current();
    if (m_refreshing || module < 0 || item < 0)
        return;
    const QString low = m_rangeMin->text().trimmed(), high = m_rangeMax->text().trimmed();
    ItemRange range;
    if (!low.isEmpty() || !high.isEmpty()) {
        // Non-numbers are kept as written; `check` reports a bad range.
        range = std::pair{RangeBound{low, low.toDouble()}, RangeBound{high, high.toDouble()}};
    }
    const AttributeKey key = AttributeKey::ofItem(module, item, Field::ItemRange);
    if (m_document->attribute(key) == AttributeValue(range))
        return;
    m_document->push(new SetAttributeCommand(m_document, key, range, tr("Edit range")));
}

void ItemForm::commitWhenSkipped() {
    const auto [module, item] = current();
    if (m_refreshing || module < 0 || item < 0)
        return;
    const QString value = m_skipValue->text().trimmed();
    const QString condition = m_skipIf->text();
    std::optional<WhenSkipped> skipped;
    if (!value.isEmpty()) {
        bool number = false;
        value.toDouble(&number);
        skipped = WhenSkipped{value, !number,
                              condition.trimmed().isEmpty() ? std::nullopt
                                                            : std::optional<QString>(condition)};
    }
    const AttributeKey key = AttributeKey::ofItem(module, item, Field::ItemWhenSkipped);
    if (m_document->attribute(key) == AttributeValue(skipped))
        return;
    m_document->push(
        SetAttributeCommand::typing(m_document, key, skipped, tr("Edit implied value")));
}

void ItemForm::codeSourceChosen(int index) {
    const auto [module, item] = current();
    if (m_refreshing || module < 0 || item < 0)
        return;
    const Instrument& instrument = m_document->instrument();
    CodeSource source;
    if (index > 0) {
        source.listName = instrument.codeLists.at(index - 1).name;
    } else {
        // Own codes start as a copy of what the item showed, so nothing is lost.
        source.hasInlineCodes = true;
        const Item& it = instrument.modules.at(module).items.at(item);
        if (const CodeList* list = instrument.findCodeList(it.codeListName))
            source.inlineCodes = list->codes;
        else
            source.inlineCodes = it.inlineCodes;
    }
    const AttributeKey key = AttributeKey::ofItem(module, item, Field::ItemCodes);
    if (m_document->attribute(key) == AttributeValue(source))
        return;
    m_document->push(new SetAttributeCommand(m_document, key, source, tr("Change code source")));
}

bool ItemForm::focusField(const QString& field, std::optional<int> column) {
    const auto [module, item] = current();
    if (module < 0)
        return false;
    if (item < 0) {
        if (field == u"ask_if")
            m_moduleAskIf->focusColumn(column.value_or(1));
        else
            m_moduleName->setFocus(Qt::OtherFocusReason);
        return true;
    }
    if (field == u"ask_if") {
        m_askIf->focusColumn(column.value_or(1));
    } else if (field == u"when_skipped.if") {
        m_skipIf->focusColumn(column.value_or(1));
    } else if (field.startsWith(u"when_skipped")) {
        m_skipValue->setFocus(Qt::OtherFocusReason);
    } else if (field.startsWith(u"codes")) {
        static const QRegularExpression row(QStringLiteral("\\[(\\d+)\\]"));
        const QRegularExpressionMatch match = row.match(field);
        m_codes->setFocus(Qt::OtherFocusReason);
        if (match.hasMatch())
            m_codes->setCurrentIndex(m_codesModel->index(match.captured(1).toInt(), 0));
    } else if (field.startsWith(u"missing")) {
        m_missing->setFocus(Qt::OtherFocusReason);
    } else if (field == u"range") {
        m_rangeMin->setFocus(Qt::OtherFocusReason);
    } else if (field == u"text") {
        m_text->setFocus(Qt::OtherFocusReason);
    } else if (field == u"label") {
        m_label->setFocus(Qt::OtherFocusReason);
    } else if (field.startsWith(u"routing")) {
        return false;
    } else {
        m_name->setFocus(Qt::OtherFocusReason);
    }
    return true;
}

} // namespace rb
