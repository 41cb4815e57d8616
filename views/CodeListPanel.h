#pragma once

#include <QWidget>

class QLabel;
class QListWidget;
class QPushButton;
class QTableView;

namespace rb {

class CodeTableModel;
class Document;
struct ChangeEvent;

// The shared code lists: the lists (rename by editing the name, which
// rewrites every item that uses it), which items use the selected list, and
// its codes as an editable table.
class CodeListPanel : public QWidget {
    Q_OBJECT
public:
    explicit CodeListPanel(Document* document, QWidget* parent = nullptr);

    QListWidget* lists() const { return m_lists; }
    QTableView* codes() const { return m_codes; }
    CodeTableModel* codesModel() const { return m_model; }
    QLabel* usedBy() const { return m_usedBy; }
    // Adds a list with a fresh name and selects it; returns its index.
    int addList();
    void selectList(int index);

private:
    void rebuild();
    void listChanged(int row);
    void documentChanged(const ChangeEvent& event);
    QStringList usersOf(const QString& listName) const;

    Document* m_document;
    QListWidget* m_lists;
    QLabel* m_usedBy;
    QTableView* m_codes;
    CodeTableModel* m_model;
    QPushButton* m_removeList;
    bool m_rebuilding = false;
};

} // namespace rb
