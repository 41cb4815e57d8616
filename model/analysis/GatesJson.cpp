#include "GatesJson.h"

#include <QJsonArray>

using namespace Qt::StringLiterals;

namespace rb {

QJsonObject gatesToJson(const RoutingAnalysis& analysis) {
    QJsonArray items;
    for (const ItemUniverse& u : analysis.universes) {
        QJsonObject o;
        o.insert(u"name"_s, analysis.itemName(u.position));
        o.insert(u"module"_s, analysis.moduleName(u.position));
        o.insert(u"asked"_s, askedName(u.asked));
        o.insert(u"asked_if"_s, u.asked == ItemUniverse::Asked::Conditional ? QJsonValue(u.askedIf)
                                                                            : QJsonValue());
        o.insert(u"gate_items"_s, QJsonArray::fromStringList(analysis.gateItems(u)));
        o.insert(u"plain"_s, u.plain);
        o.insert(u"position"_s, u.position);
        o.insert(u"minimal"_s, u.minimal);
        items.append(o);
    }
    return QJsonObject{{u"items"_s, items}};
}

} // namespace rb
