#include "PlainDrawing.h"

#include "layout/CrossingCounter.h"

#include <algorithm>
#include <cmath>
#include <functional>
#include <map>

namespace rb::layout {

namespace {

// Space-separated fields; a double-quoted field may hold spaces and \" escapes.
QStringList fields(const QString& line) {
    QStringList out;
    QString current;
    bool quoted = false, inField = false;
    for (int i = 0; i < line.size(); ++i) {
        const QChar c = line.at(i);
        if (quoted) {
            if (c == QLatin1Char('\\') && i + 1 < line.size())
                current += line.at(++i);
            else if (c == QLatin1Char('"'))
                quoted = false;
            else
                current += c;
        } else if (c == QLatin1Char('"')) {
            quoted = inField = true;
        } else if (c.isSpace()) {
            if (inField)
                out.append(current);
            current.clear();
            inField = false;
        } else {
            current += c;
            inField = true;
        }
    }
    if (inField)
        out.append(current);
    return out;
}

QList<QPointF> flatten(const QList<QPointF>& c) {
    QList<QPointF> out;
    if (c.isEmpty())
        return out;
    out.append(c.first());
    for (int s = 0; s + 3 < c.size(); s += 3)
        for (int k = 1; k <= 12; ++k) {
            const double t = k / 12.0, u = 1 - t;
            out.append(u * u * u * c[s] + 3 * u * u * t * c[s + 1] + 3 * u * t * t * c[s + 2] +
                       t * t * t * c[s + 3]);
        }
    return out;
}

// x where the polyline first meets height y; if it never does, the x of its
// point nearest to that height.
double xAt(const QList<QPointF>& poly, double y) {
    for (int k = 0; k + 1 < poly.size(); ++k) {
        const QPointF a = poly[k], b = poly[k + 1];
        if ((a.y() - y) * (b.y() - y) <= 0 && a.y() != b.y())
            return a.x() + (b.x() - a.x()) * (y - a.y()) / (b.y() - a.y());
    }
    double best = 0, dist = 1e300;
    for (const QPointF& p : poly)
        if (std::abs(p.y() - y) < dist) {
            dist = std::abs(p.y() - y);
            best = p.x();
        }
    return best;
}

qint64 heightKey(double y) {
    return qRound64(y * 100);
}

} // namespace

PlainDrawing PlainDrawing::parse(const QByteArray& plain) {
    PlainDrawing d;
    for (const QByteArray& raw : plain.split('\n')) {
        const QStringList t = fields(QString::fromUtf8(raw));
        if (t.size() >= 4 && t.at(0) == QLatin1String("node")) {
            d.nodes.insert(t.at(1), QPointF(t.at(2).toDouble(), t.at(3).toDouble()));
        } else if (t.size() >= 4 && t.at(0) == QLatin1String("edge")) {
            Edge e{t.at(1), t.at(2), {}};
            const int n = t.at(3).toInt();
            for (int k = 0; k < n && 5 + 2 * k < t.size(); ++k)
                e.controlPoints.append(
                    QPointF(t.at(4 + 2 * k).toDouble(), t.at(5 + 2 * k).toDouble()));
            d.edges.append(e);
        }
    }
    return d;
}

qint64 PlainDrawing::crossings(int* layerCount) const {
    // Layers: distinct node heights, top (largest y: plain output points up) first.
    std::map<qint64, int, std::greater<qint64>> layerOf;
    for (const QPointF& p : nodes)
        layerOf[heightKey(p.y())] = 0;
    QList<double> layerY;
    for (auto& [key, index] : layerOf) {
        index = int(layerY.size());
        layerY.append(double(key) / 100.0);
    }
    if (layerCount)
        *layerCount = int(layerY.size());
    QList<CrossingCounter::LayeredEdge> layered;
    for (const Edge& edge : edges) {
        if (!nodes.contains(edge.tail) || !nodes.contains(edge.head))
            continue;
        const QPointF a = nodes.value(edge.tail), b = nodes.value(edge.head);
        const int la = layerOf.at(heightKey(a.y())), lb = layerOf.at(heightKey(b.y()));
        if (la == lb)
            continue; // within one layer: in no gap between layers
        const QPointF upper = la < lb ? a : b, lower = la < lb ? b : a;
        const QList<QPointF> poly = flatten(edge.controlPoints);
        CrossingCounter::LayeredEdge e;
        e.firstLayer = std::min(la, lb);
        e.xs.append(upper.x());
        for (int l = std::min(la, lb) + 1; l < std::max(la, lb); ++l)
            e.xs.append(xAt(poly, layerY.at(l)));
        e.xs.append(lower.x());
        layered.append(e);
    }
    return CrossingCounter::layeredCrossings(layered, int(layerY.size()));
}

} // namespace rb::layout
