#pragma once

#include "Expr.h"

#include <QList>

#include <functional>

namespace rb::cond {

// What an item holds at evaluation time.
struct CellValue {
    enum class State {
        NotPresented, // empty: the item was not presented
        Blank,        // presented but no value recorded (data check only)
        Number,
        Text, // text items, dates, and values that are not numbers
        Codes // multi items: the chosen codes
    };
    State state = State::NotPresented;
    double number = 0;
    QString text;
    QList<qint64> codes;

    static CellValue notPresented() { return {}; }
    static CellValue ofNumber(double v) { return {State::Number, v, {}, {}}; }
    static CellValue ofText(const QString& t) { return {State::Text, 0, t, {}}; }
    static CellValue ofCodes(const QList<qint64>& c) { return {State::Codes, 0, {}, c}; }
    static CellValue blank() { return {State::Blank, 0, {}, {}}; }
    bool presented() const { return state != State::NotPresented; }
};

// How the evaluator sees the world: a value per item name and whether a value
// is a missing code of that item (for `answered`). Names arrive as written in
// the condition; the environment resolves them ignoring case. An unknown name
// reads as not presented.
struct Environment {
    std::function<CellValue(const QString& name)> value;
    std::function<bool(const QString& name, qint64 code)> isMissingCode;
};

// DESIGN.md semantics: empty satisfies no =, <, <=, >, >=, in, has; <> and
// `not in` are negations; missing codes are ordinary values for comparisons;
// numbers compare by value; text never equals a number.
bool evaluate(const Expr& expr, const Environment& env);

} // namespace rb::cond
