// Tests of the routing analysis: the condition algebra, the component finder,
// the minimiser (against published worked examples), universes and the
// semantic findings. Expected values are reasoned by hand in the comments.

#include "TestInstruments.h"
#include "analysis/ConditionAlgebra.h"
#include "analysis/GatesJson.h"
#include "analysis/Minimiser.h"
#include "analysis/RoutingAnalysis.h"
#include "analysis/RoutingAnalyzer.h"
#include "analysis/Scc.h"
#include "routing/CompiledRouting.h"
#include "routing/Simulator.h"

#include <QJsonArray>
#include <QJsonDocument>
#include <QProcess>
#include <QRegularExpression>
#include <QSet>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QtTest>

#include <QRandomGenerator>

#include <set>

using namespace rb;
using namespace rb::analysis;
using namespace rbtest;
using namespace Qt::StringLiterals;

namespace {

using Graph = std::vector<std::vector<int>>;

Graph graphOf(int n, const std::vector<std::pair<int, int>>& edges) {
    Graph g(n);
    for (auto [a, b] : edges)
        g[a].push_back(b);
    return g;
}

std::set<std::set<int>> asSets(const std::vector<std::vector<int>>& components) {
    std::set<std::set<int>> out;
    for (const auto& c : components)
        out.insert(std::set<int>(c.begin(), c.end()));
    return out;
}

// Minimises a boolean function given by minterms (variable 0 = most significant
// = the first letter) and prints each product like "BC'D'".
std::set<QString> minimiseTable(const QString& letters, const std::vector<int>& minterms,
                                const std::vector<int>& dontCares, int* literalCount = nullptr) {
    Mdd mdd;
    const int n = int(letters.size());
    std::vector<int> vars;
    for (int i = 0; i < n; ++i)
        vars.push_back(mdd.addVar(2));
    auto cube = [&](int m) {
        int f = Mdd::True;
        for (int i = n - 1; i >= 0; --i)
            f = mdd.andOp(f, mdd.literalCell(vars[i], (m >> (n - 1 - i)) & 1));
        return f;
    };
    int on = Mdd::False, dc = Mdd::False;
    for (int m : minterms)
        on = mdd.orOp(on, cube(m));
    for (int m : dontCares)
        dc = mdd.orOp(dc, cube(m));
    const Sop sop = minimiseSop(mdd, on, mdd.notOp(dc), vars);
    if (literalCount)
        *literalCount = sop.literalCount();
    std::set<QString> products;
    for (const SopProduct& p : sop.products) {
        QString text;
        for (const SopLiteral& l : p.literals)
            text += letters[l.var] + (l.cells.test(1) ? QString() : u"'"_s);
        products.insert(text);
    }
    return products;
}

struct Analysed {
    Instrument instrument;
    std::unique_ptr<CompiledRouting> routing;
    RoutingAnalysis result;
    const ItemUniverse& universe(const QString& name) const {
        for (const ItemUniverse& u : result.universes)
            if (result.itemName(u.position) == name)
                return u;
        qFatal("no such item");
    }
    QStringList findingIds() const {
        QStringList ids;
        for (const Finding& f : result.findings)
            ids.append(f.id());
        return ids;
    }
};

std::unique_ptr<Analysed> analyse(const Instrument& instrument) {
    auto a = std::make_unique<Analysed>();
    a->instrument = instrument;
    a->routing = std::make_unique<CompiledRouting>(a->instrument);
    a->result = analyzeRouting(*a->routing);
    return a;
}

} // namespace

class TestAnalysis : public QObject {
    Q_OBJECT

private slots:
    // --- condition algebra -------------------------------------------------
    void equivalentConditionsShareOneNode() {
        const Instrument ins = instrument(
            {module(u"m"_s, {yesNoItem(u"a"_s), yesNoItem(u"b"_s), integerItem(u"n"_s, 1, 20)})});
        CompiledRouting routing(ins);
        QList<cond::ExprPtr> extra;
        for (const QString& t :
             {u"a = 1 or a = 2"_s, u"a in (1..2)"_s, u"not (a <> 1)"_s, u"a = 1"_s,
              u"not (a = 1 or b = 1)"_s, u"not a = 1 and not b = 1"_s, u"n > 2.5"_s, u"n >= 3"_s,
              u"n < 1"_s, u"a = 1 and a = 2"_s, u"a in (1, 2)"_s})
            extra.append(routing.compileCondition(t));
        ConditionAlgebra algebra(routing, extra);
        // Same value sets on the codes {1, 2, 8, 9} and on empty.
        QCOMPARE(algebra.conditionText(u"a = 1 or a = 2"_s),
                 algebra.conditionText(u"a in (1..2)"_s));
        QCOMPARE(algebra.conditionText(u"not (a <> 1)"_s), algebra.conditionText(u"a = 1"_s));
        // De Morgan.
        QCOMPARE(algebra.conditionText(u"not (a = 1 or b = 1)"_s),
                 algebra.conditionText(u"not a = 1 and not b = 1"_s));
        // Integers: more than 2.5 is at least 3.
        QCOMPARE(algebra.conditionText(u"n > 2.5"_s), algebra.conditionText(u"n >= 3"_s));
        // The range is 1..20 and there is no missing code below 1: nothing is below 1.
        QVERIFY(!algebra.satisfiable(algebra.conditionText(u"n < 1"_s)));
        QVERIFY(!algebra.satisfiable(algebra.conditionText(u"a = 1 and a = 2"_s)));
        QVERIFY(algebra.implies(algebra.conditionText(u"a = 1"_s),
                                algebra.conditionText(u"a in (1, 2)"_s)));
        QVERIFY(!algebra.implies(algebra.conditionText(u"a in (1, 2)"_s),
                                 algebra.conditionText(u"a = 1"_s)));
        // Different conditions get different nodes.
        QVERIFY(algebra.conditionText(u"a = 1"_s) != algebra.conditionText(u"a in (1, 2)"_s));
    }

