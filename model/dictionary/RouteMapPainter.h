#pragma once

#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"

class QPainter;

namespace rb {

// A laid-out route map, kept with the dictionary so the PDF can draw it as
// vector graphics (QtSvg is not linked in model/, so the SVG itself cannot be
// rendered here).
struct RouteMapDrawing {
    layout::RouteGraph graph;
    layout::RouteLayout layout;
};

// Draws the map in layout coordinates (scene units) with the same look as the
// SVG export (model/layout/SvgWriter.cpp): pale module bands, rounded item
// boxes, START/END circles, rule edges in green with their shortened
// conditions, corner tags for conditional (?), unreachable (x) and looping
// items. Text is drawn as text (never interpreted as markup).
void paintRouteMap(QPainter& painter, const RouteMapDrawing& map);

} // namespace rb
