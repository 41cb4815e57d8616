#include "EditorWindow.h"

#include "CodeListPanel.h"
#include "DataCheckDialog.h"
#include "FileExports.h"
#include "FindingsModel.h"
#include "Icons.h"
#include "ItemForm.h"
#include "OutlineModel.h"
#include "PlainText.h"
#include "PreviewHtml.h"
#include "PreviewPanel.h"
#include "RulesPanel.h"
#include "TrialRunPanel.h"
#include "check/InstrumentCheck.h"
#include "edit/AnalysisRunner.h"
#include "edit/Cascades.h"
#include "edit/Document.h"
#include "edit/StructureCommands.h"
#include "routemap/RouteMapView.h"
#include "storage/InstrumentFile.h"
#include "storage/ProjectLock.h"
#include "storage/YamlFormat.h"

#include <QAction>
#include <QApplication>
#include <QCloseEvent>
#include <QDockWidget>
#include <QFileDialog>
#include <QFileInfo>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QMenuBar>
#include <QRegularExpression>
#include <QSaveFile>
#include <QScrollArea>
#include <QSettings>
#include <QStatusBar>
#include <QStyleFactory>
#include <QTableView>
#include <QTimer>
#include <QToolBar>
#include <QTreeView>
#include <QUndoView>

namespace rb {

namespace {

constexpr int kMaxRecent = 8;

QString uniqueName(const Instrument& instrument, const QString& stem) {
    for (int n = 1;; ++n) {
        const QString name = QStringLiteral("%1_%2").arg(stem).arg(n);
        bool taken = false;
        for (const Module& module : instrument.modules) {
            taken = taken || module.name.compare(name, Qt::CaseInsensitive) == 0;
            for (const Item& item : module.items)
                taken = taken || item.name.compare(name, Qt::CaseInsensitive) == 0;
        }
        if (!taken)
            return name;
    }
}

Instrument emptyInstrument() {
    Instrument instrument;
    instrument.title = QCoreApplication::translate("rb::EditorWindow", "Untitled instrument");
    instrument.version = QStringLiteral("0.1");
    instrument.language = QStringLiteral("en");
    return instrument;
}

QPalette darkPalette() {
    QPalette p;
    const QColor window(0x2b, 0x2d, 0x31), base(0x1f, 0x21, 0x24), text(0xe6, 0xe6, 0xe6);
    p.setColor(QPalette::Window, window);
    p.setColor(QPalette::WindowText, text);
    p.setColor(QPalette::Base, base);
    p.setColor(QPalette::AlternateBase, window);
    p.setColor(QPalette::ToolTipBase, base);
    p.setColor(QPalette::ToolTipText, text);
    p.setColor(QPalette::Text, text);
    p.setColor(QPalette::Button, window);
    p.setColor(QPalette::ButtonText, text);
    p.setColor(QPalette::Highlight, QColor(0x3d, 0x7a, 0xb8));
    p.setColor(QPalette::HighlightedText, Qt::white);
    p.setColor(QPalette::Link, QColor(0x8c, 0xb8, 0xf0));
    p.setColor(QPalette::Mid, QColor(0x80, 0x84, 0x8a));
    p.setColor(QPalette::Disabled, QPalette::Text, QColor(0x7a, 0x7a, 0x7a));
    p.setColor(QPalette::Disabled, QPalette::ButtonText, QColor(0x7a, 0x7a, 0x7a));
    return p;
}

} // namespace

EditorWindow::EditorWindow(QWidget* parent)
    : QMainWindow(parent), m_document(new Document(this)),
      m_runner(new AnalysisRunner(m_document, this)), m_outline(new OutlineModel(m_document, this)),
      m_findings(new FindingsModel(this)), m_outlineView(new QTreeView),
      m_findingsView(new QTableView), m_exports(new FileExports(m_document, this)),
      m_routeMap(new RouteMapView), m_mapTimer(new QTimer(this)), m_counts(new QLabel),
      m_readOnlyNote(new QLabel(tr("Read-only"))) {
    Icons::initResources();
    setWindowIcon(Icons::get(Icons::Application));
    setStyleSheet(Icons::styleSheet());
    setDockOptions(AnimatedDocks | AllowTabbedDocks | AllowNestedDocks);
    buildPanels();
    buildActions();
    statusBar()->addPermanentWidget(m_readOnlyNote);
    statusBar()->addPermanentWidget(m_counts);
    m_readOnlyNote->setObjectName(QStringLiteral("readOnlyNote"));
    m_readOnlyNote->hide();
    connect(m_document, &Document::readOnlyChanged, this, &EditorWindow::applyReadOnly);
    connect(m_document, &Document::modifiedChanged, this, &EditorWindow::updateTitle);
    connect(m_document, &Document::pathChanged, this, &EditorWindow::updateTitle);
    connect(m_runner, &AnalysisRunner::analysed, this, &EditorWindow::analysisArrived);
    m_askSave = [this] {
        return QMessageBox::question(
            this, tr("Unsaved changes"), tr("The instrument has unsaved changes. Save them first?"),
            QMessageBox::Save | QMessageBox::Discard | QMessageBox::Cancel, QMessageBox::Save);
    };
    m_askOverwrite = [this](const QString& path) {
        return QMessageBox::question(
                   this, tr("Changed on disk"),
                   tr("%1 was changed by another program since it was opened here. "
                      "Overwrite those changes with this editor's version?")
                       .arg(QFileInfo(path).fileName()),
                   QMessageBox::Yes | QMessageBox::No, QMessageBox::No) == QMessageBox::Yes;
    };
    resize(1360, 860);
    newDocument();
    setDarkPalette(QSettings().value(QStringLiteral("darkPalette"), false).toBool());
}

EditorWindow::~EditorWindow() {
    // The children are deleted by ~QWidget, after this part of the window is
    // gone; a signal one of them sends on its way out (selection, focus,
    // undo stack) must not reach a half-destroyed EditorWindow (UBSan saw one).
    for (QObject* child : findChildren<QObject*>())
        child->disconnect(this);
    m_form->setUniverseProvider({});
}

bool EditorWindow::isReadOnly() const {
    return m_document->isReadOnly();
}

QDockWidget* EditorWindow::dock(const QString& title, const QString& name, QWidget* widget,
                                Qt::DockWidgetArea area) {
    auto* d = new QDockWidget(title, this);
    d->setObjectName(name);
    d->setWidget(widget);
    addDockWidget(area, d);
    return d;
}

void EditorWindow::buildPanels() {
    m_outlineView->setObjectName(QStringLiteral("outline"));
    m_outlineView->setModel(m_outline);
    m_outlineView->setDragDropMode(QAbstractItemView::InternalMove);
    m_outlineView->setDefaultDropAction(Qt::MoveAction);
    m_outlineView->setDragEnabled(true);
    m_outlineView->setAcceptDrops(true);
    m_outlineView->setDropIndicatorShown(true);
    m_outlineView->setEditTriggers(QAbstractItemView::EditKeyPressed |
                                   QAbstractItemView::SelectedClicked);
    m_outlineView->setUniformRowHeights(true); // 5,000 rows stay quick
    m_outlineView->header()->setSectionResizeMode(OutlineModel::NameColumn,
                                                  QHeaderView::Interactive);
    m_outlineView->header()->resizeSection(OutlineModel::NameColumn, 190);
    connect(m_outlineView->selectionModel(), &QItemSelectionModel::currentChanged, this,
            [this](const QModelIndex& current) { selectionChanged(current); });
    connect(m_outline, &QAbstractItemModel::modelReset, m_outlineView, &QTreeView::expandAll);
    connect(m_outline, &QAbstractItemModel::rowsInserted, this, [this](const QModelIndex& parent) {
        if (!parent.isValid())
            return;
        m_outlineView->expand(parent);
    });

    m_form = new ItemForm(m_document, m_outline);
    m_form->setObjectName(QStringLiteral("itemForm"));
    m_form->setUniverseProvider([this](int position) { return universeText(position); });
    setCentralWidget(m_form);

    m_rules = new RulesPanel(m_document, m_outline);
    m_codeLists = new CodeListPanel(m_document);
    m_trial = new TrialRunPanel(m_document);
    m_preview = new PreviewPanel(m_document);

    m_findingsView->setObjectName(QStringLiteral("findings"));
    m_findingsView->setModel(m_findings);
    m_findingsView->setSelectionBehavior(QAbstractItemView::SelectRows);
    m_findingsView->setSelectionMode(QAbstractItemView::SingleSelection);
    m_findingsView->setWordWrap(false);
    m_findingsView->verticalHeader()->hide();
    m_findingsView->horizontalHeader()->setSectionResizeMode(FindingsModel::MessageColumn,
                                                             QHeaderView::Stretch);
    connect(m_findingsView, &QAbstractItemView::activated, this,
            [this](const QModelIndex& index) { jumpToFinding(index.row()); });

    auto* undoView = new QUndoView(m_document->undoStack());
    undoView->setObjectName(QStringLiteral("history"));
    undoView->setEmptyLabel(tr("(opened)"));

    // The map is laid out on the GUI thread, so it is redrawn a little after the
    // findings (never delaying them) and only while its dock is on screen.
    m_mapTimer->setSingleShot(true);
    m_mapTimer->setInterval(120);
    connect(m_mapTimer, &QTimer::timeout, this, &EditorWindow::refreshRouteMap);
    connect(m_routeMap, &RouteMapView::itemSelected, this, &EditorWindow::routeMapSelected);

    QDockWidget* outlineDock =
        dock(tr("Outline"), QStringLiteral("outlineDock"), m_outlineView, Qt::LeftDockWidgetArea);
    QDockWidget* rulesDock =
        dock(tr("Routing rules"), QStringLiteral("rulesDock"), m_rules, Qt::RightDockWidgetArea);
    QDockWidget* listsDock = dock(tr("Shared code lists"), QStringLiteral("codeListsDock"),
                                  m_codeLists, Qt::RightDockWidgetArea);
    QDockWidget* findingsDock = dock(tr("Findings"), QStringLiteral("findingsDock"), m_findingsView,
                                     Qt::BottomDockWidgetArea);
    // The trial run's controls need ~300 px; scrolled, they do not force the
    // findings (tabbed with it) to that height.
    auto* trialScroll = new QScrollArea;
    trialScroll->setWidgetResizable(true);
    trialScroll->setFrameShape(QFrame::NoFrame);
    trialScroll->setWidget(m_trial);
    QDockWidget* trialDock =
        dock(tr("Trial run"), QStringLiteral("trialDock"), trialScroll, Qt::BottomDockWidgetArea);
    QDockWidget* previewDock = dock(tr("Dictionary preview"), QStringLiteral("previewDock"),
                                    m_preview, Qt::BottomDockWidgetArea);
    QDockWidget* historyDock =
        dock(tr("History"), QStringLiteral("historyDock"), undoView, Qt::LeftDockWidgetArea);
    m_routeMapDock =
        dock(tr("Route map"), QStringLiteral("routeMapDock"), m_routeMap, Qt::RightDockWidgetArea);
    connect(m_routeMapDock, &QDockWidget::visibilityChanged, this, [this](bool visible) {
        if (visible && m_mapRevision != m_runner->latest().revision)
            m_mapTimer->start();
    });
    // The side columns run the full height; findings and friends sit under the form.
    setCorner(Qt::BottomLeftCorner, Qt::LeftDockWidgetArea);
    setCorner(Qt::BottomRightCorner, Qt::RightDockWidgetArea);
    splitDockWidget(outlineDock, historyDock, Qt::Vertical);
    tabifyDockWidget(findingsDock, trialDock);
    tabifyDockWidget(findingsDock, previewDock);
    findingsDock->raise();
    // Right: rules and code lists as tabs above the route map, always in view.
    splitDockWidget(rulesDock, m_routeMapDock, Qt::Vertical);
    tabifyDockWidget(rulesDock, listsDock);
    rulesDock->raise();
}

void EditorWindow::showEvent(QShowEvent* event) {
    QMainWindow::showEvent(event);
    if (m_docksSized)
        return;
    // Dock sizes only take once the window has its own size.
    m_docksSized = true;
    QTimer::singleShot(0, this, [this] { sizeDocks(); });
}

void EditorWindow::sizeDocks() {
    const auto byName = [this](const char* name) {
        return findChild<QDockWidget*>(QLatin1String(name));
    };
    resizeDocks({byName("outlineDock"), byName("rulesDock")}, {width() / 5, width() / 3},
                Qt::Horizontal);
    resizeDocks({byName("outlineDock"), byName("historyDock")}, {height() * 3 / 4, height() / 6},
                Qt::Vertical);
    resizeDocks({byName("rulesDock"), byName("routeMapDock")}, {height() * 2 / 5, height() * 3 / 5},
                Qt::Vertical);
    resizeDocks({byName("findingsDock")}, {height() / 4}, Qt::Vertical);
}

void EditorWindow::buildActions() {
    buildFileMenu();
    buildEditMenu();
    buildViewMenu();
}

void EditorWindow::buildFileMenu() {
    QMenu* file = menuBar()->addMenu(tr("&File"));
    auto add = [&](const QString& text, const QString& name, auto slot,
                   QKeySequence::StandardKey key = QKeySequence::UnknownKey) {
        QAction* action = file->addAction(text, this, slot);
        action->setObjectName(name);
        if (key != QKeySequence::UnknownKey)
            action->setShortcut(key);
        return action;
    };
    add(
        tr("&New"), QStringLiteral("actionNew"),
        [this] {
            if (maybeSave())
                newDocument();
        },
        QKeySequence::New);
    add(
        tr("&Open..."), QStringLiteral("actionOpen"), [this] { openWithDialog(); },
        QKeySequence::Open);
    m_recentMenu = file->addMenu(tr("Open &Recent"));
    rebuildRecentMenu();
    file->addSeparator();
    m_saveAction = add(
        tr("&Save"), QStringLiteral("actionSave"), [this] { save(); }, QKeySequence::Save);
    add(
        tr("Save &As..."), QStringLiteral("actionSaveAs"), [this] { saveAsWithDialog(); },
        QKeySequence::SaveAs);
    file->addSeparator();
    add(tr("&Import YAML..."), QStringLiteral("actionImportYaml"), [this] { importYaml(); });
    QMenu* exports = file->addMenu(tr("&Export"));
    m_exports->addActions(exports);
    exports->addAction(tr("Plain HTML preview..."), this, &EditorWindow::exportPreview);
    file->addSeparator();
    add(
        tr("&Quit"), QStringLiteral("actionQuit"), [this] { close(); }, QKeySequence::Quit);
}

void EditorWindow::buildEditMenu() {
    QMenu* edit = menuBar()->addMenu(tr("&Edit"));
    QAction* undo = m_document->undoStack()->createUndoAction(this, tr("&Undo"));
    undo->setShortcut(QKeySequence::Undo);
    undo->setObjectName(QStringLiteral("actionUndo"));
    QAction* redo = m_document->undoStack()->createRedoAction(this, tr("&Redo"));
    redo->setShortcut(QKeySequence::Redo);
    redo->setObjectName(QStringLiteral("actionRedo"));
    edit->addAction(undo);
    edit->addAction(redo);
    edit->addSeparator();
    QAction* module = edit->addAction(Icons::get(Icons::Module), tr("Add &module"), this,
                                      &EditorWindow::addModule);
    module->setObjectName(QStringLiteral("actionAddModule"));
    module->setShortcut(QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_M));
    QAction* item =
        edit->addAction(Icons::get(Icons::Add), tr("Add &item"), this, &EditorWindow::addItem);
    item->setObjectName(QStringLiteral("actionAddItem"));
    item->setShortcut(QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_N));
    // Delete and moves act on the outline only, so they never steal keys from text fields.
    QAction* remove = new QAction(Icons::get(Icons::Remove), tr("&Delete"), this);
    remove->setObjectName(QStringLiteral("actionDelete"));
    remove->setShortcut(QKeySequence::Delete);
    remove->setShortcutContext(Qt::WidgetWithChildrenShortcut);
    connect(remove, &QAction::triggered, this, &EditorWindow::deleteSelected);
    m_outlineView->addAction(remove);
    edit->addAction(remove);
    QAction* up = new QAction(Icons::get(Icons::Up), tr("Move &up"), this);
    up->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_Up));
    up->setShortcutContext(Qt::WidgetWithChildrenShortcut);
    connect(up, &QAction::triggered, this, [this] { moveSelected(-1); });
    QAction* down = new QAction(Icons::get(Icons::Down), tr("Move do&wn"), this);
    down->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_Down));
    down->setShortcutContext(Qt::WidgetWithChildrenShortcut);
    connect(down, &QAction::triggered, this, [this] { moveSelected(+1); });
    m_outlineView->addActions({up, down});
    edit->addActions({up, down});
    m_editActions = {module, item, remove, up, down};

    QToolBar* tools = addToolBar(tr("Edit"));
    tools->setObjectName(QStringLiteral("editToolBar"));
    tools->addActions({module, item, remove});
    tools->addSeparator();
    tools->addActions({undo, redo});
    QMenu* run = menuBar()->addMenu(tr("&Run"));
    QAction* restart = run->addAction(Icons::get(Icons::Play), tr("&Restart trial run"), m_trial,
                                      &TrialRunPanel::restart);
    restart->setShortcut(QKeySequence(Qt::Key_F5));
    run->addAction(tr("&Check now"), m_runner, &AnalysisRunner::runNow)
        ->setShortcut(QKeySequence(Qt::Key_F7));
    run->addAction(tr("Check a &response file..."), this,
                   [this] { DataCheckRun::askAndRun(m_document->instrument(), this); });
    tools->addSeparator();
    tools->addAction(restart);
}

