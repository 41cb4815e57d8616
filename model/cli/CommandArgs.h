#pragma once

#include <QHash>
#include <QStringList>

namespace rb::cli {

// The words after a subcommand: positional arguments, flags (--json) and
// options with a value (--format html, -o OUT). Unknown options are an error.
class CommandArgs {
public:
    // Returns a message for the user when the words do not parse.
    QString parse(const QStringList& words);

    const QStringList& positional() const { return m_positional; }
    bool flag(const QString& name) const { return m_flags.contains(name); }
    QString option(const QString& name) const { return m_options.value(name); }
    bool hasOption(const QString& name) const { return m_options.contains(name); }

private:
    QStringList m_positional;
    QStringList m_flags;
    QHash<QString, QString> m_options;
};

} // namespace rb::cli
