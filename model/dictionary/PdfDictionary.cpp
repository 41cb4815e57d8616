#include "PdfDictionary.h"

#include "HtmlDictionary.h"
#include "PdfReproducible.h"
#include "RouteMapPainter.h"

#include <QAbstractTextDocumentLayout>
#include <QBuffer>
#include <QGuiApplication>
#include <QHashFunctions>
#include <QPageLayout>
#include <QPageSize>
#include <QPainter>
#include <QPdfWriter>
#include <QTextDocument>

#include <algorithm>
#include <cmath>

using namespace Qt::StringLiterals;

namespace rb {

namespace {

constexpr double kSceneDpi = 96; // the route layout's units are pixels at 100 %

// One page's drawing area (device pixels of the writer) and a footer strip.
struct PageGeometry {
    QSizeF body;
    double footer = 0;
};

PageGeometry pageGeometry(const QPdfWriter& writer) {
    const QRectF paint = writer.pageLayout().paintRectPixels(writer.resolution());
    const double footer = writer.resolution() * 0.3; // 7.6 mm for the page number
    return {QSizeF(paint.width(), paint.height() - footer), footer};
}

void pageNumber(QPainter& painter, const PageGeometry& page, int number, int of) {
    painter.save();
    QFont font(u"sans-serif"_s);
    font.setPointSizeF(8);
    painter.setFont(font);
    painter.setPen(QColor(0x55, 0x55, 0x55));
    const QRectF strip(0, page.body.height(), page.body.width(), page.footer);
    painter.drawText(strip, Qt::AlignRight | Qt::AlignBottom, u"%1 / %2"_s.arg(number).arg(of));
    painter.restore();
}

// Where the map is cut into page-high slices: between two nodes where one
// fits, so no box is split across pages.
QList<double> sliceTops(const RouteMapDrawing& map, double sliceHeight) {
    QList<double> gaps; // midpoints between consecutive node rows
    QList<QRectF> nodes = map.layout.nodes;
    std::sort(nodes.begin(), nodes.end(),
              [](const QRectF& a, const QRectF& b) { return a.top() < b.top(); });
    for (int i = 1; i < nodes.size(); ++i)
        gaps.append((nodes.at(i - 1).bottom() + nodes.at(i).top()) / 2);
    const QRectF bounds = map.layout.bounds;
    QList<double> tops{bounds.top()};
    while (tops.last() + sliceHeight < bounds.bottom()) {
        const double limit = tops.last() + sliceHeight;
        double cut = limit;
        for (double g : gaps)
            if (g > tops.last() + sliceHeight / 4 && g <= limit)
                cut = g; // the last gap that still fits
        tops.append(cut);
    }
    return tops;
}

double mapHeading(const QPdfWriter& writer) {
    return writer.resolution() * 0.4; // ~10 mm above the picture for its title
}

// The map area of a page: the body below the heading.
double mapSliceHeight(const PageGeometry& page, double heading, double scale) {
    return (page.body.height() - heading) / scale;
}

void paintMapPage(QPainter& painter, const RouteMapDrawing& map, const PageGeometry& page,
                  double heading, double scale, double top, double bottom, bool first) {
    painter.save();
    QFont font(u"sans-serif"_s);
    font.setPointSizeF(13);
    font.setBold(true);
    painter.setFont(font);
    painter.setPen(Qt::black);
    painter.drawText(QRectF(0, 0, page.body.width(), heading), Qt::AlignLeft | Qt::AlignTop,
                     first ? u"Route map"_s : u"Route map (continued)"_s);
    painter.restore();
    painter.save();
    painter.translate(0, heading);
    painter.setClipRect(QRectF(QPointF(0, 0), QSizeF(page.body.width(), (bottom - top) * scale)));
    painter.scale(scale, scale);
    painter.translate(-map.layout.bounds.left(), -top);
    paintRouteMap(painter, map);
    painter.restore();
}

// The dictionary text, paginated by QTextDocument at the writer's resolution.
void paintText(QPainter& painter, QPdfWriter& writer, QTextDocument& document,
               const PageGeometry& page, int totalPages) {
    for (int i = 0; i < document.pageCount(); ++i) {
        if (i > 0)
            writer.newPage();
        const QRectF view(QPointF(0, i * page.body.height()), page.body);
        painter.save();
        painter.translate(0, -view.top());
        document.drawContents(&painter, view);
        painter.restore();
        pageNumber(painter, page, i + 1, totalPages);
    }
}

// QPdfWriter keeps its fonts in a QHash and writes them in hash order, which
// follows the per-process random seed: with a fixed time asked for, hash with
// the deterministic seed while this PDF is painted, so two runs write the font
// objects in the same order. Tables made meanwhile elsewhere in the process
// (the analysis thread) only lose their randomisation, not correctness.
class DeterministicHashing {
public:
    explicit DeterministicHashing(bool on) : m_on(on) {
        if (m_on)
            QHashSeed::setDeterministicGlobalSeed();
    }
    ~DeterministicHashing() {
        if (m_on)
            QHashSeed::resetRandomGlobalSeed();
    }
    DeterministicHashing(const DeterministicHashing&) = delete;
    DeterministicHashing& operator=(const DeterministicHashing&) = delete;

private:
    bool m_on;
};

} // namespace

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
    const std::optional<QDateTime> fixedTime = reproducibleTime();
    QByteArray bytes;
    {
        const DeterministicHashing hashing(fixedTime.has_value());
        QBuffer buffer(&bytes);
        buffer.open(QIODevice::WriteOnly);
        QPdfWriter writer(&buffer);
        writer.setTitle(u"Data dictionary: "_s + dictionary.title);
        writer.setCreator(u"Routebook"_s);
        writer.setPageSize(
            QPageSize(pageSize == PdfPageSize::A4 ? QPageSize::A4 : QPageSize::Letter));
        writer.setPageMargins(QMarginsF(15, 15, 15, 15), QPageLayout::Millimeter);
        if (fixedTime)
            writer.setDocumentXmpMetadata(reproducibleXmp(writer.title(), *fixedTime));
        const PageGeometry page = pageGeometry(writer);

        QTextDocument document;
        document.documentLayout()->setPaintDevice(&writer); // measure fonts as printed
        document.setDocumentMargin(0);
        document.setHtml(
            QString::fromUtf8(exportHtmlDictionary(dictionary, HtmlFlavour::TextDocument)));
        document.setPageSize(page.body);

        // The map at its own size (1 scene pixel = 1/96 inch), shrunk to the page width.
        const double heading = mapHeading(writer);
        double scale = 0;
        QList<double> tops; // map y where each map page starts
        if (dictionary.routeMap && dictionary.routeMap->layout.bounds.width() > 0) {
            const double width = dictionary.routeMap->layout.bounds.width();
            scale = std::min(writer.resolution() / kSceneDpi, page.body.width() / width);
            tops = sliceTops(*dictionary.routeMap, mapSliceHeight(page, heading, scale));
        }
        const int textPages = document.pageCount();
        const int total = textPages + int(tops.size());

        QPainter painter;
        if (!painter.begin(&writer))
            return {{}, u"the PDF writer could not start a page"_s};
        paintText(painter, writer, document, page, total);
        for (int k = 0; k < tops.size(); ++k) {
            const RouteMapDrawing& map = *dictionary.routeMap;
            writer.newPage();
            const double bottom = k + 1 < tops.size() ? tops.at(k + 1) : map.layout.bounds.bottom();
            paintMapPage(painter, map, page, heading, scale, tops.at(k), bottom, k == 0);
            pageNumber(painter, page, textPages + k + 1, total);
        }
        painter.end();
    }
    if (bytes.isEmpty())
        return {{}, u"the PDF writer produced no output"_s};
    if (fixedTime)
        bytes = stampPdfDates(bytes, *fixedTime);
    return {bytes, {}};
}

} // namespace rb
