#include "HostileFiles.h"

#include "CliRun.h"
#include "Fixtures.h"
#include "condition/Parser.h"
#include "data/CsvReader.h"
#include "storage/ProjectFile.h"
#include "storage/YamlFormat.h"

#include <QBuffer>
#include <QDir>
#include <QFile>
#include <QRegularExpression>
#include <QTest>

#include <sqlite3.h>

using namespace Qt::StringLiterals;
using namespace reliability;

namespace {

// Raw SQL on a file through the C API (not the code under test), foreign keys
// off so that rows may break the schema's references.
QString rawExec(const QString& file, const char* sql) {
    sqlite3* db = nullptr;
    QString error;
    if (sqlite3_open(QFile::encodeName(file).constData(), &db) != SQLITE_OK) {
        error = QString::fromUtf8(sqlite3_errmsg(db));
    } else {
        char* message = nullptr;
        if (sqlite3_exec(db, sql, nullptr, nullptr, &message) != SQLITE_OK)
            error = QString::fromUtf8(message ? message : "error");
        sqlite3_free(message);
    }
    sqlite3_close(db);
    return error;
}

void writeFile(const QString& file, const QByteArray& bytes) {
    QFile f(file);
    QVERIFY(f.open(QIODevice::WriteOnly));
    QCOMPARE(f.write(bytes), bytes.size());
}

QByteArray readFile(const QString& file) {
    QFile f(file);
    return f.open(QIODevice::ReadOnly) ? f.readAll() : QByteArray();
}

// A small valid project: two modules, a shared code list, a rule.
rb::Instrument smallProject() {
    return largeInstrument(0, 2, 8);
}

void saveSmall(const QString& file) {
    QVERIFY(!rb::saveProjectFile(smallProject(), file));
}

// One hostile project file: how to make it and the message it must give.
// Either `make` writes the file, or (make == nullptr) the small project is
// saved and `sql` is run on it raw.
struct ProjectCase {
    const char* name;
    void (*make)(const QString& file);
    const char* sql;
    const char* message; // regular expression the error must match
};

// Expected messages follow the refusals DESIGN.md and ProjectFile.cpp promise:
// a file is judged first by its bytes (empty / not SQLite), then by its marks
// (foreign), then by SQLite's own structure check and foreign-key check.
const ProjectCase kProjectCases[] = {
    {"empty file", [](const QString& f) { writeFile(f, {}); }, nullptr, "the file is empty"},
    {"random bytes", [](const QString& f) { writeFile(f, pseudoRandomBytes(65536, 7)); }, nullptr,
     "not a Routebook project \\(not an SQLite database\\)"},
    {"sqlite header then random bytes",
     [](const QString& f) {
         writeFile(f, QByteArray("SQLite format 3\0", 16) + pseudoRandomBytes(8192, 11));
     },
     nullptr, "not a Routebook project|damaged Routebook project"},
    {"truncated to half",
     [](const QString& f) {
         saveSmall(f);
         const QByteArray bytes = readFile(f);
         writeFile(f, bytes.left(bytes.size() / 2));
     },
     nullptr, "not a Routebook project|damaged Routebook project"},
    {"truncated to 600 bytes",
     [](const QString& f) {
         saveSmall(f);
         writeFile(f, readFile(f).left(600));
     },
     nullptr, "not a Routebook project|damaged Routebook project"},
    {"pages overwritten",
     [](const QString& f) {
         saveSmall(f);
         QByteArray bytes = readFile(f);
         // Keep the header page, scribble over everything after it.
         const QByteArray noise = pseudoRandomBytes(int(bytes.size()) - 4096, 3);
         bytes.replace(4096, noise.size(), noise);
         writeFile(f, bytes);
     },
     nullptr, "damaged Routebook project|not a Routebook project"},
    {"sqlite file of another program",
     [](const QString& f) {
         QCOMPARE(rawExec(f, "CREATE TABLE recipe (name TEXT, minutes INTEGER);"
                             "INSERT INTO recipe VALUES ('nettle soup', 40);"),
                  QString());
     },
     nullptr, "is an SQLite database but not a Routebook project"},
    {"dangling code list", nullptr, "DELETE FROM code_list",
     "damaged Routebook project.*code_list"},
    // m0_q7 holds a rule (index 7), so its rule row is left pointing nowhere.
    {"rules of a deleted item", nullptr, "DELETE FROM item WHERE name = 'm0_q7'",
     "damaged Routebook project.*item"},
    {"item of a deleted module", nullptr, "DELETE FROM module WHERE ord = 0",
     "damaged Routebook project.*module"},
    {"unknown item type", nullptr, "UPDATE item SET type = 'hovercraft' WHERE name = 'm0_q0'",
     "damaged Routebook project.*hovercraft"},
    {"text in an integer column", nullptr, "UPDATE code SET code = 'seven' WHERE ord = 0",
     "damaged Routebook project.*code"},
    {"two instrument rows", nullptr,
     "DROP TABLE instrument; CREATE TABLE instrument (id INTEGER, "
     "title TEXT, version TEXT, language TEXT);"
     "INSERT INTO instrument VALUES (1,'a','1','en'), (1,'b','1','en');",
     "damaged Routebook project"},
    {"newer schema version", nullptr, "UPDATE routebook_schema SET version = 99",
     "newer Routebook \\(schema version 99"},
    {"a folder", [](const QString& f) { QVERIFY(QDir().mkpath(f)); }, nullptr,
     "is not a regular file"},
};

void makeCase(const ProjectCase& c, const QString& file) {
    if (c.make) {
        c.make(file);
        return;
    }
    saveSmall(file);
    QCOMPARE(rawExec(file, c.sql), QString());
}

void addProjectRows() {
    QTest::addColumn<int>("index");
    for (int i = 0; i < int(std::size(kProjectCases)); ++i)
        QTest::newRow(kProjectCases[i].name) << i;
}

QString fileNameOf(const char* caseName, const char* extension) {
    return QString::fromLatin1(caseName).replace(u' ', u'-') + QLatin1String(extension);
}

// Each test function makes its own copy of a case: nothing left over from
// an earlier function (a damaged file there would make saving refuse here).
QString freshFile(const QTemporaryDir& dir, const char* caseName) {
    const QString file = dir.filePath(QString::fromLatin1(QTest::currentTestFunction()) + u'-' +
                                      fileNameOf(caseName, ".routebook"));
    QFile::remove(file);
    QFile::remove(file + u"-journal"_s);
    QDir(file).removeRecursively();
    return file;
}

} // namespace

