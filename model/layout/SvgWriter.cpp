#include "SvgWriter.h"

#include <QXmlStreamWriter>

namespace rb::layout {

namespace {

// Our own look: items as rounded boxes, START/END as circles, modules as pale
// bands; markers as small corner tags (see RouteMapStyle in views/ for the
// same design on screen).
const char* const kStyle =
    "text{font-family:sans-serif;font-size:11px;fill:#1d2a33}"
    ".band rect{fill:#eef3f6;stroke:#b9c8d2;stroke-width:1}"
    ".band text{font-size:11px;font-weight:bold;fill:#4a6272}"
    ".node rect,.node circle{fill:#ffffff;stroke:#3a6d8c;stroke-width:1.4}"
    ".node.unreachable rect{fill:#f1f1f1;stroke:#a33;stroke-dasharray:4 3}"
    ".node .name{font-weight:bold}.node .label{fill:#4f5f69}"
    ".tag rect{stroke:none}.tag text{font-size:9px;font-weight:bold;fill:#fff}"
    ".tag.conditional rect{fill:#c98a16}.tag.unreachable rect{fill:#a33}"
    ".tag.looping rect{fill:#6b4fa0}"
    ".edge polyline{fill:none;stroke:#56707f;stroke-width:1.2}"
    ".edge.rule polyline{stroke:#2b7a4b}.edge.filtered polyline{stroke-dasharray:5 3}"
    ".edge text{font-size:9px;fill:#2b5a3f}";

QString num(double v) {
    return QString::number(v, 'f', 1);
}

QString points(const QList<QPointF>& pts) {
    QStringList parts;
    for (const QPointF& p : pts)
        parts.append(num(p.x()) + QLatin1Char(',') + num(p.y()));
    return parts.join(QLatin1Char(' '));
}

class Writer {
public:
    Writer(QByteArray* out, const RouteGraph& g, const RouteLayout& l)
        : m_xml(out), m_g(g), m_l(l) {
        m_xml.setAutoFormatting(true);
        m_xml.setAutoFormattingIndent(1);
    }

    // The layout's bounds plus the rule labels, which may reach past the
    // outermost lane (width estimated at 0.6 em a character of the 9 px label
    // font: a rule of thumb, common practice, no source).
    QRectF drawingBounds() const {
        QRectF b = m_l.bounds;
        for (int e = 0; e < m_g.edges.size(); ++e) {
            if (m_g.edges.at(e).kind != RouteEdge::Kind::Rule)
                continue;
            const EdgeRoute& route = m_l.edges.at(e);
            const double w = 5.4 * double(shortCondition(m_g.edges.at(e).condition).size()) + 4;
            const QPointF at = route.labelAnchor;
            b |= QRectF(route.side < 0 ? at.x() - w : at.x(), at.y() - 10, w, 13);
        }
        return b;
    }

