#pragma once

#include "edit/LiveAnalysis.h"

#include <QAbstractItemModel>

namespace rb {

class Document;
struct ChangeEvent;

// Modules and their items as a two-level tree, in questionnaire order: an
// adapter over a Document. Edits (rename, relabel, drag to reorder) push
// commands; document events become exact row and data signals. Item icons
// show the latest analysis: conditional, never asked, in a loop, findings.
class OutlineModel : public QAbstractItemModel {
    Q_OBJECT
public:
    enum Column { NameColumn, LabelColumn, ColumnCount };

    explicit OutlineModel(Document* document, QObject* parent = nullptr);

    // The analysis marks by flat position (from AnalysisRunner).
    void setMarks(const QList<ItemMarks>& marks);

    QModelIndex index(int row, int column, const QModelIndex& parent = {}) const override;
    QModelIndex parent(const QModelIndex& child) const override;
    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    bool setData(const QModelIndex& index, const QVariant& value, int role = Qt::EditRole) override;
    Qt::ItemFlags flags(const QModelIndex& index) const override;
    QVariant headerData(int section, Qt::Orientation orientation,
                        int role = Qt::DisplayRole) const override;

    Qt::DropActions supportedDropActions() const override { return Qt::MoveAction; }
    QStringList mimeTypes() const override;
    QMimeData* mimeData(const QModelIndexList& indexes) const override;
    bool dropMimeData(const QMimeData* data, Qt::DropAction action, int row, int column,
                      const QModelIndex& parent) override;

    // Module row: (module, -1); item row: (module, item); invalid: (-1, -1).
    std::pair<int, int> locate(const QModelIndex& index) const;
    QModelIndex moduleIndex(int module, int column = 0) const;
    QModelIndex itemIndex(int module, int item, int column = 0) const;
    // The index of an item (or, failing that, a module) by name, any case.
    QModelIndex indexOfName(const QString& name) const;
    int flatPosition(int module, int item) const;
    // The inverse of flatPosition: (module, item), or (-1, -1) out of range.
    std::pair<int, int> rowOfPosition(int position) const;

private:
    void before(const ChangeEvent& event);
    void after(const ChangeEvent& event);
    void rebuildStarts();
    QVariant itemData(int module, int item, int column, int role) const;
    QVariant moduleData(int module, int column, int role) const;
    QVariant itemIcon(int position) const;

    static constexpr quintptr kModuleRow = ~quintptr(0);
    Document* m_document;
    QList<ItemMarks> m_marks;
    QList<int> m_moduleStart; // flat position of each module's first item
    bool m_moving = false;    // a beginMoveRows is open
};

} // namespace rb
