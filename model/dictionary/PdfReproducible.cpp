#include "PdfReproducible.h"

#include "Dictionary.h"

#include <QCryptographicHash>
#include <QRegularExpression>

using namespace Qt::StringLiterals;

namespace rb {

namespace {

// "D:YYYYMMDDHHmmSS" then a zone: "Z", or "+HH'mm'" / "-HH'mm'" (PDF 1.7, 7.9.4).
const QRegularExpression
    kDate(uR"(/(?:CreationDate|ModDate) ?\(D:(\d{14})(Z|[+-]\d\d'\d\d'?)?\))"_s);
// The trailer's file identifier: /ID [<hex> <hex>] (PDF 1.7, 14.4).
const QRegularExpression kId(uR"(/ID ?\[ ?<([0-9A-Fa-f]+)> ?<([0-9A-Fa-f]+)> ?\])"_s);

void overwrite(QByteArray& bytes, qsizetype at, const QByteArray& with) {
    bytes.replace(at, with.size(), with); // same length: offsets after it do not move
}

QString zoneOfSameLength(const QString& zone) {
    if (zone.isEmpty() || zone == u"Z"_s)
        return zone;
    return zone.size() == 7 ? u"+00'00'"_s : u"+00'00"_s;
}

} // namespace

std::optional<QDateTime> reproducibleTime() {
    if (!qEnvironmentVariableIsSet("SOURCE_DATE_EPOCH"))
        return std::nullopt;
    const GenerationTime time = generationTime();
    if (time.error)
        return std::nullopt;
    return time.time.toUTC();
}

QByteArray reproducibleXmp(const QString& title, const QDateTime& time) {
    const QString stamp = time.toUTC().toString(Qt::ISODate);
    const QByteArray seed = title.toUtf8() + '\n' + stamp.toLatin1();
    const QString id =
        QString::fromLatin1(QCryptographicHash::hash(seed, QCryptographicHash::Md5).toHex());
    QString xml = uR"(<?xpacket begin="" id="W5M0MpCehiHzreSzNTczkc9d"?>
<x:xmpmeta xmlns:x="adobe:ns:meta/">
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">
<rdf:Description rdf:about="" xmlns:dc="http://purl.org/dc/elements/1.1/" xmlns:xmp="http://ns.adobe.com/xap/1.0/" xmlns:xmpMM="http://ns.adobe.com/xap/1.0/mm/" xmlns:pdf="http://ns.adobe.com/pdf/1.3/">
<dc:title><rdf:Alt><rdf:li xml:lang="x-default">%1</rdf:li></rdf:Alt></dc:title>
<xmp:CreatorTool>Routebook</xmp:CreatorTool>
<xmp:CreateDate>%2</xmp:CreateDate>
<xmp:ModifyDate>%2</xmp:ModifyDate>
<xmp:MetadataDate>%2</xmp:MetadataDate>
<xmpMM:DocumentID>uuid:%3</xmpMM:DocumentID>
<xmpMM:InstanceID>uuid:%3</xmpMM:InstanceID>
</rdf:Description>
</rdf:RDF>
</x:xmpmeta>
<?xpacket end="w"?>)"_s;
    return xml.arg(title.toHtmlEscaped(), stamp, id).toUtf8();
}

QByteArray stampPdfDates(QByteArray pdf, const QDateTime& time) {
    const QString digits = time.toUTC().toString(u"yyyyMMddHHmmss"_s);
    // The text is Latin-1 as far as these ASCII patterns go; offsets map 1:1.
    const QString text = QString::fromLatin1(pdf);
    for (auto it = kDate.globalMatch(text); it.hasNext();) {
        const QRegularExpressionMatch m = it.next();
        overwrite(pdf, m.capturedStart(1), digits.toLatin1());
        if (m.capturedLength(2) > 0)
            overwrite(pdf, m.capturedStart(2), zoneOfSameLength(m.captured(2)).toLatin1());
    }
    QList<QRegularExpressionMatch> ids;
    for (auto it = kId.globalMatch(text); it.hasNext();)
        ids.append(it.next());
    // Blank every identifier first, so the digest does not depend on the random ones.
    for (const QRegularExpressionMatch& m : ids)
        for (int group : {1, 2})
            overwrite(pdf, m.capturedStart(group), QByteArray(m.capturedLength(group), '0'));
    const QByteArray digest = QCryptographicHash::hash(pdf, QCryptographicHash::Sha256).toHex();
    for (const QRegularExpressionMatch& m : ids)
        for (int group : {1, 2})
            overwrite(
                pdf, m.capturedStart(group),
                digest.left(m.capturedLength(group)).leftJustified(m.capturedLength(group), '0'));
    return pdf;
}

} // namespace rb
