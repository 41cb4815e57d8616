#include "CodeLocation.h"

namespace rb {

QList<Code> codesAt(const Instrument& instrument, const CodeLocation& where) {
    switch (where.kind) {
    case CodeLocation::Kind::SharedList:
        return instrument.codeLists.at(where.codeList).codes;
    case CodeLocation::Kind::ItemInline:
        return instrument.modules.at(where.module).items.at(where.item).inlineCodes;
    case CodeLocation::Kind::ItemMissing:
        break;
    }
    return instrument.modules.at(where.module).items.at(where.item).missing;
}

AttributeKey codesKey(const CodeLocation& where) {
    switch (where.kind) {
    case CodeLocation::Kind::SharedList:
        return AttributeKey::ofCodeList(where.codeList, Field::CodeListCodes);
    case CodeLocation::Kind::ItemInline:
        return AttributeKey::ofItem(where.module, where.item, Field::ItemCodes);
    case CodeLocation::Kind::ItemMissing:
        break;
    }
    return AttributeKey::ofItem(where.module, where.item, Field::ItemMissing);
}

AttributeValue codesValue(const CodeLocation& where, const QList<Code>& codes) {
    if (where.kind == CodeLocation::Kind::ItemInline)
        return CodeSource{QString(), true, codes};
    return codes;
}

bool isValidLocation(const Instrument& instrument, const CodeLocation& where) {
    if (where.kind == CodeLocation::Kind::SharedList)
        return where.codeList >= 0 && where.codeList < instrument.codeLists.size();
    return where.module >= 0 && where.module < instrument.modules.size() && where.item >= 0 &&
           where.item < instrument.modules.at(where.module).items.size();
}

} // namespace rb
