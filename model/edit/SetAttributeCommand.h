#pragma once

#include "Attribute.h"

#include <QUndoCommand>

namespace rb {

class Document;

// The one attribute edit: redo and undo are the same swap of the stored value
// and the document's. Edits made by typing (Merge::Typing) merge with the
// previous typing edit of the same attribute into one undo step, and a merged
// edit that ends where it started becomes obsolete. Discrete edits (a button,
// a choice in a list) stay one step each.
class SetAttributeCommand : public QUndoCommand {
public:
    enum class Merge { No, Typing };

    SetAttributeCommand(Document* document, const AttributeKey& key, AttributeValue value,
                        const QString& text, QUndoCommand* parent = nullptr,
                        Merge merge = Merge::No);
    // A typing edit (top level; merges).
    static SetAttributeCommand* typing(Document* document, const AttributeKey& key,
                                       AttributeValue value, const QString& text) {
        return new SetAttributeCommand(document, key, std::move(value), text, nullptr,
                                       Merge::Typing);
    }

    void redo() override { swap(); }
    void undo() override { swap(); }
    int id() const override;
    bool mergeWith(const QUndoCommand* other) override;

    const AttributeKey& key() const { return m_key; }

private:
    void swap();

    Document* m_document;
    AttributeKey m_key;
    AttributeValue m_value; // after redo: the value before the edit
    bool m_mergeable;
};

} // namespace rb
