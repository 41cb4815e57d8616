#pragma once

#include "Expr.h"
#include "instrument/Instrument.h"

namespace rb::cond {

// A problem of a parsed condition against the instrument.
struct ConditionProblem {
    QString check;  // "unknown-variable" or "type-mismatch"
    int column = 0; // 1-based column in the condition text
    QString message;
};

// Unknown names; `has` on a non-multi item; `=`/`<`/`in` on a multi item; text
// compared with a number or a number with text; a range on a text item; reading
// a `statement`. Names resolve through the index, ignoring case; atoms parsed
// with a resolver keep the position it gave (resolve against this same index).
QList<ConditionProblem> typeCheck(const Expr& expr, const ItemIndex& index);

// Every atom's item name as written, in order of appearance (with repeats).
struct NameUse {
    QString name;
    int column = 0;
    int position = Expr::kUnresolved; // the atom's (Expr::position)
};
QList<NameUse> namesRead(const Expr& expr);

// The same atoms handed to `visit` one by one, in the same order, copying
// nothing (for walks over every condition of a large instrument).
template <typename Visit> void forEachNameRead(const Expr& expr, Visit&& visit) {
    if (expr.isAtom())
        visit(expr);
    for (const ExprPtr& child : expr.children)
        forEachNameRead(*child, visit);
}

} // namespace rb::cond
