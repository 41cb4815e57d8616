#include "TextEscape.h"

using namespace Qt::StringLiterals;

namespace rb {

namespace {

bool isDroppedControl(char16_t c) {
    return (c < 0x20 && c != u'\t' && c != u'\n' && c != u'\r') || c == 0x7f;
}

// Keeps valid surrogate pairs, drops lone halves and the XML non-characters.
QString xmlCharactersOnly(const QString& text) {
    QString out;
    out.reserve(text.size());
    for (qsizetype i = 0; i < text.size(); ++i) {
        const QChar c = text.at(i);
        if (c.isHighSurrogate() && i + 1 < text.size() && text.at(i + 1).isLowSurrogate()) {
            out += c;
            out += text.at(++i);
            continue;
        }
        if (c.isSurrogate() || isDroppedControl(c.unicode()) || c.unicode() == 0xfffe ||
            c.unicode() == 0xffff)
            continue;
        out += c;
    }
    return out;
}

QString referenceEscaped(const QString& text) {
    QString out;
    out.reserve(text.size() + text.size() / 8);
    for (const QChar c : text) {
        switch (c.unicode()) {
        case u'&':
            out += u"&amp;"_s;
            break;
        case u'<':
            out += u"&lt;"_s;
            break;
        case u'>':
            out += u"&gt;"_s;
            break;
        case u'"':
            out += u"&quot;"_s;
            break;
        case u'\'':
            out += u"&#39;"_s;
            break;
        default:
            out += c;
        }
    }
    return out;
}

} // namespace

QString htmlEscaped(const QString& text) {
    return referenceEscaped(xmlCharactersOnly(text));
}

QString xmlEscaped(const QString& text) {
    return referenceEscaped(xmlCharactersOnly(text));
}

QString csvField(const QString& text) {
    const bool quote = text.contains(u',') || text.contains(u'"') || text.contains(u'\n') ||
                       text.contains(u'\r') || text.startsWith(u' ') || text.endsWith(u' ');
    if (!quote)
        return text;
    QString doubled = text;
    doubled.replace(u'"', u"\"\""_s);
    return u'"' + doubled + u'"';
}

QString markdownEscaped(const QString& text) {
    static const QString markup = u"\\`*_[]|~#"_s;
    QString out;
    out.reserve(text.size() + text.size() / 4);
    for (const QChar c : xmlCharactersOnly(text)) {
        if (c == u'\n' || c == u'\r' || c == u'\t')
            out += u' ';
        else if (c == u'&')
            out += u"&amp;"_s;
        else if (c == u'<')
            out += u"&lt;"_s;
        else if (c == u'>')
            out += u"&gt;"_s;
        else if (markup.contains(c))
            out += u'\\' + QString(c);
        else
            out += c;
    }
    return out;
}

} // namespace rb
