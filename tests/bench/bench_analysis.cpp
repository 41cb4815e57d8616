// Generates large invented instruments (dense forward skips, filters, shared
// code lists; about 30% of items conditional, more than the 20% the scale
// target names) and times the full check: compiling every condition, the
// structural checks, and the routing analysis with all universes and semantic
// findings (checkInstrument computes every universe on the way).
// Each size is measured on three instruments (seeds); per instrument the
// median of 5 runs; the figures are the mean of the three medians. Also the
// peak resident memory of the process.
//
// Why three instruments, each built module by module from exact counts: the
// growth per 10x items is meant to show how the program scales, so every size
// must carry the same work per item. With one seed and independent draws per
// item, the 5,000-item instrument of seed 4242 had 3.14 diagram nodes per
// item and the 50,000-item one 3.33 (+6 %), and over seeds 1-6 the 5,000-item
// figure ranged 3.06-3.68: the old growth ratio measured the draw as much as
// the program. Exact counts per module cut the spread to about +-2.5 %, and
// the mean over three seeds halves what is left.

#include "analysis/RoutingAnalysis.h"
#include "analysis/RoutingAnalyzer.h"
#include "check/InstrumentCheck.h"
#include "check/StructuralChecks.h"
#include "routing/CompiledRouting.h"

#include <QCoreApplication>
#include <QElapsedTimer>
#include <QRandomGenerator>

#include <sched.h>
#include <spawn.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <memory>
#include <string>
#include <vector>

using namespace rb;
using namespace Qt::StringLiterals;