void TestHostileFiles::init() {
    QVERIFY(m_dir.isValid());
}

void TestHostileFiles::projectFilesInProcess_data() {
    addProjectRows();
}

void TestHostileFiles::projectFilesInProcess() {
    QFETCH(int, index);
    const ProjectCase& c = kProjectCases[index];
    const QString file = freshFile(m_dir, c.name);
    makeCase(c, file);
    if (QTest::currentTestFailed())
        return;
    const rb::LoadResult loaded = rb::loadProjectFile(file);
    QVERIFY(!loaded.ok());
    QCOMPARE(loaded.errors.size(), 1);
    const QString message = loaded.errors.first().message;
    QVERIFY2(message.contains(QRegularExpression(QString::fromLatin1(c.message))),
             qPrintable(message));
    QVERIFY2(message.contains(file), qPrintable(message)); // says which file
}

void TestHostileFiles::hostileFilesInCli_data() {
    addProjectRows();
}

// The same files through `routebook check` and `routebook export`: exit 2, the
// message on stderr, nothing on stdout, nothing written.
void TestHostileFiles::hostileFilesInCli() {
    QFETCH(int, index);
    const ProjectCase& c = kProjectCases[index];
    const QString file = freshFile(m_dir, c.name);
    makeCase(c, file);
    if (QTest::currentTestFailed())
        return;
    const QRegularExpression expected(QString::fromLatin1(c.message));
    const CliOutcome check = runCli({u"check"_s, file});
    QVERIFY2(!check.crashed && !check.timedOut, qPrintable(check.describe()));
    QCOMPARE(check.exitCode, 2);
    QVERIFY2(QString::fromUtf8(check.err).contains(expected), qPrintable(check.describe()));
    QVERIFY(check.out.isEmpty());
    const QString out = path(u"out.yaml"_s);
    const CliOutcome exported = runCli({u"export"_s, file, u"--format"_s, u"yaml"_s, u"-o"_s, out});
    QCOMPARE(exported.exitCode, 2);
    QVERIFY(!QFile::exists(out));
}

