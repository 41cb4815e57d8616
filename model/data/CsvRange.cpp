#include "CsvRange.h"

#include <cstring>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace rb {

namespace {

// Bytes that end an unquoted field or make it an error.
struct StopTable {
    bool stop[256] = {};
    constexpr StopTable() {
        stop[size_t(',')] = stop[size_t('\n')] = stop[size_t('\r')] = stop[size_t('"')] = true;
    }
};
constexpr StopTable kStops;

} // namespace

CsvRange::CsvRange(const char* begin, const char* end, qint64 maxRecordBytes)
    : m_begin(begin), m_pos(begin), m_end(end), m_maxRecordBytes(maxRecordBytes) {}

QString CsvRange::guardMessage(qint64 maxRecordBytes) {
    return QStringLiteral("record is longer than the line-length guard of %1 bytes")
        .arg(maxRecordBytes);
}

CsvRange::Status CsvRange::fail(qint64 line, const char* lineStart, const char* at,
                                const QString& message) {
    m_error = Error{line, int(at - lineStart + 1), message};
    m_pos = m_end;
    return Status::Error;
}

// Most records hold no quote and no carriage return: their fields end at the
// commas and the record at the first line feed. This finds them 32 bytes at a
// time; anything else (a quote, a carriage return, the last bytes of the range,
// a record over the guard) is left to the careful path, which starts again from
// the record's first byte and so gives the same fields and errors.
bool CsvRange::nextPlain() {
#if defined(__SSE2__)
    const char* const start = m_pos;
    const char* from = start;
    const __m128i comma = _mm_set1_epi8(','), lineFeed = _mm_set1_epi8('\n'),
                  quote = _mm_set1_epi8('"'), carriageReturn = _mm_set1_epi8('\r');
    // One bit per byte of 32 bytes (two 16-byte loads) where the byte is `c`.
    auto mask = [](__m128i low, __m128i high, __m128i c) {
        return unsigned(_mm_movemask_epi8(_mm_cmpeq_epi8(low, c))) |
               (unsigned(_mm_movemask_epi8(_mm_cmpeq_epi8(high, c))) << 16);
    };
    // Fields go straight into the storage, which always has room for the 33
    // fields a 32-byte chunk can end (no capacity check per field).
    QByteArrayView* out = m_fields.data();
    std::size_t count = 0;
    for (const char* i = start; m_end - i >= 32 && i - start <= m_maxRecordBytes; i += 32) {
        if (m_fields.size() - count < 33) {
            m_fields.resize(2 * m_fields.size() + 64);
            out = m_fields.data();
        }
        const __m128i low = _mm_loadu_si128(reinterpret_cast<const __m128i*>(i));
        const __m128i high = _mm_loadu_si128(reinterpret_cast<const __m128i*>(i + 16));
        const unsigned ends = mask(low, high, lineFeed);
        const unsigned upTo = ends ? (ends ^ (ends - 1)) : ~0u; // through the first line feed
        if ((mask(low, high, quote) | mask(low, high, carriageReturn)) & upTo)
            break;
        for (unsigned commas = mask(low, high, comma) & upTo; commas; commas &= commas - 1) {
            const char* at = i + __builtin_ctz(commas);
            out[count++] = QByteArrayView(from, at - from);
            from = at + 1;
        }
        if (!ends)
            continue;
        const char* at = i + __builtin_ctz(ends);
        if (at + 1 - start > m_maxRecordBytes)
            break;
        out[count++] = QByteArrayView(from, at - from);
        m_count = count;
        m_recordLine = m_line++;
        m_pos = at + 1;
        return true;
    }
#endif
    return false;
}

void CsvRange::addField(QByteArrayView field) {
    if (m_count == m_fields.size())
        m_fields.resize(2 * m_fields.size() + 64);
    m_fields[m_count++] = field;
}

