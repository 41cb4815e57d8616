#pragma once

#include <QByteArray>
#include <QDateTime>
#include <QString>

#include <optional>

namespace rb {

// Making QPdfWriter's output byte-for-byte reproducible (reproducible-builds.org,
// "SOURCE_DATE_EPOCH" specification): the writer stamps the wall-clock time into
// the Info dictionary and a random document ID into the trailer and the XMP
// metadata. With SOURCE_DATE_EPOCH set, we hand the writer our own XMP packet
// and, after writing, overwrite the Info dates and the trailer /ID in place with
// values of the same length, so the cross-reference offsets stay valid.

// SOURCE_DATE_EPOCH as a UTC time; nullopt when unset or malformed (a malformed
// value is reported by the dictionary's generation time, not here).
std::optional<QDateTime> reproducibleTime();

// An XMP packet (ISO 16684-1) with the title, a fixed creation date and
// document / instance IDs derived from the title and the date.
QByteArray reproducibleXmp(const QString& title, const QDateTime& time);

// Rewrites every "/CreationDate (D:...)" and "/ModDate (D:...)" to `time` in
// UTC and every hex string of the trailer's /ID to a digest of the rest of the
// file, each in exactly as many bytes as it had.
QByteArray stampPdfDates(QByteArray pdf, const QDateTime& time);

} // namespace rb