// A rule whose target names an item that is gone is not a broken file: by
// DESIGN.md ("unknown targets load and become a finding of check") it loads,
// and check reports unknown-target (exit 1), not bad input.
void TestHostileFiles::ruleToDeletedItemIsAFinding() {
    const QString file = path(u"retargeted.routebook"_s);
    saveSmall(file);
    QCOMPARE(rawExec(file, "UPDATE rule SET target = 'm0_q_removed'"), QString());
    const CliOutcome check = runCli({u"check"_s, file, u"--json"_s});
    QVERIFY2(!check.crashed && !check.timedOut, qPrintable(check.describe()));
    QCOMPARE(check.exitCode, 1);
    QVERIFY2(check.out.contains("\"unknown-target\""), check.out.left(2000).constData());
}

// 10,000 nested parentheses: the condition is a syntax finding (a broken
// condition loads, DESIGN.md), so `check` exits 1 - never a stack overflow.
void TestHostileFiles::deepConditionIsASyntaxFinding() {
    const QString file = path(u"deep-condition.yaml"_s);
    writeFile(file, yamlWithCondition(deepParentheses(10000)));
    const CliOutcome check = runCli({u"check"_s, file, u"--json"_s});
    QVERIFY2(!check.crashed && !check.timedOut, qPrintable(check.describe()));
    QCOMPARE(check.exitCode, 1);
    QVERIFY2(check.out.contains("\"syntax\""), check.out.left(2000).constData());
    QVERIFY2(check.out.contains("nested too deeply"), check.out.left(2000).constData());
}

// A long valid condition must be checked without a crash or hang. 20,000
// characters (about 1,700 alternatives " or a = NNNNN" of ~12 characters)
// compare item a with ~1,700 values, so its variable has over 1,700 cells (a
// fixed 256-cell set once overflowed here and crashed). A 1,000,000-character broken
// condition gives a syntax finding (the parser is linear; checked in process
// below, and loading it is checked here through `export --format yaml`).
void TestHostileFiles::longConditionIsChecked() {
    const QString million = path(u"million.yaml"_s);
    writeFile(million, yamlWithCondition(longCondition(1000000)));
    const CliOutcome loaded = runCli({u"export"_s, million, u"--format"_s, u"yaml"_s});
    QVERIFY2(!loaded.crashed && !loaded.timedOut, qPrintable(loaded.describe()));
    QCOMPARE(loaded.exitCode, 0);
    QVERIFY(loaded.out.size() > 1000000);

    // Broken at the very end ("... or or"): a syntax finding, exit 1.
    const QString broken = path(u"long-broken.yaml"_s);
    writeFile(broken, yamlWithCondition(longCondition(1000000) + u" or or"_s));
    const CliOutcome check = runCli({u"check"_s, broken, u"--json"_s});
    QVERIFY2(!check.crashed && !check.timedOut, qPrintable(check.describe()));
    QCOMPARE(check.exitCode, 1);
    QVERIFY2(check.out.contains("\"syntax\""), check.out.left(2000).constData());

    const QString valid = path(u"long-condition.yaml"_s);
    writeFile(valid, yamlWithCondition(longCondition(20000)));
    for (const QString& command : {u"check"_s, u"gates"_s}) {
        const CliOutcome checked = runCli({command, valid, u"--json"_s});
        QVERIFY2(!checked.crashed && !checked.timedOut, qPrintable(checked.describe()));
        QVERIFY2(checked.exitCode == 0 || checked.exitCode == 1, qPrintable(checked.describe()));
        QVERIFY2(!checked.out.contains("\"syntax\""), checked.out.left(2000).constData());
    }
}

