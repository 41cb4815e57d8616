#include "PlainText.h"

#include <QLabel>
#include <QTextDocument>

namespace rb {

QString plainToolTip(const QString& text) {
    return Qt::convertFromPlainText(text, Qt::WhiteSpaceNormal);
}

QLabel* plainLabel(QLabel* label) {
    label->setTextFormat(Qt::PlainText);
    return label;
}

} // namespace rb
