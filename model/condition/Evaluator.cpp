#include "Evaluator.h"

#include <cmath>

namespace rb::cond {

namespace {

using State = CellValue::State;

// Three-way comparison of a cell with a literal, or nothing when they cannot be
// compared: empty and blank cells, chosen code sets, and a number against text
// (either way round). Text compares by exact UTF-16 code units, so `<` on text
// and on ISO dates is plain lexicographic order.
std::optional<int> compareCell(const CellValue& cell, const Value& value) {
    if (cell.state == State::Number && value.isNumber())
        return cell.number < value.number ? -1 : (cell.number > value.number ? 1 : 0);
    if (cell.state == State::Text && !value.isNumber()) {
        const int c = cell.text.compare(value.text);
        return c < 0 ? -1 : (c > 0 ? 1 : 0);
    }
    return std::nullopt;
}

bool holds(CompareOp op, int c) {
    switch (op) {
    case CompareOp::Eq:
        return c == 0;
    case CompareOp::Ne:
        return c != 0;
    case CompareOp::Lt:
        return c < 0;
    case CompareOp::Le:
        return c <= 0;
    case CompareOp::Gt:
        return c > 0;
    case CompareOp::Ge:
        return c >= 0;
    }
    return false;
}

bool compare(const CellValue& cell, CompareOp op, const Value& value) {
    // `x <> v` is `not (x = v)`: true for empty, blank and incomparable cells.
    if (op == CompareOp::Ne)
        return !compare(cell, CompareOp::Eq, value);
    const std::optional<int> c = compareCell(cell, value);
    return c && holds(op, *c);
}

bool inElement(const CellValue& cell, const ListElement& element) {
    if (!element.high)
        return compare(cell, CompareOp::Eq, element.low);
    return compare(cell, CompareOp::Ge, element.low) && compare(cell, CompareOp::Le, *element.high);
}

bool inList(const CellValue& cell, const QList<ListElement>& list) {
    for (const ListElement& element : list)
        if (inElement(cell, element))
            return true;
    return false;
}

bool has(const CellValue& cell, const Value& value) {
    if (cell.state != State::Codes || !value.isNumber())
        return false;
    for (qint64 code : cell.codes)
        if (double(code) == value.number)
            return true;
    return false;
}

bool isMissing(const Environment& env, const QString& name, qint64 code) {
    return env.isMissingCode && env.isMissingCode(name, code);
}

bool answered(const CellValue& cell, const QString& name, const Environment& env) {
    switch (cell.state) {
    case State::NotPresented:
    case State::Blank:
        return false;
    case State::Text:
        return !cell.text.trimmed().isEmpty();
    case State::Number: {
        // Only a whole number can be a missing code.
        const bool whole = std::floor(cell.number) == cell.number && std::isfinite(cell.number);
        return !(whole && isMissing(env, name, qint64(cell.number)));
    }
    case State::Codes:
        for (qint64 code : cell.codes)
            if (!isMissing(env, name, code))
                return true;
        return false;
    }
    return false;
}

CellValue valueOf(const Environment& env, const QString& name) {
    return env.value ? env.value(name) : CellValue::notPresented();
}

} // namespace

bool evaluate(const Expr& expr, const Environment& env) {
    switch (expr.kind) {
    case Expr::Kind::Or:
        for (const ExprPtr& child : expr.children)
            if (evaluate(*child, env))
                return true;
        return false;
    case Expr::Kind::And:
        for (const ExprPtr& child : expr.children)
            if (!evaluate(*child, env))
                return false;
        return true;
    case Expr::Kind::Not:
        return !evaluate(*expr.children.at(0), env);
    case Expr::Kind::Compare:
        return compare(valueOf(env, expr.name), expr.op, expr.value);
    case Expr::Kind::In:
        return inList(valueOf(env, expr.name), expr.list) != expr.negated;
    case Expr::Kind::Has:
        return has(valueOf(env, expr.name), expr.value);
    case Expr::Kind::Asked:
        return valueOf(env, expr.name).presented();
    case Expr::Kind::Answered:
        return answered(valueOf(env, expr.name), expr.name, env);
    case Expr::Kind::True:
        return true;
    case Expr::Kind::False:
        return false;
    }
    return false;
}

} // namespace rb::cond
