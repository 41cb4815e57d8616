#include "CommandArgs.h"

namespace rb::cli {

namespace {
const QStringList kFlags = {QStringLiteral("--json"), QStringLiteral("--flags")};
const QStringList kOptions = {QStringLiteral("--format"),         QStringLiteral("-o"),
                              QStringLiteral("--answers"),        QStringLiteral("--table"),
                              QStringLiteral("--report"),         QStringLiteral("--analysis-file"),
                              QStringLiteral("--suppress-below"), QStringLiteral("--id-column"),
                              QStringLiteral("--page-size")};
} // namespace

QString CommandArgs::parse(const QStringList& words) {
    for (int i = 0; i < words.size(); ++i) {
        const QString& w = words.at(i);
        if (kFlags.contains(w)) {
            m_flags.append(w);
        } else if (kOptions.contains(w)) {
            if (i + 1 >= words.size())
                return QStringLiteral("option %1 needs a value").arg(w);
            m_options.insert(w, words.at(++i));
        } else if (w.startsWith(QLatin1Char('-')) && w.size() > 1) {
            return QStringLiteral("unknown option '%1'").arg(w);
        } else {
            m_positional.append(w);
        }
    }
    return {};
}

} // namespace rb::cli
