#pragma once

#include "Attribute.h"

namespace rb {

// Where a list of codes lives, for code edits: a shared list, an item's own
// (inline) codes, or an item's extra missing codes.
struct CodeLocation {
    enum class Kind { SharedList, ItemInline, ItemMissing };
    Kind kind = Kind::SharedList;
    int codeList = -1;
    int module = -1;
    int item = -1;

    static CodeLocation shared(int codeList) { return {Kind::SharedList, codeList, -1, -1}; }
    static CodeLocation inlineOf(int module, int item) {
        return {Kind::ItemInline, -1, module, item};
    }
    static CodeLocation missingOf(int module, int item) {
        return {Kind::ItemMissing, -1, module, item};
    }
    bool operator==(const CodeLocation&) const = default;
};

QList<Code> codesAt(const Instrument& instrument, const CodeLocation& where);
// The attribute that holds these codes and the value that sets them to `codes`.
AttributeKey codesKey(const CodeLocation& where);
AttributeValue codesValue(const CodeLocation& where, const QList<Code>& codes);
// Whether the location still exists in the instrument.
bool isValidLocation(const Instrument& instrument, const CodeLocation& where);

} // namespace rb
