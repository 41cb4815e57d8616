#include "DataCheck.h"

#include "ChunkChecker.h"
#include "CsvRange.h"

#include <QFileDevice>
#include <QSet>
#include <QThread>

#if defined(Q_OS_UNIX)
#include <sys/mman.h>
#include <unistd.h>
#endif

#include <condition_variable>
#include <cstring>
#include <deque>
#include <map>
#include <memory>
#include <mutex>
#include <optional>
#include <thread>

namespace rb {

qint64 ItemCounts::nonresponse() const {
    return nonresponseByKind[0] + nonresponseByKind[1] + nonresponseByKind[2] +
           nonresponseByKind[3];
}

QString cellClassName(CellClass c) {
    switch (c) {
    case CellClass::Answered:
        return QStringLiteral("answered");
    case CellClass::Blank:
        return QStringLiteral("blank");
    case CellClass::DontKnow:
        return QStringLiteral("dont_know");
    case CellClass::Refused:
        return QStringLiteral("refused");
    case CellClass::NotApplicable:
        return QStringLiteral("not_applicable");
    case CellClass::Invalid:
        return QStringLiteral("invalid");
    case CellClass::LegitimateSkip:
        return QStringLiteral("legitimate_skip");
    case CellClass::RoutingViolation:
        return QStringLiteral("routing_violation");
    }
    return {};
}

namespace {

#if defined(Q_OS_UNIX)
// A read-only mapping of part of a file, unmapped when destroyed (munmap may be
// called from any thread: the checking thread drops its block when done).
class FileWindow {
public:
    static std::unique_ptr<FileWindow> map(int fd, qint64 offset, qint64 length) {
        static const qint64 page = sysconf(_SC_PAGESIZE);
        const qint64 aligned = offset - offset % page;
        const size_t size = size_t(length + (offset - aligned));
        int flags = MAP_PRIVATE;
#if defined(MAP_POPULATE)
        flags |= MAP_POPULATE; // the pages in one call, not one fault each in the workers
#endif
        void* base = mmap(nullptr, size, PROT_READ, flags, fd, off_t(aligned));
        if (base == MAP_FAILED)
            return nullptr;
        return std::unique_ptr<FileWindow>(
            new FileWindow(base, size, static_cast<const char*>(base) + (offset - aligned)));
    }
    ~FileWindow() {
        munmap(m_base, m_size);
    }
    FileWindow(const FileWindow&) = delete;
    FileWindow& operator=(const FileWindow&) = delete;
    const char* data() const {
        return m_data;
    }

private:
    FileWindow(void* base, size_t size, const char* data)
        : m_base(base), m_size(size), m_data(data) {}
    void* m_base;
    size_t m_size;
    const char* m_data;
};
#else
class FileWindow {
public:
    static std::unique_ptr<FileWindow> map(int, qint64, qint64) { return nullptr; }
    const char* data() const { return nullptr; }
};
#endif

// Reads the response file in blocks that end at a record boundary. A regular
// file may be mapped window by window (DataCheckOptions::mapRegularFiles: its
// bytes are not copied, and the copy out of the page cache was a tenth of the
// reading thread's time); otherwise it is read, and the bytes after the last
// boundary are carried into the next block.
class BlockReader {
public:
    // Blocks of a few MB are checked one per task: large enough that the
    // per-block work is noise, small enough that a few in flight stay far below
    // 100 MB and that cancelling waits for at most one block.
    BlockReader(QIODevice& device, qint64 maxRecordBytes, qsizetype blockBytes, bool map)
        : m_device(device), m_maxRecordBytes(maxRecordBytes),
          m_blockBytes(qMax<qsizetype>(blockBytes, 1)) {
        auto* file = map ? qobject_cast<QFileDevice*>(&device) : nullptr;
        if (file && !file->isSequential() && file->handle() >= 0 &&
            !file->openMode().testFlag(QIODevice::Text)) { // text mode would change the bytes
            m_fd = file->handle();
            m_offset = file->pos();
            m_size = file->size();
        }
    }

