#pragma once

#include <QSet>
#include <QString>

namespace rb {

// The outcome of rewriting one condition. Rewrites go through the parser and
// the printer (never text search): a condition that does not parse is left as
// it is and flagged, a condition that does not mention the name is left
// byte-for-byte as written.
struct ConditionRewrite {
    QString text;
    bool changed = false;
    bool unparsable = false;
    bool rangeTouched = false; // recode only: an a..b range or an ordering holds the old code
};

// Renames every atom that reads `from` (any case) to `to`.
ConditionRewrite renameInCondition(const QString& condition, const QString& from,
                                   const QString& to);

// Replaces the code `from` by `to` in every comparison, `in` element and `has`
// on the items named in `itemsLower` (lower-case names): `=`, `<>`, `in`
// elements, `has`. Ranges a..b holding `from` and ordering comparisons (`<`...)
// are left alone (moving them changes which other codes they hold) and
// reported through rangeTouched.
ConditionRewrite recodeInCondition(const QString& condition, const QSet<QString>& itemsLower,
                                   qint64 from, qint64 to);

} // namespace rb