    void atomNodesDoNotDependOnWhatCameBefore() {
        // 3,000 atoms on one item: more than the algebra's atom cache holds, so
        // its slots are shared and overwritten. Translated forwards, then
        // backwards, then spelled differently (new trees, never cached), every
        // atom must give the same node, and no two atoms the same node (each
        // names a different value).
        const Instrument ins = instrument({module(u"m"_s, {integerItem(u"n"_s, 0, 5000)})});
        CompiledRouting routing(ins);
        QList<cond::ExprPtr> atoms;
        for (int v = 0; v < 3000; ++v)
            atoms.append(routing.compileCondition(u"n = "_s + QString::number(v)));
        ConditionAlgebra algebra(routing, atoms);
        QList<int> forwards;
        for (const cond::ExprPtr& a : atoms)
            forwards.append(algebra.condition(*a));
        for (qsizetype v = atoms.size() - 1; v >= 0; --v)
            QCOMPARE(algebra.condition(*atoms[v]), forwards[v]);
        for (int v = 0; v < 3000; v += 7)
            QCOMPARE(algebra.conditionText(u"n in ("_s + QString::number(v) + u')'), forwards[v]);
        QCOMPARE(QSet<int>(forwards.begin(), forwards.end()).size(), 3000);
    }

    void emptySatisfiesOnlyNegations() {
        const Instrument ins = instrument({module(u"m"_s, {yesNoItem(u"a"_s)})});
        CompiledRouting routing(ins);
        QList<cond::ExprPtr> extra{routing.compileCondition(u"a <> 1"_s),
                                   routing.compileCondition(u"a in (2, 8, 9)"_s)};
        ConditionAlgebra algebra(routing, extra);
        const int ne = algebra.conditionText(u"a <> 1"_s);
        const int in = algebra.conditionText(u"a in (2, 8, 9)"_s);
        // `a <> 1` holds for empty, `a in (2, 8, 9)` does not (DESIGN.md semantics).
        QVERIFY(algebra.mdd().intersects(ne, algebra.emptyOf(0)));
        QVERIFY(!algebra.mdd().intersects(in, algebra.emptyOf(0)));
        QCOMPARE(algebra.mdd().andOp(ne, algebra.presentedOf(0)), in);
    }

    // --- strongly connected components --------------------------------------
    void sccTinyDigraph() {
        // Sedgewick & Wayne, Algorithms 4th ed., section 4.2, tinyDG.txt with
        // KosarajuSharirSCC: 5 components {1} {0,2,3,4,5} {9,10,11,12} {6,8} {7}
        // (shared/references/worked-examples.md 2a, SEEN).
        const Graph g =
            graphOf(13, {{4, 2},  {2, 3},  {3, 2}, {6, 0},   {0, 1},  {2, 0}, {11, 12}, {12, 9},
                         {9, 10}, {9, 11}, {7, 9}, {10, 12}, {11, 4}, {4, 3}, {3, 5},   {6, 8},
                         {8, 6},  {5, 4},  {0, 5}, {6, 4},   {6, 9},  {7, 6}});
        const std::set<std::set<int>> expected{{1}, {0, 2, 3, 4, 5}, {9, 10, 11, 12}, {6, 8}, {7}};
        QCOMPARE(asSets(stronglyConnectedComponents(g)), expected);
        // From 0 one reaches {0..5} (worked-examples.md 2a, COMPUTED).
        const std::vector<bool> r = reachableFrom(g, 0);
        for (int v = 0; v < 13; ++v)
            QCOMPARE(bool(r[v]), v <= 5);
    }

