#include "AnalysisFile.h"

namespace rb {

CsvAnalysisWriter::~CsvAnalysisWriter() {
    flush();
}

void CsvAnalysisWriter::appendField(const QByteArray& field) {
    const bool quote =
        field.contains(',') || field.contains('"') || field.contains('\n') || field.contains('\r');
    if (!quote) {
        m_buffer += field;
        return;
    }
    QByteArray escaped = field;
    escaped.replace("\"", "\"\"");
    m_buffer += '"' + escaped + '"';
}

void CsvAnalysisWriter::header(const QStringList& columns) {
    QList<QByteArray> cells;
    for (const QString& c : columns)
        cells.append(c.toUtf8());
    row(cells);
}

void CsvAnalysisWriter::row(const QList<QByteArray>& cells) {
    for (qsizetype i = 0; i < cells.size(); ++i) {
        if (i)
            m_buffer += ',';
        appendField(cells.at(i));
    }
    m_buffer += "\r\n";
    if (m_buffer.size() > (1 << 20))
        flush();
}

bool CsvAnalysisWriter::flush() {
    if (!m_buffer.isEmpty() && m_device.write(m_buffer) != m_buffer.size())
        m_failed = true;
    m_buffer.clear();
    return !m_failed;
}

} // namespace rb
