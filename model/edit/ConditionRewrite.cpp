#include "ConditionRewrite.h"

#include "condition/Parser.h"
#include "condition/Printer.h"

#include <functional>

namespace rb {

namespace {

using cond::Expr;
using cond::ExprPtr;

// Rebuilds the tree with `edit` applied to every atom; `edit` returns whether
// it changed the copy it was given. Untouched subtrees are shared, not copied.
ExprPtr mapAtoms(const ExprPtr& node, const std::function<bool(Expr&)>& edit, bool& changed) {
    if (node->isAtom()) {
        auto copy = std::make_shared<Expr>(*node);
        if (!edit(*copy))
            return node;
        changed = true;
        return copy;
    }
    if (node->children.isEmpty())
        return node;
    bool childChanged = false;
    QList<ExprPtr> children;
    for (const ExprPtr& child : node->children)
        children.append(mapAtoms(child, edit, childChanged));
    if (!childChanged)
        return node;
    changed = true;
    auto copy = std::make_shared<Expr>(*node);
    copy->children = children;
    return copy;
}

ConditionRewrite rewrite(const QString& condition, const std::function<bool(Expr&)>& edit) {
    ConditionRewrite result{condition, false, false, false};
    const cond::ParseResult parsed = cond::parseCondition(condition);
    if (!parsed.ok()) {
        result.unparsable = true;
        return result;
    }
    bool changed = false;
    const ExprPtr renamed = mapAtoms(parsed.expr, edit, changed);
    if (changed) {
        result.text = cond::printCondition(*renamed);
        result.changed = true;
    }
    return result;
}

cond::Value integerValue(qint64 code) {
    cond::Value value;
    value.kind = cond::Value::Kind::Integer;
    value.text = QString::number(code);
    value.number = double(code);
    return value;
}

bool holdsCode(const cond::Value& value, qint64 code) {
    return value.isNumber() && value.number == double(code);
}

} // namespace

ConditionRewrite renameInCondition(const QString& condition, const QString& from,
                                   const QString& to) {
    return rewrite(condition, [&](Expr& atom) {
        if (atom.name.compare(from, Qt::CaseInsensitive) != 0)
            return false;
        atom.name = to;
        return true;
    });
}

ConditionRewrite recodeInCondition(const QString& condition, const QSet<QString>& itemsLower,
                                   qint64 from, qint64 to) {
    bool rangeTouched = false;
    ConditionRewrite result = rewrite(condition, [&](Expr& atom) {
        if (!itemsLower.contains(atom.name.toLower()))
            return false;
        bool edited = false;
        const bool equality = atom.kind == Expr::Kind::Has ||
                              (atom.kind == Expr::Kind::Compare &&
                               (atom.op == cond::CompareOp::Eq || atom.op == cond::CompareOp::Ne));
        if (atom.kind == Expr::Kind::Compare && !equality && holdsCode(atom.value, from))
            rangeTouched = true; // `x < 3`: which codes it holds depends on order
        else if (equality && holdsCode(atom.value, from)) {
            atom.value = integerValue(to);
            edited = true;
        }
        for (cond::ListElement& element : atom.list) {
            if (element.high) {
                if (holdsCode(element.low, from) || holdsCode(*element.high, from) ||
                    (element.low.number < double(from) && double(from) < element.high->number))
                    rangeTouched = true;
            } else if (holdsCode(element.low, from)) {
                element.low = integerValue(to);
                edited = true;
            }
        }
        return edited;
    });
    result.rangeTouched = rangeTouched;
    return result;
}

} // namespace rb
