#include "PdfDictionary.h"

#include "HtmlDictionary.h"

#include <QBuffer>
#include <QGuiApplication>
#include <QPageLayout>
#include <QPageSize>
#include <QPdfWriter>
#include <QTextDocument>

using namespace Qt::StringLiterals;

namespace rb {

std::optional<PdfPageSize> pdfPageSizeFromName(const QString& name) {
    if (name.compare(u"a4"_s, Qt::CaseInsensitive) == 0)
        return PdfPageSize::A4;
    if (name.compare(u"letter"_s, Qt::CaseInsensitive) == 0)
        return PdfPageSize::Letter;
    return std::nullopt;
}

PdfResult exportPdfDictionary(const Dictionary& dictionary, PdfPageSize pageSize) {
    if (!qobject_cast<QGuiApplication*>(QCoreApplication::instance()))
        return {{}, u"PDF export needs a QGuiApplication (fonts and painting)"_s};
    QByteArray bytes;
    {
        QBuffer buffer(&bytes);
        buffer.open(QIODevice::WriteOnly);
        QPdfWriter writer(&buffer);
        writer.setTitle(u"Data dictionary: "_s + dictionary.title);
        writer.setCreator(u"Routebook"_s);
        writer.setPageSize(
            QPageSize(pageSize == PdfPageSize::A4 ? QPageSize::A4 : QPageSize::Letter));
        writer.setPageMargins(QMarginsF(15, 15, 15, 15), QPageLayout::Millimeter);
        QTextDocument document;
        document.setHtml(
            QString::fromUtf8(exportHtmlDictionary(dictionary, HtmlFlavour::TextDocument)));
        document.print(&writer);
    }
    if (bytes.isEmpty())
        return {{}, u"the PDF writer produced no output"_s};
    return {bytes, {}};
}

} // namespace rb
