#include "DotExport.h"

#include "layout/RouteGraph.h"

#include <QTextStream>

namespace rb {

// Graphviz refuses quoted strings beyond 16,384 characters; a label longer
// than this is cut (the full text stays in the dictionary and the project).
constexpr qsizetype kMaxDotText = 2000;

QString dotQuoted(const QString& full) {
    const QString text = full.size() > kMaxDotText ? full.left(kMaxDotText) + QChar(0x2026) : full;
    QString out;
    out.reserve(text.size() + 2);
    out += QLatin1Char('"');
    for (QChar c : text) {
        if (c == QLatin1Char('\\') || c == QLatin1Char('"'))
            out += QLatin1Char('\\');
        if (c == QLatin1Char('\n'))
            out += QStringLiteral("\\n");
        else if (c == QLatin1Char('\r') || c.category() == QChar::Other_Control)
            out += QLatin1Char(' ');
        else
            out += c;
    }
    out += QLatin1Char('"');
    return out;
}

namespace {

QString nodeId(const CompiledRouting& routing, int position) {
    if (position >= routing.itemCount())
        return QStringLiteral("END");
    return dotQuoted(routing.index().at(position).item->name);
}

// Label lengths: long enough to recognise an item or a condition, short
// enough that Graphviz keeps boxes narrow; the full text is in the tooltip.
constexpr int kLabelChars = 40;
constexpr int kConditionChars = 28;

void writeNodes(const CompiledRouting& routing, QTextStream& out) {
    out << "  START [shape=circle];\n  END [shape=doublecircle];\n";
    for (const ItemIndex::Entry& e : routing.index().entries()) {
        QString label = e.item->name, tooltip = e.item->name;
        if (!e.item->label.isEmpty()) {
            label += QLatin1Char('\n') + layout::shortCondition(e.item->label, kLabelChars);
            tooltip += QStringLiteral(": ") + e.item->label;
        }
        for (const std::optional<QString>& filter : {e.module->askIf, e.item->askIf})
            if (filter) {
                label +=
                    QStringLiteral("\nask if: ") + layout::shortCondition(*filter, kLabelChars);
                tooltip += QStringLiteral("\nask if: ") + *filter;
            }
        out << "  " << nodeId(routing, e.position) << " [label=" << dotQuoted(label)
            << ", tooltip=" << dotQuoted(tooltip) << ", module=" << dotQuoted(e.module->name)
            << "];\n";
    }
}

// Conditions are external labels (xlabel): placed after the layout, they do
// not become label nodes, which would double the ranks and slow dot down many
// times over (see DEVELOPERS.md, route map).
void writeEdges(const CompiledRouting& routing, QTextStream& out) {
    const int count = routing.itemCount();
    out << "  START -> " << nodeId(routing, 0) << ";\n";
    for (int p = 0; p < count; ++p) {
        const QString from = nodeId(routing, p);
        bool always = false;
        const QList<Rule>& rules = routing.index().at(p).item->routing;
        for (int k = 0; k < rules.size() && !always; ++k) {
            const CompiledRouting::CompiledRule& rule = routing.item(p).rules.at(k);
            if (!rule.usable)
                continue;
            always = rule.condition == nullptr;
            const QString condition = always ? QStringLiteral("always") : *rules.at(k).condition;
            out << "  " << from << " -> " << nodeId(routing, rule.target)
                << " [xlabel=" << dotQuoted(layout::shortCondition(condition, kConditionChars))
                << ", tooltip=" << dotQuoted(condition) << ", kind=rule];\n";
        }
        if (!always)
            out << "  " << from << " -> " << nodeId(routing, p + 1) << " [kind=next];\n";
        if (!routing.item(p).filters.isEmpty())
            out << "  " << from << " -> " << nodeId(routing, p + 1)
                << " [xlabel=\"filtered out\", style=dashed, kind=filtered];\n";
    }
}

} // namespace

QByteArray exportDot(const CompiledRouting& routing) {
    QString text;
    QTextStream out(&text);
    out << "digraph routebook {\n  graph [label=" << dotQuoted(routing.instrument().title)
        << "];\n  node [shape=box];\n";
    writeNodes(routing, out);
    writeEdges(routing, out);
    out << "}\n";
    out.flush();
    return text.toUtf8();
}

} // namespace rb
