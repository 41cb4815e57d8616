#pragma once

#include "HeaderMapping.h"
#include "condition/Evaluator.h"
#include "routing/CompiledRouting.h"

#include <QByteArrayView>
#include <QHash>

#include <vector>

namespace rb {

// The class of one cell (DESIGN.md "Data check" table). The first six apply
// to presented items, the last two to items that were not presented.
enum class CellClass {
    Answered,
    Blank,         // nonresponse: blank
    DontKnow,      // nonresponse: a dont_know code
    Refused,       // nonresponse: a refused code
    NotApplicable, // nonresponse: a not_applicable code (on a presented item)
    Invalid,
    LegitimateSkip,
    RoutingViolation
};
inline bool isNonresponse(CellClass c) {
    return c == CellClass::Blank || c == CellClass::DontKnow || c == CellClass::Refused ||
           c == CellClass::NotApplicable;
}

// The class of a presented cell holding a code of this missing kind (None: answered).
CellClass classOfMissing(MissingKind kind);

// Numbers in a response file: an optional minus, digits, optionally a point and
// digits ("3", "-2", "2.5"). Anything else ("1e3", "+4", " 3", ".5") is not a
// number; the SQL export applies the same rule.
bool parseCellNumber(QByteArrayView cell, double& value);
bool isIsoDate(QByteArrayView cell); // YYYY-MM-DD, a real calendar date

// What a record's cells mean for one item.
struct CellReading {
    cond::CellValue value; // what conditions read when the item is presented
    CellClass presented = CellClass::Blank;
    bool skipIsLegitimate = true; // class when not presented: legitimate skip or violation
    QList<qint64> counted;        // codes for the frequencies (when presented)
};

// Reads cells item by item, with the per-item tables (codes, range, missing
// codes, the legitimate-skip code) computed once.
class CellInterpreter {
public:
    CellInterpreter(const CompiledRouting& routing, const HeaderMapping& mapping);

    CellReading read(int position, RecordFields fields) const;
    bool hasVariable(int position) const {
        return m_items[size_t(position)].type != ItemType::Statement;
    }
    // A short description of the values an item accepts, for messages.
    QString domainOf(int position) const;

private:
    struct ItemTable {
        ItemType type = ItemType::Statement;
        QHash<qint64, MissingKind> codes; // every code of the item with its kind
        QList<qint64> codeOrder;          // multi: code per column, mapping order
        bool hasRange = false;
        double min = 0, max = 0;
    };
    CellReading readSingleColumn(const ItemTable& t, QByteArrayView cell) const;
    CellReading readMulti(int position, const ItemTable& t, RecordFields fields) const;
    bool isLegitimateSkipValue(const ItemTable& t, QByteArrayView cell) const;

    const HeaderMapping& m_mapping;
    std::vector<ItemTable> m_items;
    QByteArray m_skipCode; // settings.legitimate_skip_code, UTF-8
};

} // namespace rb
