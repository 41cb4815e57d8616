#pragma once

#include "analysis/GatesJson.h" // gatesToJson, for `gates --json`
#include "analysis/RoutingAnalysis.h"
#include "check/Finding.h"
#include "routing/CompiledRouting.h"
#include "routing/Simulator.h"

#include <QJsonObject>

namespace rb {

// The JSON shapes of DESIGN.md "Command line".
QJsonObject findingsToJson(const Findings& findings);
QJsonObject routeToJson(const CompiledRouting& routing, const RouteResult& route);

} // namespace rb
