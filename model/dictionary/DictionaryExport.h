#pragma once

#include "routing/CompiledRouting.h"

#include <QByteArray>
#include <QString>
#include <QStringList>

namespace rb {

// The dictionary formats of `routebook export`: html, pdf, md, csv, ddi.
QStringList dictionaryFormats();
bool isDictionaryFormat(const QString& format);

struct DictionaryExportResult {
    QByteArray bytes;
    QString error; // empty on success; a message for stderr otherwise
};

// Builds the dictionary (generation time from SOURCE_DATE_EPOCH) and renders
// it. `pageSize` is for pdf only: "a4" (default when empty) or "letter".
DictionaryExportResult exportDictionary(const CompiledRouting& routing, const QString& format,
                                        const QString& pageSize = QString());

} // namespace rb