void EditorWindow::buildViewMenu() {
    m_viewMenu = menuBar()->addMenu(tr("&View"));
    for (QDockWidget* d : findChildren<QDockWidget*>())
        m_viewMenu->addAction(d->toggleViewAction());
    m_viewMenu->addSeparator();
    QAction* dark = m_viewMenu->addAction(tr("&Dark palette"));
    dark->setObjectName(QStringLiteral("actionDarkPalette"));
    dark->setCheckable(true);
    dark->setChecked(QSettings().value(QStringLiteral("darkPalette"), false).toBool());
    connect(dark, &QAction::toggled, this, [this](bool on) {
        QSettings().setValue(QStringLiteral("darkPalette"), on);
        setDarkPalette(on);
    });
}

void EditorWindow::setDarkPalette(bool dark) {
    // Fusion draws every palette role the same on every platform.
    static const QPalette light = QApplication::palette();
    if (QApplication::style()->name().compare(u"fusion", Qt::CaseInsensitive) != 0)
        if (QStyle* fusion = QStyleFactory::create(QStringLiteral("Fusion")))
            QApplication::setStyle(fusion);
    QApplication::setPalette(dark ? darkPalette() : light);
    // Widgets under a style sheet were polished with the palette they had then
    // and do not follow a later application palette; polishing again does.
    setStyleSheet(QString());
    setStyleSheet(Icons::styleSheet());
}

