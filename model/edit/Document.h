#pragma once

#include "ChangeEvent.h"

#include <QObject>
#include <QUndoStack>

namespace rb {

// One open project: the instrument, its file path and the one undo stack every
// panel pushes to. Panels never change the instrument directly: they push
// commands (model/edit/*Command.h), and commands call the raw mutators below,
// each of which announces itself with aboutToChange(event) and changed(event).
class Document : public QObject {
    Q_OBJECT
public:
    explicit Document(QObject* parent = nullptr);

    const Instrument& instrument() const { return m_instrument; }
    QUndoStack* undoStack() { return &m_undoStack; }
    const QUndoStack* undoStack() const { return &m_undoStack; }

    QString path() const { return m_path; }
    void setPath(const QString& path);
    bool isModified() const { return !m_undoStack.isClean(); }
    void markSaved() { m_undoStack.setClean(); }
    // Grows by one with every change; lets background work drop stale results.
    quint64 revision() const { return m_revision; }

    // Replaces the instrument (new or opened file) and clears the history.
    void reset(Instrument instrument, const QString& path);
    // Takes ownership and executes (QUndoStack::push); a read-only document
    // drops the command unexecuted.
    void push(QUndoCommand* command);
    // Read-only: the project is open in another editor. The views disable
    // editing; this is the last line, so no panel can change it by accident.
    bool isReadOnly() const { return m_readOnly; }
    void setReadOnly(bool readOnly);

    // Raw mutators for commands only; indices must be valid.
    AttributeValue attribute(const AttributeKey& key) const;
    void setAttribute(const AttributeKey& key, const AttributeValue& value);
    void insertModule(int index, const Module& module);
    Module takeModule(int index);
    void moveModule(int from, int to);
    void insertItem(int module, int index, const Item& item);
    Item takeItem(int module, int index);
    void moveItem(int fromModule, int fromItem, int toModule, int toItem);
    void insertCodeList(int index, const CodeList& list);
    CodeList takeCodeList(int index);

signals:
    void aboutToChange(const rb::ChangeEvent& event);
    void changed(const rb::ChangeEvent& event);
    void pathChanged(const QString& path);
    void modifiedChanged(bool modified);
    void readOnlyChanged(bool readOnly);

private:
    void announce(const ChangeEvent& event) { emit aboutToChange(event); }
    void finish(const ChangeEvent& event);

    Instrument m_instrument;
    QString m_path;
    QUndoStack m_undoStack;
    quint64 m_revision = 0;
    bool m_readOnly = false;
};

} // namespace rb
