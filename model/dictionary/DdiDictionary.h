#pragma once

#include "Dictionary.h"

#include <QByteArray>

namespace rb {

// The dictionary as DDI Codebook 2.5 XML (DDI Alliance, DDI Codebook 2.5.1 XML
// Schema; shared copy in ../shared/standards/ddi-codebook-2.5/): one `var` per
// variable with `labl`, `qstn` (`qstnLit`, `forward` for each routing rule,
// `ivuInstr`), `valrng`, `universe` (words and the condition), `catgry` with
// `missing="Y"` and `missType` for missing codes and for the legitimate-skip
// code, `varFormat` (never a statistical package's name) and `notes`; modules
// and multiple-choice items become `varGrp`s.
QByteArray exportDdiDictionary(const Dictionary& dictionary);

} // namespace rb
