#pragma once

#include <QList>
#include <QString>

namespace rb {

// An error as a value: where it is (file, 1-based line and column; 0 when
// unknown) and a message a person can act on.
struct Diagnostic {
    QString file;
    int line = 0;
    int column = 0;
    QString message;

    // "file:line:column: message", the form every command prints on stderr.
    QString toString() const;
};

using Diagnostics = QList<Diagnostic>;

QString formatDiagnostics(const Diagnostics& diagnostics);

} // namespace rb
