#include "HeaderMapping.h"

#include <QHash>

namespace rb {

namespace {
Diagnostic headerError(const QString& fileName, int column, const QString& message) {
    return Diagnostic{fileName, 1, column, message};
}
} // namespace

HeaderMappingResult mapHeader(const CompiledRouting& routing, RecordFields header,
                              const QString& fileName, const QString& idColumn) {
    HeaderMappingResult result;
    HeaderMapping& m = result.mapping;
    m.columnCount = int(header.size());
    QHash<QString, int> byName; // lower-case name -> column
    for (int c = 0; c < m.columnCount; ++c) {
        const QString name = QString::fromUtf8(header[size_t(c)]);
        m.headerNames.append(name);
        const QString key = name.toLower();
        if (byName.contains(key)) {
            result.error = headerError(
                fileName, c + 1,
                QStringLiteral("column '%1' appears twice (names ignore case)").arg(name));
            return result;
        }
        byName.insert(key, c);
    }
    if (!idColumn.isEmpty()) {
        m.idColumn = byName.value(idColumn.toLower(), -1);
        if (m.idColumn < 0) {
            result.error = headerError(
                fileName, 1, QStringLiteral("no column '%1' for --id-column").arg(idColumn));
            return result;
        }
    }
    const Instrument& instrument = routing.instrument();
    QList<bool> used(m.columnCount, false);
    if (m.idColumn >= 0)
        used[m.idColumn] = true;
    const int count = routing.itemCount();
    m.column.assign(size_t(count), -1);
    m.multiColumns.assign(size_t(count), {});
    for (int p = 0; p < count; ++p) {
        const Item& item = *routing.index().at(p).item;
        if (item.type == ItemType::Statement)
            continue;
        const QStringList names = item.type == ItemType::Multi
                                      ? multiVariableNames(instrument, item)
                                      : QStringList{item.name};
        for (const QString& name : names) {
            const int c = byName.value(name.toLower(), -1);
            if (c < 0)
                m.missingColumns.append(name);
            else
                used[c] = true;
            if (item.type == ItemType::Multi)
                m.multiColumns[size_t(p)].push_back(c);
            else
                m.column[size_t(p)] = c;
        }
    }
    for (int c = 0; c < m.columnCount; ++c)
        if (!used[c])
            m.unknownColumns.append(m.headerNames.at(c));
    return result;
}

} // namespace rb
