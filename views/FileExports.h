#pragma once

#include <QObject>
#include <QString>

#include <functional>

class QMenu;
class QWidget;

namespace rb {

class Document;

// The editor's File > Export entries: the data dictionary in every format the
// command line writes (html, pdf A4 / Letter, md, csv, ddi), the route map (svg,
// png), the YAML instrument and the DOT graph. Bytes come from the same model
// functions as `routebook export`; every file is written through QSaveFile, so
// a failed export leaves nothing behind. Where the file goes and how an error is
// shown are replaceable, so tests never block on a modal dialog.
class FileExports : public QObject {
    Q_OBJECT
public:
    // (dialog title, name filter, suggested file name) -> chosen path, empty to cancel.
    using PathChooser = std::function<QString(const QString&, const QString&, const QString&)>;
    // (title, message).
    using ErrorReporter = std::function<void(const QString&, const QString&)>;

    FileExports(Document* document, QWidget* window);

    // Adds one action per export to `menu`; names are "actionExport_<kind>",
    // e.g. actionExport_html, actionExport_pdf_letter, actionExport_map_png.
    void addActions(QMenu* menu);

    void setPathChooser(PathChooser choose) { m_choose = std::move(choose); }
    void setErrorReporter(ErrorReporter report) { m_report = std::move(report); }
    QString choosePath(const QString& title, const QString& filter, const QString& suggested);
    void reportError(const QString& title, const QString& message) const;

    // Each returns whether the file was written; failures are reported.
    bool exportDictionaryTo(const QString& format, const QString& pageSize, const QString& path);
    bool exportRouteMapTo(const QString& format, const QString& path);
    bool exportYamlTo(const QString& path);
    bool exportDotTo(const QString& path);
    bool writeBytes(const QString& path, const QByteArray& bytes);

private:
    void addAction(QMenu* menu, const QString& text, const QString& kind, const QString& filter,
                   const QString& suffix, std::function<bool(const QString&)> write);
    QString suggestedName(const QString& suffix) const;

    Document* m_document;
    QWidget* m_window;
    PathChooser m_choose;
    ErrorReporter m_report;
};

// The route map SVG drawn into a PNG at its own size on white (QtSvg's renderer).
// Empty when the SVG cannot be read.
QByteArray routeMapPng(const QByteArray& svg);

} // namespace rb