namespace {

Code code(qint64 value, const QString& label, MissingKind missing = MissingKind::None) {
    Code c;
    c.code = value;
    c.label = label;
    c.missing = missing;
    return c;
}

// `n` copies of each value, shuffled: one module's worth of a property.
QList<int> deck(QRandomGenerator& rng, std::initializer_list<std::pair<int, int>> counts) {
    QList<int> cards;
    for (auto [value, n] : counts)
        cards.insert(cards.size(), n, value);
    for (qsizetype k = cards.size() - 1; k > 0; --k)
        cards.swapItemsAt(k, qsizetype(rng.bounded(quint32(k + 1))));
    return cards;
}

// Every module of 50 items has exactly 25 yes/no items, 15 on a scale and 10
// integers, 10 items with a skip rule and 2 with a filter, in random order;
// what the filters and rules read and where the skips go is drawn per item.
Instrument generate(int count, quint32 seed) {
    QRandomGenerator rng(seed);
    Instrument ins;
    ins.title = u"Generated garden survey"_s;
    ins.version = u"1"_s;
    ins.codeLists = {
        {u"yes_no"_s,
         {code(1, u"Yes"_s), code(2, u"No"_s), code(8, u"Don't know"_s, MissingKind::DontKnow),
          code(9, u"Refused"_s, MissingKind::Refused)}},
        {u"scale"_s,
         {code(1, u"Never"_s), code(2, u"Rarely"_s), code(3, u"Sometimes"_s), code(4, u"Often"_s),
          code(5, u"Always"_s), code(9, u"Refused"_s, MissingKind::Refused)}}};
    enum Kind { YesNo, Scale, Count };
    const int perModule = 50;
    QList<int> kinds, skips, filters;
    QStringList names;
    QList<ItemType> types;
    for (int i = 0; i < count; ++i) {
        if (i % perModule == 0) {
            Module m;
            m.name = u"m"_s + QString::number(i / perModule);
            m.title = m.name;
            ins.modules.append(m);
            kinds = deck(rng, {{YesNo, 25}, {Scale, 15}, {Count, 10}});
            skips = deck(rng, {{1, 10}, {0, 40}});
            filters = deck(rng, {{1, 2}, {0, 48}});
        }
        Item it;
        it.name = u"q"_s + QString::number(i);
        it.label = u"Question "_s + QString::number(i);
        it.text = it.label + u'?';
        const int kind = kinds.at(i % perModule);
        if (kind == YesNo) {
            it.type = ItemType::Single;
            it.codeListName = u"yes_no"_s;
        } else if (kind == Scale) {
            it.type = ItemType::Single;
            it.codeListName = u"scale"_s;
        } else {
            it.type = ItemType::Integer;
            it.range = std::make_pair(RangeBound{u"0"_s, 0}, RangeBound{u"50"_s, 50});
            it.missing = {code(98, u"Don't know"_s, MissingKind::DontKnow)};
        }
        auto recent = [&](int back) {
            return std::max(0, i - 1 - int(rng.bounded(quint32(back))));
        };
        auto atomOn = [&](int p) {
            const QString n = names.at(p);
            if (types.at(p) == ItemType::Integer)
                return n + u" >= "_s + QString::number(rng.bounded(40));
            return rng.bounded(2) ? n + u" = 1"_s : n + u" in (2..4)"_s;
        };
        if (i > 0 && filters.at(i % perModule)) {
            QString cond = atomOn(recent(8));
            if (rng.bounded(3) == 0)
                cond += u" and "_s + atomOn(recent(8));
            it.askIf = cond;
        }
        // Dense forward skips: a fifth of the items skip the next one or two
        // items on their own answer.
        if (skips.at(i % perModule) && i + 2 < count) {
            Rule r;
            r.condition =
                it.type == ItemType::Integer ? it.name + u" = 0"_s : it.name + u" in (2, 8, 9)"_s;
            r.target = u"q"_s + QString::number(std::min(count - 1, i + 2 + int(rng.bounded(2))));
            it.routing.append(r);
        }
        names.append(it.name);
        types.append(it.type);
        ins.modules.last().items.append(it);
    }
    return ins;
}

long peakKilobytes() {
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    return usage.ru_maxrss;
}

double cpuMilliseconds() {
    timespec t{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t);
    return double(t.tv_sec) * 1e3 + double(t.tv_nsec) / 1e6;
}

// Five runs of `work`: wall-clock and CPU time (the CPU time of this process
// is what other load on a shared machine disturbs least), each sorted (median at 2).
struct Runs {
    QList<double> wall, cpu;
};
// Writes a buffer larger than the machine's caches (the VM reports a 480 MiB
// L3), so that the next run starts with nothing of the last one cached, as a
// single `routebook check` does. Back-to-back runs otherwise keep a small
// instrument's whole working set cached from run to run, which a large one
// cannot be: the warm figures then compare cached with uncached work.
// A fresh process (this program again, started with --evict-caches CPU) on
// this process's core does the writing: caches are shared by physical
// address, and the buffer then never counts in our peak RSS. posix_spawn,
// unlike fork, leaves our pages as they are (no copy-on-write faults after).
int evictInThisProcess(int cpu) {
    cpu_set_t set;
    CPU_ZERO(&set);
    CPU_SET(cpu, &set);
    sched_setaffinity(0, sizeof set, &set);
    std::vector<unsigned char> buffer(std::size_t(1) << 30);
    std::memset(buffer.data(), 1, buffer.size());
    return buffer[buffer.size() / 2] == 1 ? 0 : 1;
}

const char* g_self = nullptr;

void evictCaches() {
    std::string cpu = std::to_string(sched_getcpu());
    char option[] = "--evict-caches";
    char* argv[] = {const_cast<char*>(g_self), option, cpu.data(), nullptr};
    pid_t child = 0;
    if (posix_spawnp(&child, g_self, nullptr, nullptr, argv, environ) != 0) {
        std::fprintf(stderr, "cannot start %s to empty the caches\n", g_self);
        std::exit(1);
    }
    int status = 0;
    waitpid(child, &status, 0);
}

enum class Caches { Warm, Evicted };

template <typename Work> Runs fiveRuns(Work work, Caches caches = Caches::Warm) {
    Runs runs;
    for (int run = 0; run < 5; ++run) {
        if (caches == Caches::Evicted)
            evictCaches();
        QElapsedTimer timer;
        timer.start();
        const double cpu = cpuMilliseconds();
        work();
        runs.cpu.append(cpuMilliseconds() - cpu);
        runs.wall.append(double(timer.nsecsElapsed()) / 1e6);
    }
    std::sort(runs.wall.begin(), runs.wall.end());
    std::sort(runs.cpu.begin(), runs.cpu.end());
    return runs;
}

// What one instrument measured: medians of five runs (ms) and the phases
// of one further run.
struct Figures {
    double full = 0, cpu = 0, cold = 0, analysis = 0;
    double compile = 0, programme = 0, universes = 0, findingsPhase = 0, structural = 0,
           release = 0;
    double conditional = 0, findings = 0, nodes = 0, programmeNodes = 0;

