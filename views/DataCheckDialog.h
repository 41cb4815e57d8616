#pragma once

#include "data/DataCheck.h"
#include "instrument/Instrument.h"

#include <QDialog>
#include <QPointer>
#include <QProgressDialog>

#include <atomic>
#include <memory>

class QLabel;
class QTextBrowser;
class QThread;

namespace rb {

// The editor's "Check a response file..." action: the model's data check of a
// CSV against a copy of the instrument, in a worker thread, with a cancellable
// progress dialog (progress from bytes checked), then the HTML report in a
// dialog. Nothing is written unless the user saves the report; a cancelled run
// stops after the block in hand and leaves no trace.
class DataCheckRun : public QObject {
    Q_OBJECT
public:
    DataCheckRun(const Instrument& instrument, const QString& csvPath, QWidget* parent);
    ~DataCheckRun() override;

    void start();
    void cancel();
    bool isFinished() const { return m_finished; }
    QProgressDialog* progressDialog() const { return m_progress; }
    // After finished(): the result, or the error (cancelled, bad file).
    const DataCheckOutcome& outcome() const { return m_outcome; }
    const QByteArray& reportHtml() const { return m_html; }

    // Asks for a CSV file, checks it and shows the report (modal).
    static void askAndRun(const Instrument& instrument, QWidget* parent);

signals:
    void progressed(int permille);
    void finished();

private:
    void work();
    void done();

    Instrument m_instrument; // a snapshot: editing may go on meanwhile
    QString m_path;
    qint64 m_total = 0;
    QPointer<QProgressDialog> m_progress;
    QThread* m_thread = nullptr;
    std::atomic<bool> m_cancel{false};
    bool m_finished = false;
    DataCheckOutcome m_outcome;
    QByteArray m_html;
};

// Shows a data-check report: a one-line summary and the HTML page, with a
// button to save the page.
class DataCheckReportDialog : public QDialog {
    Q_OBJECT
public:
    DataCheckReportDialog(const DataCheckResult& result, const QByteArray& html,
                          const QString& csvName, QWidget* parent);
    QLabel* summary() const { return m_summary; }
    QTextBrowser* browser() const { return m_browser; }

private:
    void save();

    QByteArray m_html;
    QString m_csvName;
    QLabel* m_summary;
    QTextBrowser* m_browser;
};

// Record count, items and record-level problems, counts below suppressBelow as "<N".
QString dataCheckSummary(const DataCheckResult& result, int suppressBelow);

} // namespace rb
