#pragma once

#include "condition/Expr.h"

#include <QRandomGenerator>

// Builds random condition trees for the printer/parser round trip. Trees are
// valid for the grammar: And/Or have 2+ children, names are not lower-case
// keywords, number spellings are ones the lexer reads back unchanged.
class TreeGenerator {
public:
    explicit TreeGenerator(quint32 seed) : m_random(seed) {}
    rb::cond::ExprPtr tree(int maxDepth);

private:
    QRandomGenerator m_random;
    int pick(int n) { return int(m_random.bounded(n)); }
    rb::cond::ExprPtr atom();
    rb::cond::Value value();
    QString name();
};
