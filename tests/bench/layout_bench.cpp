// Route-map layout benchmark (not a ctest test; run tests/bench/layout_bench.sh).
//
// For generated questionnaire-like instruments of N items (modules of 20 items;
// a conditional forward skip on ~30 % of items, 2 to 25 items ahead) it times
// our layout (graph + layout, best of 5) and counts its edge crossings, then
// writes the project's own DOT export of the same instrument, times Graphviz
// `dot -Tplain` on it in the same run, and counts the crossings of dot's
// drawing with the same counter: each edge sampled at dot's rank lines (its
// spline flattened), node centres at its ends, bilayer count per rank gap.
#include "export/DotExport.h"
#include "layout/CrossingCounter.h"
#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"
#include "routing/CompiledRouting.h"

#include <QCoreApplication>
#include <QElapsedTimer>
#include <QFile>
#include <QHash>
#include <QProcess>
#include <QRandomGenerator>
#include <QTemporaryDir>
#include <QTextStream>

#include <algorithm>
#include <map>

#include <sys/resource.h>
#include <time.h>

using namespace rb;

namespace {

double processCpuSeconds() {
    timespec t{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t);
    return double(t.tv_sec) + t.tv_nsec / 1e9;
}

// CPU time (user + system) of all finished child processes so far.
double childrenCpuSeconds() {
    rusage usage{};
    getrusage(RUSAGE_CHILDREN, &usage);
    return double(usage.ru_utime.tv_sec + usage.ru_stime.tv_sec) +
           double(usage.ru_utime.tv_usec + usage.ru_stime.tv_usec) / 1e6;
}

Instrument generate(int items, quint32 seed, int maxSkip) {
    QRandomGenerator random(seed);
    Instrument in;
    in.title = QStringLiteral("Generated %1").arg(items);
    for (int p = 0; p < items; ++p) {
        if (p % 20 == 0) {
            Module m;
            m.name = QStringLiteral("m%1").arg(p / 20 + 1);
            m.title = QStringLiteral("Module %1").arg(p / 20 + 1);
            in.modules.append(m);
        }
        Item item;
        item.name = QStringLiteral("q%1").arg(p + 1);
        item.label = QStringLiteral("Generated item %1").arg(p + 1);
        item.hasInlineCodes = true;
        item.inlineCodes = {{1, QStringLiteral("Yes"), MissingKind::None},
                            {2, QStringLiteral("No"), MissingKind::None}};
        if (random.bounded(100) < 30) {
            const int target = p + 2 + int(random.bounded(quint32(maxSkip - 1)));
            Rule rule;
            rule.condition = QStringLiteral("q%1 = 2").arg(p + 1);
            rule.target =
                target >= items ? QStringLiteral("END") : QStringLiteral("q%1").arg(target + 1);
            item.routing.append(rule);
        }
        in.modules.last().items.append(item);
    }
    return in;
}

// --- dot -Tplain reader ----------------------------------------------------

QStringList tokens(const QString& line) {
    QStringList out;
    QString current;
    bool quoted = false, inToken = false;
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
            quoted = inToken = true;
        } else if (c.isSpace()) {
            if (inToken)
                out.append(current);
            current.clear();
            inToken = false;
        } else {
            current += c;
            inToken = true;
        }
    }
    if (inToken)
        out.append(current);
    return out;
}

struct PlainDrawing {
    QHash<QString, QPointF> nodes;
    QList<std::pair<QStringList, QList<QPointF>>> edges; // {tail, head}, control points
};

PlainDrawing readPlain(const QByteArray& text) {
    PlainDrawing d;
    for (const QByteArray& raw : text.split('\n')) {
        const QStringList t = tokens(QString::fromUtf8(raw));
        if (t.size() >= 4 && t.at(0) == QLatin1String("node")) {
            d.nodes.insert(t.at(1), QPointF(t.at(2).toDouble(), t.at(3).toDouble()));
        } else if (t.size() >= 4 && t.at(0) == QLatin1String("edge")) {
            const int n = t.at(3).toInt();
            QList<QPointF> pts;
            for (int k = 0; k < n && 5 + 2 * k < t.size(); ++k)
                pts.append(QPointF(t.at(4 + 2 * k).toDouble(), t.at(5 + 2 * k).toDouble()));
            d.edges.append({{t.at(1), t.at(2)}, pts});
        }
    }
    return d;
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

// x where the polyline first meets height y; fallback: nearest point's x.
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

qint64 dotCrossings(const PlainDrawing& d, int* rankCount) {
    // Ranks: distinct node heights, top (largest y in plain output) first.
    std::map<qint64, int, std::greater<qint64>> rankOf;
    for (const QPointF& p : d.nodes)
        rankOf[qRound64(p.y() * 100)] = 0;
    QList<double> rankY;
    for (auto& [key, index] : rankOf) {
        index = int(rankY.size());
        rankY.append(key / 100.0);
    }
    *rankCount = int(rankY.size());
    QList<layout::CrossingCounter::LayeredEdge> layered;
    for (const auto& [ends, control] : d.edges) {
        const QPointF a = d.nodes.value(ends.at(0)), b = d.nodes.value(ends.at(1));
        int ra = rankOf.at(qRound64(a.y() * 100)), rb = rankOf.at(qRound64(b.y() * 100));
        if (ra == rb)
            continue; // flat edge: in no gap between ranks
        const QPointF upper = ra < rb ? a : b, lower = ra < rb ? b : a;
        const QList<QPointF> poly = flatten(control);
        layout::CrossingCounter::LayeredEdge e;
        e.firstLayer = std::min(ra, rb);
        e.xs.append(upper.x());
        for (int r = std::min(ra, rb) + 1; r < std::max(ra, rb); ++r)
            e.xs.append(xAt(poly, rankY.at(r)));
        e.xs.append(lower.x());
        layered.append(e);
    }
    return layout::CrossingCounter::layeredCrossings(layered, int(rankY.size()));
}

} // namespace

