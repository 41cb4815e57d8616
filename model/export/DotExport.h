#pragma once

#include "routing/CompiledRouting.h"

#include <QByteArray>

namespace rb {

// The routing graph in Graphviz DOT: START, one node per item, END; rule edges
// with their (shortened) condition as an external label and the full one as
// tooltip, fall-through edges, and a dashed "filtered out" edge past every item
// that has a filter. Node labels: name, shortened label and filters (full text
// in the tooltip). Broken rules are left out, as the analysis treats them.
// Every string is escaped for DOT. External labels keep dot fast: an edge
// `label` would make dot insert a label node and double every rank.
QByteArray exportDot(const CompiledRouting& routing);

// DOT double-quoted string content: backslash, quote and line breaks escaped.
QString dotQuoted(const QString& text);

} // namespace rb
