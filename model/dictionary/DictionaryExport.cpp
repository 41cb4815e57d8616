#include "DictionaryExport.h"

#include "CsvDictionary.h"
#include "DdiDictionary.h"
#include "Dictionary.h"
#include "HtmlDictionary.h"
#include "MarkdownDictionary.h"
#include "PdfDictionary.h"

using namespace Qt::StringLiterals;

namespace rb {

QStringList dictionaryFormats() {
    return {u"html"_s, u"pdf"_s, u"md"_s, u"csv"_s, u"ddi"_s};
}

bool isDictionaryFormat(const QString& format) {
    return dictionaryFormats().contains(format);
}

DictionaryExportResult exportDictionary(const CompiledRouting& routing, const QString& format,
                                        const QString& pageSize) {
    if (!isDictionaryFormat(format))
        return {{}, u"not a dictionary format: '%1'"_s.arg(format)};
    std::optional<PdfPageSize> page = PdfPageSize::A4;
    if (!pageSize.isEmpty()) {
        page = pdfPageSizeFromName(pageSize);
        if (!page)
            return {{}, u"--page-size must be a4 or letter (got '%1')"_s.arg(pageSize)};
    }
    const GenerationTime time = generationTime();
    if (time.error)
        return {{}, time.error->toString()};
    const Dictionary dictionary = buildDictionary(routing, time.time);
    if (format == u"html"_s)
        return {exportHtmlDictionary(dictionary), {}};
    if (format == u"md"_s)
        return {exportMarkdownDictionary(dictionary), {}};
    if (format == u"csv"_s)
        return {exportCsvDictionary(dictionary), {}};
    if (format == u"ddi"_s)
        return {exportDdiDictionary(dictionary), {}};
    const PdfResult pdf = exportPdfDictionary(dictionary, *page);
    return {pdf.bytes, pdf.error};
}

} // namespace rb
