#pragma once

#include "edit/LiveAnalysis.h"
#include "instrument/Instrument.h"

namespace rb {

// A plain HTML rendering of the instrument for the preview panel, every user
// string escaped: per item its name, label, text, type, codes and universe.
// It stands in until the data dictionary builder exists (PreviewPanel takes
// any builder with this signature).
// At most `maxItems` items are rendered (Qt's rich text grows worse than
// linearly with document size); a note says how many were left out.
QString plainPreviewHtml(const Instrument& instrument, const LiveAnalysis& analysis,
                         int maxItems = 300);

} // namespace rb
