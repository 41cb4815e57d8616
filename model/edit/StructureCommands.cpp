#include "StructureCommands.h"

#include "Document.h"

#include <QCoreApplication>

namespace rb {

namespace {
QString tr(const char* text) {
    return QCoreApplication::translate("rb::Commands", text);
}
} // namespace

ModuleCommand::ModuleCommand(Document* document, int index, bool inserting, QUndoCommand* parent)
    : QUndoCommand(parent), m_document(document), m_index(index), m_inserting(inserting) {}

ModuleCommand* ModuleCommand::insert(Document* document, int index, Module module,
                                     QUndoCommand* parent) {
    auto* command = new ModuleCommand(document, index, true, parent);
    command->setText(tr("Add module %1").arg(module.name));
    command->m_module = std::move(module);
    return command;
}

ModuleCommand* ModuleCommand::remove(Document* document, int index, QUndoCommand* parent) {
    auto* command = new ModuleCommand(document, index, false, parent);
    command->setText(tr("Delete module %1").arg(document->instrument().modules.at(index).name));
    return command;
}

void ModuleCommand::put() {
    m_document->insertModule(m_index, m_module);
    m_module = {};
}

void ModuleCommand::take() {
    m_module = m_document->takeModule(m_index);
}

ItemCommand::ItemCommand(Document* document, int module, int index, bool inserting,
                         QUndoCommand* parent)
    : QUndoCommand(parent), m_document(document), m_module(module), m_index(index),
      m_inserting(inserting) {}

ItemCommand* ItemCommand::insert(Document* document, int module, int index, Item item,
                                 QUndoCommand* parent) {
    auto* command = new ItemCommand(document, module, index, true, parent);
    command->setText(tr("Add item %1").arg(item.name));
    command->m_item = std::move(item);
    return command;
}

ItemCommand* ItemCommand::remove(Document* document, int module, int index, QUndoCommand* parent) {
    auto* command = new ItemCommand(document, module, index, false, parent);
    command->setText(
        tr("Delete item %1").arg(document->instrument().modules.at(module).items.at(index).name));
    return command;
}

void ItemCommand::put() {
    m_document->insertItem(m_module, m_index, m_item);
    m_item = {};
}

void ItemCommand::take() {
    m_item = m_document->takeItem(m_module, m_index);
}

CodeListCommand::CodeListCommand(Document* document, int index, bool inserting,
                                 QUndoCommand* parent)
    : QUndoCommand(parent), m_document(document), m_index(index), m_inserting(inserting) {}

CodeListCommand* CodeListCommand::insert(Document* document, int index, CodeList list,
                                         QUndoCommand* parent) {
    auto* command = new CodeListCommand(document, index, true, parent);
    command->setText(tr("Add code list %1").arg(list.name));
    command->m_list = std::move(list);
    return command;
}

CodeListCommand* CodeListCommand::remove(Document* document, int index, QUndoCommand* parent) {
    auto* command = new CodeListCommand(document, index, false, parent);
    command->setText(
        tr("Delete code list %1").arg(document->instrument().codeLists.at(index).name));
    return command;
}

void CodeListCommand::put() {
    m_document->insertCodeList(m_index, m_list);
    m_list = {};
}

void CodeListCommand::take() {
    m_list = m_document->takeCodeList(m_index);
}

MoveItemCommand::MoveItemCommand(Document* document, int fromModule, int fromItem, int toModule,
                                 int toItem, QUndoCommand* parent)
    : QUndoCommand(parent), m_document(document), m_fromModule(fromModule), m_fromItem(fromItem),
      m_toModule(toModule), m_toItem(toItem) {
    setText(tr("Move item %1")
                .arg(document->instrument().modules.at(fromModule).items.at(fromItem).name));
}

void MoveItemCommand::redo() {
    m_document->moveItem(m_fromModule, m_fromItem, m_toModule, m_toItem);
}

void MoveItemCommand::undo() {
    m_document->moveItem(m_toModule, m_toItem, m_fromModule, m_fromItem);
}

MoveModuleCommand::MoveModuleCommand(Document* document, int from, int to, QUndoCommand* parent)
    : QUndoCommand(parent), m_document(document), m_from(from), m_to(to) {
    setText(tr("Move module %1").arg(document->instrument().modules.at(from).name));
}

void MoveModuleCommand::redo() {
    m_document->moveModule(m_from, m_to);
}
void MoveModuleCommand::undo() {
    m_document->moveModule(m_to, m_from);
}

} // namespace rb
