// libFuzzer target: opening a .routebook project. The bytes are written to a
// private temporary file and opened as a user would open them; the result must
// be a project or errors with messages. A project that opens must save and
// reopen as the same instrument.
#include "storage/ProjectFile.h"

#include <QByteArray>
#include <QDir>
#include <QFile>

#include <cstdint>
#include <cstdlib>
#include <unistd.h>

namespace {
QString scratchPath(const char* suffix) {
    return QDir::tempPath() + QStringLiteral("/routebook-fuzz-%1%2")
                                  .arg(QString::number(getpid()), QString::fromLatin1(suffix));
}

void removeWithJournal(const QString& path) {
    QFile::remove(path);
    QFile::remove(path + QStringLiteral("-journal"));
}
} // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
    const QString path = scratchPath(".routebook");
    removeWithJournal(path);
    {
        QFile file(path);
        if (!file.open(QIODevice::WriteOnly))
            std::abort();
        file.write(reinterpret_cast<const char*>(data), qint64(size));
    }
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    removeWithJournal(path);
    if (!loaded.ok()) {
        if (loaded.errors.isEmpty() || loaded.errors.first().message.isEmpty())
            std::abort();
        return 0;
    }
    const QString copy = scratchPath("-copy.routebook");
    removeWithJournal(copy);
    if (rb::saveProjectFile(*loaded.instrument, copy))
        std::abort(); // a project we read must be one we can write
    const rb::LoadResult again = rb::loadProjectFile(copy);
    removeWithJournal(copy);
    if (!again.ok() || !(*again.instrument == *loaded.instrument))
        std::abort(); // the save lost or changed something
    return 0;
}
