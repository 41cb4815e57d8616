#pragma once

#include <QString>

namespace rb {

// Every user string is escaped for its target before it is written, so that
// a label holding markup, quotes or control characters stays plain text.

// HTML text and attribute values: & < > " ' become references; control
// characters other than tab and line breaks are dropped (they are not text).
QString htmlEscaped(const QString& text);

// XML 1.0 text and attribute values: as HTML, and characters XML 1.0 forbids
// (C0 controls except tab/LF/CR, U+FFFE, U+FFFF, lone surrogates) are dropped.
QString xmlEscaped(const QString& text);

// One RFC 4180 field: quoted (with doubled quotes) when it holds a comma,
// a quote, CR or LF, or leading/trailing spaces; otherwise as is.
QString csvField(const QString& text);

// Markdown inline text: line breaks become spaces, markup characters are
// backslash-escaped and < > & become HTML references, so no raw HTML,
// emphasis, links, code or table cell breaks can start inside a value.
QString markdownEscaped(const QString& text);

} // namespace rb