    struct Block {
        QByteArray bytes;       // owned, or a view of `window`
        bool truncated = false; // the start of a record longer than the guard
        std::unique_ptr<FileWindow> window;
    };
    // False at the end of the input.
    bool next(Block& block) {
        block = Block();
        if (m_fd >= 0) {
            if (const std::optional<bool> mapped = nextMapped(block))
                return *mapped;
            m_fd = -1; // cannot map after all: read from where the mapping stopped
            if (!m_device.seek(m_offset))
                return false;
        }
        return nextRead(block);
    }
    qint64 skippedBytes() const { return m_skipped; }

private:
    // nullopt when the file cannot be mapped (nothing consumed then).
    std::optional<bool> nextMapped(Block& block) {
        if (m_offset >= m_size)
            return false;
        qint64 length = qMin<qint64>(m_blockBytes, m_size - m_offset);
        for (;;) {
            std::unique_ptr<FileWindow> window = FileWindow::map(m_fd, m_offset, length);
            if (!window)
                return std::nullopt;
            const bool last = m_offset + length == m_size;
            const char* data = window->data();
            if (!m_bomChecked && (length >= 3 || last)) {
                m_bomChecked = true; // a UTF-8 byte order mark is not part of the first field
                if (length >= 3 && std::memcmp(data, "\xEF\xBB\xBF", 3) == 0) {
                    m_offset += 3;
                    length -= 3;
                    data += 3;
                    m_skipped = 3;
                }
            }
            qsizetype take = 0;
            if (last) {
                take = qsizetype(length);
            } else if (m_bomChecked) {
                take = lastRecordEnd(data, qsizetype(length));
                if (take == 0 && length > m_maxRecordBytes) {
                    take = qsizetype(length);
                    block.truncated = true; // the check stops at this record
                }
            }
            if (take > 0 || last) {
                block.bytes = QByteArray::fromRawData(data, take);
                block.window = std::move(window);
                m_offset = block.truncated ? m_size : m_offset + take;
                return take > 0;
            }
            length = qMin(2 * length, m_size - m_offset); // a record longer than the window
        }
    }

    bool nextRead(Block& block) {
        block.bytes = std::move(m_carry);
        m_carry = QByteArray();
        for (;;) {
            const qsizetype old = block.bytes.size();
            if (!m_eof) {
                block.bytes.resize(old + m_blockBytes);
                const qint64 got = m_device.read(block.bytes.data() + old, m_blockBytes);
                block.bytes.resize(old + qMax<qint64>(got, 0));
                m_eof = got <= 0;
            }
            if (!m_bomChecked && (block.bytes.size() >= 3 || m_eof)) {
                m_bomChecked = true; // a UTF-8 byte order mark is not part of the first field
                if (block.bytes.startsWith("\xEF\xBB\xBF")) {
                    block.bytes.remove(0, 3);
                    m_skipped = 3;
                }
            }
            if (m_eof)
                return !block.bytes.isEmpty();
            if (!m_bomChecked)
                continue;
            const qsizetype end = lastRecordEnd(block.bytes.constData(), block.bytes.size());
            if (end > 0) {
                m_carry = block.bytes.mid(end);
                block.bytes.truncate(end);
                return true;
            }
            if (block.bytes.size() > m_maxRecordBytes) {
                block.truncated = true;
                m_eof = true; // the check stops at this record
                return true;
            }
        }
    }