CsvRange::Status CsvRange::next() {
    if (!m_error.message.isEmpty())
        return Status::Error;
    if (m_pos == m_end)
        return Status::End;
    m_count = 0;
    if (nextPlain())
        return Status::Record;
    const char* const start = m_pos;
    const char* const n = m_end;
    const char* i = m_pos;
    qint64 line = m_line;
    const char* lineStart = start;
    m_scratchFields.clear();
    m_scratch.clear();
    for (;;) {
        if (i < n && *i == '"') {
            const char* const open = i;
            const char* const openLineStart = lineStart;
            const qint64 openLine = line;
            const char* from = ++i;
            bool escaped = false;
            qsizetype scratchFrom = m_scratch.size();
            for (;;) {
                const void* q = i < n ? std::memchr(i, '"', size_t(n - i)) : nullptr;
                if (!q) { // the record runs to the end: too long before it is broken
                    if (n - start > m_maxRecordBytes)
                        return fail(m_line, start, start, guardMessage(m_maxRecordBytes));
                    return fail(openLine, openLineStart, open,
                                QStringLiteral("unterminated quoted field"));
                }
                const char* at = static_cast<const char*>(q);
                for (const char* k = i; k < at; ++k)
                    if (*k == '\n') {
                        ++line;
                        lineStart = k + 1;
                    }
                i = at + 1;
                if (i < n && *i == '"') { // a doubled quote stands for one quote
                    if (!escaped) {
                        escaped = true;
                        scratchFrom = m_scratch.size();
                    }
                    m_scratch.append(from, at - from + 1);
                    from = ++i;
                    continue;
                }
                if (escaped) {
                    m_scratch.append(from, at - from);
                    m_scratchFields.push_back({qsizetype(m_count), scratchFrom});
                    addField(QByteArrayView(from, m_scratch.size() - scratchFrom));
                } else {
                    addField(QByteArrayView(from, at - from));
                }
                break;
            }
        } else {
            const char* from = i;
            while (i < n && !kStops.stop[static_cast<unsigned char>(*i)])
                ++i;
            if (i < n && *i == '"')
                return fail(line, lineStart, i,
                            QStringLiteral("quote inside an unquoted field (quote the whole "
                                           "field and double the quote)"));
            addField(QByteArrayView(from, i - from));
        }
        const char* recordEnd = nullptr;
        qint64 nextLine = line;
        if (i == n) { // end of input ends the last record
            recordEnd = i;
        } else if (*i == ',') {
            ++i;
            continue;
        } else if (*i == '\n' || (*i == '\r' && i + 1 < n && i[1] == '\n')) {
            recordEnd = i + (*i == '\r' ? 2 : 1);
            nextLine = line + 1;
        } else if (*i == '\r') {
            if (i + 1 == n && n - start > m_maxRecordBytes) // as above: too long first
                return fail(m_line, start, start, guardMessage(m_maxRecordBytes));
            return fail(line, lineStart, i,
                        QStringLiteral("carriage return not followed by a line feed"));
        } else {
            return fail(line, lineStart, i,
                        QStringLiteral("expected a comma or a line end after a closing quote"));
        }
        if (recordEnd - start > m_maxRecordBytes)
            return fail(m_line, start, start, guardMessage(m_maxRecordBytes));
        // Fields unescaped into the scratch buffer point into it only now that it
        // no longer grows.
        for (const auto& [field, offset] : m_scratchFields)
            m_fields[size_t(field)] =
                QByteArrayView(m_scratch.constData() + offset, m_fields[size_t(field)].size());
        m_recordLine = m_line;
        m_line = nextLine;
        m_pos = recordEnd;
        return Status::Record;
    }
}

qsizetype lastRecordEnd(const char* begin, qsizetype size) {
    if (!std::memchr(begin, '"', size_t(size))) {
        for (qsizetype k = size; k > 0; --k)
            if (begin[k - 1] == '\n')
                return k;
        return 0;
    }
    bool quoted = false;
    qsizetype last = 0;
    for (qsizetype k = 0; k < size; ++k) {
        const char c = begin[k];
        if (c == '"')
            quoted = !quoted;
        else if (c == '\n' && !quoted)
            last = k + 1;
    }
    return last;
}

} // namespace rb
