#include "LayoutTestTools.h"

#include "layout/CrossingCounter.h"
#include "layout/PlainDrawing.h"
#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"
#include "routing/CompiledRouting.h"

#include "export/DotExport.h"
#include "export/SvgExport.h"

#include <QProcess>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QXmlStreamReader>

using namespace rb;
using namespace rb::layout;
using namespace rb::layouttest;
using namespace Qt::StringLiterals;

class TestLayout : public QObject {
    Q_OBJECT

private slots:
    void bilayerPublishedExample();
    void bilayerBarycenterOrder();
    void bilayerSharedEndsDoNotCross();
    void layeredCountsEachGap();
    void graphHasStartItemsEnd();
    void graphEdgesMatchRouting();
    void markers();
    void edgesLeadingTo();
    void applyUniversesOverridesMarkers();
    void shortCondition_data();
    void shortCondition();
    void nestedSkipsDoNotCross();
    void interleavedPairUsesBothSides();
    void threeInterleavedSkipsCrossOnce();
    void crossingTheSpineBeatsTwoSides();
    void neverWorseThanBestTwoSides_data();
    void neverWorseThanBestTwoSides();
    void dotExportIsDotFriendly();
    void plainDrawingCountsByTheSameRule();
    void dotRanksAreOurLayers();
    void moduleBandsFrameTheirItems();
    void randomInvariants_data();
    void randomInvariants();
    void svgIsWellFormedAndComplete();
    void svgEscapesText();
    void cliExportsSvg();
};

// Barth, Juenger & Mutzel, "Simple and Efficient Bilayer Cross Counting",
// JGAA 8(2):179-194, 2004, figure 1: north n0..n5, south s0..s4, 11 edges,
// 12 crossings (edge list as in shared/references/worked-examples.md 6a).
// By hand: the south sequence 0 1 2 0 3 4 0 2 3 2 4 has 2+4+2+1+3 = 12 inversions.
void TestLayout::bilayerPublishedExample() {
    const QList<CrossingCounter::BilayerEdge> edges = {
        {0, 0}, {1, 1}, {1, 2}, {2, 0}, {2, 3}, {2, 4}, {3, 0}, {3, 2}, {4, 3}, {5, 2}, {5, 4}};
    QCOMPARE(CrossingCounter::bilayerCrossings(edges, 5), 12);
    // The order of the input does not matter.
    QList<CrossingCounter::BilayerEdge> reversed(edges.rbegin(), edges.rend());
    QCOMPARE(CrossingCounter::bilayerCrossings(reversed, 5), 12);
}

// Same graph, south reordered s1, s0, s2, s3, s4 (one barycenter step);
// worked-examples.md 6b (COMPUTED there, not published): 11 crossings.
// By hand: with s1 -> 0 and s0 -> 1 the sorted south sequence is
// 1 0 2 1 3 4 1 2 3 2 4, whose inversions are 1+1+3+2+1+3 = 11.
void TestLayout::bilayerBarycenterOrder() {
    auto s = [](int south) { return south == 0 ? 1 : south == 1 ? 0 : south; };
    const QList<CrossingCounter::BilayerEdge> edges = {{0, s(0)}, {1, s(1)}, {1, s(2)}, {2, s(0)},
                                                       {2, s(3)}, {2, s(4)}, {3, s(0)}, {3, s(2)},
                                                       {4, s(3)}, {5, s(2)}, {5, s(4)}};
    QCOMPARE(CrossingCounter::bilayerCrossings(edges, 5), 11);
}

void TestLayout::bilayerSharedEndsDoNotCross() {
    // A fan from one north node, and a fan into one south node: no crossing.
    QCOMPARE(CrossingCounter::bilayerCrossings({{0, 0}, {0, 1}, {0, 2}}, 3), 0);
    QCOMPARE(CrossingCounter::bilayerCrossings({{0, 1}, {1, 1}, {2, 1}}, 3), 0);
    // A single swap: one crossing.
    QCOMPARE(CrossingCounter::bilayerCrossings({{0, 1}, {1, 0}}, 2), 1);
}

