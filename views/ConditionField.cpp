#include "ConditionField.h"

#include "ConditionHighlighter.h"
#include "PlainText.h"
#include "condition/Lexer.h"
#include "condition/Parser.h"
#include "instrument/Instrument.h"

#include <QAbstractItemView>
#include <QCompleter>
#include <QKeyEvent>
#include <QLabel>
#include <QStringListModel>
#include <QTextBlock>
#include <QVBoxLayout>

namespace rb {

// A QPlainTextEdit that behaves like a line edit: one line high, Enter ends
// the edit, Tab moves focus; it hands completion keys to the popup.
class ConditionField::LineEdit : public QPlainTextEdit {
public:
    explicit LineEdit(ConditionField* owner) : QPlainTextEdit(owner), m_owner(owner) {
        setLineWrapMode(NoWrap);
        setTabChangesFocus(true);
        setVerticalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
        setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
        document()->setDocumentMargin(2);
        setSizePolicy(QSizePolicy::Expanding, QSizePolicy::Fixed);
    }
    QSize sizeHint() const override {
        const int height = fontMetrics().lineSpacing() + 2 * int(document()->documentMargin()) +
                           2 * frameWidth() + 2;
        return {QPlainTextEdit::sizeHint().width(), height};
    }
    QSize minimumSizeHint() const override { return {60, sizeHint().height()}; }

protected:
    void keyPressEvent(QKeyEvent* event) override {
        QCompleter* completer = m_owner->m_completer;
        if (completer->popup()->isVisible()) {
            switch (event->key()) {
            case Qt::Key_Enter:
            case Qt::Key_Return:
            case Qt::Key_Escape:
            case Qt::Key_Tab:
            case Qt::Key_Backtab:
                event->ignore(); // the popup takes them
                return;
            default:
                break;
            }
        }
        if (event->key() == Qt::Key_Return || event->key() == Qt::Key_Enter) {
            emit m_owner->editingFinished();
            return;
        }
        const bool explicitAsk =
            event->key() == Qt::Key_Space && (event->modifiers() & Qt::ControlModifier);
        if (!explicitAsk)
            QPlainTextEdit::keyPressEvent(event);
        if (explicitAsk || (!event->text().isEmpty() && event->text().at(0).isLetterOrNumber()) ||
            event->text() == QStringLiteral(" ") || event->text() == QStringLiteral("("))
            m_owner->complete();
        else if (completer->popup()->isVisible() && event->text().isEmpty() == false)
            completer->popup()->hide();
    }
    void focusOutEvent(QFocusEvent* event) override {
        QPlainTextEdit::focusOutEvent(event);
        if (!m_owner->m_completer->popup()->isVisible())
            emit m_owner->editingFinished();
    }

private:
    ConditionField* m_owner;
};

ConditionField::ConditionField(QWidget* parent)
    : QWidget(parent), m_editor(new LineEdit(this)), m_error(plainLabel(new QLabel(this))),
      m_highlighter(new ConditionHighlighter(m_editor->document())),
      m_completer(new QCompleter(this)), m_completions(new QStringListModel(this)) {
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(0, 0, 0, 0);
    layout->setSpacing(1);
    layout->addWidget(m_editor);
    layout->addWidget(m_error);
    m_error->setObjectName(QStringLiteral("conditionError"));
    m_error->setWordWrap(true);
    m_error->hide();
    setFocusProxy(m_editor);

    m_completer->setModel(m_completions);
    m_completer->setWidget(m_editor);
    m_completer->setCompletionMode(QCompleter::PopupCompletion);
    m_completer->setCaseSensitivity(Qt::CaseInsensitive);
    connect(m_completer, qOverload<const QString&>(&QCompleter::activated), this,
            &ConditionField::insertCompletion);
    connect(m_editor, &QPlainTextEdit::textChanged, this, &ConditionField::textChanged);
}

void ConditionField::setInstrument(const Instrument* instrument) {
    m_instrument = instrument;
    if (!instrument) {
        m_highlighter->setNameKnown({});
        return;
    }
    m_highlighter->setNameKnown([this](const QString& name) {
        if (!m_instrument)
            return true;
        for (const Module& module : m_instrument->modules)
            for (const Item& item : module.items)
                if (item.name.compare(name, Qt::CaseInsensitive) == 0)
                    return true;
        return false;
    });
    m_highlighter->rehighlight();
}

QPlainTextEdit* ConditionField::editor() const {
    return m_editor;
}

QString ConditionField::text() const {
    return m_editor->toPlainText();
}

void ConditionField::setText(const QString& text) {
    if (text == m_editor->toPlainText())
        return;
    m_settingText = true;
    m_editor->setPlainText(text);
    m_settingText = false;
    updateError();
}

QString ConditionField::errorText() const {
    return m_error->isVisible() ? m_error->text() : QString();
}

void ConditionField::focusColumn(int column) {
    QTextCursor cursor = m_editor->textCursor();
    cursor.setPosition(qBound(0, column - 1, int(text().size())));
    m_editor->setTextCursor(cursor);
    m_editor->setFocus(Qt::OtherFocusReason);
}

void ConditionField::textChanged() {
    updateError();
    if (!m_settingText)
        emit edited(text());
}

void ConditionField::updateError() {
    const QString condition = text();
    if (condition.trimmed().isEmpty()) {
        m_error->hide();
        return;
    }
    const cond::ParseResult parsed = cond::parseCondition(condition);
    if (parsed.ok()) {
        m_error->hide();
        return;
    }
    m_error->setText(tr("Column %1: %2").arg(parsed.error->column).arg(parsed.error->message));
    m_error->setProperty("problem", true);
    m_error->show();
}

namespace {

const Item* findItem(const Instrument& instrument, const QString& name) {
    for (const Module& module : instrument.modules)
        for (const Item& item : module.items)
            if (item.name.compare(name, Qt::CaseInsensitive) == 0)
                return &item;
    return nullptr;
}

// The item whose codes fit at the end of `tokens`: NAME op | NAME [not] in ( ... | NAME has.
QString codeContext(const QList<cond::Token>& tokens) {
    using K = cond::Token::Kind;
    int i = int(tokens.size()) - 1;
    if (i >= 0 && tokens.at(i).kind == K::End)
        --i;
    if (i >= 1 && tokens.at(i - 1).kind == K::Name &&
        (tokens.at(i).kind == K::Op || tokens.at(i).isKeyword(QLatin1String("has"))))
        return tokens.at(i - 1).text;
    // Inside an in-list: walk back over values, commas and ranges to "(".
    while (i >= 0 && (tokens.at(i).kind == K::Integer || tokens.at(i).kind == K::Comma ||
                      tokens.at(i).kind == K::DotDot || tokens.at(i).kind == K::Decimal))
        --i;
    if (i >= 2 && tokens.at(i).kind == K::LParen &&
        tokens.at(i - 1).isKeyword(QLatin1String("in"))) {
        int n = i - 2;
        if (n >= 0 && tokens.at(n).isKeyword(QLatin1String("not")))
            --n;
        if (n >= 0 && tokens.at(n).kind == K::Name)
            return tokens.at(n).text;
    }
    return {};
}

} // namespace

// Offers names when the cursor ends a word, or codes after a comparison.
QStringList ConditionField::completionsAt(int cursor, QString* prefix) const {
    const QString before = text().left(cursor);
    int start = cursor;
    while (start > 0 && (before.at(start - 1).isLetterOrNumber() || before.at(start - 1) == u'_'))
        --start;
    *prefix = before.mid(start);
    QStringList offers;
    if (!m_instrument)
        return offers;
    const cond::LexResult lexed = cond::lexCondition(before.left(start));
    const QString codeItem = lexed.error ? QString() : codeContext(lexed.tokens);
    if (!codeItem.isEmpty()) {
        if (const Item* item = findItem(*m_instrument, codeItem))
            for (const Code& code : m_instrument->codesOf(*item))
                offers.append(QStringLiteral("%1  %2").arg(code.code).arg(code.label));
        return offers;
    }
    if (prefix->isEmpty() || prefix->at(0).isDigit())
        return offers;
    for (const Module& module : m_instrument->modules)
        for (const Item& item : module.items)
            if (item.type != ItemType::Statement)
                offers.append(item.name);
    for (const char* keyword : {"and", "or", "not", "in", "has", "asked", "answered"})
        offers.append(QLatin1String(keyword));
    return offers;
}

void ConditionField::complete() {
    QString prefix;
    const QStringList offers = completionsAt(m_editor->textCursor().position(), &prefix);
    if (offers.isEmpty()) {
        m_completer->popup()->hide();
        return;
    }
    m_completions->setStringList(offers);
    m_completer->setCompletionPrefix(prefix);
    if (m_completer->completionCount() == 0 ||
        (m_completer->completionCount() == 1 && m_completer->currentCompletion() == prefix)) {
        m_completer->popup()->hide();
        return;
    }
    QRect rect = m_editor->cursorRect();
    rect.setWidth(m_completer->popup()->sizeHintForColumn(0) + 24);
    m_completer->complete(rect);
}

void ConditionField::insertCompletion(const QString& completion) {
    // Codes are offered as "CODE  label": insert the code only.
    const QString word = completion.section(QStringLiteral("  "), 0, 0);
    QTextCursor cursor = m_editor->textCursor();
    const int prefixLength = int(m_completer->completionPrefix().size());
    cursor.movePosition(QTextCursor::Left, QTextCursor::KeepAnchor, prefixLength);
    cursor.insertText(word);
    m_editor->setTextCursor(cursor);
}

} // namespace rb
