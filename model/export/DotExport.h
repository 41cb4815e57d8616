#pragma once

#include "routing/CompiledRouting.h"

#include <QByteArray>

namespace rb {

// The routing graph in Graphviz DOT: START, one node per item, END; rule edges
// labelled with their conditions, fall-through edges, and a dashed "filtered
// out" edge past every item that has a filter. Broken rules are left out, as
// the analysis treats them. Every string is escaped for DOT.
QByteArray exportDot(const CompiledRouting& routing);

// DOT double-quoted string content: backslash, quote and line breaks escaped.
QString dotQuoted(const QString& text);

} // namespace rb
