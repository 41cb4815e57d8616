#pragma once

#include <QByteArray>

// Random instruments (fixed seeds) for the equivalence of the compiled record
// program with the reference simulator: every item type, missing codes, filters
// on earlier and later items, every condition form, rules jumping forward, to
// END and back (loops), when_skipped with and without `if`. Invented names only.
QByteArray randomInstrumentYaml(quint32 seed);
