#pragma once

#include <QList>
#include <QString>

#include <memory>
#include <optional>

namespace rb::cond {

// A literal value as written in a condition: a number (integer or decimal) or
// double-quoted text. `text` keeps the spelling (for numbers: "3.0" stays "3.0",
// for text: the unescaped content); `number` holds the value of a number.
struct Value {
    enum class Kind { Integer, Decimal, Text };
    Kind kind = Kind::Integer;
    QString text;
    double number = 0;

    bool isNumber() const { return kind != Kind::Text; }
    bool operator==(const Value& other) const; // same kind and spelling
};

// One element of an `in (...)` list: a value or an inclusive range lo..hi.
struct ListElement {
    Value low;
    std::optional<Value> high; // set for lo..hi
    bool operator==(const ListElement&) const = default;
};

enum class CompareOp { Eq, Ne, Lt, Le, Gt, Ge };
QString compareOpText(CompareOp op);

struct Expr;
using ExprPtr = std::shared_ptr<const Expr>;

// The syntax tree. Immutable once built; shared freely.
struct Expr {
    enum class Kind {
        Or,       // children (2 or more)
        And,      // children (2 or more)
        Not,      // children[0]
        Compare,  // name op value
        In,       // name [not] in (list); `negated` for `not in`
        Has,      // name has value
        Asked,    // asked(name)
        Answered, // answered(name)
        True,
        False
    };
    Kind kind = Kind::True;
    QString name; // the item name as written (atoms only)
    CompareOp op = CompareOp::Eq;
    Value value;             // Compare, Has
    QList<ListElement> list; // In
    bool negated = false;    // In: `not in`
    QList<ExprPtr> children; // Or, And, Not
    int column = 0;          // 1-based column where this node starts in the source text
    int nameColumn = 0;      // 1-based column of `name` (atoms)
    // Atoms: the position of the item read, when the tree was parsed for one
    // instrument (CompiledRouting passes a resolver to parseCondition): -1 for
    // no such item, kUnresolved when parsed without one (look the name up).
    static constexpr int kUnresolved = -2;
    int position = kUnresolved;

    // Structural equality, ignoring columns; names compare ignoring case.
    bool sameTree(const Expr& other) const;
    // An atom reads one item (compare, in, has, asked, answered).
    bool isAtom() const;
};

} // namespace rb::cond