    void sccCormenFigure() {
        // Cormen, Leiserson, Rivest & Stein, Introduction to Algorithms 3rd ed.,
        // Fig. 22.9: {a,b,e} {c,d} {f,g} {h} (worked-examples.md 2b).
        enum { a, b, c, d, e, f, g, h };
        const Graph gr = graphOf(8, {{a, b},
                                     {b, c},
                                     {b, e},
                                     {b, f},
                                     {c, d},
                                     {c, g},
                                     {d, c},
                                     {d, h},
                                     {e, a},
                                     {e, f},
                                     {f, g},
                                     {g, f},
                                     {g, h},
                                     {h, h}});
        const std::set<std::set<int>> expected{{a, b, e}, {c, d}, {f, g}, {h}};
        QCOMPARE(asSets(stronglyConnectedComponents(gr)), expected);
        const std::vector<bool> r = reachableFrom(gr, c);
        QVERIFY(!r[a] && !r[b] && !r[e]);
        QVERIFY(r[c] && r[d] && r[f] && r[g] && r[h]);
    }

    void sccAgreesWithGraphvizOnRandomGraphs() {
        // Graphviz `sccmap` (Debian package graphviz) as an outside reference on
        // random digraphs written as DOT by this test (the project's DOT export is
        // the lead's; switch to it once it lands). Compare the sets of components
        // with at least two vertices (sccmap leaves single vertices out).
        const QString sccmap = QStandardPaths::findExecutable(u"sccmap"_s);
        if (sccmap.isEmpty())
            QSKIP("sccmap (graphviz) not installed");
        QRandomGenerator rng(99);
        std::size_t components = 0;
        for (int round = 0; round < 40; ++round) {
            const int n = 3 + int(rng.bounded(18));
            Graph g(n);
            QString dot = u"digraph g {\n"_s;
            for (int v = 0; v < n; ++v)
                dot += u"  n"_s + QString::number(v) + u";\n"_s;
            const int edges = n + int(rng.bounded(quint32(2 * n)));
            for (int e = 0; e < edges; ++e) {
                const int a = int(rng.bounded(quint32(n))), b = int(rng.bounded(quint32(n)));
                if (a == b || std::find(g[a].begin(), g[a].end(), b) != g[a].end())
                    continue;
                g[a].push_back(b);
                dot += u"  n"_s + QString::number(a) + u" -> n"_s + QString::number(b) + u";\n"_s;
            }
            dot += u"}\n"_s;
            QProcess p;
            p.start(sccmap, {});
            p.write(dot.toUtf8());
            p.closeWriteChannel();
            QVERIFY(p.waitForFinished(10000));
            // sccmap prints "digraph cluster_K { nA -> nB; ... }" per non-trivial
            // component (its internal edges), then a summary graph.
            std::set<std::set<int>> theirs;
            const QStringList lines = QString::fromUtf8(p.readAllStandardOutput()).split(u'\n');
            std::set<int> current;
            bool inCluster = false;
            static const QRegularExpression node(u"\\bn(\\d+)\\b"_s);
            for (QString line : lines) {
                line = line.trimmed();
                if (line.startsWith(u"digraph cluster"_s)) {
                    inCluster = true;
                    current.clear();
                } else if (inCluster && line.startsWith(u'}')) {
                    inCluster = false;
                    if (current.size() > 1)
                        theirs.insert(current);
                } else if (inCluster) {
                    for (const QRegularExpressionMatch& m : node.globalMatch(line))
                        current.insert(m.captured(1).toInt());
                }
            }
            std::set<std::set<int>> ours;
            for (const auto& c : stronglyConnectedComponents(g))
                if (c.size() > 1)
                    ours.insert(std::set<int>(c.begin(), c.end()));
            QCOMPARE(ours, theirs);
            components += theirs.size();
        }
        qInfo("%zu non-trivial components compared", components);
        QVERIFY(components > 10); // the graphs did have loops to find
    }

    // --- minimiser against published worked examples --------------------------
    void quineMcCluskeyWithDontCares() {
        // Wikipedia, "Quine-McCluskey algorithm", Example: f = m(4,8,10,11,12,15) +
        // d(9,14); minimum BC'D' + AB' + AC or BC'D' + AD' + AC (worked-examples 1a).
        const std::set<QString> got = minimiseTable(u"ABCD"_s, {4, 8, 10, 11, 12, 15}, {9, 14});
        const std::set<QString> one{u"BC'D'"_s, u"AB'"_s, u"AC"_s};
        const std::set<QString> two{u"BC'D'"_s, u"AD'"_s, u"AC"_s};
        QVERIFY2(got == one || got == two,
                 qPrintable(QStringList(got.begin(), got.end()).join(u" + "_s)));
    }

