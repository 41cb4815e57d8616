#include "MarkdownDictionary.h"

#include "TextEscape.h"

using namespace Qt::StringLiterals;

namespace rb {

namespace {

QString md(const QString& text) {
    return markdownEscaped(text);
}

// Conditions are shown bold and escaped rather than as inline code, whose
// backtick fence a backtick inside the value could close.
QString condText(const QString& text) {
    return u"**"_s + md(text) + u"**"_s;
}

QString moduleTitle(const DictionaryModule& m) {
    return m.title.isEmpty() ? m.name : m.title + u" ("_s + m.name + u')';
}

QString codesText(const QList<DictionaryCode>& codes) {
    // A blank line first: a table may not interrupt the paragraph before it.
    QString out = u"\n\n  | Code | Label | Missing |\n  |---:|---|---|\n"_s;
    for (const DictionaryCode& c : codes) {
        const QString kind = missingKindWords(c.missing);
        out += u"  | "_s + QString::number(c.code) + u" | "_s + md(c.label) + u" | "_s +
               (kind.isEmpty() ? QString() : u"missing: "_s + md(kind)) + u" |\n"_s;
    }
    return out;
}

QString universeText(const Dictionary& d, const DictionaryEntry& e) {
    if (!e.isConditional())
        return u"**"_s + askedWords(e) + u"**"_s;
    QString out = u"**CONDITIONAL**: asked only when "_s + condText(e.askedIf) + u"; in words: "_s +
                  md(e.plain);
    if (!e.gates.isEmpty()) {
        QStringList links;
        for (const DictionaryGate& g : e.gates)
            links.append(g.entry < 0 ? md(g.name)
                                     : u"["_s + md(g.name) + u"](#"_s +
                                           d.entries.at(g.entry).anchor.toLower() + u')');
        out += u". Gate items: "_s + links.join(u", "_s);
    }
    return out;
}

QString routingText(const DictionaryEntry& e) {
    if (e.routing.isEmpty())
        return u"continues with the next item"_s;
    QStringList rules;
    for (const DictionaryRoute& r : e.routing)
        rules.append(md(routeWords(r)));
    if (!e.routing.constLast().condition.isEmpty())
        rules.append(u"otherwise continue with the next item"_s);
    return rules.join(u"; "_s);
}

void entryText(const Dictionary& d, const DictionaryEntry& e, QString& out) {
    // An explicit anchor, so gate links work whatever slug rules a viewer uses.
    out += u"\n<a id=\""_s + e.anchor.toLower() + u"\"></a>\n\n### "_s + md(e.variable) + u" — "_s +
           md(e.label) + u" — "_s + askedWords(e) + u"\n\n"_s;
    const auto line = [&out](const QString& name, const QString& value) {
        out += u"- **"_s + name + u":** "_s + value + u'\n';
    };
    if (!e.text.isEmpty())
        line(u"Question text"_s, md(e.text));
    if (!e.instruction.isEmpty())
        line(u"Instruction"_s, md(e.instruction));
    line(u"Type"_s, md(e.typeWords));
    if (e.indicatorOf)
        line(u"Stands for"_s, u"1 = code "_s + QString::number(e.indicatorOf->code) + u" ("_s +
                                  md(e.indicatorOf->label) + u") was chosen; item "_s + md(e.item));
    line(u"Module, position"_s, md(e.moduleTitle.isEmpty() ? e.module : e.moduleTitle) +
                                    u", item "_s + QString::number(e.position) + u" of "_s +
                                    QString::number(d.counts.items));
    if (!e.codes.isEmpty())
        line(u"Codes"_s, codesText(e.codes));
    if (e.rangeMin || e.rangeMax)
        line(u"Range"_s,
             md(e.rangeMin.value_or(QString())) + u" to "_s + md(e.rangeMax.value_or(QString())));
    line(u"Universe"_s, universeText(d, e));
    line(u"Not asked"_s, md(e.notPresented));
    if (e.implied)
        line(u"Implied value"_s, md(impliedWords(*e.implied)));
    line(u"Routing after"_s, routingText(e));
    if (!e.notes.isEmpty())
        line(u"Notes"_s, md(e.notes));
}

} // namespace

QByteArray exportMarkdownDictionary(const Dictionary& d) {
    QString out = u"# Data dictionary: "_s + md(d.title.isEmpty() ? u"(untitled)"_s : d.title) +
                  u"\n\nVersion "_s + (d.version.isEmpty() ? u"(none)"_s : md(d.version)) +
                  u" · generated "_s + d.generated.toString(Qt::ISODate) + u" by Routebook\n\n"_s;
    const DictionaryCounts& c = d.counts;
    out += u"| Count | Number |\n|---|---:|\n"_s;
    out += u"| Items | %1 |\n| Variables in the data | %2 |\n| Conditional items | %3 |\n"_s
           u"| Items never asked | %4 |\n| Modules | %5 |\n| Routing findings: errors | %6 |\n"_s
           u"| Routing findings: warnings | %7 |\n"_s.arg(c.items)
               .arg(c.variables)
               .arg(c.conditionalItems)
               .arg(c.neverAskedItems)
               .arg(c.modules)
               .arg(c.errors)
               .arg(c.warnings);
    out += u"\nRespondents outside an item's universe were not asked and hold "_s +
           (d.legitimateSkipCode.isEmpty()
                ? u"a blank"_s
                : u"the legitimate-skip code "_s + md(d.legitimateSkipCode)) +
           u".\n\n## Contents\n\n"_s;
    for (int m = 0; m < d.modules.size(); ++m) {
        const DictionaryModule& mod = d.modules.at(m);
        out += QString::number(m + 1) + u". "_s + md(moduleTitle(mod)) + u'\n';
        for (int i : mod.entries)
            out += u"    - ["_s + md(d.entries.at(i).variable) + u"](#"_s +
                   d.entries.at(i).anchor.toLower() + u") "_s + askedWords(d.entries.at(i)) + u'\n';
    }
    out += u"\n## Route map\n\n[Route map: see the HTML dictionary, or routebook export FILE "_s
           u"--format svg.]\n"_s;
    out.replace(u"[Route map"_s, u"\\[Route map"_s).replace(u"svg.]"_s, u"svg.\\]"_s);
    for (int m = 0; m < d.modules.size(); ++m) {
        const DictionaryModule& mod = d.modules.at(m);
        out +=
            u"\n## Module "_s + QString::number(m + 1) + u": "_s + md(moduleTitle(mod)) + u"\n"_s;
        if (!mod.askIf.isEmpty())
            out += u"\nModule filter (as written): "_s + condText(mod.askIf) + u"\n"_s;
        for (int i : mod.entries)
            entryText(d, d.entries.at(i), out);
    }
    return out.toUtf8();
}

} // namespace rb