void TestLayout::layeredCountsEachGap() {
    // Two edges over three layers that swap between layers 0-1 and again
    // between 1-2: two crossings. A third edge sharing x at every layer with
    // the first adds none (ties are shared points, not crossings).
    QList<CrossingCounter::LayeredEdge> edges = {{0, {0.0, 10.0, 0.0}}, {0, {5.0, 5.0, 5.0}}};
    QCOMPARE(CrossingCounter::layeredCrossings(edges, 3), 2);
    edges.append({0, {0.0, 10.0, 0.0}});
    QCOMPARE(CrossingCounter::layeredCrossings(edges, 3), 4);
    // An edge starting at layer 1 is compared in the gap 1-2 only.
    QCOMPARE(CrossingCounter::layeredCrossings({{1, {0.0, 2.0}}, {0, {9.0, 1.0, 1.0}}}, 3), 1);
}

void TestLayout::graphHasStartItemsEnd() {
    const Instrument in = makeInstrument({2, 1}, {});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    QCOMPARE(g.nodes.size(), 5);
    QCOMPARE(g.nodes.first().kind, RouteNode::Kind::Start);
    QCOMPARE(g.nodes.last().kind, RouteNode::Kind::End);
    QCOMPARE(g.nodes.at(1).name, u"q1"_s);
    QCOMPARE(g.nodes.at(3).module, u"m2"_s);
    // No rules: START->q1, q1->q2, q2->q3, q3->END.
    QCOMPARE(g.edges.size(), 4);
    QCOMPARE(g.modules.size(), 2);
    QCOMPARE(g.modules.at(0).firstNode, 1);
    QCOMPARE(g.modules.at(0).lastNode, 2);
    QCOMPARE(g.modules.at(1).firstNode, 3);
}

void TestLayout::graphEdgesMatchRouting() {
    // q1: if q1 = 1 goto q3 (conditional: rule + fall-through);
    // q2: goto END unconditionally (rule only); q3: broken target (left out).
    const Instrument in =
        makeInstrument({3}, {{0, u"q3"_s, u"q1 = 1"_s}, {1, u"END"_s, {}}, {2, u"nowhere"_s, {}}});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    // START->q1, q1->q3 rule, q1->q2 next, q2->END rule, q3->END next.
    QCOMPARE(g.edges.size(), 5);
    QCOMPARE(g.edges.at(1).kind, RouteEdge::Kind::Rule);
    QCOMPARE(g.edges.at(1).to, 3);
    QCOMPARE(g.edges.at(1).condition, u"q1 = 1"_s);
    QCOMPARE(g.edges.at(3).condition, u"always"_s);
    QCOMPARE(g.edges.at(3).to, 4);
    QCOMPARE(g.edges.at(4).from, 3);
    QCOMPARE(g.edges.at(4).kind, RouteEdge::Kind::Next);
}

void TestLayout::markers() {
    // q1 goes to q3 unconditionally, so q2 is unreachable; q4 may go back to
    // q3, so q3 and q4 loop; q5 has a filter.
    Instrument in = makeInstrument({5}, {{0, u"q3"_s, {}}, {3, u"q3"_s, u"q4 = 1"_s}});
    in.modules[0].items[4].askIf = u"q1 = 1"_s;
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    QVERIFY(!g.nodes.at(1).conditional);
    QVERIFY(g.nodes.at(2).unreachable);
    QVERIFY(!g.nodes.at(2).conditional); // unreachable is its own marker
    QVERIFY(!g.nodes.at(3).unreachable);
    QVERIFY(g.nodes.at(3).looping && g.nodes.at(4).looping);
    QVERIFY(!g.nodes.at(1).looping && !g.nodes.at(5).looping);
    QVERIFY(g.nodes.at(5).conditional);
    QCOMPARE(g.nodes.at(5).filter, u"q1 = 1"_s);
    // q3, q4 are on every path: not conditional (a loop back does not pass them by).
    QVERIFY(!g.nodes.at(3).conditional && !g.nodes.at(4).conditional);
}

void TestLayout::edgesLeadingTo() {
    // q1 if q1 = 1 goto q3; q2; q3; q4. Edges (by index): 0 START->q1,
    // 1 q1->q3, 2 q1->q2, 3 q2->q3, 4 q3->q4, 5 q4->END.
    const Instrument in = makeInstrument({4}, {{0, u"q3"_s, u"q1 = 1"_s}});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    QCOMPARE(g.edges.size(), 6);
    QCOMPARE(g.edgesLeadingTo(3), (QList<int>{0, 1, 2, 3}));
    QCOMPARE(g.edgesLeadingTo(2), (QList<int>{0, 2}));
    QCOMPARE(g.edgesLeadingTo(0), QList<int>{});
}

