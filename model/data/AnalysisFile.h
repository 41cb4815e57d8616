#pragma once

#include "DataCheck.h"

#include <QIODevice>

namespace rb {

// Writes analysis-file rows as RFC 4180 CSV (CRLF line ends, fields quoted only
// when they hold a comma, a quote or a line break) to a device, buffered.
class CsvAnalysisWriter : public AnalysisSink {
public:
    explicit CsvAnalysisWriter(QIODevice& device) : m_device(device) {}
    ~CsvAnalysisWriter() override;

    void header(const QStringList& columns) override;
    void row(const QList<QByteArray>& cells) override;
    // Writes what is buffered; false when the device refused bytes.
    bool flush();

private:
    void appendField(const QByteArray& field);

    QIODevice& m_device;
    QByteArray m_buffer;
    bool m_failed = false;
};

} // namespace rb
