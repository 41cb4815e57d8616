#pragma once

#include <QString>
#include <QStringView>

// How names and keywords of the condition language are spelled (DESIGN.md):
// one place for the lexer, which reads them, and the instrument's name rule,
// which must refuse what the lexer would not read as a name.
namespace rb::cond {

inline bool isAsciiLetter(QChar c) {
    return (c >= u'a' && c <= u'z') || (c >= u'A' && c <= u'Z');
}
inline bool isAsciiDigit(QChar c) {
    return c >= u'0' && c <= u'9';
}
// A character after a name's first letter: a letter, a digit or _.
inline bool isNameChar(QChar c) {
    return isAsciiLetter(c) || isAsciiDigit(c) || c == u'_';
}

// The keyword spelled exactly so, as a shared string, or null. Keywords are
// lower case only: `AND` is a name.
const QString* keywordSpelled(QStringView word);

} // namespace rb::cond
