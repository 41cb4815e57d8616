// Benchmark of the data check (not a ctest test; timings are printed, never asserted).
//   datacheck_bench generate DIR RECORDS [ITEMS]   writes DIR/bench.yaml and DIR/bench.csv
//   datacheck_bench run DIR [THREADS]              checks DIR/bench.csv, prints MB/s and peak
//   memory (THREADS 0 or absent: one per core)
//   datacheck_bench loop DIR                       a plain byte loop over DIR/bench.csv (the
//   floor: read in 4 MB blocks, count line feeds and commas, touch every byte)
// The generated instrument: ITEMS (default 300) items in groups of 10; the first item
// of a group is a yes/no gate, the next 9 are asked only if it is 1 (about 44% of the
// cells are legitimately skipped: 9/10 of the items with a 1-in-2 gate ... see below).
#include "data/DataCheck.h"
#include "storage/YamlFormat.h"

#include <QCoreApplication>
#include <QElapsedTimer>
#include <QFile>
#include <QRandomGenerator>
#include <QTextStream>
#include <QThread>

#include <sys/resource.h>

using namespace rb;

static int generate(const QString& dir, qint64 records, int items) {
    QByteArray yaml =
        "routebook: 1\ninstrument: {title: \"Bench\", version: \"1\", language: \"en\"}\n"
        "code_lists:\n  yn:\n    - {code: 1, label: \"Yes\"}\n    - {code: 2, label: \"No\"}\n"
        "    - {code: 9, label: \"Refused\", missing: refused}\nmodules:\n  - name: m\n    "
        "items:\n";
    for (int i = 0; i < items; ++i) {
        const QByteArray name = "v" + QByteArray::number(i);
        if (i % 10 == 0)
            yaml += "      - {name: " + name + ", text: \"Gate?\", type: single, codes: yn}\n";
        else
            yaml += "      - {name: " + name +
                    ", text: \"How many?\", type: integer, range: [0, 99], "
                    "ask_if: \"v" +
                    QByteArray::number(i - i % 10) + " = 1\"}\n";
    }
    QFile y(dir + QStringLiteral("/bench.yaml"));
    if (!y.open(QIODevice::WriteOnly))
        return 2;
    y.write(yaml);
    QFile c(dir + QStringLiteral("/bench.csv"));
    if (!c.open(QIODevice::WriteOnly))
        return 2;
    QByteArray header;
    for (int i = 0; i < items; ++i)
        header += (i ? ",v" : "v") + QByteArray::number(i);
    c.write(header + "\n");
    QRandomGenerator rng(300);
    QByteArray line;
    for (qint64 r = 0; r < records; ++r) {
        line.clear();
        bool open = false;
        for (int i = 0; i < items; ++i) {
            if (i)
                line += ',';
            if (i % 10 == 0) {
                // Gate: 1 with probability 0.55, so 0.45 x 9/10 = 40.5% of cells are skipped.
                const int g = rng.bounded(100) < 55 ? 1 : (rng.bounded(50) ? 2 : 9);
                open = g == 1;
                line += QByteArray::number(g);
            } else if (open) {
                line += QByteArray::number(rng.bounded(100));
            }
        }
        c.write(line + "\n");
    }
    return 0;
}

static int byteLoop(const QString& dir) {
    QFile data(dir + QStringLiteral("/bench.csv"));
    if (!data.open(QIODevice::ReadOnly))
        return 2;
    QElapsedTimer clock;
    clock.start();
    QByteArray block(4 << 20, Qt::Uninitialized);
    qint64 lines = 0, commas = 0, total = 0;
    for (qint64 got; (got = data.read(block.data(), block.size())) > 0;) {
        total += got;
        for (qint64 k = 0; k < got; ++k) {
            lines += block[k] == '\n';
            commas += block[k] == ',';
        }
    }
    const double seconds = double(clock.nsecsElapsed()) / 1e9;
    QTextStream(stdout) << "byte loop: " << lines << " lines, " << commas << " commas, "
                        << QString::number(seconds, 'f', 2) << " s, "
                        << QString::number(double(total) / 1e6 / seconds, 'f', 1) << " MB/s\n";
    return 0;
}

static int runCheck(const QString& dir, int threads) {
    LoadResult loaded = loadYamlFile(dir + QStringLiteral("/bench.yaml"));
    if (!loaded.ok())
        return 2;
    const CompiledRouting routing(*loaded.instrument);
    QFile data(dir + QStringLiteral("/bench.csv"));
    if (!data.open(QIODevice::ReadOnly))
        return 2;
    QElapsedTimer clock;
    clock.start();
    DataCheckOptions options;
    options.threads = threads;
    options.mapRegularFiles = true; // as the command line does
    const DataCheckOutcome outcome = runDataCheck(routing, data, data.fileName(), options);
    const double seconds = double(clock.nsecsElapsed()) / 1e9;
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    QTextStream out(stdout);
    if (!outcome.result) {
        out << outcome.error->toString() << '\n';
        return 2;
    }
    qint64 skipped = 0, cells = 0;
    for (const ItemCounts& c : outcome.result->items) {
        skipped += c.legitimateSkip;
        cells += outcome.result->records;
    }
    const double mb = double(data.size()) / 1e6;
    out << "records " << outcome.result->records << ", " << QString::number(mb, 'f', 1) << " MB, "
        << QString::number(100.0 * double(skipped) / double(cells), 'f', 1)
        << "% legitimately skipped\n"
        << "data check: " << QString::number(seconds, 'f', 2) << " s, "
        << QString::number(mb / seconds, 'f', 1) << " MB/s, peak RSS " << usage.ru_maxrss / 1024
        << " MB, " << (threads > 0 ? threads : QThread::idealThreadCount()) << " thread(s)\n";
    return 0;
}

int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    const QStringList args = app.arguments();
    if (args.size() >= 4 && args.at(1) == QLatin1String("generate"))
        return generate(args.at(2), args.at(3).toLongLong(),
                        args.size() > 4 ? args.at(4).toInt() : 300);
    if ((args.size() == 3 || args.size() == 4) && args.at(1) == QLatin1String("run"))
        return runCheck(args.at(2), args.size() == 4 ? args.at(3).toInt() : 0);
    if (args.size() == 3 && args.at(1) == QLatin1String("loop"))
        return byteLoop(args.at(2));
    QTextStream(stderr)
        << "usage: datacheck_bench generate DIR RECORDS [ITEMS] | run DIR [THREADS] | loop DIR\n";
    return 2;
}
