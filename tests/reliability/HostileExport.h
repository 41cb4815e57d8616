#pragma once

#include <QObject>
#include <QTemporaryDir>

// A hostile instrument (markup, quotes, control characters, right-to-left
// marks, huge strings in every field) exported to every format the CLI knows:
// no active markup, well-formed XML/SVG, valid CSV, SQL that cannot be
// injected into, YAML that round-trips exactly. A format the CLI does not
// accept yet is skipped with a message.
class TestHostileExport : public QObject {
    Q_OBJECT
private slots:
    void initTestCase();
    void exportFormat_data();
    void exportFormat();
    void yamlFileRoundTrip();

private:
    QTemporaryDir m_dir;
    QString m_project; // the hostile instrument as a .routebook project
};
