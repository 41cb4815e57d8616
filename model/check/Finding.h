#pragma once

#include <QList>
#include <QString>

#include <optional>

namespace rb {

enum class Severity { Error, Warning };
QString severityName(Severity severity); // "error" / "warning"

// One finding of `check` (DESIGN.md "Analysis").
struct Finding {
    QString check; // e.g. "unknown-variable"
    Severity severity = Severity::Error;
    QString item;    // item name; empty for module-level and instrument-level findings
    QString module;  // module name (always set when known)
    QString subject; // when neither item nor module: the code list or test respondent it is about
    QString field;   // YAML path, e.g. "ask_if", "routing[1].if"; may be empty
    std::optional<int> column; // 1-based within the condition; nullopt when not about one
    QString message;
    // Sort key: flat questionnaire position of the item (modules: their first
    // item's position; instrument-level: -1 sorts first).
    int position = -1;

    // "check:item-or-module:field" (DESIGN.md).
    QString id() const;
};

using Findings = QList<Finding>;

// Questionnaire position, then field, then check (DESIGN.md); stable.
void sortFindings(Findings& findings);

} // namespace rb