int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    QStringList args = app.arguments().mid(1);
    bool runDot = true;
    if (args.removeAll(QStringLiteral("--no-dot")) > 0)
        runDot = false;
    // --keep-dot DIR: leave the DOT files there (to try Graphviz options by hand).
    QString keepDir;
    if (const qsizetype k = args.indexOf(QStringLiteral("--keep-dot"));
        k >= 0 && k + 1 < args.size()) {
        keepDir = args.at(k + 1);
        args.remove(k, 2);
    }
    // --max-skip K: skips reach 2..K items ahead (default 25, as the issue asks;
    // larger values stress the layout with many long, overlapping edges).
    int maxSkip = 25;
    if (const qsizetype k = args.indexOf(QStringLiteral("--max-skip"));
        k >= 0 && k + 1 < args.size()) {
        maxSkip = std::max(2, args.at(k + 1).toInt());
        args.remove(k, 2);
    }
    QList<int> sizes;
    for (const QString& a : args)
        sizes.append(a.toInt());
    if (sizes.isEmpty())
        sizes = {200, 1000, 3000};
    QTextStream out(stdout);
    QTemporaryDir dir;
    // Times in seconds: wall clock, and CPU time (the fairer figure on a busy
    // machine); ours is the best of 5 runs, dot runs once. speedup = CPU ratio.
    out << "items  edges  ours_wall ours_cpu  ours_crossings  lanes(L/R)  dot_wall  dot_cpu   "
           "dot_crossings  speedup\n";
    for (int n : sizes) {
        const Instrument in = generate(n, 20261201u + quint32(n), maxSkip);
        const CompiledRouting routing(in);
        double best = 1e300, bestCpu = 1e300;
        layout::RouteGraph graph;
        layout::RouteLayout laidOut;
        for (int rep = 0; rep < 5; ++rep) {
            QElapsedTimer timer;
            timer.start();
            const double cpu0 = processCpuSeconds();
            graph = layout::RouteGraph::fromRouting(routing);
            laidOut = layout::layoutRouteGraph(graph);
            bestCpu = std::min(bestCpu, processCpuSeconds() - cpu0);
            best = std::min(best, timer.nsecsElapsed() / 1e9);
        }
        const qint64 ours = laidOut.crossings(graph);
        out << qSetFieldWidth(7) << Qt::left << n << qSetFieldWidth(7) << graph.edges.size()
            << qSetFieldWidth(10) << QString::number(best, 'f', 4) << qSetFieldWidth(10)
            << QString::number(bestCpu, 'f', 4) << qSetFieldWidth(16) << ours << qSetFieldWidth(12)
            << QStringLiteral("%1/%2").arg(laidOut.leftLanes).arg(laidOut.rightLanes);
        const QString dotFile =
            (keepDir.isEmpty() ? dir.path() : keepDir) + QStringLiteral("/g%1.dot").arg(n);
        if (runDot || !keepDir.isEmpty()) {
            QFile f(dotFile);
            if (!f.open(QIODevice::WriteOnly) || f.write(exportDot(routing)) < 0)
                return 2;
        }
        if (runDot) {
            QProcess dot;
            QElapsedTimer timer;
            timer.start();
            const double childCpu0 = childrenCpuSeconds();
            dot.start(QStringLiteral("dot"), {QStringLiteral("-Tplain"), dotFile});
            if (!dot.waitForFinished(-1) || dot.exitCode() != 0) {
                out << qSetFieldWidth(0) << "dot failed: " << dot.readAllStandardError() << '\n';
                return 2;
            }
            const double dotSeconds = timer.nsecsElapsed() / 1e9;
            const double dotCpu = childrenCpuSeconds() - childCpu0;
            int ranks = 0;
            const qint64 theirs = dotCrossings(readPlain(dot.readAllStandardOutput()), &ranks);
            out << qSetFieldWidth(10) << QString::number(dotSeconds, 'f', 3) << qSetFieldWidth(10)
                << QString::number(dotCpu, 'f', 3) << qSetFieldWidth(15) << theirs
                << qSetFieldWidth(0) << QString::number(dotCpu / std::max(bestCpu, 1e-6), 'f', 0)
                << 'x';
        }
        out << qSetFieldWidth(0) << '\n';
        out.flush();
    }
    return 0;
}
