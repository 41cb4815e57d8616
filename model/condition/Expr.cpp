#include "Expr.h"

using namespace Qt::StringLiterals;

namespace rb::cond {

bool Value::operator==(const Value& other) const {
    // Spelling, not numeric value: the tree keeps what the designer wrote, so
    // `3.0` and `3` are different trees (they still evaluate alike).
    return kind == other.kind && text == other.text;
}

QString compareOpText(CompareOp op) {
    switch (op) {
    case CompareOp::Eq:
        return u"="_s;
    case CompareOp::Ne:
        return u"<>"_s;
    case CompareOp::Lt:
        return u"<"_s;
    case CompareOp::Le:
        return u"<="_s;
    case CompareOp::Gt:
        return u">"_s;
    case CompareOp::Ge:
        return u">="_s;
    }
    return {};
}

bool Expr::isAtom() const {
    switch (kind) {
    case Expr::Kind::Compare:
    case Expr::Kind::In:
    case Expr::Kind::Has:
    case Expr::Kind::Asked:
    case Expr::Kind::Answered:
        return true;
    default:
        return false;
    }
}

namespace {

bool sameAtom(const Expr& a, const Expr& b) {
    if (a.name.compare(b.name, Qt::CaseInsensitive) != 0)
        return false;
    switch (a.kind) {
    case Expr::Kind::Compare:
        return a.op == b.op && a.value == b.value;
    case Expr::Kind::In:
        return a.negated == b.negated && a.list == b.list;
    case Expr::Kind::Has:
        return a.value == b.value;
    default:
        return true;
    }
}

} // namespace

bool Expr::sameTree(const Expr& other) const {
    if (kind != other.kind)
        return false;
    if (isAtom())
        return sameAtom(*this, other);
    if (children.size() != other.children.size())
        return false;
    for (qsizetype i = 0; i < children.size(); ++i)
        if (!children.at(i)->sameTree(*other.children.at(i)))
            return false;
    return true;
}

} // namespace rb::cond
