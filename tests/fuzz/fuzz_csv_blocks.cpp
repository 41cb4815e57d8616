// libFuzzer target, differential: the data check's block parser (CsvRange, with
// lastRecordEnd cutting blocks) against the streaming CSV reader, which is the
// reference. The first input byte picks the record-length guard and where a
// block is cut; the rest is the file. Both readers must agree on every record,
// its fields and first line, and on the first error (line, column, message);
// cutting the file at lastRecordEnd and parsing the two blocks one after the
// other must give the same records as reading it whole.
#include "data/CsvRange.h"
#include "data/CsvReader.h"

#include <QBuffer>

#include <cstdint>
#include <cstdlib>
#include <vector>

namespace {

struct Record {
    qint64 line; // 1-based
    std::vector<QByteArray> fields;
    bool operator==(const Record&) const = default;
};

void check(bool ok) {
    if (!ok)
        std::abort();
}

// Every record of [begin, end) through CsvRange, lines offset by `firstLine`;
// false when the range reports an error.
bool rangeRecords(const char* begin, const char* end, qint64 guard, qint64 firstLine,
                  std::vector<Record>& out, qint64& linesDone) {
    rb::CsvRange range(begin, end, guard);
    for (;;) {
        switch (range.next()) {
        case rb::CsvRange::Status::Record: {
            Record r{firstLine + range.recordLine() + 1, {}};
            for (QByteArrayView f : range.fields())
                r.fields.push_back(f.toByteArray());
            out.push_back(std::move(r));
            continue;
        }
        case rb::CsvRange::Status::End:
            linesDone = range.linesDone();
            return true;
        case rb::CsvRange::Status::Error:
            return false;
        }
    }
}

} // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
    if (size == 0)
        return 0;
    static const qint64 guards[] = {12, 40, 1000, 1 << 20};
    const qint64 guard = guards[data[0] & 3];
    QByteArray text(reinterpret_cast<const char*>(data + 1), qsizetype(size - 1));

    QBuffer buffer(&text);
    buffer.open(QIODevice::ReadOnly);
    rb::CsvReader reader(buffer, QStringLiteral("fuzz.csv"), guard);
    // The data check drops a UTF-8 byte order mark before it cuts blocks, as
    // the streaming reader does.
    const QByteArray body = text.startsWith("\xEF\xBB\xBF") ? text.mid(3) : text;
    rb::CsvRange range(body.constData(), body.constData() + body.size(), guard);
    std::vector<Record> whole;
    for (size_t n = 0; n <= size + 1; ++n) {
        const rb::CsvReader::Status a = reader.next();
        const rb::CsvRange::Status b = range.next();
        check(int(a) == int(b));
        if (a == rb::CsvReader::Status::Error) {
            check(range.error().line + 1 == qint64(reader.error().line));
            check(range.error().column == reader.error().column);
            check(range.error().message == reader.error().message);
            return 0;
        }
        if (a == rb::CsvReader::Status::End)
            break;
        check(range.recordLine() + 1 == reader.recordLine());
        Record r{reader.recordLine(), {}};
        for (QByteArrayView f : reader.fields())
            r.fields.push_back(f.toByteArray());
        std::vector<QByteArray> fast;
        for (QByteArrayView f : range.fields())
            fast.push_back(f.toByteArray());
        check(fast == r.fields);
        whole.push_back(std::move(r));
    }
    check(whole.size() <= size + 1); // the readers advance

    // The file read whole is clean: cut it as the data check cuts its blocks.
    const qsizetype prefix = qsizetype((data[0] >> 2) * body.size() / 63);
    const qsizetype cut = rb::lastRecordEnd(body.constData(), prefix);
    check(cut >= 0 && cut <= prefix);
    std::vector<Record> split;
    qint64 firstLines = 0, secondLines = 0;
    check(rangeRecords(body.constData(), body.constData() + cut, guard, 0, split, firstLines));
    check(rangeRecords(body.constData() + cut, body.constData() + body.size(), guard, firstLines,
                       split, secondLines));
    check(split == whole);
    return 0;
}
