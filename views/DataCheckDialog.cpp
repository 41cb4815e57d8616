#include "DataCheckDialog.h"

#include "analysis/RoutingAnalysis.h"
#include "data/DataCheckJson.h"
#include "data/DataCheckReport.h"

#include <QDialogButtonBox>
#include <QFile>
#include <QFileDialog>
#include <QFileInfo>
#include <QLabel>
#include <QMessageBox>
#include <QProgressDialog>
#include <QPushButton>
#include <QSaveFile>
#include <QTextBrowser>
#include <QThread>
#include <QVBoxLayout>

namespace rb {

DataCheckRun::DataCheckRun(const Instrument& instrument, const QString& csvPath, QWidget* parent)
    : QObject(parent), m_instrument(instrument), m_path(csvPath),
      m_total(QFileInfo(csvPath).size()) {
    m_progress = new QProgressDialog(tr("Checking %1...").arg(QFileInfo(csvPath).fileName()),
                                     tr("Cancel"), 0, 1000, parent);
    m_progress->setObjectName(QStringLiteral("dataCheckProgress"));
    m_progress->setWindowModality(Qt::WindowModal);
    m_progress->setMinimumDuration(300);
    m_progress->setAutoClose(false);
    m_progress->setAutoReset(false);
    connect(m_progress, &QProgressDialog::canceled, this, &DataCheckRun::cancel);
    connect(this, &DataCheckRun::progressed, m_progress, &QProgressDialog::setValue);
}

DataCheckRun::~DataCheckRun() {
    cancel();
    if (m_thread) {
        m_thread->wait();
        delete m_thread;
    }
    delete m_progress;
}

void DataCheckRun::cancel() {
    m_cancel = true;
}

void DataCheckRun::start() {
    m_thread = QThread::create([this] { work(); });
    connect(m_thread, &QThread::finished, this, &DataCheckRun::done);
    m_thread->start();
}

// On the worker thread: only model calls and an atomic flag.
void DataCheckRun::work() {
    QFile data(m_path);
    if (!data.open(QIODevice::ReadOnly)) {
        m_outcome.error = Diagnostic{m_path, 0, 0, tr("cannot read: %1").arg(data.errorString())};
        return;
    }
    const CompiledRouting routing(m_instrument);
    DataCheckOptions options;
    options.blockBytes = 1 << 20; // cancelling waits for one block at most
    options.progress = [this](qint64 done) {
        if (m_total > 0)
            emit progressed(int(1000 * done / m_total));
        return !m_cancel;
    };
    m_outcome = runDataCheck(routing, data, m_path, options);
    if (!m_outcome.result || m_cancel)
        return;
    ReportOptions report;
    report.dataFileName = QFileInfo(m_path).fileName();
    const RoutingAnalysis analysis = analyzeRouting(routing);
    report.universes = &analysis.universes;
    m_html = dataCheckReportHtml(routing, *m_outcome.result, report);
}

void DataCheckRun::done() {
    if (m_cancel && m_outcome.result) { // cancelled after the last block: drop it all
        m_outcome.result.reset();
        m_outcome.error = Diagnostic{m_path, 0, 0, tr("the data check was cancelled")};
        m_html.clear();
    }
    m_finished = true;
    if (m_progress)
        m_progress->hide();
    emit finished();
}

void DataCheckRun::askAndRun(const Instrument& instrument, QWidget* parent) {
    const QString path = QFileDialog::getOpenFileName(
        parent, tr("Check a response file"), QString(), tr("CSV files (*.csv);;All files (*)"));
    if (path.isEmpty())
        return;
    auto* run = new DataCheckRun(instrument, path, parent);
    connect(run, &DataCheckRun::finished, parent, [run, parent, path] {
        const DataCheckOutcome& o = run->outcome();
        if (o.result) {
            auto* dialog = new DataCheckReportDialog(*o.result, run->reportHtml(),
                                                     QFileInfo(path).fileName(), parent);
            dialog->setAttribute(Qt::WA_DeleteOnClose);
            dialog->open();
        } else if (!o.error->message.contains(QStringLiteral("cancelled"))) {
            QMessageBox::warning(parent, tr("Check a response file"), o.error->toString());
        }
        run->deleteLater();
    });
    run->start();
}

QString dataCheckSummary(const DataCheckResult& r, int suppressBelow) {
    return DataCheckRun::tr("%1 records, %2 items: %3 with routing violations, %4 with invalid "
                            "values, %5 break-offs")
        .arg(r.records)
        .arg(r.items.size())
        .arg(shownCount(r.violations.count, suppressBelow),
             shownCount(r.invalid.count, suppressBelow),
             shownCount(r.breakOffs.count, suppressBelow));
}

DataCheckReportDialog::DataCheckReportDialog(const DataCheckResult& result, const QByteArray& html,
                                             const QString& csvName, QWidget* parent)
    : QDialog(parent), m_html(html), m_csvName(csvName) {
    setObjectName(QStringLiteral("dataCheckReport"));
    setWindowTitle(tr("Data check of %1").arg(csvName));
    resize(900, 700);
    auto* layout = new QVBoxLayout(this);
    // Counts of records are cells too: small ones are shown as the report shows them.
    m_summary = new QLabel(dataCheckSummary(result, ReportOptions().suppressBelow), this);
    m_summary->setTextFormat(Qt::PlainText);
    m_browser = new QTextBrowser(this);
    m_browser->setOpenLinks(false);
    m_browser->setHtml(QString::fromUtf8(html));
    auto* buttons = new QDialogButtonBox(QDialogButtonBox::Close, this);
    QPushButton* save = buttons->addButton(tr("Save report..."), QDialogButtonBox::ActionRole);
    connect(save, &QPushButton::clicked, this, &DataCheckReportDialog::save);
    connect(buttons, &QDialogButtonBox::rejected, this, &QDialog::reject);
    layout->addWidget(m_summary);
    layout->addWidget(m_browser);
    layout->addWidget(buttons);
}

void DataCheckReportDialog::save() {
    const QString path = QFileDialog::getSaveFileName(
        this, tr("Save report"), QFileInfo(m_csvName).completeBaseName() + QStringLiteral(".html"),
        tr("HTML files (*.html)"));
    if (path.isEmpty())
        return;
    QSaveFile file(path);
    if (!file.open(QIODevice::WriteOnly) || file.write(m_html) != m_html.size() || !file.commit())
        QMessageBox::warning(this, tr("Save report"),
                             tr("Cannot write %1: %2").arg(path, file.errorString()));
}

} // namespace rb