void TestLayout::applyUniversesOverridesMarkers() {
    // Structurally q2 is conditional (q1 may skip it) and q3 is not; exact
    // universes (made up here, as the analysis would hand them over) win.
    const Instrument in = makeInstrument({3}, {{0, u"q3"_s, u"q1 = 1"_s}});
    const CompiledRouting routing(in);
    RouteGraph g = RouteGraph::fromRouting(routing);
    QVERIFY(g.nodes.at(2).conditional && !g.nodes.at(3).conditional);
    ItemUniverse q2;
    q2.position = 1;
    q2.asked = ItemUniverse::Asked::Conditional;
    q2.askedIf = u"q1 <> 1"_s;
    ItemUniverse q3;
    q3.position = 2;
    q3.asked = ItemUniverse::Asked::Never;
    ItemUniverse bogus;
    bogus.position = 7; // no such item: ignored
    g.applyUniverses({q2, q3, bogus});
    QVERIFY(g.nodes.at(2).conditional);
    QCOMPARE(g.nodes.at(2).universe, u"q1 <> 1"_s);
    QVERIFY(g.nodes.at(3).unreachable && !g.nodes.at(3).conditional);
    QVERIFY(!g.nodes.at(1).conditional && !g.nodes.at(1).unreachable);
}

void TestLayout::shortCondition_data() {
    QTest::addColumn<QString>("in");
    QTest::addColumn<int>("max");
    QTest::addColumn<QString>("out");
    QTest::newRow("short") << u"a = 1"_s << 10 << u"a = 1"_s;
    QTest::newRow("spaces") << u"a  =\n 1"_s << 10 << u"a = 1"_s;
    QTest::newRow("cut") << u"has_vehicle in (2, 8, 9)"_s << 8 << u"has_veh\u2026"_s;
}

void TestLayout::shortCondition() {
    QFETCH(QString, in);
    QFETCH(int, max);
    QFETCH(QString, out);
    QCOMPARE(layout::shortCondition(in, max), out);
}

void TestLayout::nestedSkipsDoNotCross() {
    // q1 -> q5 and q2 -> q4 are nested (nodes [1,5] and [2,4]): drawn with the
    // inner one in an inner lane they need not cross, on one side.
    const Instrument in =
        makeInstrument({5}, {{0, u"q5"_s, u"q1 = 1"_s}, {1, u"q4"_s, u"q2 = 1"_s}});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    const RouteLayout l = layoutRouteGraph(g);
    QCOMPARE(l.crossings(g), 0);
    QCOMPARE(geometricCrossings(l), 0);
    const EdgeRoute& outer = l.edges.at(1);
    const EdgeRoute& inner = l.edges.at(3);
    QCOMPARE(outer.side, inner.side);
    QVERIFY(std::abs(inner.points.at(1).x()) < std::abs(outer.points.at(1).x()));
}

void TestLayout::interleavedPairUsesBothSides() {
    // q1 -> q3 and q2 -> q4 interleave (nodes [1,3], [2,4]): on one side they
    // would cross once; on opposite sides not at all.
    const Instrument in =
        makeInstrument({4}, {{0, u"q3"_s, u"q1 = 1"_s}, {1, u"q4"_s, u"q2 = 1"_s}});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    const RouteLayout l = layoutRouteGraph(g);
    QCOMPARE(l.edges.at(1).side, -l.edges.at(3).side);
    QCOMPARE(l.crossings(g), 0);
    QCOMPARE(geometricCrossings(l), 0);
}

void TestLayout::threeInterleavedSkipsCrossOnce() {
    // [1,4], [2,5], [3,6] interleave pairwise; two sides cannot separate three
    // mutually interleaving edges, so the least possible is one crossing.
    const Instrument in = makeInstrument(
        {6}, {{0, u"q4"_s, u"q1 = 1"_s}, {1, u"q5"_s, u"q2 = 1"_s}, {2, u"q6"_s, u"q3 = 1"_s}});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    const RouteLayout l = layoutRouteGraph(g);
    QCOMPARE(l.crossings(g), 1);
    QCOMPARE(geometricCrossings(l), 1);
}

