#pragma once

#include "instrument/Instrument.h"

#include <QUndoCommand>

namespace rb {

class Document;

// Adds or removes one module. While removed, the command owns the module
// (with its items) so redo/undo restore it exactly.
class ModuleCommand : public QUndoCommand {
public:
    static ModuleCommand* insert(Document* document, int index, Module module,
                                 QUndoCommand* parent = nullptr);
    static ModuleCommand* remove(Document* document, int index, QUndoCommand* parent = nullptr);

    void redo() override { m_inserting ? put() : take(); }
    void undo() override { m_inserting ? take() : put(); }

private:
    ModuleCommand(Document* document, int index, bool inserting, QUndoCommand* parent);
    void put();
    void take();

    Document* m_document;
    int m_index;
    bool m_inserting;
    Module m_module; // owned while not in the document
};

// Adds or removes one item; owns the removed item.
class ItemCommand : public QUndoCommand {
public:
    static ItemCommand* insert(Document* document, int module, int index, Item item,
                               QUndoCommand* parent = nullptr);
    static ItemCommand* remove(Document* document, int module, int index,
                               QUndoCommand* parent = nullptr);

    void redo() override { m_inserting ? put() : take(); }
    void undo() override { m_inserting ? take() : put(); }

private:
    ItemCommand(Document* document, int module, int index, bool inserting, QUndoCommand* parent);
    void put();
    void take();

    Document* m_document;
    int m_module;
    int m_index;
    bool m_inserting;
    Item m_item;
};

// Adds or removes one shared code list; owns the removed list.
class CodeListCommand : public QUndoCommand {
public:
    static CodeListCommand* insert(Document* document, int index, CodeList list,
                                   QUndoCommand* parent = nullptr);
    static CodeListCommand* remove(Document* document, int index, QUndoCommand* parent = nullptr);

    void redo() override { m_inserting ? put() : take(); }
    void undo() override { m_inserting ? take() : put(); }

private:
    CodeListCommand(Document* document, int index, bool inserting, QUndoCommand* parent);
    void put();
    void take();

    Document* m_document;
    int m_index;
    bool m_inserting;
    CodeList m_list;
};

// Moves an item, within its module or to another one. `toItem` is the index
// in the destination module after the item has been taken out.
class MoveItemCommand : public QUndoCommand {
public:
    MoveItemCommand(Document* document, int fromModule, int fromItem, int toModule, int toItem,
                    QUndoCommand* parent = nullptr);
    void redo() override;
    void undo() override;

private:
    Document* m_document;
    int m_fromModule, m_fromItem, m_toModule, m_toItem;
};

// Moves a module (with its items); `to` is the index after removal.
class MoveModuleCommand : public QUndoCommand {
public:
    MoveModuleCommand(Document* document, int from, int to, QUndoCommand* parent = nullptr);
    void redo() override;
    void undo() override;

private:
    Document* m_document;
    int m_from, m_to;
};

} // namespace rb
