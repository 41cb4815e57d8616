#include "ChangeEvent.h"

namespace rb {

bool ChangeEvent::changesStructure() const {
    if (kind != Kind::Attribute)
        return true;
    return key.field == Field::ItemName || key.field == Field::ModuleName ||
           key.field == Field::CodeListName;
}

} // namespace rb