// Node intervals [lo, hi] of the side edges, reasoned by hand (x = the pair
// interleaves: lo1 < lo2 < hi1 < hi2; every other pair is nested or apart):
//   A = [12,18] [11,19]   D1 = [5,13] [4,14]   D2 = [8,31] [8,32]
//   B = [27,33] [26,34]   E = [15,30]
// Conflicts: all 4 pairs A-D1, D1-D2, D2-B; both pairs E-A and E-B. The 5-cycle
// E-A-D1-D2-B-E is odd, and two edge-disjoint copies of it exist (one through
// the first edge of each group, one through the second), so on two sides alone
// at least 2 crossings remain (A left, D1 right, D2 left, B right gives 2).
// Crossing the spine once costs 1 (each gap has one fall-through edge): E's
// upper part [15, g+1/2] on B's opposite side and its lower part [g+1/2, 30] on
// A's opposite side meet nothing for 19 <= g <= 25, so the least count is 1.
void TestLayout::crossingTheSpineBeatsTwoSides() {
    auto rule = [](int lo, int hi, int code) {
        // Node n is item qn (position n - 1).
        return RuleSpec{lo - 1, QStringLiteral("q%1").arg(hi),
                        QStringLiteral("q%1 = %2").arg(lo).arg(code)};
    };
    const Instrument in = makeInstrument({36}, {rule(12, 18, 1), rule(11, 19, 1), rule(5, 13, 1),
                                                rule(4, 14, 1), rule(8, 31, 1), rule(8, 32, 2),
                                                rule(27, 33, 1), rule(26, 34, 1), rule(15, 30, 1)});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    const RouteLayout l = layoutRouteGraph(g);
    QCOMPARE(l.crossings(g), 1);
    QCOMPARE(geometricCrossings(l), 1);
    int e = -1;
    for (int i = 0; i < g.edges.size(); ++i)
        if (g.edges.at(i).from == 15 && g.edges.at(i).to == 30)
            e = i;
    QVERIFY(e >= 0);
    const EdgeRoute& route = l.edges.at(e);
    QVERIFY2(route.crossGap >= 19 && route.crossGap <= 25,
             qPrintable(QString::number(route.crossGap)));
    QCOMPARE(route.targetSide, -route.side);
    QCOMPARE(route.points.size(), 6);
    QString where;
    QVERIFY2(!edgeThroughNode(l, &where), qPrintable(where));
}

void TestLayout::neverWorseThanBestTwoSides_data() {
    QTest::addColumn<quint32>("seed");
    for (quint32 seed = 101; seed <= 130; ++seed)
        QTest::addRow("seed %u", seed) << seed;
}

// Reference by exhaustion: the least count over all 2^k side choices, each
// edge whole on one side (two edges on one side cross when they interleave).
// The layout may do better by crossing the spine, never worse.
void TestLayout::neverWorseThanBestTwoSides() {
    QFETCH(quint32, seed);
    QRandomGenerator random(seed);
    const Instrument in = randomInstrument(random, 12 + int(seed % 14));
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    QList<std::pair<int, int>> side;
    for (const RouteEdge& e : g.edges)
        if (e.to != e.from + 1)
            side.append({std::min(e.from, e.to), std::max(e.from, e.to)});
    if (side.size() > 16)
        QSKIP("too many side edges to enumerate");
    qint64 best = -1;
    for (quint32 mask = 0; mask < (1u << side.size()); ++mask) {
        qint64 count = 0;
        for (int i = 0; i < side.size(); ++i)
            for (int j = 0; j < side.size(); ++j) {
                const auto [a, b] = side.at(i);
                const auto [c, d] = side.at(j);
                count += ((mask >> i) & 1) == ((mask >> j) & 1) && a < c && c < b && b < d;
            }
        if (best < 0 || count < best)
            best = count;
    }
    const RouteLayout l = layoutRouteGraph(g);
    QVERIFY2(l.crossings(g) <= best,
             qPrintable(QStringLiteral("%1 > %2").arg(l.crossings(g)).arg(best)));
    QCOMPARE(geometricCrossings(l), l.crossings(g));
}

