#include "AnalysisFile.h"

namespace rb {

void appendCsvField(QByteArray& out, QByteArrayView field) {
    bool quote = false;
    for (char c : field)
        quote |= c == ',' || c == '"' || c == '\n' || c == '\r';
    if (!quote) {
        out.append(field);
        return;
    }
    out += '"';
    for (char c : field) {
        if (c == '"')
            out += '"';
        out += c;
    }
    out += '"';
}

CsvAnalysisWriter::~CsvAnalysisWriter() {
    flush();
}

void CsvAnalysisWriter::header(const QStringList& columns) {
    for (qsizetype i = 0; i < columns.size(); ++i) {
        if (i)
            m_buffer += ',';
        appendCsvField(m_buffer, columns.at(i).toUtf8());
    }
    m_buffer += "\r\n";
}

void CsvAnalysisWriter::rows(QByteArrayView csv) {
    if (m_buffer.size() + csv.size() > (1 << 20))
        flush();
    if (csv.size() > (1 << 20)) { // a whole block: straight to the device
        if (m_device.write(csv.data(), csv.size()) != csv.size())
            m_failed = true;
        return;
    }
    m_buffer.append(csv);
}

bool CsvAnalysisWriter::flush() {
    if (!m_buffer.isEmpty() && m_device.write(m_buffer) != m_buffer.size())
        m_failed = true;
    m_buffer.clear();
    return !m_failed;
}

} // namespace rb
