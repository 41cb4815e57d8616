#include "CsvReader.h"

#include <cstring>

namespace rb {

namespace {
constexpr qsizetype kBlockBytes = 1 << 20;
} // namespace

CsvReader::CsvReader(QIODevice& device, const QString& fileName, qint64 maxRecordBytes)
    : m_device(device), m_fileName(fileName), m_maxRecordBytes(maxRecordBytes) {}

// Drops the consumed front of the buffer and appends one block; false at end of input.
bool CsvReader::fill() {
    if (m_eof)
        return false;
    if (m_pos > 0) {
        m_buffer.remove(0, m_pos);
        m_consumedBefore += m_pos;
        m_pos = 0;
    }
    const qsizetype old = m_buffer.size();
    m_buffer.resize(old + kBlockBytes);
    const qint64 got = m_device.read(m_buffer.data() + old, kBlockBytes);
    m_buffer.resize(old + qMax<qint64>(got, 0));
    if (got <= 0)
        m_eof = true;
    // The byte order mark is looked for once 3 bytes (or the whole input) are in.
    if (!m_started && (m_buffer.size() >= 3 || m_eof)) {
        m_started = true;
        // A UTF-8 byte order mark is not part of the first field.
        if (m_buffer.startsWith("\xEF\xBB\xBF"))
            m_pos = 3;
    }
    return got > 0;
}

CsvReader::Status CsvReader::fail(qint64 line, qsizetype lineStart, qsizetype at,
                                  const QString& message) {
    m_error = Diagnostic{m_fileName, int(line), int(at - lineStart + 1), message};
    return Status::Error;
}

CsvReader::Status CsvReader::next() {
    if (!m_error.message.isEmpty())
        return Status::Error;
    while (!m_started)
        fill();
    for (;;) {
        while (m_pos == m_buffer.size() && !m_eof)
            fill();
        if (m_pos == m_buffer.size())
            return Status::End;
        const qsizetype start = m_pos;
        const Parse parsed = parseRecord();
        if (parsed == Parse::Failed)
            return fail(m_failLine, m_failLineStart, m_failAt, m_failMessage);
        if (parsed == Parse::Done) {
            if (m_pos - start > m_maxRecordBytes)
                return fail(
                    m_recordLine, start, start,
                    QStringLiteral("record is longer than the line-length guard of %1 bytes")
                        .arg(m_maxRecordBytes));
            m_fields.clear();
            m_fields.reserve(m_spans.size());
            for (const Span& s : m_spans)
                m_fields.emplace_back((s.inScratch ? m_scratch.constData() : m_buffer.constData()) +
                                          s.offset,
                                      s.size);
            return Status::Record;
        }
        // NeedMore: the record runs past the buffer; read on and parse it again.
        if (m_buffer.size() - m_pos > m_maxRecordBytes)
            return fail(m_line, m_pos, m_pos,
                        QStringLiteral("record is longer than the line-length guard of %1 bytes")
                            .arg(m_maxRecordBytes));
        fill();
    }
}

// Parses one record from m_pos. On Done, m_pos and m_line move past it; on
// NeedMore nothing moves (the caller reads more and calls again).
CsvReader::Parse CsvReader::parseRecord() {
    const char* d = m_buffer.constData();
    const qsizetype n = m_buffer.size();
    qsizetype i = m_pos;
    qint64 line = m_line;
    qsizetype lineStart = m_pos;
    m_spans.clear();
    m_scratch.clear();
    auto failAt = [&](qsizetype at, const QString& message) {
        m_failLine = line;
        m_failLineStart = lineStart;
        m_failAt = at;
        m_failMessage = message;
        return Parse::Failed;
    };
    for (;;) {
        if (i < n && d[i] == '"') {
            const qsizetype open = i, openLineStart = lineStart;
            const qint64 openLine = line;
            const qsizetype from = m_scratch.size();
            ++i;
            for (;;) {
                const void* q = i < n ? std::memchr(d + i, '"', size_t(n - i)) : nullptr;
                if (!q) {
                    if (!m_eof)
                        return Parse::NeedMore;
                    line = openLine;
                    lineStart = openLineStart;
                    return failAt(open, QStringLiteral("unterminated quoted field"));
                }
                const qsizetype at = static_cast<const char*>(q) - d;
                for (qsizetype k = i; k < at; ++k)
                    if (d[k] == '\n') {
                        ++line;
                        lineStart = k + 1;
                    }
                m_scratch.append(d + i, at - i);
                i = at + 1;
                if (i == n && !m_eof)
                    return Parse::NeedMore;
                if (i < n && d[i] == '"') { // a doubled quote stands for one quote
                    m_scratch.append('"');
                    ++i;
                    continue;
                }
                break;
            }
            m_spans.push_back({from, m_scratch.size() - from, true});
        } else {
            const qsizetype from = i;
            while (i < n) {
                const char c = d[i];
                if (c == ',' || c == '\n' || c == '\r' || c == '"')
                    break;
                ++i;
            }
            if (i == n && !m_eof)
                return Parse::NeedMore;
            if (i < n && d[i] == '"')
                return failAt(i, QStringLiteral("quote inside an unquoted field (quote the whole "
                                                "field and double the quote)"));
            m_spans.push_back({from, i - from, false});
        }
        if (i == n) { // end of input ends the last record
            m_pos = i;
            m_recordLine = m_line;
            m_line = line;
            return Parse::Done;
        }
        const char c = d[i];
        if (c == ',') {
            ++i;
            continue;
        }
        if (c == '\r' && i + 1 == n && !m_eof)
            return Parse::NeedMore;
        if (c == '\n' || (c == '\r' && i + 1 < n && d[i + 1] == '\n')) {
            m_pos = i + (c == '\r' ? 2 : 1);
            m_recordLine = m_line;
            m_line = line + 1;
            return Parse::Done;
        }
        if (c == '\r')
            return failAt(i, QStringLiteral("carriage return not followed by a line feed"));
        return failAt(i, QStringLiteral("expected a comma or a line end after a closing quote"));
    }
}

} // namespace rb