// The DOT export keeps conditions off the ranks: external labels (no edge
// `label`, which makes dot add label nodes and double the ranks), a condition
// longer than 28 characters cut to 27 plus an ellipsis, the full text in the
// tooltip.
void TestLayout::dotExportIsDotFriendly() {
    const QString condition = u"q1 = 1 and q1 <> 2 and q1 < 3 and q1 > 0"_s; // 40 characters
    const Instrument in = makeInstrument({3}, {{0, u"q3"_s, condition}});
    const CompiledRouting routing(in);
    const QString dot = QString::fromUtf8(exportDot(routing));
    QVERIFY2(dot.contains(
                 u"\"q1\" -> \"q3\" [xlabel=\"q1 = 1 and q1 <> 2 and q1 <\u2026\", tooltip=\""_s +
                 condition + u"\""_s),
             qPrintable(dot));
    for (const QString& line : dot.split(u'\n'))
        if (line.contains(u"->"_s))
            QVERIFY2(!line.contains(u" [label="_s) && !line.contains(u", label="_s),
                     qPrintable(line));
}

// A hand-written `-Tplain` drawing (y points up): "a 1" (0,4) and b (4,4) on
// the top layer, m (2,2) in the middle, c (0,0) and d (4,0) at the bottom.
// "a 1" -> c bulges right: Bezier (0,4) (6,3) (6,1) (0,0) is at x = 4.5 at
// y = 2 (t = 1/2: (0 + 3*6 + 3*6 + 0) / 8). b -> m and m -> d are straight.
// Gap top-middle: north order "a 1" (0) < b (4), south 4.5 > 2: one crossing.
// Gap middle-bottom: north m (2) < 4.5, south d (4) > c (0): one crossing.
// The flat edge "a 1" -> b lies in one layer and is left out.
void TestLayout::plainDrawingCountsByTheSameRule() {
    const QByteArray plain = "graph 1 6 4\n"
                             "node \"a 1\" 0 4 0.5 0.5 a solid box black lightgrey\n"
                             "node b 4 4 0.5 0.5 b solid box black lightgrey\n"
                             "node m 2 2 0.5 0.5 m solid box black lightgrey\n"
                             "node c 0 0 0.5 0.5 c solid box black lightgrey\n"
                             "node d 4 0 0.5 0.5 d solid box black lightgrey\n"
                             "edge \"a 1\" c 4 0 4 6 3 6 1 0 0 solid black\n"
                             "edge b m 4 4 4 3.333 3.333 2.667 2.667 2 2 solid black\n"
                             "edge m d 4 2 2 2.667 1.333 3.333 0.667 4 0 solid black\n"
                             "edge \"a 1\" b 4 0 4 1 4 3 4 4 4 solid black\n"
                             "stop\n";
    const PlainDrawing d = PlainDrawing::parse(plain);
    QCOMPARE(d.nodes.size(), 5);
    QCOMPARE(d.edges.size(), 4);
    QCOMPARE(d.nodes.value(u"a 1"_s), QPointF(0, 4));
    int layers = 0;
    QCOMPARE(d.crossings(&layers), 2);
    QCOMPARE(layers, 3);
}

// Fairness of the dot comparison: the fall-through chain makes each item one
// rank lower than the one before, so dot's ranks are exactly our layers
// (START, 5 items, END: 7), and the nested skips q1 -> q5, q2 -> q4 need no
// crossing in either drawing.
void TestLayout::dotRanksAreOurLayers() {
    const QString dot = QStandardPaths::findExecutable(u"dot"_s);
    if (dot.isEmpty())
        QSKIP("dot not installed (Debian package graphviz)");
    const Instrument in =
        makeInstrument({5}, {{0, u"q5"_s, u"q1 = 1"_s}, {1, u"q4"_s, u"q2 = 1"_s}});
    const CompiledRouting routing(in);
    QProcess p;
    p.start(dot, {u"-Tplain"_s});
    p.write(exportDot(routing));
    p.closeWriteChannel();
    QVERIFY(p.waitForFinished(60000));
    QCOMPARE(p.exitCode(), 0);
    const PlainDrawing d = PlainDrawing::parse(p.readAllStandardOutput());
    QCOMPARE(d.nodes.size(), 7);
    QCOMPARE(d.edges.size(), RouteGraph::fromRouting(routing).edges.size());
    int layers = 0;
    QCOMPARE(d.crossings(&layers), 0);
    QCOMPARE(layers, 7);
}

