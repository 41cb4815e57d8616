#include "RouteMapItems.h"

#include "PlainText.h"

#include <QPainter>
#include <QStyleOptionGraphicsItem>

#include <cmath>

namespace rb {

namespace {

// Our own palette (the SVG export in model/layout/SvgWriter.cpp uses the same).
const QColor kNodeStroke(0x3a, 0x6d, 0x8c);
const QColor kSelected(0xe0, 0x7b, 0x00);
const QColor kConditional(0xc9, 0x8a, 0x16);
const QColor kUnreachable(0xaa, 0x33, 0x33);
const QColor kLooping(0x6b, 0x4f, 0xa0);
const QColor kEdge(0x56, 0x70, 0x7f);
const QColor kRuleEdge(0x2b, 0x7a, 0x4b);
const QColor kHighlight(0xe0, 0x7b, 0x00);

QPainterPath polyline(const QList<QPointF>& pts) {
    QPainterPath path;
    if (pts.isEmpty())
        return path;
    path.moveTo(pts.first());
    for (int k = 1; k < pts.size(); ++k)
        path.lineTo(pts.at(k));
    return path;
}

} // namespace

RouteNodeItem::RouteNodeItem(int node, const layout::RouteNode& data, const QRectF& rect)
    : m_node(node), m_data(data), m_rect(rect) {
    setFlag(ItemIsSelectable);
    setZValue(2);
    QString tip = data.name;
    if (!data.label.isEmpty())
        tip += QStringLiteral(": ") + data.label;
    if (!data.filter.isEmpty())
        tip += QStringLiteral("\nask if: ") + data.filter;
    if (!data.universe.isEmpty())
        tip += QStringLiteral("\nasked if: ") + data.universe;
    else if (data.conditional)
        tip += QStringLiteral("\nconditional: not every respondent gets it");
    if (data.unreachable)
        tip += QStringLiteral("\nunreachable: no path from START");
    if (data.looping)
        tip += QStringLiteral("\non a routing loop");
    setToolTip(plainToolTip(tip));
}

QRectF RouteNodeItem::boundingRect() const {
    return m_rect.adjusted(-3, -3, 3, 3);
}

void RouteNodeItem::paint(QPainter* painter, const QStyleOptionGraphicsItem*, QWidget*) {
    painter->setRenderHint(QPainter::Antialiasing);
    QPen pen(isSelected()         ? kSelected
             : m_data.unreachable ? kUnreachable
                                  : kNodeStroke,
             isSelected() ? 2.6 : 1.4);
    if (m_data.unreachable)
        pen.setStyle(Qt::DashLine);
    painter->setPen(pen);
    painter->setBrush(m_data.unreachable ? QColor(0xf1, 0xf1, 0xf1) : QColor(Qt::white));
    QFont font = painter->font();
    font.setPixelSize(11);
    if (m_data.kind != layout::RouteNode::Kind::Item) {
        painter->drawEllipse(m_rect);
        font.setBold(true);
        font.setPixelSize(8);
        painter->setFont(font);
        painter->setPen(kNodeStroke);
        painter->drawText(m_rect, Qt::AlignCenter, m_data.name);
        return;
    }
    painter->drawRoundedRect(m_rect, 5, 5);
    const QRectF text = m_rect.adjusted(8, 3, -50, -3);
    font.setBold(true);
    painter->setFont(font);
    painter->setPen(QColor(0x1d, 0x2a, 0x33));
    const QFontMetricsF bold(font);
    painter->drawText(text.topLeft() + QPointF(0, bold.ascent()),
                      bold.elidedText(m_data.name, Qt::ElideRight, text.width() + 40));
    font.setBold(false);
    painter->setFont(font);
    painter->setPen(QColor(0x4f, 0x5f, 0x69));
    const QFontMetricsF plain(font);
    painter->drawText(text.topLeft() + QPointF(0, bold.height() + plain.ascent()),
                      plain.elidedText(m_data.label, Qt::ElideRight, m_rect.width() - 16));
    paintTags(painter);
}

void RouteNodeItem::paintTags(QPainter* painter) const {
    struct Tag {
        bool on;
        QColor colour;
        QString letter;
    };
    const Tag tags[] = {{m_data.conditional, kConditional, QStringLiteral("?")},
                        {m_data.unreachable, kUnreachable, QStringLiteral("\u00d7")},
                        {m_data.looping, kLooping, QStringLiteral("\u21ba")}};
    int slot = 0;
    QFont font = painter->font();
    font.setPixelSize(9);
    font.setBold(true);
    painter->setFont(font);
    for (const Tag& t : tags) {
        if (!t.on)
            continue;
        const QRectF r(m_rect.right() - 14 - slot++ * 15, m_rect.top() + 2, 13, 11);
        painter->setPen(Qt::NoPen);
        painter->setBrush(t.colour);
        painter->drawRoundedRect(r, 2, 2);
        painter->setPen(Qt::white);
        painter->drawText(r, Qt::AlignCenter, t.letter);
    }
}

RouteEdgeItem::RouteEdgeItem(int edge, const layout::RouteEdge& data,
                             const layout::EdgeRoute& route, const QString& fromName,
                             const QString& toName)
    : m_edge(edge), m_data(data), m_route(route) {
    setPath(polyline(route.points));
    setZValue(1);
    setPen(basePen());
    if (data.kind == layout::RouteEdge::Kind::Rule)
        m_label = layout::shortCondition(data.condition);
    QString tip = fromName + QStringLiteral(" \u2192 ") + toName;
    if (!data.condition.isEmpty())
        tip += QStringLiteral("\n") + data.condition;
    setToolTip(plainToolTip(tip));
}

QPen RouteEdgeItem::basePen() const {
    QPen pen(m_data.kind == layout::RouteEdge::Kind::Rule ? kRuleEdge : kEdge, 1.2);
    if (m_data.kind == layout::RouteEdge::Kind::Filtered)
        pen.setStyle(Qt::DashLine);
    return pen;
}

void RouteEdgeItem::setHighlighted(bool on) {
    if (on == m_highlighted)
        return;
    m_highlighted = on;
    QPen pen = basePen();
    if (on) {
        pen.setColor(kHighlight);
        pen.setWidthF(2.4);
    }
    setPen(pen);
    setZValue(on ? 1.5 : 1);
    update();
}

QRectF RouteEdgeItem::boundingRect() const {
    QRectF r = QGraphicsPathItem::boundingRect().adjusted(-6, -6, 6, 6);
    if (!m_label.isEmpty())
        r |= QRectF(m_route.labelAnchor - QPointF(170, 12), m_route.labelAnchor + QPointF(170, 4));
    return r;
}

void RouteEdgeItem::paint(QPainter* painter, const QStyleOptionGraphicsItem*, QWidget*) {
    painter->setRenderHint(QPainter::Antialiasing);
    painter->setPen(pen());
    painter->setBrush(Qt::NoBrush);
    painter->drawPath(path());
    const QList<QPointF>& pts = m_route.points;
    if (pts.size() >= 2) {
        // Arrowhead at the target end.
        const QPointF tip = pts.last();
        const QLineF last(pts.at(pts.size() - 2), tip);
        const double angle = std::atan2(-last.dy(), last.dx());
        const double size = 7;
        QPolygonF head;
        head << tip << tip - QPointF(std::cos(angle - 0.4) * size, -std::sin(angle - 0.4) * size)
             << tip - QPointF(std::cos(angle + 0.4) * size, -std::sin(angle + 0.4) * size);
        painter->setBrush(pen().color());
        painter->drawPolygon(head);
    }
    if (m_label.isEmpty())
        return;
    QFont font = painter->font();
    font.setPixelSize(9);
    painter->setFont(font);
    painter->setPen(m_highlighted ? kHighlight : kRuleEdge);
    const QFontMetricsF metrics(font);
    QPointF at = m_route.labelAnchor;
    if (m_route.side < 0)
        at.rx() -= metrics.horizontalAdvance(m_label);
    painter->drawText(at, m_label);
}

ModuleBandItem::ModuleBandItem(const layout::ModuleSpan& span, const QRectF& rect)
    : QGraphicsRectItem(rect), m_title(span.title.isEmpty() ? span.name : span.title) {
    setZValue(0);
    setToolTip(plainToolTip(span.title.isEmpty() ? span.name
                                                 : span.name + QStringLiteral(": ") + span.title));
}

void ModuleBandItem::paint(QPainter* painter, const QStyleOptionGraphicsItem*, QWidget*) {
    painter->setPen(QPen(QColor(0xb9, 0xc8, 0xd2), 1));
    painter->setBrush(QColor(0xee, 0xf3, 0xf6));
    painter->drawRoundedRect(rect(), 4, 4);
    QFont font = painter->font();
    font.setPixelSize(11);
    font.setBold(true);
    painter->setFont(font);
    painter->setPen(QColor(0x4a, 0x62, 0x72));
    const QRectF title = rect().adjusted(6, 2, -6, 0);
    painter->drawText(QRectF(title.topLeft(), QSizeF(title.width(), 16)),
                      Qt::AlignLeft | Qt::AlignVCenter,
                      QFontMetricsF(font).elidedText(m_title, Qt::ElideRight, title.width()));
}

} // namespace rb
