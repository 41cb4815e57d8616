#pragma once

#include "routing/CompiledRouting.h"

#include <QByteArray>

namespace rb {

// The route map as a standalone SVG document: the spine-and-lanes layout of
// model/layout/ drawn with our own look. Needs no display and no fonts (text
// is shortened by character count, not measured), so the command line and the
// data dictionary can embed it.
QByteArray exportSvg(const CompiledRouting& routing);

} // namespace rb
