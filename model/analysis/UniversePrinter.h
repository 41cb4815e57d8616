#pragma once

#include "ConditionAlgebra.h"
#include "Minimiser.h"

namespace rb::analysis {

// Prints a sum of products over an algebra's variables in the condition
// language (`x = 1`, `x in (1, 3..5)`, `x <> 2`, `x not in (...)`, `x >= 3`,
// `asked(x)`, `answered(x)`, `x has 2` ...) and in plain words from the gate
// items' labels and code labels. A literal containing *empty* is printed in a
// negative form (`<>`, `not in`, `not asked`), because only those hold for an
// item that was not presented; every printed literal states its exact set.
class UniversePrinter {
public:
    explicit UniversePrinter(const ConditionAlgebra& algebra) : m_algebra(algebra) {}

    QString condition(const Sop& sop) const; // "true" / "false" for constants
    QString words(const Sop& sop) const; // "asked when ..." / "asked of everyone" / "never asked"
    QString literal(const SopLiteral& literal) const;
    QString literalWords(const SopLiteral& literal) const;

private:
    struct Segment {
        double low, high;
        bool lowClosed, highClosed;
    };
    // A reference: a copy touched the shared name's reference count, a write to
    // memory that on a large instrument is no longer in the caches.
    const QString& itemName(int position) const;
    ItemType itemType(int position) const;
    QString itemLabel(int position) const;
    QString codeWords(int position, qint64 code) const;
    QList<Segment> segmentsOf(const DecisionVar& var, const CellSet& cells, bool integer,
                              bool& onlyNumbers) const;
    std::optional<QString> valueList(const DecisionVar& var, const CellSet& cells,
                                     bool& single) const;
    std::optional<QString> comparison(const QString& name, const QList<Segment>& segments) const;
    std::optional<QString> positive(const DecisionVar& var, const CellSet& cells) const;
    QStringList valueWords(const DecisionVar& var, const CellSet& cells) const;
    CellSet nonEmptyCells(const DecisionVar& var, const CellSet& cells) const;

    const ConditionAlgebra& m_algebra;
};

} // namespace rb::analysis
