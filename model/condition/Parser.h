#pragma once

#include "Expr.h"

#include <functional>
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
// With `resolve`, every atom's `position` is resolve(name), so that whoever
// analyses the tree for that instrument need not look the name up again.
ParseResult parseCondition(const QString& text,
                           const std::function<int(const QString&)>& resolve = {});

} // namespace rb::cond
