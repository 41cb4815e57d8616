#include "Spelling.h"

using namespace Qt::StringLiterals;

namespace rb::cond {

const QString* keywordSpelled(QStringView word) {
    static const QString keywords[] = {u"and"_s,   u"or"_s,       u"not"_s,  u"in"_s,   u"has"_s,
                                       u"asked"_s, u"answered"_s, u"true"_s, u"false"_s};
    for (const QString& k : keywords)
        if (k == word)
            return &k;
    return nullptr;
}

} // namespace rb::cond
