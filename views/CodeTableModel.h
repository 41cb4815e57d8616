#pragma once

#include "edit/CodeLocation.h"

#include <QAbstractTableModel>

#include <optional>

namespace rb {

class Document;
struct ChangeEvent;

// The codes at one location (a shared list, an item's own codes, an item's
// extra missing codes) as an editable table: code, label, missing kind.
// Changing a code's number rewrites the conditions that compare with it (one
// undo step); other edits swap the whole list through one attribute command.
class CodeTableModel : public QAbstractTableModel {
    Q_OBJECT
public:
    enum Column { CodeColumn, LabelColumn, MissingColumn, ColumnCount };

    explicit CodeTableModel(Document* document, QObject* parent = nullptr);

    void setLocation(std::optional<CodeLocation> where);
    std::optional<CodeLocation> location() const { return m_where; }

    // Appends a code one above the largest (or 1), or removes/moves a row.
    void addCode();
    void removeCode(int row);
    void moveCode(int row, int delta);

    int rowCount(const QModelIndex& parent = {}) const override;
    int columnCount(const QModelIndex& parent = {}) const override;
    QVariant data(const QModelIndex& index, int role = Qt::DisplayRole) const override;
    bool setData(const QModelIndex& index, const QVariant& value, int role = Qt::EditRole) override;
    Qt::ItemFlags flags(const QModelIndex& index) const override;
    QVariant headerData(int section, Qt::Orientation orientation,
                        int role = Qt::DisplayRole) const override;

    // Names for the missing column: "", "dont_know", ... (the combo's choices).
    static QStringList missingChoices();

private:
    QList<Code> codes() const;
    void pushCodes(const QList<Code>& codes, const QString& text);
    void documentChanged(const ChangeEvent& event);

    Document* m_document;
    std::optional<CodeLocation> m_where;
};

} // namespace rb