void TestLayout::moduleBandsFrameTheirItems() {
    const Instrument in = makeInstrument({2, 3}, {{0, u"m2"_s, u"q1 = 1"_s}});
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    const RouteLayout l = layoutRouteGraph(g);
    QCOMPARE(l.moduleBands.size(), 2);
    for (int m = 0; m < 2; ++m)
        for (int n = g.modules.at(m).firstNode; n <= g.modules.at(m).lastNode; ++n)
            QVERIFY(l.moduleBands.at(m).contains(l.nodes.at(n)));
    QVERIFY(!l.moduleBands.at(0).intersects(l.moduleBands.at(1)));
    QVERIFY(!l.moduleBands.at(0).intersects(l.nodes.at(0))); // START is outside
    // Bands reach past the lanes: the skip's lane lies inside band 1.
    const QPointF lanePoint = l.edges.at(1).points.at(1);
    QVERIFY(l.moduleBands.at(0).left() < lanePoint.x() &&
            lanePoint.x() < l.moduleBands.at(0).right());
}

void TestLayout::randomInvariants_data() {
    QTest::addColumn<quint32>("seed");
    QTest::addColumn<int>("items");
    for (quint32 seed = 1; seed <= 25; ++seed)
        QTest::addRow("seed %u", seed) << seed << int(5 + seed * 7 % 80);
}

void TestLayout::randomInvariants() {
    QFETCH(quint32, seed);
    QFETCH(int, items);
    QRandomGenerator random(seed);
    const Instrument in = randomInstrument(random, items);
    const CompiledRouting routing(in);
    const RouteGraph g = RouteGraph::fromRouting(routing);
    const RouteLayout l = layoutRouteGraph(g);
    QCOMPARE(l.nodes.size(), items + 2);
    QCOMPARE(l.edges.size(), g.edges.size());
    // Questionnaire order along the main axis: each node strictly below the last.
    for (int n = 1; n < l.nodes.size(); ++n)
        QVERIFY2(l.nodes.at(n).top() > l.nodes.at(n - 1).bottom(), qPrintable(QString::number(n)));
    // No overlapping nodes (implied by the above, checked directly anyway).
    for (int a = 0; a < l.nodes.size(); ++a)
        for (int b = a + 1; b < l.nodes.size(); ++b)
            QVERIFY(!l.nodes.at(a).intersects(l.nodes.at(b)));
    QString where;
    QVERIFY2(!edgeThroughNode(l, &where), qPrintable(where));
    // Every edge starts on its source box and ends on its target box.
    for (int i = 0; i < g.edges.size(); ++i) {
        const QList<QPointF>& pts = l.edges.at(i).points;
        QVERIFY(pts.size() >= 2);
        QVERIFY(l.nodes.at(g.edges.at(i).from)
                    .adjusted(-0.01, -0.01, 0.01, 0.01)
                    .contains(pts.first()));
        QVERIFY(
            l.nodes.at(g.edges.at(i).to).adjusted(-0.01, -0.01, 0.01, 0.01).contains(pts.last()));
    }
    // The layered count (what the benchmark reports) equals the crossings
    // actually drawn, found segment by segment.
    QCOMPARE(l.crossings(g), geometricCrossings(l));
    // Lanes on one side do not share a vertical line where they overlap; an
    // edge that crosses the spine has a vertical run on each side.
    struct Run {
        double x, top, bottom;
    };
    QList<Run> runs;
    for (const EdgeRoute& r : l.edges)
        for (int k = 1; k + 2 < r.points.size(); k += 2) {
            const QPointF a = r.points.at(k), b = r.points.at(k + 1);
            QCOMPARE(a.x(), b.x());
            runs.append({a.x(), std::min(a.y(), b.y()), std::max(a.y(), b.y())});
        }
    for (int i = 0; i < runs.size(); ++i)
        for (int j = i + 1; j < runs.size(); ++j)
            if (runs.at(i).x == runs.at(j).x)
                QVERIFY(runs.at(i).bottom < runs.at(j).top || runs.at(j).bottom < runs.at(i).top);
}

