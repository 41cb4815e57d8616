#pragma once

#include "analysis/RoutingAnalysis.h"
#include "check/Finding.h"
#include "instrument/Instrument.h"

namespace rb {

// Per item (flat questionnaire position): what the outline marks.
struct ItemMarks {
    ItemUniverse::Asked asked = ItemUniverse::Asked::Always;
    QString askedIf; // the universe, for tool tips
    bool inLoop = false;
    bool hasError = false;
    bool hasWarning = false;
};

// Everything the editor shows about an instrument's routing, computed in one
// go from a copy of the instrument (so it can run on a worker thread).
struct LiveAnalysis {
    quint64 revision = 0; // the Document revision it was computed for
    Findings findings;    // check + routing analysis, sorted, no duplicate ids
    QList<ItemMarks> marks;
    RoutingAnalysis routing; // the exact universes, for the route map's markers
};

LiveAnalysis analyseInstrument(const Instrument& instrument, quint64 revision);

} // namespace rb
