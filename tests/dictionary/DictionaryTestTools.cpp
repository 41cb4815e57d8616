#include "DictionaryTestTools.h"

#include "data/CsvReader.h"
#include "storage/InstrumentFile.h"

#include <QBuffer>
#include <QDir>
#include <QFileInfo>
#include <QProcess>
#include <QStandardPaths>

using namespace Qt::StringLiterals;

namespace rbtest {

QDateTime fixedTime() {
    return QDateTime::fromSecsSinceEpoch(kEpoch, Qt::UTC);
}

std::optional<rb::Instrument> loadInstrument(const QString& path, QString* error) {
    rb::LoadResult loaded = rb::loadInstrumentFile(path);
    if (!loaded.ok()) {
        *error = rb::formatDiagnostics(loaded.errors);
        return std::nullopt;
    }
    return std::move(loaded.instrument);
}

QStringList sampleProjects() {
    QStringList out;
    const QDir dir(QStringLiteral(ROUTEBOOK_SAMPLES_DIR));
    for (const QString& name : dir.entryList({u"*.yaml"_s}, QDir::Files, QDir::Name))
        out.append(dir.filePath(name));
    return out;
}

std::optional<QList<QStringList>> parseCsv(const QByteArray& bytes, QString* error) {
    QByteArray copy = bytes;
    QBuffer buffer(&copy);
    buffer.open(QIODevice::ReadOnly);
    rb::CsvReader reader(buffer, u"dictionary.csv"_s);
    QList<QStringList> rows;
    for (;;) {
        const rb::CsvReader::Status status = reader.next();
        if (status == rb::CsvReader::Status::End)
            return rows;
        if (status == rb::CsvReader::Status::Error) {
            *error = reader.error().toString();
            return std::nullopt;
        }
        QStringList row;
        for (const QByteArrayView field : reader.fields())
            row.append(QString::fromUtf8(field));
        rows.append(row);
    }
}

ToolRun runTool(const QString& program, const QStringList& args, const QProcessEnvironment& env,
                const QByteArray& input) {
    QProcess process;
    process.setProcessEnvironment(env);
    process.start(program, args);
    if (!process.waitForStarted(30000))
        return {};
    if (!input.isEmpty())
        process.write(input);
    process.closeWriteChannel();
    process.waitForFinished(300000);
    ToolRun run;
    run.exitCode = process.exitStatus() == QProcess::NormalExit ? process.exitCode() : -1;
    run.out = process.readAllStandardOutput();
    run.err = process.readAllStandardError();
    return run;
}

bool toolExists(const QString& program) {
    return !QStandardPaths::findExecutable(program).isEmpty();
}

QString ddiSchemaDir() {
    const QString dir = QStringLiteral(ROUTEBOOK_SHARED_DIR) + u"/standards/ddi-codebook-2.5"_s;
    return QFileInfo::exists(dir + u"/schemas/codebook.xsd"_s) ? dir : QString();
}

QStringList hostileStrings() {
    return {
        u"<script>alert(\"x\")</script>"_s,
        u"Fish & chips <b>bold</b>"_s,
        u"He said \"no\" and 'never'"_s,
        u"end of data ]]> here"_s,
        u"\u05D2\u05D9\u05E0\u05D4 \u202Ereversed\u202C \u0627\u0644\u062D\u062F\u064A\u0642\u0629"_s,
        u"*star* _under_ `tick` [link](http://x) | pipe # hash"_s};
}

rb::Instrument hostileInstrument() {
    const QStringList s = hostileStrings();
    rb::Instrument in;
    in.title = s.at(0) + u" & title"_s;
    in.version = s.at(3);
    in.language = u"en"_s;
    in.settings.legitimateSkipCode = u"-1"_s;
    rb::Module m;
    m.name = u"odd"_s;
    m.title = s.at(1);
    rb::Item gate;
    gate.name = u"gate"_s;
    gate.label = s.at(0);
    gate.text = s.at(2);
    gate.instruction = s.at(5);
    gate.type = rb::ItemType::Single;
    gate.hasInlineCodes = true;
    gate.inlineCodes = {{1, s.at(3), rb::MissingKind::None},
                        {2, s.at(4), rb::MissingKind::None},
                        {9, s.at(1), rb::MissingKind::Refused}};
    rb::Item follow;
    follow.name = u"follow"_s;
    follow.label = s.at(4);
    follow.text = QString(10000, u'w');
    follow.text.replace(0, s.at(0).size(), s.at(0));
    follow.type = rb::ItemType::Text;
    follow.askIf = u"gate = 1"_s;
    follow.notes = s.at(3) + s.at(0);
    m.items = {gate, follow};
    in.modules = {m};
    return in;
}

} // namespace rbtest
