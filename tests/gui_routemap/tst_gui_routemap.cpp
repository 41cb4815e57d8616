#include "instrument/Instrument.h"
#include "layout/RouteGraph.h"
#include "routemap/RouteMapItems.h"
#include "routemap/RouteMapScene.h"
#include "routemap/RouteMapView.h"
#include "routing/CompiledRouting.h"

#include <QApplication>
#include <QFile>
#include <QSignalSpy>
#include <QTemporaryDir>
#include <QTest>
#include <QXmlStreamReader>

using namespace rb;
using namespace Qt::StringLiterals;

namespace {

// Two modules: household (q1..q3), travel (q4..q5).
// q1: if q1 = 2 goto travel (= q4); q3 goes back to q2 when q3 = 1 (a loop);
// q5 is asked only if q1 = 1.
Instrument sample() {
    Instrument in;
    in.title = u"Commuting <test> & \"map\""_s;
    auto item = [](int n, const QString& label) {
        Item it;
        it.name = QStringLiteral("q%1").arg(n);
        it.label = label;
        it.hasInlineCodes = true;
        it.inlineCodes = {{1, u"Yes"_s, MissingKind::None}, {2, u"No"_s, MissingKind::None}};
        return it;
    };
    Module household{u"household"_s, u"Household"_s, std::nullopt, {}};
    household.items = {item(1, u"Works outside the home"_s), item(2, u"Main mode of travel"_s),
                       item(3, u"Second job"_s)};
    household.items[0].routing.append({u"q1 = 2"_s, u"travel"_s});
    household.items[2].routing.append({u"q3 = 1"_s, u"q2"_s});
    Module travel{u"travel"_s, u"Travel"_s, std::nullopt, {}};
    travel.items = {item(4, u"Distance to work"_s), item(5, u"Cycles to work"_s)};
    travel.items[1].askIf = u"q1 = 1"_s;
    in.modules = {household, travel};
    return in;
}

int countType(const QGraphicsScene& scene, int type) {
    int n = 0;
    for (QGraphicsItem* item : scene.items())
        n += item->type() == type ? 1 : 0;
    return n;
}

} // namespace

class TestGuiRouteMap : public QObject {
    Q_OBJECT

private slots:
    void init();
    void cleanup();
    void sceneMatchesGraph();
    void markersReachTheItems();
    void selectFromOutsideHighlightsUniverse();
    void clickEmitsPosition();
    void findWrapsAndSelects();
    void zoomAndFit();
    void exportsSvgAndPng();
    void analysisUniversesReachTooltips();

private:
    Instrument m_instrument;
    CompiledRouting* m_routing = nullptr;
    RouteMapView* m_view = nullptr;
};

void TestGuiRouteMap::init() {
    m_instrument = sample();
    m_routing = new CompiledRouting(m_instrument);
    m_view = new RouteMapView;
    m_view->resize(500, 400);
    m_view->setRouting(*m_routing);
    m_view->show();
    QVERIFY(QTest::qWaitForWindowExposed(m_view));
}

void TestGuiRouteMap::cleanup() {
    delete m_view;
    delete m_routing;
}

void TestGuiRouteMap::sceneMatchesGraph() {
    const QGraphicsScene& scene = *m_view->scene();
    // 5 items + START + END.
    QCOMPARE(countType(scene, RouteNodeItem::Type), 7);
    // Edges by hand: START->q1; q1->q4 rule, q1->q2; q2->q3; q3->q2 rule,
    // q3->q4; q4->q5; q5->END next and q5->END filtered out: 9.
    QCOMPARE(countType(scene, RouteEdgeItem::Type), 9);
    QCOMPARE(countType(scene, ModuleBandItem::Type), 2);
    QCOMPARE(m_view->routeScene()->edgeCount(), 9);
    // The rule edge shows its condition and has it in full in the tooltip.
    RouteEdgeItem* rule = m_view->routeScene()->edgeItem(1);
    QVERIFY(rule->toolTip().contains(u"q1 = 2"_s));
}

void TestGuiRouteMap::markersReachTheItems() {
    RouteMapScene* scene = m_view->routeScene();
    // q2, q3 are passed by (q1 may jump to q4): conditional; q5 has a filter.
    QVERIFY(scene->itemAtPosition(1)->data().conditional);
    QVERIFY(scene->itemAtPosition(4)->data().conditional);
    QVERIFY(!scene->itemAtPosition(0)->data().conditional);
    QVERIFY(!scene->itemAtPosition(3)->data().conditional);
    // q2 <-> q3 loop.
    QVERIFY(scene->itemAtPosition(1)->data().looping && scene->itemAtPosition(2)->data().looping);
    QVERIFY(scene->itemAtPosition(1)->toolTip().contains(u"loop"_s));
}