    static constexpr double Figures::*kFields[] = {
        &Figures::full,      &Figures::cpu,           &Figures::cold,
        &Figures::analysis,  &Figures::compile,       &Figures::programme,
        &Figures::universes, &Figures::findingsPhase, &Figures::structural,
        &Figures::release,   &Figures::conditional,   &Figures::findings,
        &Figures::nodes,     &Figures::programmeNodes};
};

Figures meanOf(const QList<Figures>& all) {
    Figures mean;
    for (double Figures::*field : Figures::kFields) {
        for (const Figures& f : all)
            mean.*field += f.*field;
        mean.*field /= double(all.size());
    }
    return mean;
}

// One more run split into phases. The results are kept and released at the
// end as in the full check, whose time then is the sum of the phases.
void timePhases(const Instrument& ins, Figures& f) {
    QElapsedTimer t;
    t.start();
    auto lap = [&t, last = 0.0]() mutable {
        const double now = double(t.nsecsElapsed()) / 1e6, lapped = now - last;
        last = now;
        return lapped;
    };
    auto routing = std::make_unique<CompiledRouting>(ins);
    f.compile = lap();
    auto analyzer = std::make_unique<analysis::RoutingAnalyzer>(*routing);
    f.programme = lap();
    f.programmeNodes = double(analyzer->algebra().mdd().nodeCount());
    QList<ItemUniverse> universes;
    universes.reserve(routing->itemCount());
    for (int p = 0; p < routing->itemCount(); ++p)
        universes.append(analyzer->universe(p));
    f.universes = lap();
    Findings findings = analyzer->findings();
    f.findingsPhase = lap();
    findings += structuralFindings(*routing);
    f.structural = lap();
    f.nodes = double(analyzer->algebra().mdd().nodeCount());
    universes = {};
    findings = {};
    analyzer.reset();
    routing.reset();
    f.release = lap();
}

Figures measure(const Instrument& ins) {
    Figures f;
    int findings = 0, conditional = 0;
    const Runs runs = fiveRuns([&] {
        const CompiledRouting routing(ins);
        findings = int(checkInstrument(routing).size());
    });
    // The same with the caches emptied before each run.
    const Runs coldRuns = fiveRuns(
        [&] {
            const CompiledRouting routing(ins);
            checkInstrument(routing);
        },
        Caches::Evicted);
    // The routing analysis alone (what this benchmark timed before it took the full check).
    const Runs analysisRuns = fiveRuns([&] {
        const CompiledRouting routing(ins);
        conditional = 0;
        for (const ItemUniverse& u : analyzeRouting(routing).universes)
            conditional += u.asked == ItemUniverse::Asked::Conditional ? 1 : 0;
    });
    timePhases(ins, f);
    f.full = runs.wall.at(2);
    f.cpu = runs.cpu.at(2);
    f.cold = coldRuns.wall.at(2);
    f.analysis = analysisRuns.wall.at(2);
    f.findings = findings;
    f.conditional = conditional;
    return f;
}

void printGrowth(double now, double before) {
    if (before > 0)
        std::printf(", growth x%.1f", now / before);
}

} // namespace

int main(int argc, char** argv) {
    if (argc == 3 && std::strcmp(argv[1], "--evict-caches") == 0)
        return evictInThisProcess(std::atoi(argv[2]));
    g_self = argv[0]; // as started (not /proc/self/exe, which under valgrind is valgrind)
    QCoreApplication app(argc, argv);
    QList<int> sizes;
    for (int i = 1; i < argc; ++i)
        sizes.append(QString::fromUtf8(argv[i]).toInt());
    if (sizes.isEmpty())
        sizes = {500, 5000, 50000};
    const QList<quint32> seeds = {4242, 4243, 4244};
    Figures previous;
    for (int size : sizes) {
        QList<Figures> each;
        for (quint32 seed : seeds)
            each.append(measure(generate(size, seed)));
        const Figures mean = meanOf(each);
        std::printf("        phases: compile %.1f, programme %.1f, universes %.1f, findings "
                    "%.1f, structural %.1f, release %.1f ms; %.2f diagram nodes per item (%.2f "
                    "after the programme)\n",
                    mean.compile, mean.programme, mean.universes, mean.findingsPhase,
                    mean.structural, mean.release, mean.nodes / size, mean.programmeNodes / size);
        std::printf("        analysis alone: median %.1f ms", mean.analysis);
        printGrowth(mean.analysis, previous.analysis);
        std::printf("\n        full check CPU time: median %.1f ms", mean.cpu);
        printGrowth(mean.cpu, previous.cpu);
        std::printf("\n        full check, caches emptied before each run: median %.1f ms",
                    mean.cold);
        printGrowth(mean.cold, previous.cold);
        std::printf("\n%6d items: full check median %9.1f ms (instruments %.1f, %.1f, %.1f), "
                    "%.0f conditional, %.0f findings, peak RSS %ld MB",
                    size, mean.full, each.at(0).full, each.at(1).full, each.at(2).full,
                    mean.conditional, mean.findings, peakKilobytes() / 1024);
        printGrowth(mean.full, previous.full);
        std::printf("\n");
        std::fflush(stdout);
        previous = mean;
    }
    return 0;
}