    QIODevice& m_device;
    qint64 m_maxRecordBytes;
    qsizetype m_blockBytes;
    int m_fd = -1; // mapped reading while >= 0
    qint64 m_offset = 0, m_size = 0;
    QByteArray m_carry;
    bool m_eof = false, m_bomChecked = false;
    qint64 m_skipped = 0;
};

DataCheckResult emptyResult(const CompiledRouting& routing, const HeaderMapping& mapping,
                            const RecordProgram& program) {
    DataCheckResult result;
    result.unknownColumns = mapping.unknownColumns;
    result.missingColumns = mapping.missingColumns;
    for (int p = 0; p < routing.itemCount(); ++p) {
        if (!program.hasVariable(p))
            continue;
        const Item& item = *routing.index().at(p).item;
        ItemCounts counts;
        counts.name = item.name;
        counts.type = itemTypeName(item.type);
        counts.position = p;
        QSet<qint64> listed; // a duplicate code (a check finding) is counted once
        for (const Code& code : routing.codes(p))
            if (!listed.contains(code.code)) {
                listed.insert(code.code);
                counts.frequencies.append({code.code, code.label, code.missing, 0});
            }
        result.items.append(counts);
    }
    return result;
}

QStringList analysisHeader(const CompiledRouting& routing, const HeaderMapping& mapping,
                           const RecordProgram& program, const AnalysisOptions& options) {
    QStringList columns = mapping.headerNames;
    if (options.flags)
        for (int p = 0; p < routing.itemCount(); ++p)
            if (program.hasVariable(p))
                columns.append(routing.index().at(p).item->name + QStringLiteral("_flag"));
    return columns;
}

// Adds the blocks' tallies in file order into the result.
class Merger {
public:
    Merger(const CompiledRouting& routing, const HeaderMapping& mapping,
           const RecordProgram& program, const QString& fileName, const DataCheckOptions& options)
        : m_routing(routing), m_mapping(mapping), m_program(program), m_cells(routing, mapping),
          m_fileName(fileName), m_options(options),
          m_result(emptyResult(routing, mapping, program)) {}

    void setStart(qint64 line) { m_line = line; }
    // False when the block failed: error() then says why.
    bool add(const ChunkTally& t);
    const Diagnostic& error() const { return m_error; }
    DataCheckResult take() {
        m_result.records = m_records;
        return std::move(m_result);
    }
    Diagnostic at(const QString& message) const {
        return Diagnostic{m_fileName, int(m_line), 0, message};
    }

private:
    void addProblems(const ChunkTally::Problems& from, ProblemRecords& into) const;
    Diagnostic invalidCell(const ChunkTally::InvalidCell& cell) const;

