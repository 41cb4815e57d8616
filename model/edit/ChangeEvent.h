#pragma once

#include "Attribute.h"

namespace rb {

// What changed in a Document, precise enough for item models to emit exact
// row and dataChanged signals. The document sends every event twice: before
// the change (aboutToChange, for beginInsertRows and friends) and after it.
struct ChangeEvent {
    enum class Kind {
        Reset,            // a new instrument: rebuild everything
        Attribute,        // `key` changed
        ModuleInserted,   // at `module`
        ModuleRemoved,    // from `module`
        ModuleMoved,      // from `module` to `toModule` (index after removal)
        ItemInserted,     // at `module`, `item`
        ItemRemoved,      // from `module`, `item`
        ItemMoved,        // from `module`, `item` to `toModule`, `toItem` (after removal)
        CodeListInserted, // at `codeList`
        CodeListRemoved,  // from `codeList`
    };
    Kind kind = Kind::Reset;
    AttributeKey key;
    int module = -1;
    int item = -1;
    int toModule = -1;
    int toItem = -1;
    int codeList = -1;

    // True when the change may alter the flat questionnaire order or names
    // (views that cache positions rebuild then).
    bool changesStructure() const;
};

} // namespace rb