    void petricksMethod() {
        // Petrick's method, f(A,B,C) = m(0,1,2,5,6,7): A'B' + BC' + AC or
        // A'C' + B'C + AB (Wikipedia "Petrick's method"; U. Idaho ECE 349 course notes no. 10;
        // worked-examples 1b).
        int literals = 0;
        const std::set<QString> got = minimiseTable(u"ABC"_s, {0, 1, 2, 5, 6, 7}, {}, &literals);
        const std::set<QString> one{u"A'B'"_s, u"BC'"_s, u"AC"_s};
        const std::set<QString> two{u"A'C'"_s, u"B'C"_s, u"AB"_s};
        QVERIFY(got == one || got == two);
        QCOMPARE(literals, 6);
    }

    void tabularMethodSlides() {
        // "Quine-McClusky Minimization Method, Module M4.3": F(W,X,Y,Z) =
        // m(0,1,2,3,5,7,8,10,14,15) = W'Z + WXY + X'Z', unique (worked-examples 1c).
        const std::set<QString> expected{u"W'Z"_s, u"WXY"_s, u"X'Z'"_s};
        QCOMPARE(minimiseTable(u"WXYZ"_s, {0, 1, 2, 3, 5, 7, 8, 10, 14, 15}, {}), expected);
    }

    void fiveVariables() {
        // R. Pilgrim, CSC 405 "Quine-McKluskey Minimization" (Murray State): input
        // SEEN; the unique minimum (6 terms, 23 literals) is COMPUTED in
        // worked-examples 1d, not published there.
        int literals = 0;
        const std::set<QString> expected{u"p'q's't'"_s, u"p'q'r't"_s, u"p'rst'"_s,
                                         u"qst"_s,      u"pq'r't'"_s, u"pqs't'"_s};
        QCOMPARE(minimiseTable(u"pqrst"_s, {0, 1, 3, 4, 6, 11, 14, 15, 16, 18, 24, 27, 28, 31}, {},
                               &literals),
                 expected);
        QCOMPARE(literals, 23);
    }

    void karnaughMapExample() {
        // Wikipedia "Karnaugh map" main example (RECALLED, from memory; unique
        // minimum COMPUTED in worked-examples 1e): f = m(6,8..14) = AC' + AB' + BCD'.
        const std::set<QString> expected{u"AC'"_s, u"AB'"_s, u"BCD'"_s};
        QCOMPARE(minimiseTable(u"ABCD"_s, {6, 8, 9, 10, 11, 12, 13, 14}, {}), expected);
    }

    // --- universes ---------------------------------------------------------------
    void vehicleExample() {
        // DESIGN.md's example: has_vehicle in (2, 8, 9) skips to the heating module,
        // so vehicle_count is asked exactly when has_vehicle = 1.
        const auto a = analyse(instrument(
            {module(u"transport"_s,
                    {withRule(yesNoItem(u"has_vehicle"_s, u"Household has a motor vehicle"_s),
                              u"has_vehicle in (2, 8, 9)"_s, u"heating"_s),
                     integerItem(u"vehicle_count"_s, 1, 20)}),
             module(u"heating"_s, {yesNoItem(u"heat_pump"_s)})}));
        const ItemUniverse& count = a->universe(u"vehicle_count"_s);
        QCOMPARE(count.asked, ItemUniverse::Asked::Conditional);
        QCOMPARE(count.askedIf, u"has_vehicle = 1"_s);
        QCOMPARE(a->result.gateItems(count), QStringList{u"has_vehicle"_s});
        QCOMPARE(count.plain, u"asked when 'Household has a motor vehicle' is Yes (1)"_s);
        QCOMPARE(a->universe(u"has_vehicle"_s).asked, ItemUniverse::Asked::Always);
        QCOMPARE(a->universe(u"heat_pump"_s).asked, ItemUniverse::Asked::Always);
        QCOMPARE(a->universe(u"heat_pump"_s).plain, u"asked of everyone"_s);
        QVERIFY(a->result.findings.isEmpty());
    }

    void namesOutliveAnEditOfTheInstrument() {
        // Universes name items by position; the analysis keeps the names as they
        // were analysed, through an edit and the end of the instrument and routing
        // it came from (the editor analyses one version while the user edits on).
        auto ins = std::make_unique<Instrument>(instrument(
            {module(u"transport"_s, {withRule(yesNoItem(u"has_vehicle"_s),
                                              u"has_vehicle in (2, 8, 9)"_s, u"heating"_s),
                                     integerItem(u"vehicle_count"_s, 1, 20)}),
             module(u"heating"_s, {yesNoItem(u"heat_pump"_s)})}));
        auto routing = std::make_unique<CompiledRouting>(*ins);
        const RoutingAnalysis result = analyzeRouting(*routing);
        ins->modules[0].items[0].name = u"renamed"_s;
        ins->modules[0].name = u"moved"_s;
        routing.reset();
        ins.reset();
        QCOMPARE(result.universes.size(), 3);
        QCOMPARE(result.itemName(0), u"has_vehicle"_s);
        QCOMPARE(result.moduleName(0), u"transport"_s);
        QCOMPARE(result.itemName(2), u"heat_pump"_s);
        QCOMPARE(result.moduleName(2), u"heating"_s);
        QCOMPARE(result.universes.at(1).gatePositions, QList<int>{0});
        QCOMPARE(result.gateItems(result.universes.at(1)), QStringList{u"has_vehicle"_s});
    }

