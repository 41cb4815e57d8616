#pragma once

#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"

#include <QGraphicsItem>
#include <QGraphicsPathItem>

namespace rb {

// Graphics items of the route map. Each holds only its index into the
// RouteGraph and a copy of its geometry; the scene maps indices to items.

class RouteNodeItem : public QGraphicsItem {
public:
    enum { Type = UserType + 601 };
    RouteNodeItem(int node, const layout::RouteNode& data, const QRectF& rect);

    int node() const { return m_node; }
    int position() const { return m_data.position; }
    const layout::RouteNode& data() const { return m_data; }
    int type() const override { return Type; }
    QRectF boundingRect() const override;
    void paint(QPainter* painter, const QStyleOptionGraphicsItem* option, QWidget* widget) override;

private:
    void paintTags(QPainter* painter) const;

    int m_node;
    layout::RouteNode m_data;
    QRectF m_rect;
};

class RouteEdgeItem : public QGraphicsPathItem {
public:
    enum { Type = UserType + 602 };
    RouteEdgeItem(int edge, const layout::RouteEdge& data, const layout::EdgeRoute& route,
                  const QString& fromName, const QString& toName);

    int edge() const { return m_edge; }
    int type() const override { return Type; }
    bool isHighlighted() const { return m_highlighted; }
    void setHighlighted(bool on);
    QRectF boundingRect() const override;
    void paint(QPainter* painter, const QStyleOptionGraphicsItem* option, QWidget* widget) override;

private:
    QPen basePen() const;

    int m_edge;
    layout::RouteEdge m_data;
    layout::EdgeRoute m_route;
    QString m_label; // shortened condition, drawn; the tooltip has it in full
    bool m_highlighted = false;
};

class ModuleBandItem : public QGraphicsRectItem {
public:
    enum { Type = UserType + 603 };
    ModuleBandItem(const layout::ModuleSpan& span, const QRectF& rect);
    int type() const override { return Type; }
    void paint(QPainter* painter, const QStyleOptionGraphicsItem* option, QWidget* widget) override;

private:
    QString m_title;
};

} // namespace rb
