#include "RouteMapPainter.h"

#include <QPainter>
#include <QPainterPath>
#include <QtMath>

namespace rb {

namespace {

using layout::RouteEdge;
using layout::RouteNode;

// The SVG export's colours (model/layout/SvgWriter.cpp kStyle).
const QColor kInk(0x1d, 0x2a, 0x33), kBandFill(0xee, 0xf3, 0xf6), kBandLine(0xb9, 0xc8, 0xd2),
    kBandText(0x4a, 0x62, 0x72), kNodeLine(0x3a, 0x6d, 0x8c), kUnreachableFill(0xf1, 0xf1, 0xf1),
    kUnreachableLine(0xaa, 0x33, 0x33), kLabel(0x4f, 0x5f, 0x69), kEdge(0x56, 0x70, 0x7f),
    kRuleEdge(0x2b, 0x7a, 0x4b), kRuleText(0x2b, 0x5a, 0x3f), kConditional(0xc9, 0x8a, 0x16),
    kLooping(0x6b, 0x4f, 0xa0);

QFont font(double pixels, bool bold) {
    QFont f(QStringLiteral("sans-serif"));
    f.setPixelSize(qMax(1, qRound(pixels)));
    f.setBold(bold);
    return f;
}

// Text at a baseline point; `align` is Qt::AlignLeft, AlignRight or AlignHCenter.
void text(QPainter& p, const QPointF& baseline, const QString& s, Qt::Alignment align) {
    const double width = p.fontMetrics().horizontalAdvance(s);
    double x = baseline.x();
    if (align & Qt::AlignRight)
        x -= width;
    else if (align & Qt::AlignHCenter)
        x -= width / 2;
    p.drawText(QPointF(x, baseline.y()), s); // drawText(QPointF, QString) never parses markup
}

void paintBand(QPainter& p, const layout::ModuleSpan& span, const QRectF& r) {
    p.setPen(QPen(kBandLine, 1));
    p.setBrush(kBandFill);
    p.drawRoundedRect(r, 4, 4);
    p.setFont(font(11, true));
    p.setPen(kBandText);
    text(p, r.topLeft() + QPointF(6, 14),
         layout::shortCondition(span.title.isEmpty() ? span.name : span.title, 60), Qt::AlignLeft);
}

void paintArrowHead(QPainter& p, const QPointF& from, const QPointF& tip, const QColor& colour) {
    const QLineF back(tip, from);
    if (back.length() <= 0)
        return;
    const double angle = qDegreesToRadians(back.angle());
    const auto corner = [&](double turn) {
        return tip + QPointF(std::cos(angle + turn) * 7, -std::sin(angle + turn) * 7);
    };
    p.setPen(Qt::NoPen);
    p.setBrush(colour);
    p.drawPolygon(QPolygonF({tip, corner(0.45), corner(-0.45)}));
}

void paintEdge(QPainter& p, const RouteEdge& edge, const layout::EdgeRoute& route) {
    if (route.points.size() < 2)
        return;
    const QColor colour = edge.kind == RouteEdge::Kind::Rule ? kRuleEdge : kEdge;
    QPen pen(colour, 1.2);
    if (edge.kind == RouteEdge::Kind::Filtered)
        pen.setDashPattern({5 / 1.2, 3 / 1.2});
    p.setPen(pen);
    p.setBrush(Qt::NoBrush);
    p.drawPolyline(QPolygonF(route.points));
    paintArrowHead(p, route.points.at(route.points.size() - 2), route.points.last(), colour);
    if (edge.kind != RouteEdge::Kind::Rule)
        return;
    p.setFont(font(9, false));
    p.setPen(kRuleText);
    text(p, route.labelAnchor, layout::shortCondition(edge.condition),
         route.side < 0 ? Qt::AlignRight : Qt::AlignLeft);
}

void paintTag(QPainter& p, const QRectF& node, int slot, const QColor& colour,
              const QString& letter) {
    const QRectF r(node.right() - 14 - slot * 15, node.top() + 2, 13, 11);
    p.setPen(Qt::NoPen);
    p.setBrush(colour);
    p.drawRoundedRect(r, 2, 2);
    p.setFont(font(9, true));
    p.setPen(Qt::white);
    text(p, QPointF(r.center().x(), r.bottom() - 2), letter, Qt::AlignHCenter);
}

void paintNode(QPainter& p, const RouteNode& node, const QRectF& r) {
    if (node.kind != RouteNode::Kind::Item) {
        p.setPen(QPen(kNodeLine, 1.4));
        p.setBrush(Qt::white);
        p.drawEllipse(r.center(), r.width() / 2, r.width() / 2);
        p.setFont(font(11, true));
        p.setPen(kInk);
        text(p, r.center() + QPointF(0, 4), node.name, Qt::AlignHCenter);
        return;
    }
    QPen outline(node.unreachable ? kUnreachableLine : kNodeLine, 1.4);
    if (node.unreachable)
        outline.setDashPattern({4 / 1.4, 3 / 1.4});
    p.setPen(outline);
    p.setBrush(node.unreachable ? kUnreachableFill : QColor(Qt::white));
    p.drawRoundedRect(r, 5, 5);
    p.setFont(font(11, true));
    p.setPen(kInk);
    text(p, r.topLeft() + QPointF(8, 14), layout::shortCondition(node.name, 26), Qt::AlignLeft);
    p.setFont(font(11, false));
    p.setPen(kLabel);
    text(p, r.topLeft() + QPointF(8, 27), layout::shortCondition(node.label, 30), Qt::AlignLeft);
    int slot = 0;
    if (node.conditional)
        paintTag(p, r, slot++, kConditional, QStringLiteral("?"));
    if (node.unreachable)
        paintTag(p, r, slot++, kUnreachableLine, QStringLiteral("\u00d7"));
    if (node.looping)
        paintTag(p, r, slot++, kLooping, QStringLiteral("\u21ba"));
}

} // namespace

void paintRouteMap(QPainter& painter, const RouteMapDrawing& map) {
    const layout::RouteGraph& g = map.graph;
    const layout::RouteLayout& l = map.layout;
    painter.save();
    painter.setRenderHint(QPainter::Antialiasing);
    for (int m = 0; m < g.modules.size() && m < l.moduleBands.size(); ++m)
        paintBand(painter, g.modules.at(m), l.moduleBands.at(m));
    for (int e = 0; e < g.edges.size() && e < l.edges.size(); ++e)
        paintEdge(painter, g.edges.at(e), l.edges.at(e));
    for (int n = 0; n < g.nodes.size() && n < l.nodes.size(); ++n)
        paintNode(painter, g.nodes.at(n), l.nodes.at(n));
    painter.restore();
}

} // namespace rb