void EditorWindow::forgetFile() {
    m_lock.reset();
    m_diskState = DiskState();
    m_document->setReadOnly(false);
}

void EditorWindow::newDocument() {
    forgetFile();
    m_document->reset(emptyInstrument(), QString());
    m_trial->restart();
    m_runner->runNow();
}

bool EditorWindow::openFile(const QString& path) {
    LoadResult loaded = loadInstrumentFile(path);
    if (!loaded.ok()) {
        QMessageBox::warning(this, tr("Cannot open %1").arg(QFileInfo(path).fileName()),
                             formatDiagnostics(loaded.errors));
        return false;
    }
    const QString absolute = QFileInfo(path).absoluteFilePath();
    // Reopening our own file keeps our lock; anything else takes its own.
    const bool reopening = m_lock && m_document->path() == absolute;
    auto lock = reopening ? std::move(m_lock) : std::make_unique<ProjectLock>(absolute);
    const ProjectLock::Result held = lock->acquire();
    forgetFile();
    if (held.outcome == ProjectLock::Outcome::Acquired)
        m_lock = std::move(lock);
    m_diskState = DiskState::of(absolute);
    m_document->reset(std::move(*loaded.instrument), absolute);
    m_document->setReadOnly(held.outcome == ProjectLock::Outcome::HeldElsewhere);
    m_outlineView->expandAll();
    m_trial->restart();
    m_runner->runNow();
    addRecent(m_document->path());
    updateTitle();
    if (held.outcome == ProjectLock::Outcome::HeldElsewhere)
        m_exports->reportError(
            tr("Opened read-only"),
            tr("%1 is already open in another editor (%2).\n\nIt is shown read-only here: "
               "editing and Save are off. Save As writes a copy under another name.")
                .arg(QFileInfo(absolute).fileName(), held.holder));
    else if (held.outcome == ProjectLock::Outcome::Failed)
        statusBar()->showMessage(tr("Not locked: %1").arg(held.error), 8000);
    return true;
}