    void gateOfAGateIsImplied() {
        // b is asked only when a = 1; c only when b = 1. b = 1 already implies
        // a = 1 (b is empty otherwise), so the minimal universe of c is b = 1.
        const auto a = analyse(
            instrument({module(u"m"_s, {yesNoItem(u"a"_s), withAskIf(yesNoItem(u"b"_s), u"a = 1"_s),
                                        withAskIf(yesNoItem(u"c"_s), u"b = 1"_s)})}));
        QCOMPARE(a->universe(u"b"_s).askedIf, u"a = 1"_s);
        QCOMPARE(a->universe(u"c"_s).askedIf, u"b = 1"_s);
        QCOMPARE(a->result.gateItems(a->universe(u"c"_s)), QStringList{u"b"_s});
    }

    void negationKeepsEmptyRespondents() {
        // Those with a = 2 skip b (b empty); c is filtered by b <> 1, which holds
        // for empty b. Universe: everyone except b = 1, printed as b <> 1 (one
        // literal; the set {empty, 2, 8, 9} contains empty, so a negative form).
        const auto a = analyse(instrument(
            {module(u"m"_s, {withRule(yesNoItem(u"a"_s), u"a = 2"_s, u"c"_s), yesNoItem(u"b"_s),
                             withAskIf(yesNoItem(u"c"_s), u"b <> 1"_s)})}));
        QCOMPARE(a->universe(u"b"_s).askedIf, u"a <> 2"_s);
        QCOMPARE(a->universe(u"c"_s).askedIf, u"b <> 1"_s);
        // b <> 1 reads b, which is empty for a = 2: a warning with that path.
        QCOMPARE(a->findingIds(), QStringList{u"reads-unasked-item:c:ask_if"_s});
        QVERIFY(a->result.findings.first().message.contains(u"after a"_s));
        QCOMPARE(a->result.findings.first().column, std::optional<int>(1));
    }

    void codesMergeIntoRuns() {
        // q has codes 1..6; the rule skips r for q in (1, 2, 3, 6): r is asked for
        // q in (4, 5). That set prints as "4, 5"; the skipped set 1..3 merges to a run.
        CodeList six{u"six"_s, {}};
        for (int c = 1; c <= 6; ++c)
            six.codes.append(code(c, u"c"_s + QString::number(c)));
        const auto a = analyse(instrument(
            {module(u"m"_s, {withRule(item(u"q"_s, ItemType::Single, u"six"_s),
                                      u"q in (1, 2, 3, 6)"_s, u"s"_s),
                             yesNoItem(u"r"_s), withAskIf(yesNoItem(u"s"_s), u"q in (1..3)"_s)})},
            {yesNo(), six}));
        QCOMPARE(a->universe(u"r"_s).askedIf, u"q in (4, 5)"_s);
        QCOMPARE(a->universe(u"r"_s).plain, u"asked when 'q' is c4 (4) or c5 (5)"_s);
        QCOMPARE(a->universe(u"s"_s).askedIf, u"q in (1..3)"_s);
    }

    void numericThresholds() {
        // n in 0..120 plus missing code 999; m asked if n >= 18 and n < 65: the
        // integers 18..64 (999 is not below 65).
        Item n = integerItem(u"n"_s, 0, 120);
        n.label = u"Age"_s;
        n.missing = {code(999, u"Refused"_s, MissingKind::Refused)};
        const auto a = analyse(
            instrument({module(u"m"_s, {n, withAskIf(yesNoItem(u"w"_s), u"n >= 18 and n < 65"_s),
                                        withAskIf(yesNoItem(u"v"_s), u"n > 100"_s)})}));
        QCOMPARE(a->universe(u"w"_s).askedIf, u"n in (18..64)"_s);
        QCOMPARE(a->universe(u"w"_s).plain, u"asked when 'Age' is between 18 and 64"_s);
        // More than 100: 101..120 or the missing code 999. n is always asked, so
        // empty is a don't-care and the complement 0..100 (one element against
        // two) is the shorter form DESIGN.md asks for.
        QCOMPARE(a->universe(u"v"_s).askedIf, u"n not in (0..100)"_s);
        QCOMPARE(a->universe(u"v"_s).plain, u"asked when 'Age' is not between 0 and 100"_s);
    }