    const CompiledRouting& m_routing;
    const HeaderMapping& m_mapping;
    const RecordProgram& m_program;
    CellInterpreter m_cells; // for the words of the invalid-value messages
    QString m_fileName;
    const DataCheckOptions& m_options;
    DataCheckResult m_result;
    qint64 m_records = 0; // records before the block being added
    qint64 m_line = 1;    // file line where the block starts
    Diagnostic m_error;
};

void Merger::addProblems(const ChunkTally::Problems& from, ProblemRecords& into) const {
    into.count += from.count;
    for (qint64 r : from.firstRecords)
        if (into.first.size() < m_options.firstRecordsKept)
            into.first.append(QString::number(m_records + r));
    for (const QString& id : from.firstIds)
        if (into.first.size() < m_options.firstRecordsKept)
            into.first.append(id);
}

Diagnostic Merger::invalidCell(const ChunkTally::InvalidCell& cell) const {
    const ItemCounts& counts = m_result.items.at(m_program.resultIndex(cell.position));
    return Diagnostic{
        m_fileName, int(m_line + cell.line), cell.column >= 0 ? cell.column + 1 : 0,
        QStringLiteral("record %1: invalid value%2 for %3 item '%4' (expected %5)")
            .arg(m_records + cell.record)
            .arg(cell.value.isEmpty() ? QString() : QStringLiteral(" '%1'").arg(cell.value))
            .arg(counts.type, counts.name, m_cells.domainOf(cell.position))};
}

bool Merger::add(const ChunkTally& t) {
    if (t.error) {
        const ChunkTally::Error& e = *t.error;
        const QString message = e.record < 0
                                    ? e.message
                                    : QStringLiteral("record %1 has %2 fields; the header has %3")
                                          .arg(m_records + e.record)
                                          .arg(e.fields)
                                          .arg(m_mapping.columnCount);
        m_error = Diagnostic{m_fileName, int(m_line + e.line), e.column, message};
        return false;
    }
    for (qsizetype i = 0; i < m_result.items.size(); ++i) {
        ItemCounts& c = m_result.items[i];
        const qint64* n = t.counters.data() + size_t(i) * ChunkTally::kCounters;
        c.presented += RecordProgram::presentedCount(n);
        c.answered += n[ChunkTally::Answered];
        for (int k = 0; k < 4; ++k)
            c.nonresponseByKind[size_t(k)] += n[ChunkTally::Blank + k];
        c.invalid += n[ChunkTally::Invalid];
        c.legitimateSkip += n[ChunkTally::LegitimateSkip];
        c.routingViolation += n[ChunkTally::Violation];
        c.skipAfterMissingGate += n[ChunkTally::SkipAfterMissingGate];
        c.breakOffStarts += n[ChunkTally::BreakOffStarts];
        c.implied += n[ChunkTally::Implied];
        const int base = m_program.frequencyBase(c.position);
        for (qsizetype f = 0; f < c.frequencies.size(); ++f)
            c.frequencies[f].count += t.frequencies[size_t(base + f)];
    }
    addProblems(t.problems[ChunkTally::Violations], m_result.violations);
    addProblems(t.problems[ChunkTally::InvalidRecords], m_result.invalid);
    addProblems(t.problems[ChunkTally::BreakOffs], m_result.breakOffs);
    addProblems(t.problems[ChunkTally::EmptyRecords], m_result.emptyRecords);
    addProblems(t.problems[ChunkTally::Loops], m_result.loops);
    for (const ChunkTally::InvalidCell& cell : t.invalidCells)
        if (m_result.invalidCells.size() < m_options.invalidCellsKept)
            m_result.invalidCells.append(invalidCell(cell));
    m_records += t.records;
    m_line += t.lines;
    return true;
}

// A block handed to a worker, and its tally once checked.
struct Task {
    qint64 index = 0;
    BlockReader::Block block;
    qsizetype offset = 0; // the header's bytes in the first block
    qint64 bytes = 0;     // the block's size, for progress
    ChunkTally tally;
};

// Worker threads checking blocks; results come back by block index so the
// merge can go in file order.
class WorkerPool {
public:
    WorkerPool(int threads, const std::function<ChunkChecker()>& makeChecker) {
        for (int k = 0; k < threads; ++k)
            m_threads.emplace_back([this, checker = makeChecker()]() mutable { work(checker); });
    }
    ~WorkerPool() {
        {
            std::lock_guard lock(m_mutex);
            m_stop = true;
        }
        m_wake.notify_all();
        for (std::thread& t : m_threads)
            t.join();
    }
    void push(Task task) {
        {
            std::lock_guard lock(m_mutex);
            m_queue.push_back(std::move(task));
            ++m_inFlight;
        }
        m_wake.notify_one();
    }
    int inFlight() {
        std::lock_guard lock(m_mutex);
        return m_inFlight;
    }
    // Waits for the block with this index (it must have been pushed).
    Task take(qint64 index) {
        std::unique_lock lock(m_mutex);
        m_doneChanged.wait(lock, [&] { return m_done.count(index) > 0; });
        Task t = std::move(m_done[index]);
        m_done.erase(index);
        --m_inFlight;
        return t;
    }

private:
    void work(ChunkChecker& checker) {
        for (;;) {
            Task task;
            {
                std::unique_lock lock(m_mutex);
                m_wake.wait(lock, [&] { return m_stop || !m_queue.empty(); });
                if (m_stop)
                    return;
                task = std::move(m_queue.front());
                m_queue.pop_front();
            }
            const QByteArray& b = task.block.bytes;
            checker.run(b.constData() + task.offset, b.constData() + b.size(), task.block.truncated,
                        task.tally);
            task.block = BlockReader::Block(); // free (or unmap) the block before the merge
            {
                std::lock_guard lock(m_mutex);
                const qint64 index = task.index;
                m_done.emplace(index, std::move(task));
            }
            m_doneChanged.notify_all();
        }
    }

