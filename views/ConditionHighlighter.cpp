#include "ConditionHighlighter.h"

#include "condition/Lexer.h"

#include <QGuiApplication>
#include <QPalette>

namespace rb {

ConditionHighlighter::ConditionHighlighter(QTextDocument* document)
    : QSyntaxHighlighter(document) {}

namespace {

bool darkPalette() {
    const QPalette palette = QGuiApplication::palette();
    return palette.color(QPalette::Base).lightness() < 128;
}

QTextCharFormat colour(const QColor& light, const QColor& dark, bool bold = false) {
    QTextCharFormat format;
    format.setForeground(darkPalette() ? dark : light);
    if (bold)
        format.setFontWeight(QFont::DemiBold);
    return format;
}

} // namespace

void ConditionHighlighter::highlightBlock(const QString& text) {
    using K = cond::Token::Kind;
    const cond::LexResult lexed = cond::lexCondition(text);
    // Block offsets: the condition is one line, but be safe with several.
    const int offset = currentBlock().position();
    for (const cond::Token& token : lexed.tokens) {
        const int start = token.column - 1 - offset;
        int length = 0;
        QTextCharFormat format;
        switch (token.kind) {
        case K::Name:
            length = int(token.text.size());
            format = colour(QColor(0x1f, 0x4e, 0x8c), QColor(0x8c, 0xb8, 0xf0), true);
            if (m_known && !m_known(token.text)) {
                format.setUnderlineStyle(QTextCharFormat::WaveUnderline);
                format.setUnderlineColor(QColor(0xc0, 0x39, 0x2b));
            }
            break;
        case K::Keyword:
            length = int(token.text.size());
            format = colour(QColor(0x7d, 0x3c, 0x98), QColor(0xc9, 0x9c, 0xe0), true);
            break;
        case K::Integer:
        case K::Decimal:
            length = int(token.text.size());
            format = colour(QColor(0x2e, 0x7d, 0x4f), QColor(0x8f, 0xd1, 0xa8));
            break;
        case K::Text:
            // The spelling is unescaped; colour to the closing quote instead.
            length = int(text.indexOf(u'"', start + 1 + int(token.text.size())) - start + 1);
            format = colour(QColor(0x9a, 0x5b, 0x13), QColor(0xe8, 0xb8, 0x7a));
            break;
        case K::Op:
        case K::DotDot:
            length = token.kind == K::DotDot ? 2 : int(token.text.size());
            format = colour(QColor(0x55, 0x55, 0x55), QColor(0xbb, 0xbb, 0xbb), true);
            break;
        default:
            break;
        }
        if (length > 0 && start >= 0)
            setFormat(start, length, format);
    }
    if (lexed.error) {
        const int start = lexed.error->column - 1 - offset;
        QTextCharFormat bad;
        bad.setUnderlineStyle(QTextCharFormat::WaveUnderline);
        bad.setUnderlineColor(QColor(0xc0, 0x39, 0x2b));
        if (start >= 0 && start < text.size())
            setFormat(start, int(text.size()) - start, bad);
    }
}

} // namespace rb
