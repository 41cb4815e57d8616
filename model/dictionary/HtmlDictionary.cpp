#include "HtmlDictionary.h"

#include "TextEscape.h"

using namespace Qt::StringLiterals;

namespace rb {

namespace {

// Inline style sheet: screen and print. Every module starts a new printed page.
const char16_t* const kBrowserCss = uR"(
body { font-family: sans-serif; line-height: 1.4; margin: 2em auto; max-width: 60em; color: #111; }
h1 { font-size: 1.8em; margin-bottom: 0.2em; }
h2 { border-bottom: 2px solid #345; padding-bottom: 0.2em; margin-top: 2em; }
h3 { margin: 0 0 0.4em 0; font-size: 1.15em; }
table { border-collapse: collapse; margin: 0.3em 0; }
th, td { border: 1px solid #999; padding: 0.15em 0.5em; text-align: left; vertical-align: top; }
code { font-family: monospace; background: #f1f1f1; padding: 0 0.2em; overflow-wrap: anywhere; }
.entry { border: 1px solid #bbb; border-left: 6px solid #6a8; padding: 0.6em 0.9em; margin: 1em 0; }
.entry.conditional { border-left-color: #c60; }
.entry.never { border-left-color: #a00; }
.entry.statement { border-left-color: #888; background: #fafafa; }
.varname { font-family: monospace; font-weight: bold; }
.flag { font-weight: bold; padding: 0.05em 0.4em; border: 2px solid; margin-left: 0.4em; }
.flag.conditional { color: #a40; }
.flag.never { color: #a00; }
.flag.always { color: #262; border-width: 1px; }
dl { display: grid; grid-template-columns: 11em 1fr; gap: 0.2em 0.8em; margin: 0; }
dt { font-weight: bold; }
dd { margin: 0; overflow-wrap: anywhere; }
.missing { font-style: italic; }
.routemap img { max-width: 100%; border: 1px solid #ccc; }
.placeholder { border: 2px dashed #999; padding: 2em; text-align: center; color: #555; }
@media print {
  body { margin: 0; max-width: none; font-size: 10pt; }
  .module { break-before: page; page-break-before: always; }
  .entry { break-inside: avoid; page-break-inside: avoid; }
  a { color: inherit; text-decoration: none; }
}
)";

const char16_t* const kTextDocumentCss = uR"(
body { font-family: sans-serif; font-size: 9pt; }
h1 { font-size: 18pt; }
h2 { font-size: 14pt; }
h3 { font-size: 11pt; }
td, th { padding: 2px; }
.varname { font-family: monospace; font-weight: bold; }
.flag { font-weight: bold; }
.missing { font-style: italic; }
)";

class HtmlWriter {
public:
    HtmlWriter(const Dictionary& d, HtmlFlavour flavour) : m_d(d), m_flavour(flavour) {}

    QString document() {
        const QString lang = m_d.language.isEmpty() ? u"en"_s : m_d.language;
        m_out += u"<!DOCTYPE html>\n<html lang=\""_s + htmlEscaped(lang) + u"\">\n<head>\n"_s;
        m_out += u"<meta charset=\"utf-8\">\n<title>Data dictionary: "_s + esc(titleText()) +
                 u"</title>\n<style>"_s;
        m_out += QString::fromUtf16(browser() ? kBrowserCss : kTextDocumentCss);
        m_out += u"</style>\n</head>\n<body>\n"_s;
        frontMatter();
        for (int m = 0; m < m_d.modules.size(); ++m)
            module(m);
        m_out += u"</body>\n</html>\n"_s;
        return m_out;
    }

private:
    bool browser() const { return m_flavour == HtmlFlavour::Browser; }
    // User text, isolated for right-to-left scripts where the reader knows <bdi>.
    QString user(const QString& text) const {
        return browser() ? u"<bdi>"_s + esc(text) + u"</bdi>"_s : esc(text);
    }
    static QString esc(const QString& text) { return htmlEscaped(text); }
    QString titleText() const { return m_d.title.isEmpty() ? u"(untitled)"_s : m_d.title; }
    QString block(const QString& cls) const { return u"<div class=\""_s + cls + u"\">"_s; }

    void frontMatter() {
        m_out += u"<h1>Data dictionary: "_s + user(titleText()) + u"</h1>\n"_s;
        m_out += u"<p>Version "_s + (m_d.version.isEmpty() ? u"(none)"_s : user(m_d.version)) +
                 u" &middot; generated "_s + m_d.generated.toString(Qt::ISODate) +
                 u" by Routebook</p>\n"_s;
        counts();
        m_out += u"<p>How to read an entry: <b>Asked of everyone</b> means every respondent "_s
                 u"reaches the item, so a blank is item nonresponse. <b>CONDITIONAL</b> means "_s
                 u"only respondents in the universe are asked; everyone else was skipped on "_s
                 u"purpose and holds "_s +
                 esc(m_d.legitimateSkipCode.isEmpty()
                         ? u"a blank"_s
                         : u"the legitimate-skip code "_s + m_d.legitimateSkipCode) +
                 u" (a legitimate skip). The universe is given in the condition language and "_s
                 u"in words; gate items link to their entries.</p>\n"_s;
        contents();
        routeMap();
    }

    void counts() {
        const DictionaryCounts& c = m_d.counts;
        const auto row = [this](const QString& what, int n) {
            m_out += u"<tr><th>"_s + what + u"</th><td>"_s + QString::number(n) + u"</td></tr>\n"_s;
        };
        m_out += u"<table class=\"counts\">\n"_s;
        row(u"Items"_s, c.items);
        row(u"Variables in the data"_s, c.variables);
        row(u"Conditional items"_s, c.conditionalItems);
        row(u"Items never asked"_s, c.neverAskedItems);
        row(u"Modules"_s, c.modules);
        row(u"Routing findings: errors"_s, c.errors);
        row(u"Routing findings: warnings"_s, c.warnings);
        m_out += u"</table>\n"_s;
    }

    QString moduleAnchor(int m) const { return u"M_"_s + QString::number(m + 1); }

    void contents() {
        m_out += u"<h2>Contents</h2>\n<ol>\n"_s;
        for (int m = 0; m < m_d.modules.size(); ++m) {
            const DictionaryModule& mod = m_d.modules.at(m);
            m_out += u"<li><a href=\"#"_s + moduleAnchor(m) + u"\">"_s + user(moduleTitle(mod)) +
                     u"</a>"_s;
            if (!mod.entries.isEmpty()) {
                m_out += u"\n<ul>\n"_s;
                for (int i : mod.entries) {
                    const DictionaryEntry& e = m_d.entries.at(i);
                    m_out += u"<li><a href=\"#"_s + e.anchor + u"\">"_s + esc(e.variable) +
                             u"</a> "_s + user(e.label) + u" &mdash; "_s + esc(askedWords(e)) +
                             u"</li>\n"_s;
                }
                m_out += u"</ul>\n"_s;
            }
            m_out += u"</li>\n"_s;
        }
        m_out += u"</ol>\n"_s;
    }

    void routeMap() {
        m_out += u"<h2>Route map</h2>\n"_s;
        if (browser() && !m_d.routeMapSvg.isEmpty()) {
            // An <img> keeps the picture inert: a data: SVG shown as an image runs no script.
            m_out += block(u"routemap"_s) +
                     u"<img alt=\"Route map of the instrument\" src=\""_s
                     u"data:image/svg+xml;base64,"_s +
                     QString::fromLatin1(m_d.routeMapSvg.toBase64()) + u"\"></div>\n"_s;
            return;
        }
        if (!browser() && m_d.routeMap) {
            m_out += u"<p>The route map is drawn on the last pages of this document.</p>\n"_s;
            return;
        }
        m_out +=
            u"<p class=\"placeholder\">[Route map: "_s +
            (m_d.routeMapSvg.isEmpty()
                 ? u"not available in this build."_s
                 : u"shown in the HTML dictionary; also routebook export FILE --format svg."_s) +
            u"]</p>\n"_s;
    }

    static QString moduleTitle(const DictionaryModule& m) {
        return m.title.isEmpty() ? m.name : m.title + u" ("_s + m.name + u')';
    }

    void module(int m) {
        const DictionaryModule& mod = m_d.modules.at(m);
        if (browser())
            m_out += u"<section class=\"module\" id=\""_s + moduleAnchor(m) + u"\">\n"_s;
        else
            m_out += u"<div style=\"page-break-before: always\"><a name=\""_s + moduleAnchor(m) +
                     u"\"></a></div>\n"_s;
        m_out += u"<h2>Module "_s + QString::number(m + 1) + u": "_s + user(moduleTitle(mod)) +
                 u"</h2>\n"_s;
        if (!mod.askIf.isEmpty())
            m_out +=
                u"<p>Module filter (as written): <code>"_s + esc(mod.askIf) + u"</code></p>\n"_s;
        if (mod.entries.isEmpty())
            m_out += u"<p>This module has no items.</p>\n"_s;
        for (int i : mod.entries)
            entry(m_d.entries.at(i));
        if (browser())
            m_out += u"</section>\n"_s;
    }

    static QString flagClass(const DictionaryEntry& e) {
        switch (e.asked) {
        case ItemUniverse::Asked::Always:
            return u"always"_s;
        case ItemUniverse::Asked::Conditional:
            return u"conditional"_s;
        case ItemUniverse::Asked::Never:
            return u"never"_s;
        }
        return {};
    }

    // QTextDocument knows one class per element, so the PDF gets the colour inline.
    QString flag(const DictionaryEntry& e) const {
        if (browser())
            return u"<span class=\"flag "_s + flagClass(e) + u"\">"_s + esc(askedWords(e)) +
                   u"</span>"_s;
        const QString colour = e.asked == ItemUniverse::Asked::Always ? u"#262"_s : u"#a40"_s;
        return u"<span style=\"color: "_s + colour + u"\">["_s + esc(askedWords(e)) + u"]</span>"_s;
    }

    void field(const QString& name, const QString& html) {
        m_out += browser()
                     ? u"<dt>"_s + name + u"</dt><dd>"_s + html + u"</dd>\n"_s
                     : u"<tr><td><b>"_s + name + u"</b></td><td>"_s + html + u"</td></tr>\n"_s;
    }

    void entry(const DictionaryEntry& e) {
        const QString cls = u"entry "_s + (e.hasVariable ? flagClass(e) : u"statement"_s);
        if (browser())
            m_out += u"<article class=\""_s + cls + u"\" id=\""_s + e.anchor + u"\">\n"_s;
        else
            m_out += u"<a name=\""_s + e.anchor + u"\"></a>\n"_s;
        m_out += u"<h3><span class=\"varname\">"_s + esc(e.variable) + u"</span> "_s +
                 user(e.label) + u" "_s + flag(e) + u"</h3>\n"_s;
        m_out +=
            browser() ? u"<dl>\n"_s : u"<table width=\"100%\" cellspacing=\"0\" border=\"0\">\n"_s;
        fields(e);
        m_out += browser() ? u"</dl>\n</article>\n"_s : u"</table>\n<hr>\n"_s;
    }

    void fields(const DictionaryEntry& e) {
        if (!e.text.isEmpty())
            field(u"Question text"_s, user(e.text));
        if (!e.instruction.isEmpty())
            field(u"Instruction"_s, user(e.instruction));
        field(u"Type"_s, esc(e.typeWords));
        if (e.indicatorOf)
            field(u"Stands for"_s, u"1 = code "_s + QString::number(e.indicatorOf->code) + u" ("_s +
                                       user(e.indicatorOf->label) + u") was chosen; item "_s +
                                       esc(e.item));
        field(u"Module, position"_s, user(e.moduleTitle.isEmpty() ? e.module : e.moduleTitle) +
                                         u", item "_s + QString::number(e.position) + u" of "_s +
                                         QString::number(m_d.counts.items));
        if (!e.codes.isEmpty())
            field(u"Codes"_s, codeTable(e.codes));
        if (e.rangeMin || e.rangeMax)
            field(u"Range"_s, esc(e.rangeMin.value_or(QString())) + u" to "_s +
                                  esc(e.rangeMax.value_or(QString())));
        field(u"Universe"_s, universe(e));
        field(u"Not asked"_s, esc(e.notPresented));
        if (e.implied)
            field(u"Implied value"_s, esc(impliedWords(*e.implied)));
        field(u"Routing after"_s, routing(e));
        if (!e.notes.isEmpty())
            field(u"Notes"_s, user(e.notes));
    }

    QString codeTable(const QList<DictionaryCode>& codes) const {
        // Table attributes only for QTextDocument, which ignores CSS borders.
        QString t = (browser() ? u"<table>"_s : u"<table cellspacing=\"0\" border=\"1\">"_s) +
                    u"<tr><th>Code</th><th>Label</th><th>Missing</th></tr>"_s;
        for (const DictionaryCode& c : codes) {
            const QString kind = missingKindWords(c.missing);
            t += u"<tr><td>"_s + QString::number(c.code) + u"</td><td>"_s + user(c.label) +
                 u"</td><td>"_s +
                 (kind.isEmpty()
                      ? QString()
                      : u"<span class=\"missing\">missing: "_s + esc(kind) + u"</span>"_s) +
                 u"</td></tr>"_s;
        }
        return t + u"</table>"_s;
    }

    QString link(int entry, const QString& text) const {
        if (entry < 0)
            return esc(text);
        return u"<a href=\"#"_s + m_d.entries.at(entry).anchor + u"\">"_s + esc(text) + u"</a>"_s;
    }

    QString universe(const DictionaryEntry& e) const {
        if (!e.isConditional())
            return u"<b>"_s + esc(askedWords(e)) + u"</b>"_s;
        QString html = u"<b>CONDITIONAL</b>: asked only when <code>"_s + esc(e.askedIf) +
                       u"</code><br>In words: "_s + esc(e.plain);
        if (!e.gates.isEmpty()) {
            QStringList links;
            for (const DictionaryGate& g : e.gates)
                links.append(link(g.entry, g.name));
            html += u"<br>Gate items: "_s + links.join(u", "_s);
        }
        return html;
    }

    QString routing(const DictionaryEntry& e) const {
        if (e.routing.isEmpty())
            return u"continues with the next item"_s;
        QString html = u"<ul>"_s;
        for (const DictionaryRoute& r : e.routing) {
            const QString target =
                r.targetItem.isEmpty() || r.targetItem == r.target
                    ? link(r.targetEntry, r.target)
                    : esc(r.target) + u" ("_s + link(r.targetEntry, r.targetItem) + u')';
            html += u"<li>"_s +
                    (r.condition.isEmpty() ? u"always"_s
                                           : u"if <code>"_s + esc(r.condition) + u"</code>"_s) +
                    u" go to "_s + target +
                    (r.usable ? QString() : u" <b>[broken rule: never fires]</b>"_s) + u"</li>"_s;
        }
        if (!e.routing.constLast().condition.isEmpty())
            html += u"<li>otherwise continue with the next item</li>"_s;
        return html + u"</ul>"_s;
    }

    const Dictionary& m_d;
    HtmlFlavour m_flavour;
    QString m_out;
};

} // namespace

QByteArray exportHtmlDictionary(const Dictionary& dictionary, HtmlFlavour flavour) {
    return HtmlWriter(dictionary, flavour).document().toUtf8();
}

} // namespace rb
