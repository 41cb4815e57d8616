#pragma once

#include "check/Finding.h"
#include "routing/CompiledRouting.h"

#include <QList>
#include <QString>
#include <QStringList>

namespace rb {

// The universe of one item: the condition on earlier answers under which it is
// presented (DESIGN.md "Analysis").
struct ItemUniverse {
    int position = 0;
    QString name;
    QString module;
    enum class Asked { Always, Conditional, Never } asked = Asked::Always;
    QString askedIf;       // condition-language text (empty when always/never)
    QStringList gateItems; // names read by askedIf, questionnaire order
    QString plain;         // words, e.g. "asked when 'Household has a motor vehicle' is Yes (1)"
    bool minimal = true;   // false when the heuristic printed it (still equivalent)
};

struct RoutingAnalysis {
    QList<ItemUniverse> universes; // every item incl. statements, questionnaire order
    // routing-loop, unreachable-item, reads-unasked-item, rule-never-fires,
    // rule-always-fires. Rule fields are 0-based: `routing[0].if`, `routing[0].goto`.
    Findings findings;
};

// Universes are computed on the forward (acyclic) part of the routing graph:
// a backward goto is checked for feasibility and reported as a loop, but not
// followed; items reached only through one are reported in the loop.
RoutingAnalysis analyzeRouting(const CompiledRouting& routing);

QString askedName(ItemUniverse::Asked asked); // "always" / "conditional" / "never"

} // namespace rb
