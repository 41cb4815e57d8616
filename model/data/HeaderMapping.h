#pragma once

#include "RecordFields.h"

#include "routing/CompiledRouting.h"
#include "util/Diagnostic.h"

#include <QByteArrayView>
#include <QStringList>

#include <optional>
#include <vector>

namespace rb {

// Which CSV column holds which variable. Columns match variable names ignoring
// case; a `multi` item NAME has one column NAME_CODE per code. Unknown columns
// are reported and ignored; missing ones are reported and read as blank.
struct HeaderMapping {
    // Per item position: the column of a one-variable item (-1 missing or a
    // statement); for multi items one column per code in `codes` order (-1 missing).
    std::vector<int> column;
    std::vector<std::vector<int>> multiColumns;
    int idColumn = -1;
    int columnCount = 0;
    QStringList headerNames;    // as written in the file
    QStringList unknownColumns; // as written, file order
    QStringList missingColumns; // variable names, questionnaire order
};

// Builds the mapping from the header row; an error value for a duplicate column
// (ignoring case) or an --id-column that is not there.
struct HeaderMappingResult {
    HeaderMapping mapping;
    std::optional<Diagnostic> error;
};
HeaderMappingResult mapHeader(const CompiledRouting& routing, RecordFields header,
                              const QString& fileName, const QString& idColumn);

} // namespace rb