namespace {

// Item names (data-name of item groups) and all character data of an SVG.
struct SvgContent {
    QStringList names;
    QString text;
    QString error;
};

SvgContent readSvg(const QByteArray& svg) {
    SvgContent c;
    QXmlStreamReader xml(svg);
    while (!xml.atEnd()) {
        xml.readNext();
        if (xml.isStartElement() && xml.attributes().hasAttribute(u"data-name"_s))
            c.names.append(xml.attributes().value(u"data-name"_s).toString());
        if (xml.isCharacters())
            c.text += xml.text().toString() + QLatin1Char('\n');
    }
    if (xml.hasError())
        c.error = xml.errorString();
    return c;
}

// xmllint --noout exits 0 only for well-formed XML.
void expectXmllintAccepts(const QByteArray& svg) {
    if (QStandardPaths::findExecutable(u"xmllint"_s).isEmpty())
        QSKIP("xmllint not installed (Debian package libxml2-utils)");
    QTemporaryDir dir;
    const QString path = dir.filePath(u"map.svg"_s);
    QFile file(path);
    QVERIFY(file.open(QIODevice::WriteOnly));
    file.write(svg);
    file.close();
    QProcess lint;
    lint.start(u"xmllint"_s, {u"--noout"_s, path});
    QVERIFY(lint.waitForFinished(30000));
    QVERIFY2(lint.exitCode() == 0, lint.readAllStandardError().constData());
}

} // namespace

void TestLayout::svgIsWellFormedAndComplete() {
    QRandomGenerator random(7);
    const Instrument in = randomInstrument(random, 60);
    const CompiledRouting routing(in);
    const QByteArray svg = exportSvg(routing);
    expectXmllintAccepts(svg);
    const SvgContent c = readSvg(svg);
    QVERIFY2(c.error.isEmpty(), qPrintable(c.error));
    QStringList expected{u"START"_s};
    for (int p = 1; p <= 60; ++p)
        expected.append(QStringLiteral("q%1").arg(p));
    expected.append(u"END"_s);
    QCOMPARE(c.names, expected);
}

void TestLayout::svgEscapesText() {
    Instrument in = makeInstrument({2}, {{0, u"END"_s, u"q1 = 1 and q1 < 3"_s}});
    in.title = u"Energy <use> & \"costs\""_s;
    in.modules[0].title = u"<b>Heating</b>"_s;
    in.modules[0].items[0].label = u"Bills > 100 & rising"_s;
    const CompiledRouting routing(in);
    const QByteArray svg = exportSvg(routing);
    expectXmllintAccepts(svg);
    QVERIFY(!svg.contains("<b>"));
    QVERIFY(!svg.contains("<use>"));
    const SvgContent c = readSvg(svg);
    QVERIFY2(c.error.isEmpty(), qPrintable(c.error));
    QVERIFY(c.text.contains(u"Energy <use> & \"costs\""_s));
    QVERIFY(c.text.contains(u"<b>Heating</b>"_s));
    QVERIFY(c.text.contains(u"Bills > 100 & rising"_s));
    QVERIFY(c.text.contains(u"q1 = 1 and q1 < 3"_s)); // full condition in <title>
}

void TestLayout::cliExportsSvg() {
    QTemporaryDir dir;
    const QString yaml = dir.filePath(u"in.yaml"_s), out = dir.filePath(u"out.svg"_s);
    QFile file(yaml);
    QVERIFY(file.open(QIODevice::WriteOnly));
    file.write(
        "routebook: 1\n"
        "instrument: {title: Garden survey, version: \"1\", language: en}\n"
        "modules:\n"
        "  - name: garden\n"
        "    items:\n"
        "      - {name: has_garden, text: \"Do you have a garden?\", type: single,\n"
        "         codes: [{code: 1, label: \"Yes\"}, {code: 2, label: \"No\"}],\n"
        "         routing: [{if: \"has_garden = 2\", goto: END}]}\n"
        "      - {name: garden_size, text: \"How big is it?\", type: integer, range: [1, 9999]}\n");
    file.close();
    QProcess cli;
    cli.start(QStringLiteral(ROUTEBOOK_BINARY),
              {u"export"_s, yaml, u"--format"_s, u"svg"_s, u"-o"_s, out});
    QVERIFY(cli.waitForFinished(60000));
    QVERIFY2(cli.exitCode() == 0, cli.readAllStandardError().constData());
    QFile svg(out);
    QVERIFY(svg.open(QIODevice::ReadOnly));
    const SvgContent c = readSvg(svg.readAll());
    QVERIFY2(c.error.isEmpty(), qPrintable(c.error));
    QCOMPARE(c.names, (QStringList{u"START"_s, u"has_garden"_s, u"garden_size"_s, u"END"_s}));
    QVERIFY(c.text.contains(u"has_garden = 2"_s));
}

QTEST_GUILESS_MAIN(TestLayout)
#include "tst_layout.moc"