// The parser on its own: depth is refused at its limit with the column of
// the offending parenthesis, length costs linear work (no assertion on time).
void TestHostileFiles::conditionParserLimits() {
    const rb::cond::ParseResult deep = rb::cond::parseCondition(deepParentheses(10000));
    QVERIFY(!deep.ok());
    QVERIFY(deep.error->message.contains(u"nested too deeply"_s));
    // The limit is 200 levels (Parser.cpp kMaxDepth): level 201 is the 201st '('.
    QCOMPARE(deep.error->column, 201);
    const rb::cond::ParseResult notChain =
        rb::cond::parseCondition(u"not "_s.repeated(10000) + u"a = 1"_s);
    QVERIFY(!notChain.ok());
    const QString longText = longCondition(1000000);
    const rb::cond::ParseResult flat = rb::cond::parseCondition(longText);
    QVERIFY(flat.ok());
    // One flat `or` node (about 1,000,000 / 13 = 77,000 alternatives), not a deep chain (which
    // would overflow the stack of every recursive walk over the tree).
    QCOMPARE(flat.expr->kind, rb::cond::Expr::Kind::Or);
    QVERIFY(flat.expr->children.size() > 70000);
    const rb::cond::ParseResult unterminated =
        rb::cond::parseCondition(u"a = \""_s + QString(1000000, u'x'));
    QVERIFY(!unterminated.ok());
    QCOMPARE(unterminated.error->column, 5); // where the text literal opens
}

void TestHostileFiles::yamlInProcess_data() {
    QTest::addColumn<QByteArray>("text");
    QTest::addColumn<QString>("message");
    QTest::addColumn<int>("line");
    // Ten levels of ten aliases: 10^10 nodes if expanded. Refused at the first
    // alias (line 3: l1 is the first to use one).
    QTest::newRow("alias bomb") << yamlAliasBomb(10) << u"aliases are not supported"_s << 3;
    // The nesting limit is 100 (YamlTree.h kMaxNesting); `modules:` opens
    // the second level, so the 99th '[' on line 2 is refused.
    QTest::newRow("10,000 nested flow lists")
        << yamlDeepFlow(10000) << u"nesting deeper than 100 levels"_s << 2;
    QTest::newRow("10,000 nested block lists")
        << yamlDeepBlock(10000) << u"nesting deeper than 100 levels"_s << 0;
    QTest::newRow("random bytes") << pseudoRandomBytes(100000, 5) << u"not valid UTF-8"_s << 1;
    QTest::newRow("NUL bytes") << QByteArray(1000, '\0') << QString() << 0;
    QTest::newRow("10,000 documents")
        << QByteArray("routebook: 1\n---\n").repeated(10000) << u"only one YAML document"_s << 0;
    QTest::newRow("100,000 unclosed quotes")
        << QByteArray("routebook: 1\ninstrument: \"") + QByteArray(100000, '\'')
        << u"malformed YAML"_s << 0;
}

// line 0 = any line (where yaml-cpp reports it depends on its scanner).
void TestHostileFiles::yamlInProcess() {
    QFETCH(QByteArray, text);
    QFETCH(QString, message);
    QFETCH(int, line);
    const rb::LoadResult loaded = rb::loadYamlText(text, u"hostile.yaml"_s);
    QVERIFY(!loaded.ok());
    QVERIFY(!loaded.errors.isEmpty());
    const rb::Diagnostic& first = loaded.errors.first();
    QVERIFY2(!first.message.isEmpty(), "an error without words");
    if (!message.isEmpty())
        QVERIFY2(first.message.contains(message), qPrintable(first.toString()));
    if (line > 0)
        QCOMPARE(first.line, line);
    QCOMPARE(first.file, u"hostile.yaml"_s);
}

// 50 MB: a valid instrument padded with a huge question text must load (or be
// refused with a clear error) within the CLI's memory limit; a 50 MB file
// broken at its start gives exit 2. Both under the address-space limit of
// CliRun.h. (50 MB of well-formed but deeply structured flow YAML parses in
// bounded memory, ~150 MB, but takes minutes on a loaded machine: not here.)
void TestHostileFiles::hugeYamlFile() {
    const QString huge = path(u"huge.yaml"_s);
    writeFile(huge, yamlHuge(50 * 1024 * 1024));
    const CliOutcome check = runCli({u"check"_s, huge});
    QVERIFY2(!check.crashed && !check.timedOut, qPrintable(check.describe()));
    QVERIFY2(check.exitCode == 0 || check.exitCode == 1 ||
                 (check.exitCode == 2 && !check.err.isEmpty()),
             qPrintable(check.describe()));
    QFile::remove(huge);

    const QString garbage = path(u"garbage.yaml"_s);
    // Broken on line 2, then 50 MB of random bytes: refused without reading on.
    writeFile(garbage,
              QByteArray("routebook: 1\nmodules: [}\n") + pseudoRandomBytes(50 * 1024 * 1024, 17));
    const CliOutcome bad = runCli({u"check"_s, garbage});
    QVERIFY2(!bad.crashed && !bad.timedOut, qPrintable(bad.describe()));
    QCOMPARE(bad.exitCode, 2);
    QVERIFY(bad.err.contains("garbage.yaml:"));
    QFile::remove(garbage);
}