void TestGuiRouteMap::selectFromOutsideHighlightsUniverse() {
    QSignalSpy spy(m_view, &RouteMapView::itemSelected);
    m_view->selectItem(2); // q3
    QCOMPARE(m_view->selectedPosition(), 2);
    QVERIFY(m_view->routeScene()->itemAtPosition(2)->isSelected());
    QCOMPARE(spy.count(), 0); // no echo back to the outline
    // Edges that can lead to q3 (by hand, edge numbers as in sceneMatchesGraph:
    // 0 START->q1, 1 q1->q4, 2 q1->q2, 3 q2->q3, 4 q3->q2, 5 q3->q4, ...):
    // START->q1, q1->q2, q2->q3, and the loop q3->q2.
    QCOMPARE(m_view->routeScene()->highlightedEdges(), (QList<int>{0, 2, 3, 4}));
    m_view->selectItem(3); // q4: every edge into and before it except none after
    QCOMPARE(m_view->routeScene()->highlightedEdges(), (QList<int>{0, 1, 2, 3, 4, 5}));
}

void TestGuiRouteMap::clickEmitsPosition() {
    QSignalSpy spy(m_view, &RouteMapView::itemSelected);
    RouteNodeItem* q4 = m_view->routeScene()->itemAtPosition(3);
    m_view->centerOn(q4);
    const QPoint at = m_view->mapFromScene(q4->boundingRect().center());
    QTest::mouseClick(m_view->viewport(), Qt::LeftButton, {}, at);
    QCOMPARE(spy.count(), 1);
    QCOMPARE(spy.first().first().toInt(), 3);
    QVERIFY(!m_view->routeScene()->highlightedEdges().isEmpty());
}

void TestGuiRouteMap::findWrapsAndSelects() {
    QSignalSpy spy(m_view, &RouteMapView::itemSelected);
    QCOMPARE(m_view->find(u"TRAVEL"_s), 1); // label "Main mode of travel"
    QCOMPARE(m_view->find(u"q"_s), 2);      // next after the selection
    QCOMPARE(m_view->find(u"works"_s), 0);  // wraps round
    QCOMPARE(m_view->find(u"nothing like this"_s), -1);
    QCOMPARE(spy.count(), 3);
    QCOMPARE(m_view->selectedPosition(), 0);
}

void TestGuiRouteMap::zoomAndFit() {
    const double before = m_view->zoom();
    m_view->zoomIn();
    QVERIFY(qAbs(m_view->zoom() - before * 1.25) < 1e-9);
    m_view->zoomOut();
    QVERIFY(qAbs(m_view->zoom() - before) < 1e-9);
    m_view->fitAll();
    const QRectF visible = m_view->mapToScene(m_view->viewport()->rect()).boundingRect();
    QVERIFY(visible.adjusted(-1, -1, 1, 1).contains(m_view->scene()->sceneRect()));
}

void TestGuiRouteMap::exportsSvgAndPng() {
    QTemporaryDir dir;
    QString error;
    const QString svg = dir.filePath(u"map.svg"_s), png = dir.filePath(u"map.png"_s);
    QVERIFY2(m_view->saveSvg(svg, &error), qPrintable(error));
    QVERIFY2(m_view->savePng(png, &error), qPrintable(error));
    QFile file(svg);
    QVERIFY(file.open(QIODevice::ReadOnly));
    QXmlStreamReader xml(&file);
    QString title;
    while (!xml.atEnd())
        if (xml.readNext() == QXmlStreamReader::StartElement && xml.name() == u"title"_s &&
            title.isEmpty())
            title = xml.readElementText();
    QVERIFY2(!xml.hasError(), qPrintable(xml.errorString()));
    QCOMPARE(title, m_instrument.title); // escaped in the file, intact when read back
    const QImage image(png);
    QCOMPARE(image.size(), m_view->scene()->sceneRect().size().toSize());
}

void TestGuiRouteMap::analysisUniversesReachTooltips() {
    // A hand-made analysis: q4 never asked, q5 asked if q1 = 1.
    RoutingAnalysis analysis;
    ItemUniverse never;
    never.position = 3;
    never.asked = ItemUniverse::Asked::Never;
    ItemUniverse conditional;
    conditional.position = 4;
    conditional.asked = ItemUniverse::Asked::Conditional;
    conditional.askedIf = u"q1 = 1"_s;
    analysis.universes = {never, conditional};
    m_view->selectItem(4);
    m_view->setRouting(*m_routing, &analysis);
    RouteMapScene* scene = m_view->routeScene();
    QVERIFY(scene->itemAtPosition(3)->data().unreachable);
    QVERIFY(scene->itemAtPosition(4)->toolTip().contains(u"asked if: q1 = 1"_s));
    QCOMPARE(m_view->selectedPosition(), 4); // the selection survives a rebuild
}

QTEST_MAIN(TestGuiRouteMap)
#include "tst_gui_routemap.moc"
