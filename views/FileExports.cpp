#include "FileExports.h"

#include "dictionary/DictionaryExport.h"
#include "edit/Document.h"
#include "export/DotExport.h"
#include "export/SvgExport.h"
#include "storage/YamlFormat.h"

#include <QAction>
#include <QBuffer>
#include <QFileDialog>
#include <QFileInfo>
#include <QImage>
#include <QMenu>
#include <QMessageBox>
#include <QPainter>
#include <QSaveFile>
#include <QSvgRenderer>

using namespace Qt::StringLiterals;

namespace rb {

FileExports::FileExports(Document* document, QWidget* window)
    : QObject(window), m_document(document), m_window(window) {
    m_choose = [this](const QString& title, const QString& filter, const QString& suggested) {
        return QFileDialog::getSaveFileName(m_window, title, suggested, filter);
    };
    m_report = [this](const QString& title, const QString& message) {
        QMessageBox::warning(m_window, title, message);
    };
}

void FileExports::addActions(QMenu* menu) {
    const auto dictionary = [this](const QString& format, const QString& pageSize) {
        return [this, format, pageSize](const QString& path) {
            return exportDictionaryTo(format, pageSize, path);
        };
    };
    addAction(menu, tr("Data dictionary (HTML)..."), u"html"_s, tr("HTML (*.html)"), u"html"_s,
              dictionary(u"html"_s, {}));
    addAction(menu, tr("Data dictionary (PDF, A4)..."), u"pdf"_s, tr("PDF (*.pdf)"), u"pdf"_s,
              dictionary(u"pdf"_s, u"a4"_s));
    addAction(menu, tr("Data dictionary (PDF, Letter)..."), u"pdf_letter"_s, tr("PDF (*.pdf)"),
              u"pdf"_s, dictionary(u"pdf"_s, u"letter"_s));
    addAction(menu, tr("Data dictionary (Markdown)..."), u"md"_s, tr("Markdown (*.md)"), u"md"_s,
              dictionary(u"md"_s, {}));
    addAction(menu, tr("Data dictionary (CSV)..."), u"csv"_s, tr("CSV (*.csv)"), u"csv"_s,
              dictionary(u"csv"_s, {}));
    addAction(menu, tr("Data dictionary (DDI Codebook XML)..."), u"ddi"_s, tr("XML (*.xml)"),
              u"xml"_s, dictionary(u"ddi"_s, {}));
    menu->addSeparator();
    addAction(menu, tr("Route map (SVG)..."), u"map_svg"_s, tr("SVG image (*.svg)"), u"svg"_s,
              [this](const QString& path) { return exportRouteMapTo(u"svg"_s, path); });
    addAction(menu, tr("Route map (PNG)..."), u"map_png"_s, tr("PNG image (*.png)"), u"png"_s,
              [this](const QString& path) { return exportRouteMapTo(u"png"_s, path); });
    menu->addSeparator();
    addAction(menu, tr("YAML instrument..."), u"yaml"_s, tr("YAML instrument (*.yaml)"), u"yaml"_s,
              [this](const QString& path) { return exportYamlTo(path); });
    addAction(menu, tr("Routing graph (DOT)..."), u"dot"_s, tr("Graphviz DOT (*.dot)"), u"dot"_s,
              [this](const QString& path) { return exportDotTo(path); });
}

void FileExports::addAction(QMenu* menu, const QString& text, const QString& kind,
                            const QString& filter, const QString& suffix,
                            std::function<bool(const QString&)> write) {
    QAction* action = menu->addAction(text);
    action->setObjectName(u"actionExport_"_s + kind);
    connect(action, &QAction::triggered, this, [this, text, filter, suffix, write] {
        QString title = text;
        title.remove(u"..."_s);
        const QString path = choosePath(title, filter, suggestedName(suffix));
        if (!path.isEmpty())
            write(path);
    });
}

QString FileExports::suggestedName(const QString& suffix) const {
    const QString project = m_document->path();
    const QString stem =
        project.isEmpty() ? u"dictionary"_s : QFileInfo(project).completeBaseName();
    const QString folder = project.isEmpty() ? QString() : QFileInfo(project).absolutePath() + u'/';
    return folder + stem + u'.' + suffix;
}

QString FileExports::choosePath(const QString& title, const QString& filter,
                                const QString& suggested) {
    return m_choose(title, filter, suggested);
}

void FileExports::reportError(const QString& title, const QString& message) const {
    m_report(title, message);
}

bool FileExports::exportDictionaryTo(const QString& format, const QString& pageSize,
                                     const QString& path) {
    const DictionaryExportResult result =
        exportDictionary(CompiledRouting(m_document->instrument()), format, pageSize);
    if (!result.error.isEmpty()) {
        reportError(tr("Cannot export the data dictionary"), result.error);
        return false;
    }
    return writeBytes(path, result.bytes);
}

bool FileExports::exportRouteMapTo(const QString& format, const QString& path) {
    const QByteArray svg = exportSvg(CompiledRouting(m_document->instrument()));
    if (format == u"svg"_s)
        return writeBytes(path, svg);
    const QByteArray png = routeMapPng(svg);
    if (png.isEmpty()) {
        reportError(tr("Cannot export the route map"), tr("The route map could not be drawn."));
        return false;
    }
    return writeBytes(path, png);
}

bool FileExports::exportYamlTo(const QString& path) {
    return writeBytes(path, saveYamlText(m_document->instrument()));
}

bool FileExports::exportDotTo(const QString& path) {
    return writeBytes(path, exportDot(CompiledRouting(m_document->instrument())));
}

bool FileExports::writeBytes(const QString& path, const QByteArray& bytes) {
    QSaveFile file(path);
    if (file.open(QIODevice::WriteOnly) && file.write(bytes) == bytes.size() && file.commit())
        return true;
    reportError(tr("Cannot export"), u"%1: %2"_s.arg(path, file.errorString()));
    return false;
}

QByteArray routeMapPng(const QByteArray& svg) {
    QSvgRenderer renderer(svg);
    if (!renderer.isValid() || renderer.defaultSize().isEmpty())
        return {};
    QImage image(renderer.defaultSize(), QImage::Format_ARGB32);
    image.fill(Qt::white);
    QPainter painter(&image);
    painter.setRenderHint(QPainter::Antialiasing);
    renderer.render(&painter);
    painter.end();
    QByteArray bytes;
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::WriteOnly);
    return image.save(&buffer, "PNG") ? bytes : QByteArray();
}

} // namespace rb
