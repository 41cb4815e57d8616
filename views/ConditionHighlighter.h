#pragma once

#include <QSyntaxHighlighter>

#include <functional>

namespace rb {

// Colours a condition by its tokens (lexCondition): item names, keywords,
// numbers, text, operators; a name the instrument does not know is
// underlined, and the text from a lexing error on is marked.
class ConditionHighlighter : public QSyntaxHighlighter {
    Q_OBJECT
public:
    explicit ConditionHighlighter(QTextDocument* document);
    // Tells whether a name is an item of the instrument (unset: all are).
    void setNameKnown(std::function<bool(const QString&)> known) { m_known = std::move(known); }

protected:
    void highlightBlock(const QString& text) override;

private:
    std::function<bool(const QString&)> m_known;
};

} // namespace rb