// Opening a hostile file must not change it (only an interrupted save of our
// own is ever repaired on open).
void TestHostileFiles::loadingHostileFileWritesNothing() {
    for (const ProjectCase& c : kProjectCases) {
        const QString file = freshFile(m_dir, c.name);
        makeCase(c, file);
        if (QFileInfo(file).isDir())
            continue;
        const QByteArray before = readFile(file);
        QVERIFY(!rb::loadProjectFile(file).ok());
        QVERIFY2(readFile(file) == before, c.name);
        QVERIFY2(!QFile::exists(file + u"-journal"_s), c.name);
    }
}

namespace {
struct CsvOutcome {
    int records = 0;
    size_t widest = 0;
    rb::CsvReader::Status last = rb::CsvReader::Status::End;
    rb::Diagnostic error;
};

CsvOutcome readAllCsv(QByteArray bytes) {
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::ReadOnly);
    rb::CsvReader reader(buffer, u"hostile.csv"_s);
    CsvOutcome outcome;
    while ((outcome.last = reader.next()) == rb::CsvReader::Status::Record) {
        ++outcome.records;
        outcome.widest = qMax(outcome.widest, reader.fields().size());
    }
    outcome.error = reader.error();
    return outcome;
}
} // namespace

// The CSV reader's guards (CsvReader.h: one record at most 4 MiB by default).
void TestHostileFiles::csvReaderLimits() {
    // A 6 MiB record: refused by the guard on line 2, not read into memory whole.
    const CsvOutcome longLine = readAllCsv("a,b\n" + QByteArray(6 << 20, 'x') + ",1\n");
    QCOMPARE(longLine.last, rb::CsvReader::Status::Error);
    QVERIFY2(longLine.error.message.contains(u"line-length guard"_s),
             qPrintable(longLine.error.message));
    QCOMPARE(longLine.error.line, 2);
    // An opening quote never closed, 10 MiB of text after it: the guard again
    // (the reader cannot know the quote is unterminated before the end).
    const CsvOutcome open = readAllCsv("a\n\"" + QByteArray(10 << 20, 'y'));
    QCOMPARE(open.last, rb::CsvReader::Status::Error);
    QVERIFY2(!open.error.message.isEmpty(), "no message");
    // Unterminated quote in a small file: "unterminated quoted field" at the quote.
    const CsvOutcome small = readAllCsv("a,b\n1,\"abc\n2,3\n");
    QCOMPARE(small.last, rb::CsvReader::Status::Error);
    QVERIFY(small.error.message.contains(u"unterminated quoted field"_s));
    QCOMPARE(small.error.line, 2);
    QCOMPARE(small.error.column, 3);
    // 1,000,000 commas on one line are 1,000,001 empty fields (RFC 4180: fields
    // are separated by commas), under the guard (1 MB < 4 MiB).
    const CsvOutcome wide = readAllCsv(QByteArray(1000000, ',') + "\n");
    QCOMPARE(wide.last, rb::CsvReader::Status::End);
    QCOMPARE(wide.records, 1);
    QCOMPARE(wide.widest, size_t(1000001));
    // NUL bytes and random bytes: either records or a positioned error, never a crash.
    const CsvOutcome random = readAllCsv(pseudoRandomBytes(1 << 20, 13));
    QVERIFY(random.last != rb::CsvReader::Status::Record);
    if (random.last == rb::CsvReader::Status::Error)
        QVERIFY(random.error.line >= 1);
}
