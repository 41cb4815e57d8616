#pragma once

#include "instrument/Instrument.h"

#include <optional>
#include <variant>

namespace rb {

// Every single value the editor can change in place. One generic command
// (SetAttributeCommand) swaps any of them; these say which value is meant.
enum class Field {
    InstrumentTitle,
    InstrumentVersion,
    InstrumentLanguage,
    LegitimateSkipCode,
    TestRespondents,
    ModuleName,
    ModuleTitle,
    ModuleAskIf,
    ItemName,
    ItemLabel,
    ItemText,
    ItemInstruction,
    ItemType,
    ItemCodes, // the code source: a shared list by name or inline codes
    ItemRange,
    ItemMissing,
    ItemAskIf,
    ItemRouting,
    ItemWhenSkipped,
    ItemNotes,
    CodeListName,
    CodeListCodes,
};

// Where the value lives: module/item indices for module and item fields, the
// code list index for code list fields; unused indices stay -1.
struct AttributeKey {
    Field field = Field::InstrumentTitle;
    int module = -1;
    int item = -1;
    int codeList = -1;
    bool operator==(const AttributeKey&) const = default;

    static AttributeKey instrument(Field field) { return {field, -1, -1, -1}; }
    static AttributeKey ofModule(int module, Field field) { return {field, module, -1, -1}; }
    static AttributeKey ofItem(int module, int item, Field field) {
        return {field, module, item, -1};
    }
    static AttributeKey ofCodeList(int codeList, Field field) { return {field, -1, -1, codeList}; }
};

// Where an item's codes come from (Item keeps exactly one of the two).
struct CodeSource {
    QString listName;
    bool hasInlineCodes = false;
    QList<Code> inlineCodes;
    bool operator==(const CodeSource&) const = default;
};

using ItemRange = std::optional<std::pair<RangeBound, RangeBound>>;

using AttributeValue =
    std::variant<QString, std::optional<QString>, ItemType, CodeSource, ItemRange, QList<Code>,
                 QList<Rule>, std::optional<WhenSkipped>, QList<TestRespondent>>;

// Reads and writes one attribute of an instrument. The key must address an
// existing object and the value must hold the field's alternative (a
// programming error otherwise, checked by Q_ASSERT).
AttributeValue readAttribute(const Instrument& instrument, const AttributeKey& key);
void writeAttribute(Instrument& instrument, const AttributeKey& key, const AttributeValue& value);

// Whether repeated edits of this field may merge into one undo step (typing).
bool isTypedField(Field field);

} // namespace rb
