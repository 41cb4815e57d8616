// Tests of the RFC 4180 CSV reader (model/data/CsvReader).
// Outside checks: every example of RFC 4180 section 2 (Shafranovich, "Common Format and
// MIME Type for Comma-Separated Values (CSV) Files", IETF RFC 4180, October 2005) with its
// verified erratum EID 5714, and Python's csv module (csv.reader, strict=True) as a
// reference parser on randomly generated files with fixed seeds.
#include "data/CsvReader.h"

#include <QBuffer>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QProcess>
#include <QRandomGenerator>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

using namespace Qt::StringLiterals;
using Records = QList<QStringList>;

namespace {

// A device that hands out at most `chunk` bytes per read, so records cross
// read boundaries everywhere.
class TrickleDevice : public QIODevice {
public:
    TrickleDevice(const QByteArray& data, qint64 chunk) : m_data(data), m_chunk(chunk) {
        open(QIODevice::ReadOnly | QIODevice::Unbuffered);
    }
    bool isSequential() const override { return true; }

protected:
    qint64 readData(char* out, qint64 max) override {
        const qint64 n = qMin(qMin(max, m_chunk), qint64(m_data.size()) - m_at);
        if (n <= 0)
            return 0;
        memcpy(out, m_data.constData() + m_at, size_t(n));
        m_at += n;
        return n;
    }
    qint64 writeData(const char*, qint64) override { return -1; }

private:
    QByteArray m_data;
    qint64 m_chunk;
    qint64 m_at = 0;
};

struct Parsed {
    Records records;
    QList<qint64> lines;
    std::optional<rb::Diagnostic> error;
};

Parsed parseWith(QIODevice& device, qint64 maxRecordBytes) {
    rb::CsvReader reader(device, u"t.csv"_s, maxRecordBytes);
    Parsed p;
    for (;;) {
        const rb::CsvReader::Status s = reader.next();
        if (s == rb::CsvReader::Status::End)
            return p;
        if (s == rb::CsvReader::Status::Error) {
            p.error = reader.error();
            return p;
        }
        QStringList fields;
        for (QByteArrayView f : reader.fields())
            fields.append(QString::fromUtf8(f));
        p.records.append(fields);
        p.lines.append(reader.recordLine());
    }
}

Parsed parse(const QByteArray& bytes, qint64 chunk = 0,
             qint64 maxRecordBytes = rb::CsvReader::kDefaultMaxRecordBytes) {
    if (chunk > 0) {
        TrickleDevice device(bytes, chunk);
        return parseWith(device, maxRecordBytes);
    }
    QBuffer buffer;
    buffer.setData(bytes);
    buffer.open(QIODevice::ReadOnly);
    return parseWith(buffer, maxRecordBytes);
}

} // namespace

class TestCsv : public QObject {
    Q_OBJECT
private slots:
    void rfc4180Examples_data();
    void rfc4180Examples();
    void errorsCarryLineAndColumn_data();
    void errorsCarryLineAndColumn();
    void byteOrderMarkAndUtf8();
    void recordLinesCountBreaksInsideQuotes();
    void lineLengthGuard();
    void emptyInput();
    void matchesPythonCsvOnRandomFiles();
};

// RFC 4180 section 2, rules 1-7, with the parses the RFC gives (expected values read from
// the RFC's examples, not from the reader). Rows 5 and 6 follow erratum EID 5714: no space
// between the closing quote and CRLF. Each row runs once whole and once through a device
// that gives 3 bytes per read.
void TestCsv::rfc4180Examples_data() {
    QTest::addColumn<QByteArray>("input");
    QTest::addColumn<Records>("expected");
    const Records two = {{u"aaa"_s, u"bbb"_s, u"ccc"_s}, {u"zzz"_s, u"yyy"_s, u"xxx"_s}};
    QTest::newRow("R1 CRLF separates records")
        << QByteArray("aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n") << two;
    QTest::newRow("R2 last CRLF optional") << QByteArray("aaa,bbb,ccc\r\nzzz,yyy,xxx") << two;
    QTest::newRow("R3 header line")
        << QByteArray("field_name,field_name,field_name\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n")
        << (Records{{u"field_name"_s, u"field_name"_s, u"field_name"_s}} + two);
    QTest::newRow("R4 three fields")
        << QByteArray("aaa,bbb,ccc") << Records{{u"aaa"_s, u"bbb"_s, u"ccc"_s}};
    QTest::newRow("R4 spaces are part of a field")
        << QByteArray("aa a, bbb ,ccc") << Records{{u"aa a"_s, u" bbb "_s, u"ccc"_s}};
    QTest::newRow("R5 quoted fields")
        << QByteArray("\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx") << two;
    QTest::newRow("R6 CRLF inside quotes")
        << QByteArray("\"aaa\",\"b\r\nbb\",\"ccc\"\r\nzzz,yyy,xxx")
        << Records{{u"aaa"_s, u"b\r\nbb"_s, u"ccc"_s}, {u"zzz"_s, u"yyy"_s, u"xxx"_s}};
    QTest::newRow("R6 comma and LF inside quotes")
        << QByteArray("\"a,a\",\"b\nb\"\n") << Records{{u"a,a"_s, u"b\nb"_s}};
    QTest::newRow("R7 doubled quote")
        << QByteArray("\"aaa\",\"b\"\"bb\",\"ccc\"") << Records{{u"aaa"_s, u"b\"bb"_s, u"ccc"_s}};
    // Beyond the RFC's examples but by its grammar: LF line ends (a deliberate
    // extension), empty fields, and an empty line as one empty field (record = field).
    QTest::newRow("LF line ends and empty fields")
        << QByteArray("a,,\n,b,\n") << Records{{u"a"_s, u""_s, u""_s}, {u""_s, u"b"_s, u""_s}};
    QTest::newRow("empty line is one empty field")
        << QByteArray("a\n\nb\n") << Records{{u"a"_s}, {u""_s}, {u"b"_s}};
    QTest::newRow("quoted empty field") << QByteArray("\"\",x") << Records{{u""_s, u"x"_s}};
}