    void write(const QString& title) {
        const QRectF b = drawingBounds();
        m_xml.writeStartDocument();
        m_xml.writeStartElement(QStringLiteral("svg"));
        m_xml.writeDefaultNamespace(QStringLiteral("http://www.w3.org/2000/svg"));
        m_xml.writeAttribute(QStringLiteral("version"), QStringLiteral("1.1"));
        m_xml.writeAttribute(QStringLiteral("width"), num(b.width()));
        m_xml.writeAttribute(QStringLiteral("height"), num(b.height()));
        m_xml.writeAttribute(QStringLiteral("viewBox"), QStringLiteral("%1 %2 %3 %4")
                                                            .arg(num(b.left()), num(b.top()),
                                                                 num(b.width()), num(b.height())));
        m_xml.writeTextElement(QStringLiteral("title"), title);
        writeDefs();
        for (int m = 0; m < m_g.modules.size(); ++m)
            writeBand(m);
        for (int e = 0; e < m_g.edges.size(); ++e)
            writeEdge(e);
        for (int n = 0; n < m_g.nodes.size(); ++n)
            writeNode(n);
        m_xml.writeEndElement();
        m_xml.writeEndDocument();
    }

private:
    void writeDefs() {
        m_xml.writeStartElement(QStringLiteral("defs"));
        m_xml.writeTextElement(QStringLiteral("style"), QString::fromLatin1(kStyle));
        m_xml.writeStartElement(QStringLiteral("marker"));
        m_xml.writeAttribute(QStringLiteral("id"), QStringLiteral("arrow"));
        m_xml.writeAttribute(QStringLiteral("viewBox"), QStringLiteral("0 0 8 8"));
        m_xml.writeAttribute(QStringLiteral("refX"), QStringLiteral("8"));
        m_xml.writeAttribute(QStringLiteral("refY"), QStringLiteral("4"));
        m_xml.writeAttribute(QStringLiteral("markerWidth"), QStringLiteral("7"));
        m_xml.writeAttribute(QStringLiteral("markerHeight"), QStringLiteral("7"));
        m_xml.writeAttribute(QStringLiteral("orient"), QStringLiteral("auto"));
        m_xml.writeEmptyElement(QStringLiteral("path"));
        m_xml.writeAttribute(QStringLiteral("d"), QStringLiteral("M0,0 L8,4 L0,8 z"));
        m_xml.writeAttribute(QStringLiteral("fill"), QStringLiteral("#56707f"));
        m_xml.writeEndElement();
        m_xml.writeEndElement();
    }

    void rect(const QRectF& r, double radius) {
        m_xml.writeEmptyElement(QStringLiteral("rect"));
        m_xml.writeAttribute(QStringLiteral("x"), num(r.x()));
        m_xml.writeAttribute(QStringLiteral("y"), num(r.y()));
        m_xml.writeAttribute(QStringLiteral("width"), num(r.width()));
        m_xml.writeAttribute(QStringLiteral("height"), num(r.height()));
        if (radius > 0)
            m_xml.writeAttribute(QStringLiteral("rx"), num(radius));
    }

    void text(const QPointF& at, const QString& content, const QString& cls = {},
              const QString& anchor = {}) {
        m_xml.writeStartElement(QStringLiteral("text"));
        m_xml.writeAttribute(QStringLiteral("x"), num(at.x()));
        m_xml.writeAttribute(QStringLiteral("y"), num(at.y()));
        if (!cls.isEmpty())
            m_xml.writeAttribute(QStringLiteral("class"), cls);
        if (!anchor.isEmpty())
            m_xml.writeAttribute(QStringLiteral("text-anchor"), anchor);
        m_xml.writeCharacters(content);
        m_xml.writeEndElement();
    }

    void writeBand(int m) {
        const ModuleSpan& span = m_g.modules.at(m);
        const QRectF& r = m_l.moduleBands.at(m);
        m_xml.writeStartElement(QStringLiteral("g"));
        m_xml.writeAttribute(QStringLiteral("class"), QStringLiteral("band"));
        m_xml.writeTextElement(
            QStringLiteral("title"),
            span.title.isEmpty() ? span.name : span.name + QStringLiteral(": ") + span.title);
        rect(r, 4);
        text(r.topLeft() + QPointF(6, 14),
             shortCondition(span.title.isEmpty() ? span.name : span.title, 60));
        m_xml.writeEndElement();
    }

