#include "SetAttributeCommand.h"

#include "CommandId.h"
#include "Document.h"

namespace rb {

SetAttributeCommand::SetAttributeCommand(Document* document, const AttributeKey& key,
                                         AttributeValue value, const QString& text,
                                         QUndoCommand* parent, Merge merge)
    : QUndoCommand(text, parent), m_document(document), m_key(key), m_value(std::move(value)),
      m_mergeable(merge == Merge::Typing && isTypedField(key.field)) {}

void SetAttributeCommand::swap() {
    AttributeValue current = m_document->attribute(m_key);
    m_document->setAttribute(m_key, m_value);
    m_value = std::move(current);
}

int SetAttributeCommand::id() const {
    // Only top-level commands merge; children of a cascade stay as they are.
    return m_mergeable ? int(CommandId::SetAttribute) : -1;
}

bool SetAttributeCommand::mergeWith(const QUndoCommand* other) {
    const auto* next = static_cast<const SetAttributeCommand*>(other);
    if (next->m_key != m_key || next->m_document != m_document)
        return false;
    // m_value already holds the value before both edits; the document holds
    // the value after both. Nothing else to keep.
    setObsolete(m_document->attribute(m_key) == m_value);
    return true;
}

} // namespace rb
