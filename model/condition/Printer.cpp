#include "Printer.h"

#include <QLocale>

using namespace Qt::StringLiterals;

namespace rb::cond {

namespace {

// A number built in code (empty spelling) still prints as something the lexer
// reads back as the same kind: integers without a point, decimals with one and
// never in exponent form (the language has no exponents).
QString numberSpelling(const Value& value) {
    if (value.kind == Value::Kind::Integer)
        return QString::number(qint64(value.number));
    QString s = QString::number(value.number, 'f', QLocale::FloatingPointShortest);
    if (!s.contains(u'.'))
        s += u".0"_s;
    return s;
}

bool isJunction(const Expr& e) {
    return e.kind == Expr::Kind::And || e.kind == Expr::Kind::Or;
}

void print(const Expr& e, QString& out);

// An And/Or inside an And/Or or under `not` gets parentheses: this keeps
// `(a or b) or c` apart from `a or b or c` and is easier to read than relying
// on `and` binding tighter than `or`.
void printOperand(const Expr& e, QString& out) {
    if (!isJunction(e)) {
        print(e, out);
        return;
    }
    out += u'(';
    print(e, out);
    out += u')';
}

void printList(const Expr& e, QString& out) {
    out += e.negated ? u" not in ("_s : u" in ("_s;
    for (qsizetype i = 0; i < e.list.size(); ++i) {
        if (i > 0)
            out += u", "_s;
        out += printValue(e.list.at(i).low);
        if (e.list.at(i).high)
            out += u".."_s + printValue(*e.list.at(i).high);
    }
    out += u')';
}

void print(const Expr& e, QString& out) {
    switch (e.kind) {
    case Expr::Kind::Or:
    case Expr::Kind::And: {
        const QString glue = e.kind == Expr::Kind::Or ? u" or "_s : u" and "_s;
        for (qsizetype i = 0; i < e.children.size(); ++i) {
            if (i > 0)
                out += glue;
            printOperand(*e.children.at(i), out);
        }
        return;
    }
    case Expr::Kind::Not:
        out += u"not "_s;
        printOperand(*e.children.at(0), out);
        return;
    case Expr::Kind::Compare:
        out += e.name + u' ' + compareOpText(e.op) + u' ' + printValue(e.value);
        return;
    case Expr::Kind::In:
        out += e.name;
        printList(e, out);
        return;
    case Expr::Kind::Has:
        out += e.name + u" has "_s + printValue(e.value);
        return;
    case Expr::Kind::Asked:
        out += u"asked("_s + e.name + u')';
        return;
    case Expr::Kind::Answered:
        out += u"answered("_s + e.name + u')';
        return;
    case Expr::Kind::True:
        out += u"true"_s;
        return;
    case Expr::Kind::False:
        out += u"false"_s;
        return;
    }
}

} // namespace

// Text is written in double quotes with \" for a quote and \\ for a backslash,
// the only two escapes the lexer knows (see Lexer.h).
QString printValue(const Value& value) {
    if (value.isNumber())
        return value.text.isEmpty() ? numberSpelling(value) : value.text;
    QString out;
    out.reserve(value.text.size() + 2);
    out += u'"';
    for (QChar c : value.text) {
        if (c == u'"' || c == u'\\')
            out += u'\\';
        out += c;
    }
    out += u'"';
    return out;
}

QString printCondition(const Expr& expr) {
    QString out;
    print(expr, out);
    return out;
}

} // namespace rb::cond