    std::vector<std::thread> m_threads;
    std::mutex m_mutex;
    std::condition_variable m_wake, m_doneChanged;
    std::deque<Task> m_queue;
    std::map<qint64, Task> m_done;
    int m_inFlight = 0;
    bool m_stop = false;
};

int workerCount(const DataCheckOptions& options) {
    const int wanted = options.threads > 0 ? options.threads : QThread::idealThreadCount();
    return qBound(1, wanted, 16);
}

} // namespace

DataCheckOutcome runDataCheck(const CompiledRouting& routing, QIODevice& csv,
                              const QString& fileName, const DataCheckOptions& options,
                              AnalysisSink* analysis, const AnalysisOptions& analysisOptions) {
    DataCheckOutcome outcome;
    // A block's analysis rows are as long as the block and, with flags, several
    // times longer: smaller blocks keep the rows in flight as small as the blocks were.
    BlockReader reader(csv, options.maxRecordBytes,
                       analysis ? qMax<qsizetype>(options.blockBytes / 4, 1) : options.blockBytes,
                       options.mapRegularFiles);
    Task first;
    if (!reader.next(first.block)) {
        outcome.error = Diagnostic{
            fileName, 1, 1,
            QStringLiteral("the file is empty: expected a header row of variable names")};
        return outcome;
    }
    // The header is the first record of the first block.
    const QByteArray& bytes = first.block.bytes;
    CsvRange header(bytes.constData(), bytes.constData() + bytes.size(), options.maxRecordBytes);
    const CsvRange::Status status = first.block.truncated ? CsvRange::Status::Error : header.next();
    if (status != CsvRange::Status::Record) {
        const CsvRange::Error e =
            first.block.truncated
                ? CsvRange::Error{0, 1, CsvRange::guardMessage(options.maxRecordBytes)}
                : header.error();
        outcome.error = Diagnostic{fileName, int(1 + e.line), e.column, e.message};
        return outcome;
    }
    HeaderMappingResult mapped = mapHeader(routing, header.fields(), fileName, options.idColumn);
    if (mapped.error) {
        outcome.error = mapped.error;
        return outcome;
    }
    const HeaderMapping& mapping = mapped.mapping;
    first.offset = header.consumed();
    const RecordProgram program(routing, mapping);
    if (analysis)
        analysis->header(analysisHeader(routing, mapping, program, analysisOptions));
    Merger merger(routing, mapping, program, fileName, options);
    merger.setStart(1 + header.linesDone());
    auto makeChecker = [&] {
        return ChunkChecker(routing, program, mapping, options, analysisOptions,
                            analysis != nullptr);
    };
    const int threads = workerCount(options);
    qint64 checkedBytes = reader.skippedBytes();
    auto progress = [&](qint64 blockBytes) {
        checkedBytes += blockBytes;
        return !options.progress || options.progress(checkedBytes);
    };
    auto cancelled = [&] {
        outcome.error = merger.at(QStringLiteral("the data check was cancelled"));
        return outcome;
    };

    // Worker threads (one or more): a few blocks in flight, merged in file order
    // as they come back, with their analysis rows.
    WorkerPool pool(threads, makeChecker);
    // Two blocks per thread keep every core busy; at most about 64 MB of blocks
    // in flight keeps the peak memory bounded on machines with many cores.
    const int maxInFlight =
        qMin(2 * threads,
             qMax(threads + 1, int((qint64(64) << 20) / qMax<qsizetype>(options.blockBytes, 1))));
    qint64 pushed = 0, merged = 0;
    bool more = true;
    first.bytes = first.block.bytes.size();
    pool.push(std::move(first));
    ++pushed;
    while (merged < pushed) {
        while (more && pool.inFlight() < maxInFlight) {
            Task task;
            task.index = pushed;
            more = reader.next(task.block);
            if (!more)
                break;
            task.bytes = task.block.bytes.size();
            pool.push(std::move(task));
            ++pushed;
        }
        Task done = pool.take(merged++);
        if (!merger.add(done.tally)) {
            outcome.error = merger.error();
            return outcome;
        }
        if (analysis) // in file order; an error above leaves the rest unwritten
            analysis->rows(done.tally.analysisRows);
        if (!progress(done.bytes))
            return cancelled();
    }
    outcome.result = merger.take();
    return outcome;
}

} // namespace rb
