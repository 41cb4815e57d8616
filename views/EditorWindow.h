#pragma once

#include <QMainWindow>
#include <QMessageBox>

#include <functional>

class QDockWidget;
class QLabel;
class QMenu;
class QTableView;
class QTreeView;

namespace rb {

class AnalysisRunner;
class CodeListPanel;
class Document;
class FindingsModel;
class ItemForm;
class OutlineModel;
class PreviewPanel;
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
    // The dock the route map will live in.
    QDockWidget* routeMapDock() const { return m_routeMapDock; }

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
    void exportYaml();
    void exportDot();
    void exportPreview();
    bool maybeSave();
    void updateTitle();
    void addRecent(const QString& path);
    void rebuildRecentMenu();
    void selectionChanged(const QModelIndex& current);
    void analysisArrived();
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
    QDockWidget* m_routeMapDock = nullptr;
    QMenu* m_viewMenu = nullptr;
    QMenu* m_recentMenu = nullptr;
    QLabel* m_counts;
    bool m_docksSized = false;
    std::function<QMessageBox::StandardButton()> m_askSave;
};

} // namespace rb
