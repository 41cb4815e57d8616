#pragma once

#include "Expr.h"

namespace rb::cond {

// Prints a tree in the condition language; parseCondition(print(e)) has the same
// tree as e. Parentheses only where the grammar needs them to keep the tree.
QString printCondition(const Expr& expr);
QString printValue(const Value& value); // numbers as written, text quoted and escaped

} // namespace rb::cond