// A file this window does not hold yet gets its own lock first: saving over a
// project another editor has open would lose its work.
bool EditorWindow::lockForSaving(const QString& path, std::unique_ptr<ProjectLock>& lock) {
    if (m_lock && m_document->path() == path)
        return true;
    lock = std::make_unique<ProjectLock>(path);
    const ProjectLock::Result held = lock->acquire();
    if (held.outcome == ProjectLock::Outcome::HeldElsewhere) {
        m_exports->reportError(
            tr("Cannot save"),
            tr("%1 is open in another editor (%2).").arg(QFileInfo(path).fileName(), held.holder));
        return false;
    }
    if (held.outcome == ProjectLock::Outcome::Failed)
        lock.reset(); // a folder without a lock file can still take the project
    return true;
}

bool EditorWindow::saveTo(const QString& path) {
    const QString absolute = QFileInfo(path).absoluteFilePath();
    const bool samePath = absolute == m_document->path();
    if (samePath && m_document->isReadOnly()) {
        m_exports->reportError(tr("Cannot save"),
                               tr("This project is read-only here; use Save As."));
        return false;
    }
    std::unique_ptr<ProjectLock> lock;
    if (!lockForSaving(absolute, lock))
        return false;
    if (samePath && m_diskState.differsFrom(DiskState::of(absolute)) && !m_askOverwrite(absolute))
        return false;
    if (const std::optional<Diagnostic> problem =
            saveInstrumentFile(m_document->instrument(), absolute)) {
        m_exports->reportError(tr("Cannot save"), problem->toString());
        return false;
    }
    if (lock)
        m_lock = std::move(lock); // the old file's lock goes with the old name
    m_diskState = DiskState::of(absolute);
    m_document->setReadOnly(false);
    m_document->setPath(absolute);
    m_document->markSaved();
    addRecent(m_document->path());
    statusBar()->showMessage(tr("Saved %1").arg(QFileInfo(path).fileName()), 4000);
    updateTitle();
    return true;
}

