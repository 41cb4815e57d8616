#pragma once

#include "Dictionary.h"

#include <QByteArray>

namespace rb {

// Which reader the HTML is for. A browser gets one self-contained HTML5 file
// (inline CSS with a print style sheet, the route map as an inline image, no
// scripts). QTextDocument (the PDF path) reads only a subset of HTML and CSS
// and no data: images, so it gets plain block elements and explicit page
// breaks, and a note where the route map would be.
enum class HtmlFlavour { Browser, TextDocument };

QByteArray exportHtmlDictionary(const Dictionary& dictionary,
                                HtmlFlavour flavour = HtmlFlavour::Browser);

} // namespace rb
