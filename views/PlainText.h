#pragma once

#include <QString>

class QLabel;

namespace rb {

// User text (labels, question wording, conditions) must show as typed, never
// as markup. Qt guesses rich text for tool tips and for labels left at
// Qt::AutoText (Qt::mightBeRichText), so a label like "<b>x</b>" would turn
// bold and an <img> would load. These two close that door.

// A tool tip that shows `text` literally: escaped and wrapped as rich text
// (Qt::convertFromPlainText), so line breaks survive and no tag is active.
QString plainToolTip(const QString& text);

// Sets Qt::PlainText on a label that shows user text; returns the label.
QLabel* plainLabel(QLabel* label);

} // namespace rb
