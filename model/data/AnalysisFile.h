#pragma once

#include "DataCheck.h"

#include <QIODevice>

namespace rb {

// Appends one RFC 4180 field: quoted (quotes doubled) only when it holds a
// comma, a quote or a line break.
void appendCsvField(QByteArray& out, QByteArrayView field);

// Writes analysis-file rows as RFC 4180 CSV (CRLF line ends) to a device, buffered.
class CsvAnalysisWriter : public AnalysisSink {
public:
    explicit CsvAnalysisWriter(QIODevice& device) : m_device(device) {}
    ~CsvAnalysisWriter() override;

    void header(const QStringList& columns) override;
    void rows(QByteArrayView csv) override;
    // Writes what is buffered; false when the device refused bytes.
    bool flush();

private:
    QIODevice& m_device;
    QByteArray m_buffer;
    bool m_failed = false;
};

} // namespace rb
