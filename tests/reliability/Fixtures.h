#pragma once

#include "instrument/Instrument.h"

#include <QByteArray>
#include <QString>

// Invented instruments and hostile inputs for the reliability tests. Every
// hostile input is generated here (not committed), so a 50 MB file never sits
// in the repository.
namespace reliability {

// A large gardening-club instrument: MODULES modules of ITEMS_PER_MODULE items,
// shared code lists, filters and rules. VARIANT changes every question text and
// the number of items, so two variants differ in nearly every row of the file.
rb::Instrument largeInstrument(int variant, int modules = 30, int itemsPerModule = 50);

// YAML text of a minimal valid instrument whose one item carries ASK_IF as
// its filter (double-quoted, escaped for YAML).
QByteArray yamlWithCondition(const QString& askIf);

// A YAML "billion laughs": NESTING levels of anchors, each a list of ten aliases
// of the one before.
QByteArray yamlAliasBomb(int nesting);
// DEPTH nested flow sequences: [[[[ ... ]]]].
QByteArray yamlDeepFlow(int depth);
// DEPTH nested block sequences in compact form: - - - ... x
QByteArray yamlDeepBlock(int depth);
// A valid instrument padded to at least BYTES with a long question text.
QByteArray yamlHuge(qint64 bytes);

// DEPTH pairs of parentheses around `a = 1`.
QString deepParentheses(int depth);
// A valid condition of at least LENGTH characters: a = 1 or a = 2 or ...
QString longCondition(int length);

// Bytes of a fixed pseudo-random sequence (deterministic: same SEED, same bytes).
QByteArray pseudoRandomBytes(int size, quint32 seed);

} // namespace reliability
