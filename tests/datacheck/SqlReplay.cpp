#include "SqlReplay.h"

#include <QRandomGenerator>

#include <sqlite3.h>

using namespace rb;

QByteArray GeneratedResponses::csv() const {
    QByteArray out = columns.join(QLatin1Char(',')).toUtf8() + '\n';
    for (const QList<QByteArray>& row : rows) {
        QByteArray line;
        for (qsizetype i = 0; i < row.size(); ++i)
            line += (i ? "," : "") + row.at(i);
        out += line + '\n';
    }
    return out;
}

// Cells a real file may hold: codes, in- and out-of-range numbers, other spellings of
// numbers, blanks, the skip code, text and dates (valid, invalid, leap days).
GeneratedResponses generateResponses(const CompiledRouting& routing, int records, quint32 seed) {
    GeneratedResponses g;
    QList<QList<QByteArray>> pools;
    const QList<QByteArray> common = {"",  "",   "",    "-1",  "abc", "3.0", "1.5",
                                      "0", "-2", "1e2", "100", "250", "999", "007"};
    for (int p = 0; p < routing.itemCount(); ++p) {
        const Item& item = *routing.index().at(p).item;
        if (item.type == ItemType::Statement)
            continue;
        if (item.type == ItemType::Multi) {
            for (const QString& name : multiVariableNames(routing.instrument(), item)) {
                g.columns.append(name);
                pools.append({"", "", "0", "0", "1", "1", "1", "2", "-1"});
            }
            continue;
        }
        g.columns.append(item.name);
        QList<QByteArray> pool = common;
        for (const Code& c : routing.codes(p))
            pool += {QByteArray::number(c.code), QByteArray::number(c.code)};
        if (item.range)
            pool += {item.range->first.text.toUtf8(), item.range->second.text.toUtf8(), "5", "12",
                     "99999"};
        if (item.type == ItemType::Date)
            pool += {"2024-02-29", "2023-02-29", "2026-13-01",
                     "2026-04-31", "2026-04-30", "0000-01-01"};
        if (item.type == ItemType::Text)
            pool += {"fine", " ", "x y"};
        pools.append(pool);
    }
    QRandomGenerator rng(seed);
    for (int r = 0; r < records; ++r) {
        QList<QByteArray> row;
        for (const QList<QByteArray>& pool : pools)
            row.append(pool.at(rng.bounded(int(pool.size()))));
        g.rows.append(row);
    }
    return g;
}

QStringList countRows(const DataCheckResult& result) {
    QStringList rows;
    for (const ItemCounts& c : result.items)
        rows.append(QStringList{
            c.name, QString::number(c.presented), QString::number(c.answered),
            QString::number(c.nonresponseByKind[0]), QString::number(c.nonresponseByKind[1]),
            QString::number(c.nonresponseByKind[2]), QString::number(c.nonresponseByKind[3]),
            QString::number(c.invalid), QString::number(c.legitimateSkip),
            QString::number(c.routingViolation)}
                        .join(QLatin1Char(',')));
    return rows;
}

namespace {
int collect(void* out, int columns, char** values, char**) {
    QStringList fields;
    for (int i = 1; i < columns; ++i) // column 0 is the position
        fields.append(QString::fromUtf8(values[i] ? values[i] : "0"));
    static_cast<QStringList*>(out)->append(fields.join(QLatin1Char(',')));
    return 0;
}
} // namespace

QStringList runOnSqlite(const GeneratedResponses& data, const QByteArray& script, QString& error) {
    sqlite3* db = nullptr;
    sqlite3_open(":memory:", &db);
    QStringList columns;
    for (const QString& c : data.columns)
        columns.append(QLatin1Char('"') + c + QStringLiteral("\" TEXT"));
    QByteArray ddl =
        "CREATE TABLE responses (" + columns.join(QStringLiteral(", ")).toUtf8() + ");";
    sqlite3_exec(db, ddl.constData(), nullptr, nullptr, nullptr);
    QStringList marks;
    for (qsizetype i = 0; i < data.columns.size(); ++i)
        marks.append(QStringLiteral("?"));
    sqlite3_stmt* insert = nullptr;
    const QByteArray sql =
        "INSERT INTO responses VALUES (" + marks.join(QLatin1Char(',')).toUtf8() + ")";
    sqlite3_prepare_v2(db, sql.constData(), -1, &insert, nullptr);
    int k = 0;
    for (const QList<QByteArray>& row : data.rows) {
        for (qsizetype i = 0; i < row.size(); ++i) {
            if (row.at(i).isEmpty() && (++k % 2))
                sqlite3_bind_null(insert, int(i) + 1); // loaders differ: NULL or ''
            else
                sqlite3_bind_text(insert, int(i) + 1, row.at(i).constData(), int(row.at(i).size()),
                                  SQLITE_TRANSIENT);
        }
        sqlite3_step(insert);
        sqlite3_reset(insert);
    }
    sqlite3_finalize(insert);
    QStringList rows;
    char* message = nullptr;
    if (sqlite3_exec(db, script.constData(), collect, &rows, &message) != SQLITE_OK) {
        error = QString::fromUtf8(message);
        sqlite3_free(message);
    }
    sqlite3_close(db);
    return rows;
}
