#include "Document.h"

namespace rb {

namespace {

ChangeEvent makeEvent(ChangeEvent::Kind kind) {
    ChangeEvent e;
    e.kind = kind;
    return e;
}

} // namespace

Document::Document(QObject* parent) : QObject(parent) {
    connect(&m_undoStack, &QUndoStack::cleanChanged, this,
            [this](bool clean) { emit modifiedChanged(!clean); });
}

void Document::push(QUndoCommand* command) {
    if (m_readOnly) {
        delete command;
        return;
    }
    m_undoStack.push(command);
}

void Document::setReadOnly(bool readOnly) {
    if (readOnly == m_readOnly)
        return;
    m_readOnly = readOnly;
    emit readOnlyChanged(readOnly);
}

void Document::setPath(const QString& path) {
    if (path == m_path)
        return;
    m_path = path;
    emit pathChanged(path);
}

void Document::reset(Instrument instrument, const QString& path) {
    const ChangeEvent e = makeEvent(ChangeEvent::Kind::Reset);
    announce(e);
    m_undoStack.clear();
    m_instrument = std::move(instrument);
    finish(e);
    setPath(path);
    m_undoStack.setClean();
}

void Document::finish(const ChangeEvent& event) {
    ++m_revision;
    emit changed(event);
}

AttributeValue Document::attribute(const AttributeKey& key) const {
    return readAttribute(m_instrument, key);
}

void Document::setAttribute(const AttributeKey& key, const AttributeValue& value) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::Attribute);
    e.key = key;
    e.module = key.module;
    e.item = key.item;
    e.codeList = key.codeList;
    announce(e);
    writeAttribute(m_instrument, key, value);
    finish(e);
}

void Document::insertModule(int index, const Module& module) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::ModuleInserted);
    e.module = index;
    announce(e);
    m_instrument.modules.insert(index, module);
    finish(e);
}

Module Document::takeModule(int index) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::ModuleRemoved);
    e.module = index;
    announce(e);
    Module module = m_instrument.modules.takeAt(index);
    finish(e);
    return module;
}

void Document::moveModule(int from, int to) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::ModuleMoved);
    e.module = from;
    e.toModule = to;
    announce(e);
    m_instrument.modules.insert(to, m_instrument.modules.takeAt(from));
    finish(e);
}

void Document::insertItem(int module, int index, const Item& item) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::ItemInserted);
    e.module = module;
    e.item = index;
    announce(e);
    m_instrument.modules[module].items.insert(index, item);
    finish(e);
}

Item Document::takeItem(int module, int index) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::ItemRemoved);
    e.module = module;
    e.item = index;
    announce(e);
    Item item = m_instrument.modules[module].items.takeAt(index);
    finish(e);
    return item;
}

void Document::moveItem(int fromModule, int fromItem, int toModule, int toItem) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::ItemMoved);
    e.module = fromModule;
    e.item = fromItem;
    e.toModule = toModule;
    e.toItem = toItem;
    announce(e);
    Item item = m_instrument.modules[fromModule].items.takeAt(fromItem);
    m_instrument.modules[toModule].items.insert(toItem, std::move(item));
    finish(e);
}

void Document::insertCodeList(int index, const CodeList& list) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::CodeListInserted);
    e.codeList = index;
    announce(e);
    m_instrument.codeLists.insert(index, list);
    finish(e);
}

CodeList Document::takeCodeList(int index) {
    ChangeEvent e = makeEvent(ChangeEvent::Kind::CodeListRemoved);
    e.codeList = index;
    announce(e);
    CodeList list = m_instrument.codeLists.takeAt(index);
    finish(e);
    return list;
}

} // namespace rb
