#pragma once

#include "RoutingAnalysis.h"

#include <QJsonObject>

namespace rb {

// DESIGN.md's `gates --json` shape:
// {"items":[{"name","module","asked":"always|conditional|never",
//            "asked_if":"<condition>"|null,"gate_items":[...],"plain":"<words>"}]}
// Keys may be added, never renamed: "position" (0-based) and "minimal" (false
// when the deterministic heuristic printed the condition) are extra.
QJsonObject gatesToJson(const RoutingAnalysis& analysis);

} // namespace rb
