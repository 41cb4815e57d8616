#include "DiskState.h"

#include <QCryptographicHash>
#include <QFile>
#include <QFileInfo>

namespace rb {

DiskState DiskState::of(const QString& path) {
    DiskState state;
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return state;
    QCryptographicHash hash(QCryptographicHash::Sha256);
    if (!hash.addData(&file))
        return state;
    state.exists = true;
    state.size = file.size();
    state.modified = QFileInfo(path).lastModified().toUTC();
    state.sha256 = hash.result();
    return state;
}

bool DiskState::differsFrom(const DiskState& now) const {
    if (exists != now.exists)
        return true;
    if (!exists)
        return false;
    if (size != now.size)
        return true; // cheap and certain
    return sha256 != now.sha256;
}

} // namespace rb
