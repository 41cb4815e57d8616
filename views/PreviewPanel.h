#pragma once

#include "edit/LiveAnalysis.h"

#include <QTimer>
#include <QWidget>

#include <functional>

class QLabel;
class QTextBrowser;

namespace rb {

class Document;

// The dictionary preview: HTML built from the instrument and the latest
// analysis, refreshed shortly after edits while the panel is visible. The
// builder is a hook: today a plain rendering (PreviewHtml.h), later the data
// dictionary builder.
class PreviewPanel : public QWidget {
    Q_OBJECT
public:
    using Builder = std::function<QString(const Instrument&, const LiveAnalysis&)>;

    PreviewPanel(Document* document, QWidget* parent = nullptr);

    void setBuilder(Builder builder, const QString& caption);
    // Asks for a refresh (coalesced; skipped while hidden, done when shown).
    void setAnalysis(const LiveAnalysis& analysis);
    void refreshNow();
    QTextBrowser* browser() const { return m_browser; }

protected:
    void showEvent(QShowEvent* event) override;

private:
    Document* m_document;
    Builder m_builder;
    LiveAnalysis m_analysis;
    QLabel* m_caption;
    QTextBrowser* m_browser;
    QTimer m_timer;
    bool m_stale = true;
};

} // namespace rb
