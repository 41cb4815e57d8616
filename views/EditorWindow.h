#pragma once

#include <QMainWindow>
#include <QMessageBox>

#include "storage/DiskState.h"

#include <functional>
#include <memory>

class QDockWidget;
class QLabel;
class QMenu;
class QTableView;
class QTimer;
class QTreeView;

namespace rb {

class AnalysisRunner;
class CodeListPanel;
class Document;
class FileExports;
class FindingsModel;
class ItemForm;
class OutlineModel;
class ProjectLock;
class PreviewPanel;
class RouteMapView;
class RulesPanel;
class TrialRunPanel;

// The editor's main window (the app shows it; tests drive it): the outline of modules and items
// (left), the form of the selected row (centre), the rules and code lists (right), the findings,
// trial run, dictionary preview and history (bottom), and a dock kept for the route map. One
// Document owns the instrument and the undo stack; every panel edits through it; an AnalysisRunner
// rechecks after every edit on a worker thread.
class EditorWindow : public QMainWindow {
    Q_OBJECT
public:
    explicit EditorWindow(QWidget* parent = nullptr);
    ~EditorWindow() override;

    // Opens a .routebook or .yaml file; shows a message and keeps the current
    // project when the file cannot be loaded. Returns whether it loaded.
    bool openFile(const QString& path);
    // Saves to `path` (format by extension) and makes it the document's file.
    bool saveTo(const QString& path);
    void newDocument();

    // Asked when closing or replacing a modified document (tests replace the
    // dialog; default: a Save / Discard / Cancel message box).
    void setSaveQuestion(std::function<QMessageBox::StandardButton()> ask) {
        m_askSave = std::move(ask);
    }

    // Where Save As and the exports write, and how errors are shown (tests replace
    // both; default: a file dialog and a warning box).
    FileExports* fileExports() const { return m_exports; }

    // Asked before Save overwrites a file another program changed since this
    // editor opened or last saved it (tests replace it; default: a Yes/No box).
    void setOverwriteQuestion(std::function<bool(const QString& path)> ask) {
        m_askOverwrite = std::move(ask);
    }
    // Read-only: the project is open in another editor (edits and Save off).
    bool isReadOnly() const;

    Document* document() const { return m_document; }
    AnalysisRunner* analysisRunner() const { return m_runner; }
    OutlineModel* outlineModel() const { return m_outline; }
    QTreeView* outlineView() const { return m_outlineView; }
    ItemForm* itemForm() const { return m_form; }
    RulesPanel* rulesPanel() const { return m_rules; }
    CodeListPanel* codeListPanel() const { return m_codeLists; }
    TrialRunPanel* trialRunPanel() const { return m_trial; }
    PreviewPanel* previewPanel() const { return m_preview; }
    FindingsModel* findingsModel() const { return m_findings; }
    QTableView* findingsView() const { return m_findingsView; }
    QDockWidget* routeMapDock() const { return m_routeMapDock; }
    RouteMapView* routeMapView() const { return m_routeMap; }
    // The revision the route map was last drawn for (kNever before the first drawing).
    static constexpr quint64 kNever = ~quint64(0);
    quint64 routeMapRevision() const { return m_mapRevision; }

    void addModule();
    void addItem();
    void deleteSelected();
    void moveSelected(int delta);
    void jumpToFinding(int row);
    void setDarkPalette(bool dark);

protected:
    void closeEvent(QCloseEvent* event) override;
    void showEvent(QShowEvent* event) override;

private:
    void buildPanels();
    void sizeDocks();
    QDockWidget* dock(const QString& title, const QString& name, QWidget* widget,
                      Qt::DockWidgetArea area);
    void buildActions();
    void buildFileMenu();
    void buildEditMenu();
    void buildViewMenu();
    void openWithDialog();
    bool save();
    bool saveAsWithDialog();
    void importYaml();
    void exportPreview();
    bool maybeSave();
    void updateTitle();
    void applyReadOnly(bool readOnly);
    void forgetFile();
    bool lockForSaving(const QString& path, std::unique_ptr<ProjectLock>& lock);
    void addRecent(const QString& path);
    void rebuildRecentMenu();
    void selectionChanged(const QModelIndex& current);
    void analysisArrived();
    void refreshRouteMap();
    void routeMapSelected(int position);
    QString universeText(int position) const;
    std::pair<int, int> selectedRow() const;
    void select(int module, int item);

    Document* m_document;
    AnalysisRunner* m_runner;
    OutlineModel* m_outline;
    FindingsModel* m_findings;
    QTreeView* m_outlineView;
    QTableView* m_findingsView;
    ItemForm* m_form;
    RulesPanel* m_rules;
    CodeListPanel* m_codeLists;
    TrialRunPanel* m_trial;
    PreviewPanel* m_preview;
    FileExports* m_exports;
    QDockWidget* m_routeMapDock = nullptr;
    RouteMapView* m_routeMap;
    QTimer* m_mapTimer;
    quint64 m_mapRevision = kNever;
    bool m_syncingSelection = false; // outline <-> map, so neither echoes the other
    QMenu* m_viewMenu = nullptr;
    QMenu* m_recentMenu = nullptr;
    QLabel* m_counts;
    bool m_docksSized = false;
    std::function<QMessageBox::StandardButton()> m_askSave;
    std::function<bool(const QString&)> m_askOverwrite;
    std::unique_ptr<ProjectLock> m_lock; // held while this window edits its file
    DiskState m_diskState;               // the file as last read or written here
    QList<QAction*> m_editActions;       // off while read-only
    QAction* m_saveAction = nullptr;
    QLabel* m_readOnlyNote;
};

} // namespace rb
