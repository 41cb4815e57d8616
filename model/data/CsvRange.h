#pragma once

#include "RecordFields.h"

#include <QByteArray>
#include <QByteArrayView>
#include <QString>

#include <utility>
#include <vector>

namespace rb {

// Parses the records of a byte range that holds whole records only (a block cut
// at a record boundary by lastRecordEnd, or the end of the file), with the rules
// of CsvReader: quoted fields, doubled quotes, CRLF or LF, line breaks inside
// quotes. Fields are views into the range (or into a scratch buffer for quoted
// fields with doubled quotes); nothing is allocated per cell. Lines are counted
// from 0 at the start of the range; the caller adds the range's first line.
// CsvReader stays the streaming reference; tst_datacheck checks both agree on
// random files.
class CsvRange {
public:
    enum class Status { Record, End, Error };
    struct Error {
        qint64 line = 0; // 0-based within the range
        int column = 0;  // 1-based
        QString message;
    };

    CsvRange(const char* begin, const char* end, qint64 maxRecordBytes);

    Status next();
    RecordFields fields() const { return {m_fields.data(), m_count}; }
    qint64 recordLine() const { return m_recordLine; } // 0-based, first line of the record
    qint64 linesDone() const { return m_line; }        // line ends consumed so far
    const Error& error() const { return m_error; }
    qsizetype consumed() const { return m_pos - m_begin; } // bytes of the records read

    static QString guardMessage(qint64 maxRecordBytes);

private:
    bool nextPlain();
    void addField(QByteArrayView field);
    Status fail(qint64 line, const char* lineStart, const char* at, const QString& message);

    const char* m_begin;
    const char* m_pos;
    const char* m_end;
    qint64 m_maxRecordBytes;
    qint64 m_line = 0;
    qint64 m_recordLine = 0;
    std::vector<QByteArrayView> m_fields; // storage: the record's fields are the first m_count
    std::size_t m_count = 0;
    std::vector<std::pair<qsizetype, qsizetype>> m_scratchFields; // field, offset in m_scratch
    QByteArray m_scratch;
    Error m_error;
};

// The end of the last whole record in [begin, begin + size) for data that starts
// at a record boundary outside quotes: one past the last line feed that is not
// inside a quoted field, or 0 when there is none. Quotes only switch the state
// (a doubled quote switches it twice), so a block without quotes needs one
// backwards search.
qsizetype lastRecordEnd(const char* begin, qsizetype size);

} // namespace rb
