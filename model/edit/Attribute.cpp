#include "Attribute.h"

namespace rb {

namespace {

template <typename T> const T& as(const AttributeValue& value) {
    Q_ASSERT(std::holds_alternative<T>(value));
    return std::get<T>(value);
}

AttributeValue readItem(const Item& item, Field field) {
    switch (field) {
    case Field::ItemName:
        return item.name;
    case Field::ItemLabel:
        return item.label;
    case Field::ItemText:
        return item.text;
    case Field::ItemInstruction:
        return item.instruction;
    case Field::ItemType:
        return item.type;
    case Field::ItemCodes:
        return CodeSource{item.codeListName, item.hasInlineCodes, item.inlineCodes};
    case Field::ItemRange:
        return ItemRange(item.range);
    case Field::ItemMissing:
        return item.missing;
    case Field::ItemAskIf:
        return item.askIf;
    case Field::ItemRouting:
        return item.routing;
    case Field::ItemWhenSkipped:
        return item.whenSkipped;
    case Field::ItemNotes:
        return item.notes;
    default:
        Q_ASSERT(false);
        return QString();
    }
}

void writeItem(Item& item, Field field, const AttributeValue& value) {
    switch (field) {
    case Field::ItemName:
        item.name = as<QString>(value);
        break;
    case Field::ItemLabel:
        item.label = as<QString>(value);
        break;
    case Field::ItemText:
        item.text = as<QString>(value);
        break;
    case Field::ItemInstruction:
        item.instruction = as<QString>(value);
        break;
    case Field::ItemType:
        item.type = as<ItemType>(value);
        break;
    case Field::ItemCodes: {
        const CodeSource& source = as<CodeSource>(value);
        item.codeListName = source.listName;
        item.hasInlineCodes = source.hasInlineCodes;
        item.inlineCodes = source.inlineCodes;
        break;
    }
    case Field::ItemRange:
        item.range = as<ItemRange>(value);
        break;
    case Field::ItemMissing:
        item.missing = as<QList<Code>>(value);
        break;
    case Field::ItemAskIf:
        item.askIf = as<std::optional<QString>>(value);
        break;
    case Field::ItemRouting:
        item.routing = as<QList<Rule>>(value);
        break;
    case Field::ItemWhenSkipped:
        item.whenSkipped = as<std::optional<WhenSkipped>>(value);
        break;
    case Field::ItemNotes:
        item.notes = as<QString>(value);
        break;
    default:
        Q_ASSERT(false);
    }
}

} // namespace

AttributeValue readAttribute(const Instrument& instrument, const AttributeKey& key) {
    switch (key.field) {
    case Field::InstrumentTitle:
        return instrument.title;
    case Field::InstrumentVersion:
        return instrument.version;
    case Field::InstrumentLanguage:
        return instrument.language;
    case Field::LegitimateSkipCode:
        return instrument.settings.legitimateSkipCode;
    case Field::TestRespondents:
        return instrument.testRespondents;
    case Field::ModuleName:
        return instrument.modules.at(key.module).name;
    case Field::ModuleTitle:
        return instrument.modules.at(key.module).title;
    case Field::ModuleAskIf:
        return instrument.modules.at(key.module).askIf;
    case Field::CodeListName:
        return instrument.codeLists.at(key.codeList).name;
    case Field::CodeListCodes:
        return instrument.codeLists.at(key.codeList).codes;
    default:
        return readItem(instrument.modules.at(key.module).items.at(key.item), key.field);
    }
}

void writeAttribute(Instrument& instrument, const AttributeKey& key, const AttributeValue& value) {
    switch (key.field) {
    case Field::InstrumentTitle:
        instrument.title = as<QString>(value);
        break;
    case Field::InstrumentVersion:
        instrument.version = as<QString>(value);
        break;
    case Field::InstrumentLanguage:
        instrument.language = as<QString>(value);
        break;
    case Field::LegitimateSkipCode:
        instrument.settings.legitimateSkipCode = as<QString>(value);
        break;
    case Field::TestRespondents:
        instrument.testRespondents = as<QList<TestRespondent>>(value);
        break;
    case Field::ModuleName:
        instrument.modules[key.module].name = as<QString>(value);
        break;
    case Field::ModuleTitle:
        instrument.modules[key.module].title = as<QString>(value);
        break;
    case Field::ModuleAskIf:
        instrument.modules[key.module].askIf = as<std::optional<QString>>(value);
        break;
    case Field::CodeListName:
        instrument.codeLists[key.codeList].name = as<QString>(value);
        break;
    case Field::CodeListCodes:
        instrument.codeLists[key.codeList].codes = as<QList<Code>>(value);
        break;
    default:
        writeItem(instrument.modules[key.module].items[key.item], key.field, value);
    }
}

bool isTypedField(Field field) {
    switch (field) {
    case Field::InstrumentTitle:
    case Field::InstrumentVersion:
    case Field::InstrumentLanguage:
    case Field::LegitimateSkipCode:
    case Field::ModuleTitle:
    case Field::ModuleAskIf:
    case Field::ItemLabel:
    case Field::ItemText:
    case Field::ItemInstruction:
    case Field::ItemAskIf:
    case Field::ItemRouting:
    case Field::ItemNotes:
    case Field::ItemWhenSkipped:
    case Field::CodeListCodes:
    case Field::ItemMissing:
    case Field::ItemRange:
        return true;
    default:
        // Names (renames cascade), types, code sources and the test respondent
        // list are single decisions: one undo step each.
        return false;
    }
}

} // namespace rb
