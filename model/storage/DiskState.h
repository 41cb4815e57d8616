#pragma once

#include <QByteArray>
#include <QDateTime>
#include <QString>

namespace rb {

// What a project file looked like on disk when this editor last read or wrote
// it, so a save can tell whether someone else wrote it meanwhile. Size and
// modification time are cheap but coarse (a copy keeps the time, a touch
// changes it without changing a byte); the SHA-256 of the content decides.
struct DiskState {
    bool exists = false;
    qint64 size = 0;
    QDateTime modified; // UTC
    QByteArray sha256;

    // Reads the file now. A missing file gives exists == false.
    static DiskState of(const QString& path);

    // True when `now` holds other bytes than this state (or one of the two
    // is missing). A different time with the same bytes is not a change.
    bool differsFrom(const DiskState& now) const;
};

} // namespace rb