void TestCsv::rfc4180Examples() {
    QFETCH(QByteArray, input);
    QFETCH(Records, expected);
    for (qint64 chunk : {qint64(0), qint64(3), qint64(1)}) {
        const Parsed p = parse(input, chunk);
        QVERIFY2(!p.error, qPrintable(p.error ? p.error->toString() : QString()));
        QCOMPARE(p.records, expected);
    }
}

// Expected positions counted by hand in each input (1-based line and byte column).
void TestCsv::errorsCarryLineAndColumn_data() {
    QTest::addColumn<QByteArray>("input");
    QTest::addColumn<int>("line");
    QTest::addColumn<int>("column");
    QTest::addColumn<QString>("words");
    // Erratum EID 5714: a quoted field may not be followed by a space.
    QTest::newRow("space after closing quote")
        << QByteArray("a,b\r\n\"aaa\" \r\n") << 2 << 6 << u"after a closing quote"_s;
    // RFC 4180 rule 5: a quote may not appear inside an unquoted field.
    QTest::newRow("quote inside unquoted field")
        << QByteArray("a,b\nx,y\"z\n") << 2 << 4 << u"quote inside an unquoted field"_s;
    QTest::newRow("unterminated quote")
        << QByteArray("a,b\n1,2\n3,\"open\nmore\n") << 3 << 3 << u"unterminated quoted field"_s;
    QTest::newRow("bare CR") << QByteArray("a,b\r3,4\n") << 1 << 4 << u"carriage return"_s;
    // The error after a multi-line quoted field is on the line where it happens.
    QTest::newRow("error after a line break inside quotes")
        << QByteArray("\"x\ny\"z\n") << 2 << 3 << u"after a closing quote"_s;
}

void TestCsv::errorsCarryLineAndColumn() {
    QFETCH(QByteArray, input);
    QFETCH(int, line);
    QFETCH(int, column);
    QFETCH(QString, words);
    for (qint64 chunk : {qint64(0), qint64(2)}) {
        const Parsed p = parse(input, chunk);
        QVERIFY(p.error);
        QCOMPARE(p.error->file, u"t.csv"_s);
        QCOMPARE(p.error->line, line);
        QCOMPARE(p.error->column, column);
        QVERIFY2(p.error->message.contains(words), qPrintable(p.error->message));
    }
}

void TestCsv::byteOrderMarkAndUtf8() {
    const QByteArray bytes =
        QByteArray("\xEF\xBB\xBF") + QString(u"name,ville\nZoë,\"Malmö, Skåne\"\n"_s).toUtf8();
    const Parsed p = parse(bytes, 2);
    QVERIFY(!p.error);
    QCOMPARE(p.records, (Records{{u"name"_s, u"ville"_s}, {u"Zoë"_s, u"Malmö, Skåne"_s}}));
}

void TestCsv::recordLinesCountBreaksInsideQuotes() {
    // Record 2 spans lines 2-3 (one LF inside quotes), so record 3 starts on line 4.
    const Parsed p = parse("h\n\"a\nb\"\nc\r\n");
    QVERIFY(!p.error);
    QCOMPARE(p.lines, (QList<qint64>{1, 2, 4}));
}

void TestCsv::lineLengthGuard() {
    // Records of 3, 12 and 3 bytes (without the line end); a guard of 8 bytes stops at
    // the second one, on line 2.
    const QByteArray input("a,b\n0123456789ab\nc,d\n");
    for (qint64 chunk : {qint64(0), qint64(4)}) {
        const Parsed p = parse(input, chunk, 8);
        QVERIFY(p.error);
        QCOMPARE(p.error->line, 2);
        QVERIFY(p.error->message.contains(u"line-length guard of 8 bytes"_s));
        QCOMPARE(p.records.size(), 1);
    }
    QVERIFY(!parse(input, 0, 13).error); // 12 bytes + LF fit a guard of 13
}

void TestCsv::emptyInput() {
    QCOMPARE(parse("").records.size(), 0);
    QCOMPARE(parse("\xEF\xBB\xBF").records.size(), 0);
    // RFC 4180: file = record *(CRLF record) [CRLF], so one CRLF is one empty record.
    QCOMPARE(parse("\r\n").records, (Records{{u""_s}}));
}