    void multiItemHas() {
        // m: multi with codes 1 Bus, 2 Train, 3 Bike, 9 Refused; t asked if m has 2.
        CodeList modes{u"modes"_s,
                       {code(1, u"Bus"_s), code(2, u"Train"_s), code(3, u"Bike"_s),
                        code(9, u"Refused"_s, MissingKind::Refused)}};
        Item m = item(u"m"_s, ItemType::Multi, u"modes"_s);
        m.label = u"Modes used"_s;
        const auto a = analyse(instrument(
            {module(u"x"_s, {m, withAskIf(yesNoItem(u"t"_s), u"m has 2"_s),
                             withAskIf(yesNoItem(u"u"_s), u"answered(m) and not m has 1"_s)})},
            {yesNo(), modes}));
        QCOMPARE(a->universe(u"t"_s).askedIf, u"m has 2"_s);
        QCOMPARE(a->universe(u"t"_s).plain, u"asked when 'Modes used' includes Train (2)"_s);
        QCOMPARE(a->universe(u"u"_s).askedIf, u"answered(m) and not m has 1"_s);
    }

    void manyRejoiningBranchesStayCheap() {
        // 100 two-way branches that rejoin: q_k = 1 skips r_k. 2^100 paths; the
        // programme never enumerates them. r_k is asked exactly when q_k <> 1
        // (q_k is always asked, so empty is a don't-care and the negative form,
        // one literal, is minimal).
        QList<Item> items;
        for (int k = 0; k < 100; ++k) {
            const QString q = u"q"_s + QString::number(k), r = u"r"_s + QString::number(k);
            items << withRule(yesNoItem(q), q + u" = 1"_s, u"q"_s + QString::number(k + 1))
                  << yesNoItem(r);
        }
        items.last().name = u"r99"_s;
        items[198].routing = {Rule{u"q99 = 1"_s, u"END"_s}};
        items << yesNoItem(u"last"_s);
        const auto a = analyse(instrument({module(u"m"_s, items)}));
        for (int k = 0; k < 99; ++k)
            QCOMPARE(a->universe(u"r"_s + QString::number(k)).askedIf,
                     u"q"_s + QString::number(k) + u" <> 1"_s);
        QCOMPARE(a->universe(u"q77"_s).asked, ItemUniverse::Asked::Always);
        QCOMPARE(a->universe(u"last"_s).askedIf, u"q99 <> 1"_s);
    }

    void gatesJsonShape() {
        // DESIGN.md's gates --json shape, on the vehicle example.
        const auto a = analyse(instrument(
            {module(u"transport"_s,
                    {withRule(yesNoItem(u"has_vehicle"_s, u"Household has a motor vehicle"_s),
                              u"has_vehicle in (2, 8, 9)"_s, u"END"_s),
                     integerItem(u"vehicle_count"_s, 1, 20)})}));
        const QJsonObject json = gatesToJson(a->result);
        const QJsonArray items = json.value(u"items"_s).toArray();
        QCOMPARE(items.size(), 2);
        const QJsonObject first = items.at(0).toObject(), second = items.at(1).toObject();
        QCOMPARE(first.value(u"asked"_s).toString(), u"always"_s);
        QVERIFY(first.value(u"asked_if"_s).isNull());
        QCOMPARE(first.value(u"gate_items"_s).toArray().size(), 0);
        QCOMPARE(second.value(u"name"_s).toString(), u"vehicle_count"_s);
        QCOMPARE(second.value(u"module"_s).toString(), u"transport"_s);
        QCOMPARE(second.value(u"asked"_s).toString(), u"conditional"_s);
        QCOMPARE(second.value(u"asked_if"_s).toString(), u"has_vehicle = 1"_s);
        QCOMPARE(second.value(u"gate_items"_s).toArray(), QJsonArray{u"has_vehicle"_s});
        QCOMPARE(second.value(u"plain"_s).toString(),
                 u"asked when 'Household has a motor vehicle' is Yes (1)"_s);
    }

    // --- findings --------------------------------------------------------------
    void unreachableItems() {
        // b: contradictory filter (a = 1 and a = 2) -> conditions contradict.
        // d: after an unconditional goto from c to END -> no path.
        const auto a = analyse(instrument({module(
            u"m"_s, {yesNoItem(u"a"_s), withAskIf(yesNoItem(u"b"_s), u"a = 1 and a = 2"_s),
                     withRule(yesNoItem(u"c"_s), std::nullopt, u"END"_s), yesNoItem(u"d"_s)})}));
        QCOMPARE(a->findingIds(),
                 (QStringList{u"unreachable-item:b:"_s, u"unreachable-item:d:"_s}));
        QVERIFY(a->result.findings[0].message.contains(u"contradict"_s));
        QVERIFY(a->result.findings[1].message.contains(u"no path"_s));
        QCOMPARE(a->universe(u"b"_s).asked, ItemUniverse::Asked::Never);
        QCOMPARE(a->universe(u"d"_s).plain, u"never asked"_s);
    }

