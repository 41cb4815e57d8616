#pragma once

#include "instrument/Instrument.h"

#include <QByteArray>
#include <QDateTime>
#include <QList>
#include <QProcessEnvironment>
#include <QString>
#include <QStringList>

#include <optional>

namespace rbtest {

// A fixed generation time (SOURCE_DATE_EPOCH=1700000000, which is
// 2023-11-14T22:13:20Z: 19675 days * 86400 s + 80000 s; 80000 s = 22:13:20).
inline constexpr qint64 kEpoch = 1700000000;
QDateTime fixedTime();

std::optional<rb::Instrument> loadInstrument(const QString& path, QString* error);
QStringList sampleProjects(); // every sample_projects/*.yaml

// Parses RFC 4180 bytes with the project's reader into rows of cells.
std::optional<QList<QStringList>> parseCsv(const QByteArray& bytes, QString* error);

struct ToolRun {
    int exitCode = -1; // -1: did not start or crashed
    QByteArray out, err;
};
ToolRun runTool(const QString& program, const QStringList& args,
                const QProcessEnvironment& env = QProcessEnvironment::systemEnvironment(),
                const QByteArray& input = {});
bool toolExists(const QString& program);

// The schema folder; empty when absent.
QString ddiSchemaDir();

// An instrument whose strings try to break every format: markup, quotes,
// CDATA ends, right-to-left text, a 10,000-character wording.
rb::Instrument hostileInstrument();
QStringList hostileStrings();

} // namespace rbtest