    void writeEdge(int e) {
        const RouteEdge& edge = m_g.edges.at(e);
        const EdgeRoute& route = m_l.edges.at(e);
        static const QString kinds[] = {QStringLiteral("next"), QStringLiteral("rule"),
                                        QStringLiteral("filtered")};
        m_xml.writeStartElement(QStringLiteral("g"));
        m_xml.writeAttribute(QStringLiteral("class"),
                             QStringLiteral("edge ") + kinds[int(edge.kind)]);
        m_xml.writeTextElement(
            QStringLiteral("title"),
            m_g.nodes.at(edge.from).name + QStringLiteral(" \u2192 ") + m_g.nodes.at(edge.to).name +
                (edge.condition.isEmpty() ? QString() : QStringLiteral(": ") + edge.condition));
        m_xml.writeEmptyElement(QStringLiteral("polyline"));
        m_xml.writeAttribute(QStringLiteral("points"), points(route.points));
        m_xml.writeAttribute(QStringLiteral("marker-end"), QStringLiteral("url(#arrow)"));
        if (edge.kind == RouteEdge::Kind::Rule)
            text(route.labelAnchor, shortCondition(edge.condition), {},
                 route.side < 0 ? QStringLiteral("end") : QString());
        m_xml.writeEndElement();
    }

    void tag(const QRectF& node, int slot, const QString& cls, const QString& letter) {
        const QRectF r(node.right() - 14 - slot * 15, node.top() + 2, 13, 11);
        m_xml.writeStartElement(QStringLiteral("g"));
        m_xml.writeAttribute(QStringLiteral("class"), QStringLiteral("tag ") + cls);
        rect(r, 2);
        text(QPointF(r.center().x(), r.bottom() - 2), letter, {}, QStringLiteral("middle"));
        m_xml.writeEndElement();
    }

    void writeNode(int n) {
        const RouteNode& node = m_g.nodes.at(n);
        const QRectF& r = m_l.nodes.at(n);
        m_xml.writeStartElement(QStringLiteral("g"));
        QString cls = QStringLiteral("node");
        if (node.unreachable)
            cls += QStringLiteral(" unreachable");
        m_xml.writeAttribute(QStringLiteral("class"), cls);
        m_xml.writeAttribute(QStringLiteral("data-name"), node.name);
        if (node.kind != RouteNode::Kind::Item) {
            m_xml.writeTextElement(QStringLiteral("title"), node.name);
            m_xml.writeEmptyElement(QStringLiteral("circle"));
            m_xml.writeAttribute(QStringLiteral("cx"), num(r.center().x()));
            m_xml.writeAttribute(QStringLiteral("cy"), num(r.center().y()));
            m_xml.writeAttribute(QStringLiteral("r"), num(r.width() / 2));
            text(r.center() + QPointF(0, 4), node.name, QStringLiteral("name"),
                 QStringLiteral("middle"));
            m_xml.writeEndElement();
            return;
        }
        m_xml.writeAttribute(QStringLiteral("id"), QStringLiteral("item-%1").arg(node.position));
        QString tip = node.name;
        if (!node.label.isEmpty())
            tip += QStringLiteral(": ") + node.label;
        if (!node.filter.isEmpty())
            tip += QStringLiteral("\nask if: ") + node.filter;
        if (!node.universe.isEmpty())
            tip += QStringLiteral("\nasked if: ") + node.universe;
        m_xml.writeTextElement(QStringLiteral("title"), tip);
        rect(r, 5);
        text(r.topLeft() + QPointF(8, 14), shortCondition(node.name, 26), QStringLiteral("name"));
        text(r.topLeft() + QPointF(8, 27), shortCondition(node.label, 30), QStringLiteral("label"));
        int slot = 0;
        if (node.conditional)
            tag(r, slot++, QStringLiteral("conditional"), QStringLiteral("?"));
        if (node.unreachable)
            tag(r, slot++, QStringLiteral("unreachable"), QStringLiteral("\u00d7"));
        if (node.looping)
            tag(r, slot++, QStringLiteral("looping"), QStringLiteral("\u21ba"));
        m_xml.writeEndElement();
    }

    QXmlStreamWriter m_xml;
    const RouteGraph& m_g;
    const RouteLayout& m_l;
};

} // namespace

QByteArray writeRouteMapSvg(const RouteGraph& graph, const RouteLayout& layout,
                            const QString& title) {
    QByteArray out;
    Writer(&out, graph, layout).write(title);
    return out;
}

} // namespace rb::layout
