#pragma once

#include "Expr.h"

#include <optional>

namespace rb::cond {

struct ParseError {
    int column = 0; // 1-based column in the condition text
    QString message;
};

struct ParseResult {
    ExprPtr expr;                    // set when parsing succeeded
    std::optional<ParseError> error; // set when it failed
    bool ok() const { return expr != nullptr; }
};

// Parses the condition language of DESIGN.md. Never throws; bounded recursion
// (deep nesting is an error, not a crash).
ParseResult parseCondition(const QString& text);

} // namespace rb::cond
