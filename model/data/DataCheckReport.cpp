#include "DataCheckReport.h"

#include "DataCheckJson.h"

namespace rb {

namespace {

QString esc(const QString& s) {
    return s.toHtmlEscaped();
}

QString percentText(qint64 count, qint64 base, int s) {
    if (base <= 0 || isSuppressed(count, s))
        return QStringLiteral("&ndash;");
    return QString::number(100.0 * double(count) / double(base), 'f', 1) + QLatin1Char('%');
}

// A horizontal bar chart: one bar per row, length by share of `base`; a
// suppressed count draws no bar, so the picture does not reveal it either.
QString barChart(const QList<std::pair<QString, qint64>>& rows, qint64 base, int s) {
    const int rowHeight = 18, labelWidth = 170, barWidth = 300;
    QString svg = QStringLiteral("<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"chart\" "
                                 "width=\"%1\" height=\"%2\" role=\"img\">")
                      .arg(labelWidth + barWidth + 70)
                      .arg(rowHeight * rows.size() + 4);
    for (qsizetype i = 0; i < rows.size(); ++i) {
        const auto& [label, count] = rows.at(i);
        const int y = int(i) * rowHeight + 2;
        const bool hidden = isSuppressed(count, s) || base <= 0;
        const int width = hidden ? 0 : int(double(barWidth) * double(count) / double(base) + 0.5);
        svg += QStringLiteral("<text x=\"0\" y=\"%1\">%2</text>").arg(y + 13).arg(esc(label));
        svg += QStringLiteral("<rect x=\"%1\" y=\"%2\" width=\"%3\" height=\"%4\"/>")
                   .arg(labelWidth)
                   .arg(y + 2)
                   .arg(width)
                   .arg(rowHeight - 5);
        svg += QStringLiteral("<text x=\"%1\" y=\"%2\">%3</text>")
                   .arg(labelWidth + width + 4)
                   .arg(y + 13)
                   .arg(esc(shownCount(count, s)));
    }
    return svg + QStringLiteral("</svg>");
}

QString problemRow(const QString& what, const ProblemRecords& p, int s) {
    // Record numbers point at individual rows, so they are listed only without suppression.
    const QString first =
        s > 0 || p.first.isEmpty()
            ? QStringLiteral("&ndash;")
            : esc(p.first.join(QStringLiteral(", "))) +
                  (p.count > p.first.size() ? QStringLiteral(", &hellip;") : QString());
    return QStringLiteral("<tr><td>%1</td><td class=\"n\">%2</td><td>%3</td></tr>")
        .arg(what, esc(shownCount(p.count, s)), first);
}

QString universeText(const ItemCounts& c, const ReportOptions& options) {
    if (!options.universes)
        return QStringLiteral("<p class=\"universe\">Universe: not computed for this report.</p>");
    for (const ItemUniverse& u : *options.universes) {
        if (u.position != c.position)
            continue;
        if (u.asked == ItemUniverse::Asked::Always)
            return QStringLiteral("<p class=\"universe\">Asked of everyone.</p>");
        if (u.asked == ItemUniverse::Asked::Never)
            return QStringLiteral("<p class=\"universe\">Never asked (check the routing).</p>");
        return QStringLiteral("<p class=\"universe\"><strong>CONDITIONAL</strong> &mdash; asked if "
                              "<code>%1</code><br>%2</p>")
            .arg(esc(u.askedIf), esc(u.plain));
    }
    return {};
}

QString itemSection(const CompiledRouting& routing, const ItemCounts& c, qint64 records,
                    const ReportOptions& options) {
    const int s = options.suppressBelow;
    const Item& item = *routing.index().at(c.position).item;
    QString html = QStringLiteral("<section><h2 id=\"%1\">%1 <small>%2 &middot; %3</small></h2>")
                       .arg(esc(c.name), esc(item.label), esc(c.type));
    if (!item.text.isEmpty())
        html += QStringLiteral("<p class=\"text\">%1</p>").arg(esc(item.text));
    html += universeText(c, options);
    const QList<std::pair<QString, qint64>> classes = {
        {QStringLiteral("answered"), c.answered},
        {QStringLiteral("nonresponse: blank"), c.nonresponseByKind[0]},
        {QStringLiteral("nonresponse: don't know"), c.nonresponseByKind[1]},
        {QStringLiteral("nonresponse: refused"), c.nonresponseByKind[2]},
        {QStringLiteral("nonresponse: not applicable"), c.nonresponseByKind[3]},
        {QStringLiteral("invalid"), c.invalid},
        {QStringLiteral("legitimate skip"), c.legitimateSkip},
        {QStringLiteral("routing violation"), c.routingViolation}};
    html += QStringLiteral("<div class=\"pair\"><table><tr><th>class</th><th>records</th><th>% of "
                           "records</th></tr>");
    for (const auto& [label, count] : classes)
        html += QStringLiteral("<tr><td>%1</td><td class=\"n\">%2</td><td class=\"n\">%3</td></tr>")
                    .arg(esc(label), esc(shownCount(count, s)), percentText(count, records, s));
    html += QStringLiteral(
                "<tr><td>skips after a missing gate</td><td class=\"n\">%1</td><td></td></tr>"
                "<tr><td>implied value applies</td><td class=\"n\">%2</td><td></td></tr></table>")
                .arg(esc(shownCount(c.skipAfterMissingGate, s)), esc(shownCount(c.implied, s)));
    html += barChart(classes, records, s) + QStringLiteral("</div>");
    if (!c.frequencies.isEmpty()) {
        html += QStringLiteral(
            "<div class=\"pair\"><table><tr><th>code</th><th>label</th><th>count</th>"
            "<th>% of presented</th><th>% of records</th></tr>");
        QList<std::pair<QString, qint64>> bars;
        for (const CodeCount& f : c.frequencies) {
            const QString label =
                f.label +
                (f.missing != MissingKind::None ? QStringLiteral(" (missing)") : QString());
            html +=
                QStringLiteral("<tr><td class=\"n\">%1</td><td>%2</td><td class=\"n\">%3</td>"
                               "<td class=\"n\">%4</td><td class=\"n\">%5</td></tr>")
                    .arg(QString::number(f.code), esc(label), esc(shownCount(f.count, s)),
                         percentText(f.count, c.presented, s), percentText(f.count, records, s));
            bars.append({QString::number(f.code) + QLatin1Char(' ') + f.label.left(20), f.count});
        }
        html +=
            QStringLiteral("</table>") + barChart(bars, c.presented, s) + QStringLiteral("</div>");
    }
    return html + QStringLiteral("</section>\n");
}

const char* kStyle =
    "body{font-family:sans-serif;max-width:60rem;margin:2rem auto;color:#222}"
    "table{border-collapse:collapse;margin:.5rem 1.5rem .5rem 0}"
    "td,th{border:1px solid #bbb;padding:.15rem .5rem;text-align:left}"
    "td.n{text-align:right}.pair{display:flex;flex-wrap:wrap;align-items:flex-start}"
    "svg.chart rect{fill:#4a7ab0}svg.chart text{font-size:12px}"
    ".universe{background:#f3f3f3;padding:.3rem .5rem}.caution{border-left:4px solid #c80;"
    "padding:.3rem .8rem}section{border-top:1px solid #ccc;margin-top:1rem}"
    "@media print{section{break-inside:avoid}}";

} // namespace

QByteArray dataCheckReportHtml(const CompiledRouting& routing, const DataCheckResult& result,
                               const ReportOptions& options) {
    const int s = options.suppressBelow;
    const Instrument& instrument = routing.instrument();
    QString html =
        QStringLiteral("<!DOCTYPE html>\n<html lang=\"%1\"><head><meta charset=\"utf-8\">"
                       "<title>Data check: %2</title><style>%3</style></head><body>\n")
            .arg(esc(instrument.language.isEmpty() ? QStringLiteral("en") : instrument.language),
                 esc(instrument.title), QString::fromLatin1(kStyle));
    html +=
        QStringLiteral("<h1>Data check: %1 %2</h1><p>Response file <code>%3</code>: %4 records, "
                       "%5 items with a variable.</p>")
            .arg(esc(instrument.title), esc(instrument.version), esc(options.dataFileName))
            .arg(result.records)
            .arg(result.items.size());
    const QString smallCells =
        s > 0 ? QStringLiteral("Counts from 1 to %1 are shown as &ldquo;&lt;%2&rdquo; and draw no "
                               "bar, and record numbers are not listed, because very small groups "
                               "can identify respondents (a threshold of 5 is common practice, not "
                               "a standard).")
                    .arg(s - 1)
                    .arg(s)
              : QStringLiteral("Small counts are <strong>not</strong> suppressed in this report "
                               "(--suppress-below 0): do not share it as it is.");
    html += QStringLiteral("<div class=\"caution\"><p><strong>Personal data.</strong> This report "
                           "shows aggregate counts only. %1 Keep the response file and the "
                           "analysis file under your project's data-protection rules and your "
                           "ethics board's conditions, and share this report only where those "
                           "allow.</p></div>")
                .arg(smallCells);
    html += QStringLiteral("<h2>Records</h2><table><tr><th>problem</th><th>records</th><th>first "
                           "records</th></tr>");
    html += problemRow(QStringLiteral("any routing violation"), result.violations, s);
    html += problemRow(QStringLiteral("any invalid value"), result.invalid, s);
    html += problemRow(QStringLiteral("break-off (blank to the end)"), result.breakOffs, s);
    html += problemRow(QStringLiteral("no value at all"), result.emptyRecords, s);
    html += problemRow(QStringLiteral("route loop"), result.loops, s);
    html += QStringLiteral("</table>");
    if (!result.unknownColumns.isEmpty())
        html += QStringLiteral("<p>Columns ignored (no such variable): %1</p>")
                    .arg(esc(result.unknownColumns.join(QStringLiteral(", "))));
    if (!result.missingColumns.isEmpty())
        html += QStringLiteral("<p>Variables without a column (read as blank): %1</p>")
                    .arg(esc(result.missingColumns.join(QStringLiteral(", "))));
    for (const ItemCounts& c : result.items)
        html += itemSection(routing, c, result.records, options);
    html += QStringLiteral("</body></html>\n");
    return html.toUtf8();
}

} // namespace rb
