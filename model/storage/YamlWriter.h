#pragma once

#include "instrument/Instrument.h"

#include <QByteArray>

namespace rb::yaml {

// The canonical text of an instrument (see YamlWriter.cpp for the rules).
QByteArray writeInstrument(const Instrument& instrument);

// YAML double-quoted form of any text: "..." with escapes, always one line.
QString quoted(const QString& text);
// A name (item, module, code list, goto target) written plain when that is
// safe, else double-quoted.
QString nameToken(const QString& name);

} // namespace rb::yaml
