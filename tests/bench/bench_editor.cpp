// Editor benchmark (not a ctest test; timings are reported, never asserted):
// on a generated 5,000-item instrument it measures
//   - opening: load the file, fill the window, first paint (target < 2 s);
//   - the first full analysis after opening (worker thread);
//   - edit -> findings refreshed: from pushing an edit until the worker's
//     result for that revision reaches the window (target < 300 ms);
//   - the GUI thread's own cost of one edit (command + model signals);
//   - redrawing the route map (GUI thread: routing, layout, scene items), which
//     the window does a little after the findings, while the map is on screen.
// Report the machine's load beside the figures (uptime): they scale with it.
// Usage: bench_editor [ITEMS] (default 5000). Runs on the offscreen platform.
#include "EditorWindow.h"
#include "FindingsModel.h"
#include "edit/AnalysisRunner.h"
#include "edit/Document.h"
#include "edit/LiveAnalysis.h"
#include "edit/SetAttributeCommand.h"
#include "layout/RouteGraph.h"
#include "layout/RouteLayout.h"
#include "routemap/RouteMapView.h"
#include "routing/CompiledRouting.h"
#include "storage/YamlFormat.h"

#include <QApplication>
#include <QElapsedTimer>
#include <QEventLoop>
#include <QTemporaryDir>
#include <QTimer>

#include <algorithm>
#include <cstdio>

using namespace rb;
using namespace Qt::StringLiterals;

namespace {

// An invented gardening panel: modules of 50 items; every tenth item a gate
// whose "no" skips the next three items; some numeric follow-ups with filters.
Instrument generate(int count) {
    Instrument ins;
    ins.title = u"Generated garden panel"_s;
    ins.version = u"1"_s;
    ins.language = u"en"_s;
    ins.codeLists = {{u"yes_no"_s,
                      {{1, u"Yes"_s, MissingKind::None},
                       {2, u"No"_s, MissingKind::None},
                       {9, u"Refused"_s, MissingKind::Refused}}}};
    for (int i = 0; i < count; ++i) {
        if (i % 50 == 0)
            ins.modules.append(Module{u"m%1"_s.arg(i / 50), u"Section %1"_s.arg(i / 50), {}, {}});
        Item it;
        it.name = u"q%1"_s.arg(i);
        it.label = u"Question %1"_s.arg(i);
        it.text = u"How is part %1 of the garden?"_s.arg(i);
        if (i % 10 == 5) {
            it.type = ItemType::Integer;
            it.range = std::pair{RangeBound{u"0"_s, 0}, RangeBound{u"100"_s, 100}};
            it.askIf = u"q%1 = 1"_s.arg(i - 5);
        } else {
            it.type = ItemType::Single;
            it.codeListName = u"yes_no"_s;
        }
        if (i % 10 == 0 && i + 4 < count)
            it.routing.append({u"q%1 in (2, 9)"_s.arg(i), u"q%1"_s.arg(i + 4)});
        ins.modules.last().items.append(it);
    }
    return ins;
}

double median(QList<double> values) {
    std::sort(values.begin(), values.end());
    return values.isEmpty() ? 0 : values.at(values.size() / 2);
}

// Runs the event loop until the window holds findings for the current revision.
void waitForAnalysis(EditorWindow& window) {
    QEventLoop loop;
    auto done = [&] {
        return window.analysisRunner()->latest().revision == window.document()->revision() &&
               !window.analysisRunner()->isBusy();
    };
    if (done())
        return;
    QObject::connect(window.analysisRunner(), &AnalysisRunner::analysed, &loop, [&] {
        if (done())
            loop.quit();
    });
    QTimer::singleShot(60000, &loop, &QEventLoop::quit);
    loop.exec();
}

} // namespace

int main(int argc, char** argv) {
    if (qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM"))
        qputenv("QT_QPA_PLATFORM", "offscreen");
    QApplication app(argc, argv);
    const int count = argc > 1 ? QString::fromLocal8Bit(argv[1]).toInt() : 5000;
    QTemporaryDir dir;
    const QString path = dir.filePath(u"bench.yaml"_s);
    if (saveYamlFile(generate(count), path)) {
        std::fprintf(stderr, "cannot write %s\n", qPrintable(path));
        return 1;
    }

    QElapsedTimer timer;
    timer.start();
    const LiveAnalysis alone = analyseInstrument(generate(count), 0);
    std::printf("items: %d, findings: %lld\n", count, qlonglong(alone.findings.size()));
    std::printf("analysis alone (one thread):       %7.1f ms\n", timer.nsecsElapsed() / 1e6);

    EditorWindow window;
    window.resize(1400, 900);
    window.show();
    QApplication::processEvents();
    timer.restart();
    if (!window.openFile(path))
        return 1;
    window.repaint(); // the first full paint of the filled window
    QApplication::processEvents();
    std::printf("open file -> window filled, painted: %7.1f ms   (target < 2000)\n",
                timer.nsecsElapsed() / 1e6);
    waitForAnalysis(window);
    std::printf("open file -> first findings shown: %7.1f ms\n", timer.nsecsElapsed() / 1e6);

    QList<double> refresh, guiCost;
    for (int round = 0; round < 9; ++round) {
        // Alternate two filters on an item in the middle: each changes the routing.
        const int module = int(window.document()->instrument().modules.size()) / 2;
        const QString condition =
            round % 2 ? u"q%1 = 1"_s.arg(module * 50) : u"q%1 = 2"_s.arg(module * 50);
        timer.restart();
        window.document()->push(new SetAttributeCommand(
            window.document(), AttributeKey::ofItem(module, 7, Field::ItemAskIf),
            std::optional<QString>(condition), u"bench"_s));
        guiCost.append(timer.nsecsElapsed() / 1e6);
        waitForAnalysis(window);
        refresh.append(timer.nsecsElapsed() / 1e6);
    }
    std::printf("edit -> command applied (GUI):     %7.1f ms (median of 9)\n", median(guiCost));
    std::printf("edit -> findings refreshed:        %7.1f ms (median of 9; target < 300)\n",
                median(refresh));
    QList<double> mapCost;
    for (int round = 0; round < 3; ++round) {
        timer.restart();
        window.routeMapView()->setRouting(CompiledRouting(window.document()->instrument()),
                                          &window.analysisRunner()->latest().routing);
        mapCost.append(timer.nsecsElapsed() / 1e6);
    }
    std::printf("route map redraw (GUI thread):     %7.1f ms (median of 3)\n", median(mapCost));
    QList<double> layoutCost;
    for (int round = 0; round < 3; ++round) {
        timer.restart();
        const CompiledRouting routing(window.document()->instrument());
        const layout::RouteGraph graph = layout::RouteGraph::fromRouting(routing);
        const layout::RouteLayout laidOut = layout::layoutRouteGraph(graph);
        layoutCost.append(timer.nsecsElapsed() / 1e6);
    }
    std::printf("  of which routing + layout:       %7.1f ms (median of 3)\n", median(layoutCost));
    std::printf("findings shown at the end: %d\n", window.findingsModel()->rowCount());
    window.setSaveQuestion([] { return QMessageBox::Discard; });
    return 0;
}
