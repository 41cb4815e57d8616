#include "Diagnostic.h"

namespace rb {

QString Diagnostic::toString() const {
    return QStringLiteral("%1:%2:%3: %4").arg(file).arg(line).arg(column).arg(message);
}

QString formatDiagnostics(const Diagnostics& diagnostics) {
    QString out;
    for (const Diagnostic& d : diagnostics)
        out += d.toString() + QLatin1Char('\n');
    return out;
}

} // namespace rb