    void loopsReportedOnce() {
        // c goes back to a when c = 1: a, b, c form one loop (one finding on c's
        // rule 0, its goto).
        const auto a = analyse(instrument({module(
            u"m"_s, {yesNoItem(u"a"_s), yesNoItem(u"b"_s),
                     withRule(yesNoItem(u"c"_s), u"c = 1"_s, u"a"_s), yesNoItem(u"d"_s)})}));
        QCOMPARE(a->findingIds(), QStringList{u"routing-loop:c:routing[0].goto"_s});
        QVERIFY(a->result.findings.first().message.contains(u"a, b, c"_s));
        QCOMPARE(a->result.findings.first().severity, Severity::Error);
    }

    void infeasibleBackEdgeIsNoLoop() {
        // b is asked only when a = 1, and its back-goto needs a = 2: never fires,
        // so no loop, but rule-never-fires.
        const auto a = analyse(instrument(
            {module(u"m"_s, {yesNoItem(u"a"_s), withRule(withAskIf(yesNoItem(u"b"_s), u"a = 1"_s),
                                                         u"a = 2"_s, u"a"_s)})}));
        QCOMPARE(a->findingIds(), QStringList{u"rule-never-fires:b:routing[0].if"_s});
        QVERIFY(a->result.findings.first().message.contains(u"when the rule is evaluated"_s));
    }

    void rulesThatAlwaysFire() {
        // b asked if a = 1; its rule 0 "a = 1" always holds there and leaves rule 1
        // unevaluated; c has an unconditional rule followed by another rule.
        Item b = withRule(withAskIf(yesNoItem(u"b"_s), u"a = 1"_s), u"a = 1"_s, u"d"_s);
        b = withRule(b, u"b = 2"_s, u"END"_s);
        Item c = withRule(withRule(yesNoItem(u"c"_s), std::nullopt, u"d"_s), u"c = 1"_s, u"END"_s);
        const auto a =
            analyse(instrument({module(u"m"_s, {yesNoItem(u"a"_s), b, c, yesNoItem(u"d"_s)})}));
        // b's rule 1 is never evaluated: no separate never-fires finding for it.
        QCOMPARE(a->findingIds(), (QStringList{u"rule-always-fires:b:routing[0].if"_s,
                                               u"rule-always-fires:c:routing[0].goto"_s}));
    }

    void moduleFilterFindingsAreModuleFindings() {
        // Module "later" is asked if b = 1, and b is only asked when a = 1.
        const auto a = analyse(instrument(
            {module(u"first"_s, {yesNoItem(u"a"_s), withAskIf(yesNoItem(u"b"_s), u"a = 1"_s)}),
             module(u"later"_s, {yesNoItem(u"c"_s), yesNoItem(u"d"_s)}, u"b = 1"_s)}));
        QCOMPARE(a->result.findings.size(), 1);
        const Finding& f = a->result.findings.first();
        QCOMPARE(f.check, u"reads-unasked-item"_s);
        QVERIFY(f.item.isEmpty());
        QCOMPARE(f.module, u"later"_s);
        QCOMPARE(f.id(), u"reads-unasked-item:later:ask_if"_s);
        QCOMPARE(a->universe(u"d"_s).askedIf, u"b = 1"_s);
    }

    void itemFilterIsReadOnlyWhereTheModuleFilterHolds() {
        // Module "later" is asked if a = 1; its item c adds b = 1, and b itself is
        // asked only when a = 1. The filters join as "module's and then the
        // item's", evaluated left to right, so c's own filter is evaluated only
        // for a = 1, where b is always presented: nothing reads an unasked item.
        // (Before this rule the analysis read c's filter for a <> 1 too and warned.)
        const auto a = analyse(instrument(
            {module(u"first"_s, {yesNoItem(u"a"_s), withAskIf(yesNoItem(u"b"_s), u"a = 1"_s)}),
             module(u"later"_s, {withAskIf(yesNoItem(u"c"_s), u"b = 1"_s), yesNoItem(u"d"_s)},
                    u"a = 1"_s)}));
        QCOMPARE(a->findingIds(), QStringList());
        // c: a = 1 and b = 1, and b = 1 already implies a = 1 (b is empty otherwise).
        QCOMPARE(a->universe(u"c"_s).askedIf, u"b = 1"_s);
        QCOMPARE(a->universe(u"d"_s).askedIf, u"a = 1"_s);

        // The simulator evaluates the same conditions: for a = 2, b's filter, then
        // the module filter at c (fails, so c's own is not evaluated) and at d.
        const auto answers = [](qint64 va, qint64 vb) {
            return [va, vb](int p) { return cond::CellValue::ofNumber(p == 0 ? va : vb); };
        };
        const RouteResult no = simulateRoute(*a->routing, answers(2, 1), true);
        QCOMPARE(no.path, (QList<int>{0}));
        QList<std::pair<int, int>> filters; // (position, filter index)
        for (const Evaluation& e : no.evaluated)
            filters.append({e.position, e.filter});
        QCOMPARE(filters, (QList<std::pair<int, int>>{{1, 0}, {2, 0}, {3, 0}}));
        // For a = 1, b = 1: b's filter, c's module filter then its own, d's module filter.
        const RouteResult yes = simulateRoute(*a->routing, answers(1, 1), true);
        QCOMPARE(yes.path, (QList<int>{0, 1, 2, 3}));
        filters.clear();
        for (const Evaluation& e : yes.evaluated)
            filters.append({e.position, e.filter});
        QCOMPARE(filters, (QList<std::pair<int, int>>{{1, 0}, {2, 0}, {2, 1}, {3, 0}}));
    }

