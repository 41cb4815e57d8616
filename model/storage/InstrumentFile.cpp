#include "InstrumentFile.h"

#include "ProjectFile.h"
#include "YamlFormat.h"

#include <QFileInfo>

namespace rb {

FileKind fileKindOf(const QString& path) {
    const QString suffix = QFileInfo(path).suffix().toLower();
    if (suffix == QLatin1String("routebook"))
        return FileKind::Project;
    if (suffix == QLatin1String("yaml") || suffix == QLatin1String("yml"))
        return FileKind::Yaml;
    return FileKind::Unknown;
}

static Diagnostic unknownKind(const QString& path) {
    return {
        path, 0, 0,
        QStringLiteral("unknown file type: expected a .routebook project or a .yaml instrument")};
}

LoadResult loadInstrumentFile(const QString& path) {
    switch (fileKindOf(path)) {
    case FileKind::Project:
        return loadProjectFile(path);
    case FileKind::Yaml:
        return loadYamlFile(path);
    case FileKind::Unknown:
        break;
    }
    LoadResult result;
    result.errors.append(unknownKind(path));
    return result;
}

std::optional<Diagnostic> saveInstrumentFile(const Instrument& instrument, const QString& path) {
    switch (fileKindOf(path)) {
    case FileKind::Project:
        return saveProjectFile(instrument, path);
    case FileKind::Yaml:
        return saveYamlFile(instrument, path);
    case FileKind::Unknown:
        break;
    }
    return unknownKind(path);
}

} // namespace rb
