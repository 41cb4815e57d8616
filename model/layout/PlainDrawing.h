#pragma once

#include <QByteArray>
#include <QHash>
#include <QList>
#include <QPointF>
#include <QString>

namespace rb::layout {

// A foreign layered drawing read from Graphviz's `-Tplain` text (node centres
// and edge splines), so that its crossings can be counted by exactly the rule
// RouteLayout::crossings() applies to ours: layers are the distinct node
// heights; each edge is its x at every layer from its upper to its lower end
// (node centre at both ends, its spline flattened and met with each layer line
// in between); edges within one layer are left out; CrossingCounter counts
// each gap between consecutive layers.
struct PlainDrawing {
    struct Edge {
        QString tail, head;
        QList<QPointF> controlPoints; // cubic B-spline in Bezier form, as dot writes it
    };
    QHash<QString, QPointF> nodes;
    QList<Edge> edges;

    static PlainDrawing parse(const QByteArray& plain);
    qint64 crossings(int* layerCount = nullptr) const;
};

} // namespace rb::layout