bool EditorWindow::save() {
    if (m_document->path().isEmpty())
        return saveAsWithDialog();
    return saveTo(m_document->path());
}

bool EditorWindow::saveAsWithDialog() {
    const QString path = m_exports->choosePath(
        tr("Save instrument as"),
        tr("Routebook project (*.routebook);;YAML instrument (*.yaml *.yml)"), m_document->path());
    return !path.isEmpty() && saveTo(path);
}

void EditorWindow::openWithDialog() {
    if (!maybeSave())
        return;
    const QString path = QFileDialog::getOpenFileName(
        this, tr("Open instrument"), QFileInfo(m_document->path()).absolutePath(),
        tr("Routebook files (*.routebook *.yaml *.yml)"));
    if (!path.isEmpty())
        openFile(path);
}

void EditorWindow::importYaml() {
    if (!maybeSave())
        return;
    const QString path = QFileDialog::getOpenFileName(this, tr("Import YAML instrument"), QString(),
                                                      tr("YAML instrument (*.yaml *.yml)"));
    if (path.isEmpty())
        return;
    LoadResult loaded = loadYamlFile(path);
    if (!loaded.ok()) {
        QMessageBox::warning(this, tr("Cannot import"), formatDiagnostics(loaded.errors));
        return;
    }
    // An import is a new, unsaved project: Save asks where the .routebook goes.
    forgetFile();
    m_document->reset(std::move(*loaded.instrument), QString());
    m_trial->restart();
    m_runner->runNow();
}

