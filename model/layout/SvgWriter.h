#pragma once

#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"

#include <QByteArray>

namespace rb::layout {

// Writes a laid-out route map as one standalone SVG 1.1 document (UTF-8).
// Every user string goes through QXmlStreamWriter, so it is escaped; full
// conditions and item labels sit in <title> elements (tooltips in browsers),
// shortened ones are drawn. Item groups carry id "item-N" (N = flat position)
// and data-name, so a dictionary page can link to them.
QByteArray writeRouteMapSvg(const RouteGraph& graph, const RouteLayout& layout,
                            const QString& title);

} // namespace rb::layout