    void itemFilterStillWarnsWhereTheModuleLetsEmptyThrough() {
        // Same shape, but the module is asked if a in (1, 2): for a = 2 the module
        // filter holds, b was filtered out (empty), and c's b = 1 reads it.
        const auto a = analyse(instrument(
            {module(u"first"_s, {yesNoItem(u"a"_s), withAskIf(yesNoItem(u"b"_s), u"a = 1"_s)}),
             module(u"later"_s, {withAskIf(yesNoItem(u"c"_s), u"b = 1"_s), yesNoItem(u"d"_s)},
                    u"a in (1, 2)"_s)}));
        QCOMPARE(a->findingIds(), QStringList{u"reads-unasked-item:c:ask_if"_s});
        QVERIFY2(a->result.findings.first().message.contains(u"after a"_s),
                 qPrintable(a->result.findings.first().message));
        QCOMPARE(a->universe(u"c"_s).askedIf, u"b = 1"_s);
        // (A run of two codes is listed as two values, as elsewhere: `a in (1, 2)`.)
        QCOMPARE(a->universe(u"d"_s).askedIf, u"a in (1, 2)"_s);
    }

    void thousandComparedValuesKeepEveryCell() {
        // q (0..100000) is compared with 1,000 values 10, 20, ..., 10000. Each
        // value is told apart by its own `q = v` atom of s, and every other value
        // (0, the gaps, 100000) satisfies no atom: 1,000 cells, one "other" cell
        // and the empty cell = 1,002 (a fixed 256-cell set overflowed here).
        // r lists them with `in`, s spells the
        // same set as 1,000 alternatives and t as a double negation: equivalent
        // conditions, so all three print the same. The positive list (1,000
        // values) beats the complement: 0..9, 11..19, ..., 9991..9999 and
        // 10001..100000 are 1,001 elements.
        QStringList values, alternatives;
        for (int v = 10; v <= 10000; v += 10) {
            values.append(QString::number(v));
            alternatives.append(u"q = "_s + QString::number(v));
        }
        const QString list = values.join(u", "_s);
        const QString expected = u"q in ("_s + list + u')';
        const auto a = analyse(instrument({module(
            u"m"_s, {integerItem(u"q"_s, 0, 100000), withAskIf(yesNoItem(u"r"_s), expected),
                     withAskIf(yesNoItem(u"s"_s), alternatives.join(u" or "_s)),
                     withAskIf(yesNoItem(u"t"_s), u"not (q not in ("_s + list + u"))"_s)})}));
        for (const QString& name : {u"r"_s, u"s"_s, u"t"_s}) {
            QCOMPARE(a->universe(name).asked, ItemUniverse::Asked::Conditional);
            QCOMPARE(a->universe(name).askedIf, expected);
            QCOMPARE(a->result.gateItems(a->universe(name)), QStringList{u"q"_s});
        }
        QCOMPARE(a->findingIds(), QStringList());
        // The algebra: more cells than the old fixed limit, and the three are one node.
        ConditionAlgebra algebra(*a->routing);
        QCOMPARE(algebra.variable(algebra.varsOf(0).front()).cells.size(), 1002);
        QCOMPARE(algebra.conditionText(expected),
                 algebra.conditionText(u"not (q not in ("_s + list + u"))"_s));
    }

    void brokenConditionsAreAbsent() {
        // A syntax error in b's filter: it always passes; a rule with an unknown
        // target never fires. No semantic finding comes from either.
        const auto a = analyse(instrument(
            {module(u"m"_s, {withRule(yesNoItem(u"a"_s), u"a = 1"_s, u"nowhere"_s),
                             withAskIf(yesNoItem(u"b"_s), u"a = = 1"_s), yesNoItem(u"c"_s)})}));
        QVERIFY(a->result.findings.isEmpty());
        QCOMPARE(a->universe(u"b"_s).asked, ItemUniverse::Asked::Always);
    }
};

QTEST_GUILESS_MAIN(TestAnalysis)
#include "tst_analysis.moc"