void EditorWindow::exportPreview() {
    const QString path =
        m_exports->choosePath(tr("Export plain HTML preview"), tr("HTML (*.html)"), QString());
    if (path.isEmpty())
        return;
    const QString body =
        plainPreviewHtml(m_document->instrument(), m_runner->latest(), INT_MAX); // all items
    const QString html = QStringLiteral("<!DOCTYPE html><html><head><meta charset=\"utf-8\">"
                                        "<title>%1</title></head><body>%2</body></html>")
                             .arg(m_document->instrument().title.toHtmlEscaped(), body);
    m_exports->writeBytes(path, html.toUtf8());
}

bool EditorWindow::maybeSave() {
    if (!m_document->isModified())
        return true;
    switch (m_askSave()) {
    case QMessageBox::Save:
        return save();
    case QMessageBox::Discard:
        return true;
    default:
        return false;
    }
}

void EditorWindow::closeEvent(QCloseEvent* event) {
    if (maybeSave())
        event->accept();
    else
        event->ignore();
}

void EditorWindow::updateTitle() {
    const QString path = m_document->path();
    const QString name = path.isEmpty() ? tr("Untitled") : QFileInfo(path).fileName();
    setWindowFilePath(path);
    setWindowTitle(m_document->isReadOnly() ? tr("%1[*] (read-only) - Routebook").arg(name)
                                            : tr("%1[*] - Routebook").arg(name));
    setWindowModified(m_document->isModified());
}

