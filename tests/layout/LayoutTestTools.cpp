#include "LayoutTestTools.h"

#include <QLineF>

namespace rb::layouttest {

namespace {

Item makeItem(int number) {
    Item item;
    item.name = QStringLiteral("q%1").arg(number);
    item.label = QStringLiteral("Item %1").arg(number);
    item.text = QStringLiteral("Question %1?").arg(number);
    item.hasInlineCodes = true;
    item.inlineCodes = {{1, QStringLiteral("Yes"), MissingKind::None},
                        {2, QStringLiteral("No"), MissingKind::None}};
    return item;
}

} // namespace

Instrument makeInstrument(const QList<int>& moduleSizes, const QList<RuleSpec>& rules) {
    Instrument in;
    in.title = QStringLiteral("Layout test");
    int number = 1;
    for (int m = 0; m < moduleSizes.size(); ++m) {
        Module module;
        module.name = QStringLiteral("m%1").arg(m + 1);
        module.title = QStringLiteral("Module %1").arg(m + 1);
        for (int k = 0; k < moduleSizes.at(m); ++k)
            module.items.append(makeItem(number++));
        in.modules.append(module);
    }
    QList<Item*> flat;
    for (Module& m : in.modules)
        for (Item& item : m.items)
            flat.append(&item);
    for (const RuleSpec& r : rules) {
        Rule rule;
        rule.target = r.target;
        if (!r.condition.isEmpty())
            rule.condition = r.condition;
        flat.at(r.from)->routing.append(rule);
    }
    return in;
}

Instrument randomInstrument(QRandomGenerator& random, int items) {
    QList<int> sizes;
    for (int left = items; left > 0;) {
        const int size = std::min(left, 1 + int(random.bounded(12)));
        sizes.append(size);
        left -= size;
    }
    QList<RuleSpec> rules;
    for (int p = 0; p < items; ++p) {
        const QString self = QStringLiteral("q%1 = 1").arg(p + 1);
        const int roll = int(random.bounded(100));
        if (roll < 30) {
            const int target = p + 2 + int(random.bounded(25));
            rules.append(
                {p, target >= items ? QStringLiteral("END") : QStringLiteral("q%1").arg(target + 1),
                 self});
        } else if (roll < 34 && p > 0) {
            rules.append({p, QStringLiteral("q%1").arg(int(random.bounded(p + 1)) + 1), self});
        } else if (roll < 36) {
            rules.append({p, QStringLiteral("m%1").arg(int(random.bounded(sizes.size())) + 1), {}});
        }
    }
    Instrument in = makeInstrument(sizes, rules);
    for (Module& m : in.modules)
        for (Item& item : m.items)
            if (random.bounded(10) == 0 && item.name != QLatin1String("q1"))
                item.askIf = QStringLiteral("q1 = 2");
    return in;
}

namespace {

QList<QLineF> segments(const layout::RouteLayout& layout) {
    QList<QLineF> all;
    for (const layout::EdgeRoute& r : layout.edges)
        for (int k = 0; k + 1 < r.points.size(); ++k)
            all.append(QLineF(r.points.at(k), r.points.at(k + 1)));
    return all;
}

bool strictlyBetween(double v, double a, double b) {
    return v > std::min(a, b) + 1e-6 && v < std::max(a, b) - 1e-6;
}

// The drawing is orthogonal: a proper crossing is a horizontal and a vertical
// segment meeting at a point inside both.
bool properCrossing(const QLineF& a, const QLineF& b) {
    const bool aVertical = qFuzzyCompare(a.x1(), a.x2());
    const bool bVertical = qFuzzyCompare(b.x1(), b.x2());
    if (aVertical == bVertical)
        return false;
    const QLineF& v = aVertical ? a : b;
    const QLineF& h = aVertical ? b : a;
    return strictlyBetween(v.x1(), h.x1(), h.x2()) && strictlyBetween(h.y1(), v.y1(), v.y2());
}

} // namespace

qint64 geometricCrossings(const layout::RouteLayout& layout) {
    // Per edge, so that an edge's own consecutive segments are never compared.
    QList<QList<QLineF>> perEdge;
    for (const layout::EdgeRoute& r : layout.edges) {
        QList<QLineF> s;
        for (int k = 0; k + 1 < r.points.size(); ++k)
            s.append(QLineF(r.points.at(k), r.points.at(k + 1)));
        perEdge.append(s);
    }
    qint64 count = 0;
    for (int i = 0; i < perEdge.size(); ++i)
        for (int j = i + 1; j < perEdge.size(); ++j)
            for (const QLineF& a : perEdge.at(i))
                for (const QLineF& b : perEdge.at(j))
                    count += properCrossing(a, b) ? 1 : 0;
    return count;
}

bool edgeThroughNode(const layout::RouteLayout& layout, QString* where) {
    const QList<QLineF> all = segments(layout);
    for (int n = 0; n < layout.nodes.size(); ++n) {
        const QRectF box = layout.nodes.at(n);
        for (const QLineF& s : all) {
            // Orthogonal segments: one passes through the box's inside when its
            // fixed coordinate is strictly inside and its span overlaps the box
            // strictly (an end on the border is an edge attaching there).
            const bool vertical = qFuzzyCompare(s.x1(), s.x2());
            const bool hits = vertical ? strictlyBetween(s.x1(), box.left(), box.right()) &&
                                             std::max(s.y1(), s.y2()) > box.top() + 1e-6 &&
                                             std::min(s.y1(), s.y2()) < box.bottom() - 1e-6
                                       : strictlyBetween(s.y1(), box.top(), box.bottom()) &&
                                             std::max(s.x1(), s.x2()) > box.left() + 1e-6 &&
                                             std::min(s.x1(), s.x2()) < box.right() - 1e-6;
            if (hits) {
                *where = QStringLiteral("node %1, segment (%2,%3)-(%4,%5)")
                             .arg(n)
                             .arg(s.x1())
                             .arg(s.y1())
                             .arg(s.x2())
                             .arg(s.y2());
                return true;
            }
        }
    }
    return false;
}

} // namespace rb::layouttest
