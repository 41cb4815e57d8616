#pragma once

#include "data/DataCheck.h"

#include <QByteArray>
#include <QList>
#include <QStringList>

// Random response files for the SQL replay tests (fixed seeds), and the
// per-item class counts as rows "item,presented,answered,blank,dont_know,
// refused,not_applicable,invalid,legitimate_skip,routing_violation".
struct GeneratedResponses {
    QStringList columns;
    QList<QList<QByteArray>> rows;
    QByteArray csv() const;
};
GeneratedResponses generateResponses(const rb::CompiledRouting& routing, int records, quint32 seed);
QStringList countRows(const rb::DataCheckResult& result);
// Runs the SQL script on an in-memory SQLite database holding `data` in table
// "responses" (blank cells stored as '' or NULL at random); rows of the last SELECT.
QStringList runOnSqlite(const GeneratedResponses& data, const QByteArray& script, QString& error);
