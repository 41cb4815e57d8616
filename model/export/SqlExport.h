#pragma once

#include "routing/CompiledRouting.h"

#include <QByteArray>
#include <optional>

namespace rb {

// Standard SQL that does the data check inside any SQL engine (tested on SQLite
// and PostgreSQL), for response files too big for one machine. The input is a
// table (default "responses") with one text column per variable, named exactly
// as in the instrument (multi items: NAME_CODE), blanks as NULL or ''.
// The script copies it to a work table "rb_work", replays the routing per
// record with one UPDATE per item in questionnaire order (a reached and a
// presented flag built from the filters and rules themselves, not from the
// minimised universes, because real data holds blanks and invalid values
// outside their domain), and ends with one SELECT of the per-item class counts
// (columns: position, item, presented, answered, blank, dont_know, refused,
// not_applicable, invalid, legitimate_skip, routing_violation).
// Routing with a backward goto (a loop) cannot be replayed this way: error value.
struct SqlExport {
    QByteArray sql;
    std::optional<QString> error;
};
SqlExport exportSql(const CompiledRouting& routing, const QString& table = QString());

} // namespace rb
