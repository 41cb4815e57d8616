#pragma once

#include "LiveAnalysis.h"

#include <QObject>
#include <QThreadPool>
#include <QTimer>

namespace rb {

class Document;

// Reruns the checks and the routing analysis after every change of a
// Document, on a worker thread, so the window never waits. When idle, a change
// starts a job on the next turn of the event loop (once the whole command has
// applied), so a single edit waits for nothing; changes arriving while a job
// runs are coalesced: one job runs at a time, a result whose revision is no
// longer the document's is dropped and the analysis starts again on the
// current instrument.
class AnalysisRunner : public QObject {
    Q_OBJECT
public:
    explicit AnalysisRunner(Document* document, QObject* parent = nullptr);
    ~AnalysisRunner() override; // waits for a running job

    const LiveAnalysis& latest() const { return m_latest; }
    bool isBusy() const { return m_running || m_timer.isActive(); }
    // How long edits arriving while a job runs wait to be coalesced (default 40 ms).
    void setDelay(int milliseconds) { m_delay = milliseconds; }
    // Starts at once (after a reset, say), skipping the delay.
    void runNow();

signals:
    // A result for the document's current revision arrived.
    void analysed();

private:
    void schedule();
    void start();
    void deliver(const LiveAnalysis& result);

    Document* m_document;
    QThreadPool m_pool;
    QTimer m_timer;
    LiveAnalysis m_latest;
    bool m_running = false;
    int m_delay = 40;
};

} // namespace rb
