#include "PreviewHtml.h"

namespace rb {

namespace {

QString esc(const QString& text) {
    return text.toHtmlEscaped();
}

QString codesHtml(const Instrument& instrument, const Item& item) {
    const QList<Code> codes = instrument.codesOf(item);
    if (codes.isEmpty())
        return {};
    QString html = QStringLiteral("<table class=codes>");
    for (const Code& code : codes)
        html += QStringLiteral("<tr><td align=right>%1</td><td>%2</td><td><i>%3</i></td></tr>")
                    .arg(code.code)
                    .arg(esc(code.label), esc(missingKindName(code.missing)));
    return html + QStringLiteral("</table>");
}

QString universeHtml(const LiveAnalysis& analysis, int position) {
    if (position >= analysis.marks.size())
        return QStringLiteral("<p><i>(analysis pending)</i></p>");
    const ItemMarks& marks = analysis.marks.at(position);
    switch (marks.asked) {
    case ItemUniverse::Asked::Always:
        return QStringLiteral("<p>Asked of everyone.</p>");
    case ItemUniverse::Asked::Never:
        return QStringLiteral("<p><b>NEVER ASKED</b>: no respondent reaches this item.</p>");
    case ItemUniverse::Asked::Conditional:
        break;
    }
    return QStringLiteral("<p><b>CONDITIONAL</b>: asked if <code>%1</code></p>")
        .arg(esc(marks.askedIf));
}

} // namespace

QString plainPreviewHtml(const Instrument& instrument, const LiveAnalysis& analysis, int maxItems) {
    QString html =
        QStringLiteral("<h1>%1</h1><p>Version %2 &middot; language %3</p>")
            .arg(esc(instrument.title), esc(instrument.version), esc(instrument.language));
    int position = 0;
    for (const Module& module : instrument.modules) {
        html += QStringLiteral("<h2>%1 &mdash; %2</h2>").arg(esc(module.name), esc(module.title));
        for (const Item& item : module.items) {
            if (position >= maxItems) {
                int total = 0;
                for (const Module& m : instrument.modules)
                    total += int(m.items.size());
                return html + QStringLiteral("<p><i>... the first %1 of %2 items are shown; export "
                                             "the dictionary for all of them.</i></p>")
                                  .arg(maxItems)
                                  .arg(total);
            }
            html += QStringLiteral("<h3><a name=\"%1\">%1</a> <small>%2</small></h3>")
                        .arg(esc(item.name), esc(item.label));
            html += QStringLiteral("<p>%1 <small>(%2)</small></p>")
                        .arg(esc(item.text), esc(itemTypeName(item.type)));
            html += universeHtml(analysis, position++);
            html += codesHtml(instrument, item);
        }
    }
    return html;
}

} // namespace rb
