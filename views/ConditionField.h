#pragma once

#include <QPlainTextEdit>
#include <QWidget>

#include <functional>

class QCompleter;
class QLabel;
class QStringListModel;

namespace rb {

struct Instrument;
class ConditionHighlighter;

// A one-line condition editor: syntax colours, completion of item names and
// (after `name =`, `name in (`, `name has`) of that item's codes with their
// labels, and the parse error with its column shown under the field while
// typing. An empty field means "no condition".
class ConditionField : public QWidget {
    Q_OBJECT
public:
    explicit ConditionField(QWidget* parent = nullptr);

    // The instrument whose names and codes are offered (may change; not owned).
    void setInstrument(const Instrument* instrument);
    QString text() const;
    // Sets the text without emitting edited().
    void setText(const QString& text);
    // The line editor itself (focus, tests).
    QPlainTextEdit* editor() const;
    // The message under the field ("" when the condition parses).
    QString errorText() const;
    // Moves the cursor to a 1-based column (from a finding) and focuses.
    void focusColumn(int column);

signals:
    void edited(const QString& text); // every change the user makes
    void editingFinished();

private:
    class LineEdit;
    void textChanged();
    void updateError();
    void complete();
    void insertCompletion(const QString& completion);
    QStringList completionsAt(int cursor, QString* prefix) const;

    LineEdit* m_editor;
    QLabel* m_error;
    ConditionHighlighter* m_highlighter;
    QCompleter* m_completer;
    QStringListModel* m_completions;
    const Instrument* m_instrument = nullptr;
    bool m_settingText = false;
};

} // namespace rb
