#pragma once

#include "util/Diagnostic.h"

#include <QByteArray>
#include <QByteArrayView>
#include <QIODevice>

#include <optional>
#include <vector>

namespace rb {

// A streaming reader of RFC 4180 CSV (comma separated, double-quote quoting):
// quoted fields, doubled quotes, CRLF or LF line ends, line breaks inside
// quotes, an optional final line end, UTF-8 with or without a byte order mark.
// Memory stays bounded: one read block plus the longest record, which the
// line-length guard limits. Deliberate choices where RFC 4180 is strict:
// bytes outside printable ASCII are accepted as field text (UTF-8), LF alone
// ends a record as CRLF does; a quote inside an unquoted field, text after a
// closing quote, a CR not followed by LF outside quotes and an unterminated
// quoted field are errors with line and column.
class CsvReader {
public:
    enum class Status { Record, End, Error };

    static constexpr qint64 kDefaultMaxRecordBytes = 4 * 1024 * 1024;

    CsvReader(QIODevice& device, const QString& fileName,
              qint64 maxRecordBytes = kDefaultMaxRecordBytes);

    // Reads the next record. The field views stay valid until the next call.
    Status next();
    const std::vector<QByteArrayView>& fields() const { return m_fields; }
    // 1-based physical line on which the current record starts.
    qint64 recordLine() const { return m_recordLine; }
    const Diagnostic& error() const { return m_error; }
    // Bytes consumed from the device so far (for progress).
    qint64 bytesConsumed() const { return m_consumedBefore + m_pos; }

private:
    struct Span {
        qsizetype offset;
        qsizetype size;
        bool inScratch;
    };
    enum class Parse { Done, NeedMore, Failed };

    Parse parseRecord();
    bool fill();
    Status fail(qint64 line, qsizetype lineStart, qsizetype at, const QString& message);

    QIODevice& m_device;
    QString m_fileName;
    qint64 m_maxRecordBytes;
    QByteArray m_buffer; // bytes [m_pos, m_buffer.size()) are not yet consumed
    qsizetype m_pos = 0;
    qint64 m_consumedBefore = 0; // bytes dropped from the front of the buffer
    bool m_eof = false;
    bool m_started = false;
    qint64 m_line = 1;       // line of m_pos
    qint64 m_recordLine = 1; // line where the current record starts
    std::vector<Span> m_spans;
    std::vector<QByteArrayView> m_fields;
    QByteArray m_scratch; // unescaped content of quoted fields
    Diagnostic m_error;
    // Where parseRecord stopped on failure (for the diagnostic).
    qint64 m_failLine = 0;
    qsizetype m_failLineStart = 0, m_failAt = 0;
    QString m_failMessage;
};

} // namespace rb
