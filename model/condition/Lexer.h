#pragma once

#include "Parser.h"

#include <QList>
#include <QString>

#include <optional>

namespace rb::cond {

// One token of the condition language. Columns are 1-based positions in the
// QString (UTF-16 code units), the unit every finding uses.
struct Token {
    enum class Kind {
        Name,    // [A-Za-z][A-Za-z0-9_]* that is not a lower-case keyword
        Keyword, // and or not in has asked answered true false (lower case only)
        Integer,
        Decimal,
        Text, // double-quoted; `text` holds the unescaped content
        Op,   // = <> < <= > >=
        LParen,
        RParen,
        Comma,
        DotDot,
        End // past the last character; column = length + 1
    };
    Kind kind = Kind::End;
    QString text; // spelling (unescaped content for Text)
    int column = 0;
    CompareOp op = CompareOp::Eq; // Op tokens
    double number = 0;            // Integer, Decimal

    bool isKeyword(QLatin1String word) const { return kind == Kind::Keyword && text == word; }
};

struct LexResult {
    QList<Token> tokens; // always ends with an End token when there is no error
    std::optional<ParseError> error;
};

// Splits a condition into tokens in one left-to-right pass (linear time).
// Text literals: inside the double quotes, \" stands for a quote and \\ for a
// backslash; any other backslash sequence is an error (so a stray backslash is
// never silently kept or dropped); every other character, newlines included,
// stands for itself.
LexResult lexCondition(const QString& text);

// How a token reads in an error message: 'and', '"some text"', the end of the condition.
QString describeToken(const Token& token);

} // namespace rb::cond
