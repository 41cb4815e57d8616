#include "YamlFormat.h"

#include "YamlReader.h"
#include "YamlTree.h"
#include "YamlWriter.h"

#include <QFile>
#include <QSaveFile>

using namespace Qt::StringLiterals;

namespace rb {

LoadResult loadYamlText(const QByteArray& text, const QString& fileName) {
    yaml::ParsedDocument document = yaml::parseYamlDocument(text, fileName);
    if (!document.root) {
        LoadResult result;
        result.errors = document.errors;
        return result;
    }
    return yaml::readInstrument(*document.root, fileName);
}

LoadResult loadYamlFile(const QString& path) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly)) {
        LoadResult result;
        result.errors.append({path, 0, 0, u"cannot read the file: %1"_s.arg(file.errorString())});
        return result;
    }
    return loadYamlText(file.readAll(), path);
}

QByteArray saveYamlText(const Instrument& instrument) {
    return yaml::writeInstrument(instrument);
}

std::optional<Diagnostic> saveYamlFile(const Instrument& instrument, const QString& path) {
    QSaveFile file(path);
    if (!file.open(QIODevice::WriteOnly))
        return Diagnostic{path, 0, 0, u"cannot write the file: %1"_s.arg(file.errorString())};
    const QByteArray bytes = saveYamlText(instrument);
    if (file.write(bytes) != bytes.size() || !file.commit())
        return Diagnostic{path, 0, 0, u"cannot write the file: %1"_s.arg(file.errorString())};
    return std::nullopt;
}

} // namespace rb
