#pragma once

#include <QPersistentModelIndex>
#include <QWidget>

#include <functional>
#include <optional>

class QComboBox;
class QLabel;
class QLineEdit;
class QPlainTextEdit;
class QStackedWidget;
class QTableView;
class QPushButton;

namespace rb {

class CodeTableModel;
class ConditionField;
class Document;
class OutlineModel;
struct ChangeEvent;

// The form for the selected outline row: an item's name, label, question
// text, instruction, type, codes (a shared list or its own), range, missing
// codes, filter, implied value when skipped, notes; or a module's name, title
// and filter. Typing pushes attribute commands (merged per field); the name
// is committed when editing ends, as one rename that rewrites references.
class ItemForm : public QWidget {
    Q_OBJECT
public:
    ItemForm(Document* document, OutlineModel* outline, QWidget* parent = nullptr);

    // Shows the row (module or item) behind this outline index.
    void setCurrent(const QModelIndex& index);
    // Focuses the widget of a finding's field ("ask_if", "when_skipped.if",
    // "codes[2]", ...), the cursor at `column` for conditions. Returns whether
    // the form holds that field (rules live in the rules panel).
    bool focusField(const QString& field, std::optional<int> column);
    // Gives the universe text shown for an item at a flat position.
    void setUniverseProvider(std::function<QString(int position)> provider);
    void refreshUniverse();

    // Widgets by role, for tests and keyboard wiring.
    QLineEdit* nameEdit() const { return m_name; }
    QLineEdit* labelEdit() const { return m_label; }
    QPlainTextEdit* textEdit() const { return m_text; }
    QComboBox* typeBox() const { return m_type; }
    QComboBox* codeSourceBox() const { return m_codeSource; }
    ConditionField* askIfField() const { return m_askIf; }
    QLineEdit* moduleNameEdit() const { return m_moduleName; }
    QLineEdit* moduleTitleEdit() const { return m_moduleTitle; }

private:
    QWidget* buildItemPage();
    QWidget* buildModulePage();
    void refresh();
    void refreshItem(int module, int item);
    void refreshModule(int module);
    void documentChanged(const ChangeEvent& event);
    std::pair<int, int> current() const;
    void pushItem(int field, const QVariant& value);
    void commitName();
    void commitModuleName();
    void commitRange();
    void commitWhenSkipped();
    void codeSourceChosen(int index);

    Document* m_document;
    OutlineModel* m_outline;
    QPersistentModelIndex m_current;
    bool m_refreshing = false;
    std::function<QString(int)> m_universeOf;

    QStackedWidget* m_pages;
    QLabel* m_empty;
    // item page
    QLineEdit* m_name;
    QLineEdit* m_label;
    QPlainTextEdit* m_text;
    QPlainTextEdit* m_instruction;
    QComboBox* m_type;
    QComboBox* m_codeSource;
    QTableView* m_codes;
    CodeTableModel* m_codesModel;
    QPushButton* m_addCode;
    QPushButton* m_removeCode;
    QLineEdit* m_rangeMin;
    QLineEdit* m_rangeMax;
    QTableView* m_missing;
    CodeTableModel* m_missingModel;
    ConditionField* m_askIf;
    QLineEdit* m_skipValue;
    ConditionField* m_skipIf;
    QPlainTextEdit* m_notes;
    QLabel* m_universe;
    // module page
    QLineEdit* m_moduleName;
    QLineEdit* m_moduleTitle;
    ConditionField* m_moduleAskIf;
};

} // namespace rb
