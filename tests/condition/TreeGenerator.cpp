#include "TreeGenerator.h"

using namespace Qt::StringLiterals;
using namespace rb::cond;

QString TreeGenerator::name() {
    // Mixed case and keyword look-alikes in upper case: all are names.
    static const QStringList names = {u"x"_s,       u"Age"_s, u"AND"_s,  u"q10"_s,
                                      u"has_car"_s, u"NOT"_s, u"True"_s, u"z_9_"_s};
    return names.at(pick(int(names.size())));
}

Value TreeGenerator::value() {
    static const QStringList integers = {u"0"_s, u"1"_s, u"-3"_s, u"007"_s, u"42"_s, u"-0"_s};
    static const QStringList decimals = {u"2.5"_s, u"-0.50"_s, u"3.0"_s, u"10.125"_s};
    // Quotes, backslashes, a newline, `..`, keywords and non-ASCII inside text.
    static const QStringList texts = {u""_s,          u"a b"_s,         u"say \"hi\""_s,
                                      u"C:\\dir\\"_s, u"line\nbreak"_s, u"1..5"_s,
                                      u"x = 1 or"_s,  u"été"_s,         u"\\\""_s};
    Value v;
    switch (pick(3)) {
    case 0:
        v.kind = Value::Kind::Integer;
        v.text = integers.at(pick(int(integers.size())));
        break;
    case 1:
        v.kind = Value::Kind::Decimal;
        v.text = decimals.at(pick(int(decimals.size())));
        break;
    default:
        v.kind = Value::Kind::Text;
        v.text = texts.at(pick(int(texts.size())));
        return v;
    }
    v.number = v.text.toDouble();
    return v;
}

ExprPtr TreeGenerator::atom() {
    auto e = std::make_shared<Expr>();
    switch (pick(8)) {
    case 0:
        e->kind = Expr::Kind::Compare;
        e->op = CompareOp(pick(6));
        e->value = value();
        break;
    case 1: {
        e->kind = Expr::Kind::In;
        e->negated = pick(2) == 1;
        const int n = 1 + pick(3);
        for (int i = 0; i < n; ++i) {
            ListElement element{value(), std::nullopt};
            if (pick(2) == 1)
                element.high = value();
            e->list.append(element);
        }
        break;
    }
    case 2:
        e->kind = Expr::Kind::Has;
        e->value = value();
        break;
    case 3:
        e->kind = Expr::Kind::Asked;
        break;
    case 4:
        e->kind = Expr::Kind::Answered;
        break;
    case 5:
        e->kind = Expr::Kind::True;
        return e;
    case 6:
        e->kind = Expr::Kind::False;
        return e;
    default:
        e->kind = Expr::Kind::Compare;
        e->value = value();
        break;
    }
    e->name = name();
    return e;
}

ExprPtr TreeGenerator::tree(int maxDepth) {
    if (maxDepth <= 0 || pick(3) == 0)
        return atom();
    auto e = std::make_shared<Expr>();
    switch (pick(3)) {
    case 0:
        e->kind = Expr::Kind::Not;
        e->children = {tree(maxDepth - 1)};
        return e;
    case 1:
        e->kind = Expr::Kind::And;
        break;
    default:
        e->kind = Expr::Kind::Or;
        break;
    }
    const int n = 2 + pick(3);
    for (int i = 0; i < n; ++i)
        e->children.append(tree(maxDepth - 1));
    return e;
}
