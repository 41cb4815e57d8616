// Route-map layout benchmark (not a ctest test; run tests/bench/layout_bench.sh).
//
// For generated questionnaire-like instruments of N items (modules of 20 items;
// a conditional forward skip on ~30 % of items, 2 to 25 items ahead) it times
// our layout (graph + layout, best of 5) and counts its edge crossings, then
// writes the project's own DOT export of the same instrument, times Graphviz
// `dot -Tplain` on it in the same run, and counts the crossings of dot's
// drawing with the same counter: each edge sampled at dot's rank lines (its
// spline flattened), node centres at its ends, bilayer count per rank gap
// (layout::PlainDrawing).
#include "export/DotExport.h"
#include "layout/PlainDrawing.h"
#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"
#include "routing/CompiledRouting.h"

#include <QCoreApplication>
#include <QElapsedTimer>
#include <QFile>
#include <QProcess>
#include <QRandomGenerator>
#include <QTemporaryDir>
#include <QTextStream>

#include <algorithm>

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
            const qint64 theirs =
                layout::PlainDrawing::parse(dot.readAllStandardOutput()).crossings();
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
