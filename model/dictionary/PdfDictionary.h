#pragma once

#include "Dictionary.h"

#include <QByteArray>
#include <QString>

#include <optional>

namespace rb {

enum class PdfPageSize { A4, Letter };

// "a4" / "letter" (any case); nullopt otherwise.
std::optional<PdfPageSize> pdfPageSizeFromName(const QString& name);

struct PdfResult {
    QByteArray bytes;
    QString error; // empty on success
};

// The dictionary as PDF, laid out by QTextDocument from the same HTML writer
// (its QTextDocument flavour). Painting text needs fonts, so a
// QGuiApplication must exist (the command line creates one, on the offscreen
// platform when there is no display); without one this returns an error.
PdfResult exportPdfDictionary(const Dictionary& dictionary, PdfPageSize pageSize);

} // namespace rb
