#pragma once

#include "Dictionary.h"

#include <QByteArray>

namespace rb {

// The dictionary as CommonMark text: one heading per module and per variable,
// every user string escaped so that none of it becomes markup or raw HTML.
QByteArray exportMarkdownDictionary(const Dictionary& dictionary);

} // namespace rb