void EditorWindow::applyReadOnly(bool readOnly) {
    for (QAction* action : std::as_const(m_editActions))
        action->setEnabled(!readOnly);
    m_saveAction->setEnabled(!readOnly);
    for (QWidget* panel : {static_cast<QWidget*>(m_form), static_cast<QWidget*>(m_rules),
                           static_cast<QWidget*>(m_codeLists)})
        panel->setEnabled(!readOnly);
    m_outlineView->setDragEnabled(!readOnly);
    m_outlineView->setAcceptDrops(!readOnly);
    m_outlineView->setEditTriggers(readOnly ? QAbstractItemView::NoEditTriggers
                                            : QAbstractItemView::EditKeyPressed |
                                                  QAbstractItemView::SelectedClicked);
    m_readOnlyNote->setVisible(readOnly);
    updateTitle();
}

void EditorWindow::addRecent(const QString& path) {
    QSettings settings;
    QStringList recent = settings.value(QStringLiteral("recentFiles")).toStringList();
    recent.removeAll(path);
    recent.prepend(path);
    while (recent.size() > kMaxRecent)
        recent.removeLast();
    settings.setValue(QStringLiteral("recentFiles"), recent);
    rebuildRecentMenu();
}

void EditorWindow::rebuildRecentMenu() {
    m_recentMenu->clear();
    const QStringList recent = QSettings().value(QStringLiteral("recentFiles")).toStringList();
    for (const QString& path : recent)
        m_recentMenu
            ->addAction(QFileInfo(path).fileName(), this,
                        [this, path] {
                            if (maybeSave())
                                openFile(path);
                        })
            ->setToolTip(plainToolTip(path));
    m_recentMenu->setEnabled(!recent.isEmpty());
}

std::pair<int, int> EditorWindow::selectedRow() const {
    return m_outline->locate(m_outlineView->currentIndex());
}

void EditorWindow::select(int module, int item) {
    const QModelIndex index =
        item < 0 ? m_outline->moduleIndex(module) : m_outline->itemIndex(module, item);
    m_outlineView->setCurrentIndex(index);
    m_outlineView->scrollTo(index);
}

void EditorWindow::selectionChanged(const QModelIndex& current) {
    m_form->setCurrent(current);
    m_rules->setCurrent(current);
    if (m_syncingSelection)
        return;
    const auto [module, item] = m_outline->locate(current);
    if (item >= 0)
        m_routeMap->selectItem(m_outline->flatPosition(module, item)); // does not echo
}

void EditorWindow::routeMapSelected(int position) {
    const auto [module, item] = m_outline->rowOfPosition(position);
    if (module < 0)
        return;
    m_syncingSelection = true;
    select(module, item);
    m_syncingSelection = false;
}

void EditorWindow::refreshRouteMap() {
    const LiveAnalysis& analysis = m_runner->latest();
    // A map of an older revision than the findings would mislabel positions.
    if (!m_routeMapDock->isVisible() || analysis.revision != m_document->revision())
        return;
    // Drawing 5,000 items takes ~100 ms here: wait for a pause in the editing,
    // so the redraw never holds up the findings of the next edit.
    if (m_runner->isBusy()) {
        m_mapTimer->start();
        return;
    }
    m_routeMap->setRouting(CompiledRouting(m_document->instrument()), &analysis.routing);
    m_mapRevision = analysis.revision;
    const auto [module, item] = selectedRow();
    if (item >= 0)
        m_routeMap->selectItem(m_outline->flatPosition(module, item));
}