namespace {

// A random field, quoted when it must be and sometimes when it need not be.
QByteArray randomField(QRandomGenerator& rng, QString& text) {
    static const QStringList pieces = {u"a"_s,  u"b"_s,    u" "_s, u","_s, u"\""_s,
                                       u"\n"_s, u"\r\n"_s, u"é"_s, u"7"_s, u"ß€"_s};
    const int length = rng.bounded(5);
    text.clear();
    for (int k = 0; k < length; ++k)
        text += pieces.at(rng.bounded(pieces.size()));
    const bool mustQuote =
        text.contains(u',') || text.contains(u'"') || text.contains(u'\n') || text.contains(u'\r');
    if (!mustQuote && rng.bounded(3) != 0)
        return text.toUtf8();
    QString quoted = text;
    quoted.replace(u"\""_s, u"\"\""_s);
    return '"' + quoted.toUtf8() + '"';
}

// Writes a random file and returns the records it means; `breakIt` adds a defect
// both parsers must reject (text after a closing quote, or an unterminated quote).
QByteArray randomFile(QRandomGenerator& rng, Records& meant, bool& broken) {
    QByteArray out;
    if (rng.bounded(4) == 0)
        out += "\xEF\xBB\xBF";
    meant.clear();
    const int records = 1 + rng.bounded(12);
    for (int r = 0; r < records; ++r) {
        QStringList fields;
        const int count = 1 + rng.bounded(5);
        for (int f = 0; f < count; ++f) {
            QString text;
            QByteArray raw = randomField(rng, text);
            // A lone empty field as the very last record without a line end is no
            // record at all; quote it so the meaning is unambiguous.
            if (count == 1 && raw.isEmpty())
                raw = "\"\"";
            out += (f ? "," : "") + raw;
            fields.append(text);
        }
        meant.append(fields);
        if (r + 1 < records || rng.bounded(2))
            out += rng.bounded(2) ? "\r\n" : "\n";
    }
    broken = rng.bounded(5) == 0;
    // The defect starts a record of its own: after an unquoted field a quote would be
    // a quote inside an unquoted field, which Python accepts and RFC 4180 does not.
    if (broken && !out.endsWith('\n'))
        out += '\n';
    if (broken)
        out += rng.bounded(2) ? QByteArray("\"x\"y\n") : QByteArray("z,\"open");
    return out;
}

Records recordsFromJson(const QJsonArray& array) {
    Records records;
    for (const QJsonValue& row : array) {
        QStringList fields;
        for (const QJsonValue& f : row.toArray())
            fields.append(f.toString());
        records.append(fields);
    }
    return records;
}

} // namespace

void TestCsv::matchesPythonCsvOnRandomFiles() {
    const QString python = QStandardPaths::findExecutable(u"python3"_s);
    if (python.isEmpty())
        QSKIP("python3 is not installed; the reference comparison needs it");
    QTemporaryDir dir;
    QVERIFY(dir.isValid());
    constexpr int kFiles = 300;
    QList<Records> meant(kFiles);
    QList<bool> broken(kFiles);
    QList<QByteArray> bytes(kFiles);
    QStringList paths;
    QRandomGenerator rng(4180); // fixed seed: the same files on every run
    for (int i = 0; i < kFiles; ++i) {
        bool b = false;
        bytes[i] = randomFile(rng, meant[i], b);
        broken[i] = b;
        const QString path = dir.filePath(u"r%1.csv"_s.arg(i));
        QFile file(path);
        QVERIFY(file.open(QIODevice::WriteOnly));
        file.write(bytes[i]);
        paths.append(path);
    }
    QProcess process;
    process.start(python,
                  QStringList{QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/csv/csv_reference.py")} +
                      paths);
    QVERIFY(process.waitForFinished(60000));
    QCOMPARE(process.exitCode(), 0);
    const QList<QByteArray> lines = process.readAllStandardOutput().split('\n');
    QVERIFY(lines.size() >= kFiles);
    int brokenSeen = 0;
    for (int i = 0; i < kFiles; ++i) {
        const QJsonObject reference = QJsonDocument::fromJson(lines.at(i)).object();
        const Parsed ours = parse(bytes[i], 1 + i % 7);
        const QByteArray where =
            "file " + QByteArray::number(i) + ": " + bytes[i].toPercentEncoding();
        if (broken[i]) {
            ++brokenSeen;
            QVERIFY2(reference.contains(u"error"_s), where.constData());
            QVERIFY2(ours.error.has_value(), where.constData());
            continue;
        }
        QVERIFY2(!ours.error, where.constData());
        const Records theirs = recordsFromJson(reference.value(u"records"_s).toArray());
        QCOMPARE(ours.records, theirs);
        QCOMPARE(ours.records, meant[i]); // and both equal what the generator meant
    }
    QVERIFY(brokenSeen > 20); // the defects really were exercised (about 1 in 5 of 300)
}

QTEST_GUILESS_MAIN(TestCsv)
#include "tst_csv.moc"
