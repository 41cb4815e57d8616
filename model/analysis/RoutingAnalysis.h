#pragma once

#include "check/Finding.h"
#include "routing/CompiledRouting.h"

#include <QList>
#include <QString>
#include <QStringList>

namespace rb {

// The universe of one item: the condition on earlier answers under which it is
// presented (DESIGN.md "Analysis").
// Items are named by position (RoutingAnalysis::itemName): a name copied into
// every universe touched every item's name once more, and at 50,000 items those
// are scattered over more memory than the processor's caches hold.
struct ItemUniverse {
    int position = 0;
    enum class Asked { Always, Conditional, Never } asked = Asked::Always;
    QString askedIf;          // condition-language text (empty when always/never)
    QList<int> gatePositions; // the items askedIf reads, questionnaire order
    QString plain;            // words, e.g. "asked when 'Household has a motor vehicle' is Yes (1)"
    bool minimal = true;      // false when the heuristic printed it (still equivalent)
};

struct RoutingAnalysis {
    QList<ItemUniverse> universes; // every item incl. statements, questionnaire order
    // routing-loop, unreachable-item, reads-unasked-item, rule-never-fires,
    // rule-always-fires. Rule fields are 0-based: `routing[0].if`, `routing[0].goto`.
    Findings findings;

    // Names of the items the universes refer to, as they were when analysed.
    const QString& itemName(int position) const { return m_entries.at(position).item->name; }
    const QString& moduleName(int position) const { return m_entries.at(position).module->name; }
    QStringList gateItems(const ItemUniverse& u) const; // names of u.gatePositions
    void keepNames(const CompiledRouting& routing);

private:
    // A shallow copy of the analysed instrument: it shares the items that
    // m_entries points to, so an edit of the caller's instrument (which then
    // copies its own) leaves them as they were.
    Instrument m_instrument;
    QList<ItemIndex::Entry> m_entries;
};

// Universes are computed on the forward (acyclic) part of the routing graph:
// a backward goto is checked for feasibility and reported as a loop, but not
// followed; items reached only through one are reported in the loop.
RoutingAnalysis analyzeRouting(const CompiledRouting& routing);

QString askedName(ItemUniverse::Asked asked); // "always" / "conditional" / "never"

} // namespace rb