void EditorWindow::addModule() {
    const auto [module, item] = selectedRow();
    const int at = module < 0 ? int(m_document->instrument().modules.size()) : module + 1;
    Module fresh;
    fresh.name = uniqueName(m_document->instrument(), QStringLiteral("module"));
    m_document->push(ModuleCommand::insert(m_document, at, fresh));
    select(at, -1);
    m_form->moduleNameEdit()->setFocus();
    m_form->moduleNameEdit()->selectAll();
}

void EditorWindow::addItem() {
    auto [module, item] = selectedRow();
    if (m_document->instrument().modules.isEmpty()) {
        statusBar()->showMessage(tr("Add a module first: items live in modules."), 4000);
        return;
    }
    if (module < 0)
        module = int(m_document->instrument().modules.size()) - 1;
    const int at =
        item < 0 ? int(m_document->instrument().modules.at(module).items.size()) : item + 1;
    Item fresh;
    fresh.name = uniqueName(m_document->instrument(), QStringLiteral("item"));
    fresh.type = ItemType::Single; // no codes yet: the checks say so until some are chosen
    m_document->push(ItemCommand::insert(m_document, module, at, fresh));
    select(module, at);
    m_form->nameEdit()->setFocus();
    m_form->nameEdit()->selectAll();
}

void EditorWindow::deleteSelected() {
    const auto [module, item] = selectedRow();
    if (module < 0)
        return;
    m_document->push(item < 0 ? deleteModuleCommand(m_document, module)
                              : deleteItemCommand(m_document, module, item));
}

void EditorWindow::moveSelected(int delta) {
    const auto [module, item] = selectedRow();
    const QList<Module>& modules = m_document->instrument().modules;
    if (module < 0)
        return;
    if (item < 0) {
        const int to = module + delta;
        if (to >= 0 && to < modules.size()) {
            m_document->push(new MoveModuleCommand(m_document, module, to));
            select(to, -1);
        }
        return;
    }
    const int to = item + delta;
    if (to >= 0 && to < modules.at(module).items.size()) {
        m_document->push(new MoveItemCommand(m_document, module, item, module, to));
        select(module, to);
    }
}

void EditorWindow::jumpToFinding(int row) {
    if (row < 0 || row >= m_findings->rowCount())
        return;
    const Finding finding = m_findings->findingAt(row);
    const QModelIndex target =
        m_outline->indexOfName(finding.item.isEmpty() ? finding.module : finding.item);
    if (!target.isValid())
        return;
    m_outlineView->setCurrentIndex(target);
    m_outlineView->scrollTo(target);
    static const QRegularExpression rule(QStringLiteral("^routing\\[(\\d+)\\]\\.(if|goto)$"));
    const QRegularExpressionMatch match = rule.match(finding.field);
    if (match.hasMatch()) {
        m_rules->focusRule(match.captured(1).toInt(), match.captured(2) == u"goto",
                           finding.column.value_or(1));
        return;
    }
    m_form->focusField(finding.field, finding.column);
}

QString EditorWindow::universeText(int position) const {
    const LiveAnalysis& analysis = m_runner->latest();
    if (position < 0 || position >= analysis.marks.size())
        return tr("(analysing...)");
    const ItemMarks& marks = analysis.marks.at(position);
    switch (marks.asked) {
    case ItemUniverse::Asked::Always:
        return tr("Asked of everyone");
    case ItemUniverse::Asked::Never:
        return tr("Never asked: no respondent reaches this item");
    case ItemUniverse::Asked::Conditional:
        break;
    }
    return tr("Asked if %1").arg(marks.askedIf);
}

void EditorWindow::analysisArrived() {
    const LiveAnalysis& analysis = m_runner->latest();
    m_findings->setFindings(analysis.findings);
    m_outline->setMarks(analysis.marks);
    m_preview->setAnalysis(analysis);
    m_form->refreshUniverse();
    m_mapTimer->start();
    const FindingCounts counts = countFindings(analysis.findings);
    m_counts->setText(tr("%1 errors, %2 warnings").arg(counts.errors).arg(counts.warnings));
}

} // namespace rb
