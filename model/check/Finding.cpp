#include "Finding.h"

#include <algorithm>

namespace rb {

QString severityName(Severity severity) {
    return severity == Severity::Error ? QStringLiteral("error") : QStringLiteral("warning");
}

QString Finding::id() const {
    const QString where = !item.isEmpty() ? item : !module.isEmpty() ? module : subject;
    return check + QLatin1Char(':') + where + QLatin1Char(':') + field;
}

void sortFindings(Findings& findings) {
    std::stable_sort(findings.begin(), findings.end(), [](const Finding& a, const Finding& b) {
        if (a.position != b.position)
            return a.position < b.position;
        // Module findings come before the findings of the module's first item.
        const bool aModule = a.item.isEmpty(), bModule = b.item.isEmpty();
        if (aModule != bModule)
            return aModule;
        if (a.field != b.field)
            return a.field < b.field;
        return a.check < b.check;
    });
}

} // namespace rb
