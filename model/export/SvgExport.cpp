#include "SvgExport.h"

#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"
#include "layout/SvgWriter.h"

namespace rb {

QByteArray exportSvg(const CompiledRouting& routing) {
    const layout::RouteGraph graph = layout::RouteGraph::fromRouting(routing);
    const layout::RouteLayout laidOut = layout::layoutRouteGraph(graph);
    return layout::writeRouteMapSvg(graph, laidOut, routing.instrument().title);
}

} // namespace rb
