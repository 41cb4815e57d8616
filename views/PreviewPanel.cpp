#include "PreviewPanel.h"

#include "PlainText.h"
#include "PreviewHtml.h"
#include "edit/Document.h"

#include <QLabel>
#include <QScrollBar>
#include <QTextBrowser>
#include <QVBoxLayout>

namespace rb {

PreviewPanel::PreviewPanel(Document* document, QWidget* parent)
    : QWidget(parent), m_document(document), m_caption(plainLabel(new QLabel)),
      m_browser(new QTextBrowser) {
    m_caption->setObjectName(QStringLiteral("panelNote"));
    m_caption->setWordWrap(true);
    m_browser->setObjectName(QStringLiteral("preview"));
    m_browser->setOpenLinks(false);
    auto* layout = new QVBoxLayout(this);
    layout->setContentsMargins(4, 4, 4, 4);
    layout->addWidget(m_caption);
    layout->addWidget(m_browser, 1);
    m_timer.setSingleShot(true);
    m_timer.setInterval(300); // rendering a long instrument is not free: coalesce
    connect(&m_timer, &QTimer::timeout, this, &PreviewPanel::refreshNow);
    setBuilder([](const Instrument& instrument,
                  const LiveAnalysis& analysis) { return plainPreviewHtml(instrument, analysis); },
               tr("Plain preview built from the instrument (the data dictionary export will take "
                  "its place here)."));
}

void PreviewPanel::setBuilder(Builder builder, const QString& caption) {
    m_builder = std::move(builder);
    m_caption->setText(caption);
    m_stale = true;
    if (isVisible())
        m_timer.start();
}

void PreviewPanel::setAnalysis(const LiveAnalysis& analysis) {
    m_analysis = analysis;
    m_stale = true;
    if (isVisible())
        m_timer.start();
}

void PreviewPanel::showEvent(QShowEvent* event) {
    QWidget::showEvent(event);
    if (m_stale)
        m_timer.start();
}

void PreviewPanel::refreshNow() {
    if (!m_builder || !isVisible())
        return; // stays stale; showEvent refreshes
    const int scroll = m_browser->verticalScrollBar()->value();
    m_browser->setHtml(m_builder(m_document->instrument(), m_analysis));
    m_browser->verticalScrollBar()->setValue(scroll);
    m_stale = false;
}

} // namespace rb
