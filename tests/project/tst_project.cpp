// Tests of the SQLite project file (.routebook): lossless round trips, refusal
// of files that are not ours, read-only loading, one-transaction saves and
// recovery from an interrupted save.
#include "ProjectLockTests.h"
#include "ProjectTestTools.h"

#include "storage/ProjectFile.h"
#include "storage/SqliteDatabase.h"
#include "storage/SqliteStatement.h"
#include "storage/SqliteTransaction.h"
#include "storage/YamlFormat.h"

#include <QDir>
#include <QFile>
#include <QRandomGenerator>
#include <QTemporaryDir>
#include <QtTest>

#include <sqlite3.h>

using namespace Qt::StringLiterals;
using namespace projecttest;

namespace {

// Ways to spoil a file for the load-error rows.
enum class Spoil {
    RandomBytes,
    EmptyFile,
    ShortText,
    Truncated,
    ForeignSqlite,
    ForeignWithOurTableNames,
    NewerVersion,
    TwoVersionRows,
    WrongFormatMark,
    DanglingCodeList,
    DanglingModule,
    UnknownType,
    UnknownMissingKind,
    WrongColumnType,
    HalfARange,
    NoInstrumentRow,
};

// An instrument whose item `works` uses the shared list yes_no, spelled exactly.
rb::Instrument sharedListInstrument() {
    rb::Instrument in = minimalInstrument();
    in.codeLists.append({u"yes_no"_s, {{1, u"Yes"_s, {}}, {2, u"No"_s, {}}}});
    rb::Item works;
    works.name = u"works"_s;
    works.text = u"Do you work?"_s;
    works.codeListName = u"yes_no"_s;
    in.modules.first().items.append(works);
    return in;
}

QByteArray randomBytes(int size) {
    QRandomGenerator generator(20240611); // fixed seed: the same bytes every run
    QByteArray bytes(size, Qt::Uninitialized);
    for (char& byte : bytes)
        byte = char(generator.bounded(256));
    return bytes;
}

} // namespace

Q_DECLARE_METATYPE(Spoil)

class TestProject : public QObject {
    Q_OBJECT

private:
    QString save(const rb::Instrument& instrument, const QString& name = u"p.routebook"_s) {
        const QString path = m_dir->filePath(name);
        const auto error = rb::saveProjectFile(instrument, path);
        if (error)
            qWarning("%s", qPrintable(error->toString()));
        return error ? QString() : path;
    }
    void spoil(Spoil how, const QString& path);

    std::unique_ptr<QTemporaryDir> m_dir;

private slots:
    void init() {
        m_dir = std::make_unique<QTemporaryDir>();
        QVERIFY(m_dir->isValid());
    }

    void roundTrip_data();
    void roundTrip();
    void optionalsStayDistinct();
    void codeListIsReferencedById();
    void sampleYamlRoundTrip_data();
    void sampleYamlRoundTrip();
    void loadErrors_data();
    void loadErrors();
    void loadMissingFileCreatesNothing();
    void loadLeavesFileUntouched();
    void saveRefuses_data();
    void saveRefuses();
    void saveOverEmptyFile();
    void saveTwiceSecondWins();
    void failedSaveKeepsOldContent();
    void failedSaveToNewPathLeavesNoFile();
    void fileCarriesOurMarks();
    void foreignKeysOnEveryConnection();
    void interruptedSaveOpensAsOldVersion();
    void transactionRollsBackUnlessCommitted();
    void statementKeepsNullAndEmptyApart();
    void statementFailureSticks();
};

void TestProject::roundTrip_data() {
    QTest::addColumn<rb::Instrument>("instrument");
    QTest::newRow("default-constructed") << rb::Instrument{};
    QTest::newRow("minimal") << minimalInstrument();
    QTest::newRow("every field") << fullInstrument();
    QTest::newRow("shared list") << sharedListInstrument();
    QTest::newRow("300 items") << bigInstrument(300);
}

// The expected value is the hand-built input itself: nothing is derived from
// the program's output.
void TestProject::roundTrip() {
    QFETCH(rb::Instrument, instrument);
    const QString path = save(instrument);
    QVERIFY(!path.isEmpty());
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY2(loaded.ok(), qPrintable(rb::formatDiagnostics(loaded.errors)));
    QVERIFY2(*loaded.instrument == instrument,
             qPrintable(u"first difference: "_s + firstDifference(*loaded.instrument, instrument)));
}

// The same facts as the round trip, spelled out, so that a change which made
// both sides of the comparison lose the distinction would still be caught.
void TestProject::optionalsStayDistinct() {
    const rb::LoadResult loaded = rb::loadProjectFile(save(fullInstrument()));
    QVERIFY(loaded.ok());
    const rb::Instrument& in = *loaded.instrument;
    QVERIFY(in.modules.at(0).askIf.has_value());
    QCOMPARE(*in.modules.at(0).askIf, QString());
    QVERIFY(!in.modules.at(1).askIf.has_value());
    const rb::Item& first = in.modules.at(0).items.at(0);
    QCOMPARE(first.codeListName, u"YES_NO"_s); // the item's own spelling
    QVERIFY(first.routing.at(1).condition.has_value());
    QVERIFY(!first.routing.at(2).condition.has_value());
    const rb::Item& modes = in.modules.at(0).items.at(2);
    QVERIFY(modes.whenSkipped && modes.whenSkipped->condition.has_value());
    QVERIFY(!in.modules.at(0).items.at(3).whenSkipped->condition.has_value());
    QVERIFY(!in.modules.at(0).items.at(0).whenSkipped.has_value());
    QCOMPARE(in.codeLists.at(1).codes.at(0).code, std::numeric_limits<qint64>::max());
    QCOMPARE(in.codeLists.at(1).codes.at(1).code, std::numeric_limits<qint64>::min());
    QCOMPARE(in.modules.at(1).items.at(2).range->second.text, u"007"_s);
}

// An item refers to its shared list by id: renaming the list row (by hand, as
// another tool might) renames what the item refers to.
void TestProject::codeListIsReferencedById() {
    const QString path = save(sharedListInstrument());
    QCOMPARE(rawQuery(path, "SELECT count(*) FROM item WHERE code_list_id ="
                            " (SELECT id FROM code_list WHERE name = 'yes_no')"),
             u"1"_s);
    QCOMPARE(rawExec(path, "UPDATE code_list SET name = 'agree' WHERE name = 'yes_no'"), QString());
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY(loaded.ok());
    QCOMPARE(loaded.instrument->modules.at(0).items.at(1).codeListName, u"agree"_s);
}

static QStringList sampleFiles() {
    QDir dir(QStringLiteral(ROUTEBOOK_SAMPLES_DIR));
    QStringList files;
    for (const QString& name : dir.entryList({u"*.yaml"_s}, QDir::Files, QDir::Name))
        files.append(dir.filePath(name));
    return files;
}

void TestProject::sampleYamlRoundTrip_data() {
    QTest::addColumn<QString>("file");
    const QStringList files = sampleFiles();
    for (const QString& file : files)
        QTest::newRow(qPrintable(QFileInfo(file).fileName())) << file;
    if (files.isEmpty()) // a row that fails, so an empty folder cannot pass
        QTest::newRow("no samples") << QString();
}

// YAML -> project -> YAML gives the sample's bytes: samples are stored in
// canonical form (DESIGN.md "YAML text format"), and the project is lossless.
void TestProject::sampleYamlRoundTrip() {
    QFETCH(QString, file);
    QVERIFY2(!file.isEmpty(), "no sample_projects/*.yaml found");
    const rb::LoadResult yaml = rb::loadYamlFile(file);
    QVERIFY2(yaml.ok(), qPrintable(rb::formatDiagnostics(yaml.errors)));
    const QString path = save(*yaml.instrument);
    QVERIFY(!path.isEmpty());
    const rb::LoadResult project = rb::loadProjectFile(path);
    QVERIFY2(project.ok(), qPrintable(rb::formatDiagnostics(project.errors)));
    QVERIFY2(*project.instrument == *yaml.instrument,
             qPrintable(firstDifference(*project.instrument, *yaml.instrument)));
    QCOMPARE(rb::saveYamlText(*project.instrument), readBytes(file));
}

void TestProject::spoil(Spoil how, const QString& path) {
    auto expectOk = [](const QString& error) { QCOMPARE(error, QString()); };
    switch (how) {
    case Spoil::RandomBytes:
        writeBytes(path, randomBytes(8192));
        break;
    case Spoil::EmptyFile:
        writeBytes(path, {});
        break;
    case Spoil::ShortText:
        writeBytes(path, "routebook: 1\n");
        break;
    case Spoil::Truncated: {
        QVERIFY(!save(bigInstrument(300)).isEmpty());
        const QByteArray whole = readBytes(path);
        QVERIFY(whole.size() > 8 * 4096); // many pages, so half loses real data
        writeBytes(path, whole.left(whole.size() / 2));
        break;
    }
    case Spoil::ForeignSqlite:
        expectOk(rawExec(path, "CREATE TABLE seed (name TEXT, sown DATE);"
                               "INSERT INTO seed VALUES ('kale', '2024-03-01');"));
        break;
    case Spoil::ForeignWithOurTableNames:
        // Our table names but none of our marks: still somebody else's file.
        expectOk(rawExec(path, "CREATE TABLE routebook_schema (version INTEGER);"
                               "INSERT INTO routebook_schema VALUES (1);"
                               "CREATE TABLE item (id INTEGER PRIMARY KEY, name TEXT);"));
        break;
    case Spoil::NewerVersion:
        QVERIFY(!save(minimalInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE routebook_schema SET version = 7"));
        break;
    case Spoil::TwoVersionRows:
        QVERIFY(!save(minimalInstrument()).isEmpty());
        expectOk(rawExec(path, "INSERT INTO routebook_schema VALUES (1)"));
        break;
    case Spoil::WrongFormatMark:
        QVERIFY(!save(minimalInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE routebook_meta SET value = 'recipes' WHERE key = 'format'"));
        break;
    case Spoil::DanglingCodeList:
        QVERIFY(!save(sharedListInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE item SET code_list_id = 99 WHERE name = 'works'"));
        break;
    case Spoil::DanglingModule:
        QVERIFY(!save(sharedListInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE item SET module_id = 42 WHERE name = 'works'"));
        break;
    case Spoil::UnknownType:
        QVERIFY(!save(sharedListInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE item SET type = 'slider' WHERE name = 'works'"));
        break;
    case Spoil::UnknownMissingKind:
        QVERIFY(!save(sharedListInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE code SET missing = 'maybe' WHERE code = 2"));
        break;
    case Spoil::WrongColumnType:
        QVERIFY(!save(sharedListInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE code SET code = 'two' WHERE code = 2"));
        break;
    case Spoil::HalfARange:
        QVERIFY(!save(fullInstrument()).isEmpty());
        expectOk(rawExec(path, "UPDATE item SET range_max_text = NULL WHERE name = 'beds'"));
        break;
    case Spoil::NoInstrumentRow:
        QVERIFY(!save(minimalInstrument()).isEmpty());
        expectOk(rawExec(path, "DELETE FROM instrument"));
        break;
    }
}

void TestProject::loadErrors_data() {
    QTest::addColumn<Spoil>("how");
    // %1 is the file's path. The wording is the contract of the task brief.
    QTest::addColumn<QString>("message");
    const QString notSqlite = u"%1 is not a Routebook project (not an SQLite database)"_s;
    const QString foreign = u"%1 is an SQLite database but not a Routebook project"_s;
    const QString damaged = u"%1 is a damaged Routebook project: "_s;
    QTest::newRow("random bytes") << Spoil::RandomBytes << notSqlite;
    QTest::newRow("empty file") << Spoil::EmptyFile
                                << u"%1 is not a Routebook project (the file is empty)"_s;
    QTest::newRow("short text") << Spoil::ShortText << notSqlite;
    // Cut in half, the B-tree points at pages past the end of the file; the
    // exact words come from SQLite, so only our prefix is checked.
    QTest::newRow("truncated") << Spoil::Truncated << damaged + u"*"_s;
    QTest::newRow("foreign sqlite") << Spoil::ForeignSqlite << foreign;
    QTest::newRow("foreign, our table names") << Spoil::ForeignWithOurTableNames << foreign;
    QTest::newRow("newer version")
        << Spoil::NewerVersion
        << u"%1 was written by a newer Routebook (schema version 7; this build reads up to 1)"_s;
    QTest::newRow("two version rows")
        << Spoil::TwoVersionRows
        << damaged + u"routebook_schema must hold exactly one row, not 2"_s;
    QTest::newRow("wrong format mark") << Spoil::WrongFormatMark << foreign;
    // Item `works` is the second item written, so its rowid is 2.
    QTest::newRow("dangling code list")
        << Spoil::DanglingCodeList
        << damaged + u"a row of table item (rowid 2) refers to a row of table code_list that "
                     "does not exist"_s;
    QTest::newRow("dangling module")
        << Spoil::DanglingModule
        << damaged + u"a row of table item (rowid 2) refers to a row of table module that does "
                     "not exist"_s;
    QTest::newRow("unknown type") << Spoil::UnknownType
                                  << damaged + u"item 'works' has an unknown type 'slider'"_s;
    QTest::newRow("unknown missing kind")
        << Spoil::UnknownMissingKind
        << damaged + u"table code, column missing holds an unknown missing kind 'maybe'"_s;
    QTest::newRow("text in an integer column")
        << Spoil::WrongColumnType << damaged + u"table code, column code must hold an integer"_s;
    QTest::newRow("half a range")
        << Spoil::HalfARange
        << damaged + u"table item, column range_max_text is NULL, but the other bound is not"_s;
    QTest::newRow("no instrument row")
        << Spoil::NoInstrumentRow
        << damaged + u"table instrument must hold exactly one row, not 0"_s;
}

// Each: a clear message naming the file, nothing loaded, the file unchanged
// (bytes and modification time) and no file created beside it.
void TestProject::loadErrors() {
    QFETCH(Spoil, how);
    QFETCH(QString, message);
    const QString path = m_dir->filePath(u"p.routebook"_s);
    spoil(how, path);
    if (QTest::currentTestFailed())
        return;
    const QByteArray before = readBytes(path);
    const QDateTime mtime = modified(path);
    const QStringList files = filesIn(m_dir->path());

    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY(!loaded.ok());
    QCOMPARE(loaded.errors.size(), 1);
    QCOMPARE(loaded.errors.first().file, path);
    const QString expected = message.arg(path);
    if (expected.endsWith(u'*'))
        QVERIFY2(loaded.errors.first().message.startsWith(expected.chopped(1)),
                 qPrintable(loaded.errors.first().message));
    else
        QCOMPARE(loaded.errors.first().message, expected);
    QCOMPARE(readBytes(path), before);
    QCOMPARE(modified(path), mtime);
    QCOMPARE(filesIn(m_dir->path()), files);
}

void TestProject::loadMissingFileCreatesNothing() {
    const QString path = m_dir->filePath(u"absent.routebook"_s);
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY(!loaded.ok());
    QCOMPARE(loaded.errors.first().message, u"%1 does not exist"_s.arg(path));
    QVERIFY(filesIn(m_dir->path()).isEmpty());
}

void TestProject::loadLeavesFileUntouched() {
    const QString path = save(fullInstrument());
    const QByteArray before = readBytes(path);
    const QDateTime mtime = modified(path);
    QCOMPARE(filesIn(m_dir->path()), QStringList{u"p.routebook"_s});
    QVERIFY(rb::loadProjectFile(path).ok());
    QCOMPARE(readBytes(path), before);
    QCOMPARE(modified(path), mtime);
    QCOMPARE(filesIn(m_dir->path()), QStringList{u"p.routebook"_s});
}

void TestProject::saveRefuses_data() {
    QTest::addColumn<Spoil>("how");
    QTest::addColumn<QString>("message");
    const QString unchanged = u"; it was left unchanged"_s;
    QTest::newRow("random bytes") << Spoil::RandomBytes
                                  << u"%1 is not a Routebook project (not an SQLite database)"_s +
                                         unchanged;
    QTest::newRow("short text") << Spoil::ShortText
                                << u"%1 is not a Routebook project (not an SQLite database)"_s +
                                       unchanged;
    QTest::newRow("foreign sqlite")
        << Spoil::ForeignSqlite
        << u"%1 is an SQLite database but not a Routebook project"_s + unchanged;
    QTest::newRow("newer version")
        << Spoil::NewerVersion
        << u"%1 was written by a newer Routebook (schema version 7; this build reads up to 1)"_s +
               unchanged;
}

void TestProject::saveRefuses() {
    QFETCH(Spoil, how);
    QFETCH(QString, message);
    const QString path = m_dir->filePath(u"p.routebook"_s);
    spoil(how, path);
    if (QTest::currentTestFailed())
        return;
    const QByteArray before = readBytes(path);
    const QDateTime mtime = modified(path);
    const QStringList files = filesIn(m_dir->path());

    const auto error = rb::saveProjectFile(fullInstrument(), path);
    QVERIFY(error.has_value());
    QCOMPARE(error->message, message.arg(path));
    QCOMPARE(readBytes(path), before);
    QCOMPARE(modified(path), mtime);
    QCOMPARE(filesIn(m_dir->path()), files);
}

// A 0-byte file (e.g. made by `touch`) counts as new.
void TestProject::saveOverEmptyFile() {
    const QString path = m_dir->filePath(u"p.routebook"_s);
    writeBytes(path, {});
    QVERIFY(!save(minimalInstrument()).isEmpty());
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY(loaded.ok());
    QVERIFY(*loaded.instrument == minimalInstrument());
}

void TestProject::saveTwiceSecondWins() {
    const QString path = save(fullInstrument());
    QVERIFY(!path.isEmpty());
    QVERIFY(!save(minimalInstrument()).isEmpty());
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY(loaded.ok());
    QVERIFY2(*loaded.instrument == minimalInstrument(),
             qPrintable(firstDifference(*loaded.instrument, minimalInstrument())));
    // No stale rows: the minimal instrument has 1 item, 0 rules, 0 code lists,
    // 0 test respondents; the full one had 7 items, 3 rules, 3 lists, 2 respondents.
    QCOMPARE(rawQuery(path, "SELECT count(*) FROM item"), u"1"_s);
    QCOMPARE(rawQuery(path, "SELECT count(*) FROM rule"), u"0"_s);
    QCOMPARE(rawQuery(path, "SELECT count(*) FROM code"), u"0"_s);
    QCOMPARE(rawQuery(path, "SELECT count(*) FROM test_answer"), u"0"_s);
    QCOMPARE(rawQuery(path, "SELECT count(*) FROM routebook_schema"), u"1"_s);
}

// An item that names a code list the instrument lacks fails late in the save,
// after rows were already deleted and written: the rollback restores the old.
void TestProject::failedSaveKeepsOldContent() {
    const QString path = save(fullInstrument());
    const QByteArray before = readBytes(path);
    rb::Instrument broken = sharedListInstrument();
    broken.modules.first().items.last().codeListName = u"nope"_s;
    const auto error = rb::saveProjectFile(broken, path);
    QVERIFY(error.has_value());
    QCOMPARE(error->message,
             u"cannot save %1: cannot save item 'works': it names code list 'nope', which the "
             "instrument does not have"_s.arg(path));
    QCOMPARE(readBytes(path), before);
    const rb::LoadResult loaded = rb::loadProjectFile(path);
    QVERIFY(loaded.ok());
    QVERIFY(*loaded.instrument == fullInstrument());
    QCOMPARE(filesIn(m_dir->path()), QStringList{u"p.routebook"_s}); // no journal left
}

void TestProject::failedSaveToNewPathLeavesNoFile() {
    rb::Instrument broken = sharedListInstrument();
    broken.modules.first().items.last().codeListName = u"nope"_s;
    QVERIFY(rb::saveProjectFile(broken, m_dir->filePath(u"new.routebook"_s)).has_value());
    QVERIFY(filesIn(m_dir->path()).isEmpty());
}

// Checked in the raw bytes against SQLite's "Database File Format" document
// (sqlite.org/fileformat2.html, section 1.3, from memory): offset 68 holds the
// application id, big-endian; offsets 18 and 19 hold 1 for a rollback-journal
// database and 2 for WAL.
void TestProject::fileCarriesOurMarks() {
    const QString path = save(minimalInstrument());
    const QByteArray bytes = readBytes(path);
    QVERIFY(bytes.size() >= 100);
    QCOMPARE(bytes.mid(68, 4), QByteArray("RtBk"));
    QCOMPARE(int(bytes.at(18)), 1);
    QCOMPARE(int(bytes.at(19)), 1);
    QCOMPARE(rawQuery(path, "SELECT value FROM routebook_meta WHERE key = 'format'"),
             u"routebook-project"_s);
    QCOMPARE(rawQuery(path, "SELECT version FROM routebook_schema"), u"1"_s);
    QCOMPARE(filesIn(m_dir->path()), QStringList{u"p.routebook"_s}); // no -journal/-wal/-shm
}

void TestProject::foreignKeysOnEveryConnection() {
    const QString path = save(sharedListInstrument());
    for (auto mode : {rb::SqliteDatabase::Mode::ReadOnly, rb::SqliteDatabase::Mode::ReadWrite}) {
        rb::SqliteDatabase db;
        QVERIFY(!db.open(path, mode).has_value());
        rb::SqliteStatement pragma(db, "PRAGMA foreign_keys");
        QCOMPARE(pragma.step(), rb::SqliteStatement::Step::Row);
        QCOMPARE(pragma.columnInt64(0), qint64(1));
    }
    // And it is enforced: deleting a code list an item refers to fails.
    rb::SqliteDatabase db;
    QVERIFY(!db.open(path, rb::SqliteDatabase::Mode::ReadWrite).has_value());
    const auto error = db.exec("DELETE FROM code_list");
    QVERIFY(error.has_value());
    QVERIFY2(error->contains(u"FOREIGN KEY"_s), qPrintable(*error));
}

// A crash in the middle of a save. A writer changes many pages with a tiny page
// cache, so SQLite must write changed pages into the file before COMMIT (after
// saving their old content in the journal). The file and its journal are copied
// at that moment - the state a power cut would leave - and the copy must load
// as the old version, byte for byte.
void TestProject::interruptedSaveOpensAsOldVersion() {
    const rb::Instrument old = bigInstrument(300);
    const QString path = save(old);
    QVERIFY(!path.isEmpty());
    const QByteArray oldBytes = readBytes(path);
    QVERIFY(QDir(m_dir->path()).mkdir(u"crash"_s));
    const QString crashed = m_dir->filePath(u"crash/p.routebook"_s);

    sqlite3* writer = nullptr;
    QCOMPARE(sqlite3_open_v2(QFile::encodeName(path).constData(), &writer, SQLITE_OPEN_READWRITE,
                             nullptr),
             SQLITE_OK);
    QCOMPARE(sqlite3_exec(writer,
                          "PRAGMA cache_size = 10; BEGIN IMMEDIATE;"
                          " UPDATE item SET text = replace(text, 'a', 'b'); DELETE FROM rule;",
                          nullptr, nullptr, nullptr),
             SQLITE_OK);
    const bool copied =
        QFile::copy(path, crashed) && QFile::copy(path + u"-journal"_s, crashed + u"-journal"_s);
    sqlite3_exec(writer, "ROLLBACK", nullptr, nullptr, nullptr);
    sqlite3_close(writer);
    QVERIFY(copied);
    // Without changed pages in the copy this test would prove nothing.
    QVERIFY2(readBytes(crashed) != oldBytes, "the writer did not spill pages before COMMIT");

    const rb::LoadResult loaded = rb::loadProjectFile(crashed);
    QVERIFY2(loaded.ok(), qPrintable(rb::formatDiagnostics(loaded.errors)));
    QVERIFY2(*loaded.instrument == old, qPrintable(firstDifference(*loaded.instrument, old)));
    QCOMPARE(readBytes(crashed), oldBytes);
    QCOMPARE(filesIn(m_dir->filePath(u"crash"_s)), QStringList{u"p.routebook"_s});
    QVERIFY(rb::loadProjectFile(path).ok()); // the original, rolled back normally
}

void TestProject::transactionRollsBackUnlessCommitted() {
    rb::SqliteDatabase db;
    QVERIFY(!db.open(m_dir->filePath(u"t.db"_s), rb::SqliteDatabase::Mode::ReadWrite));
    QVERIFY(!db.exec("CREATE TABLE t (x INTEGER)"));
    auto count = [&] {
        rb::SqliteStatement statement(db, "SELECT count(*) FROM t");
        statement.step();
        return statement.columnInt64(0);
    };
    {
        rb::SqliteTransaction transaction(db);
        QVERIFY(!transaction.beginError());
        QVERIFY(!db.exec("INSERT INTO t VALUES (1)"));
        QCOMPARE(count(), 1); // visible inside
    }
    QCOMPARE(count(), 0); // gone: never committed
    {
        rb::SqliteTransaction transaction(db);
        QVERIFY(!db.exec("INSERT INTO t VALUES (1)"));
        QVERIFY(!transaction.commit());
    }
    QCOMPARE(count(), 1);
}

void TestProject::statementKeepsNullAndEmptyApart() {
    rb::SqliteDatabase db;
    QVERIFY(!db.open(m_dir->filePath(u"t.db"_s), rb::SqliteDatabase::Mode::ReadWrite));
    QVERIFY(!db.exec("CREATE TABLE t (ord INTEGER, v TEXT)"));
    rb::SqliteStatement insert(db, "INSERT INTO t VALUES (?1, ?2)");
    const std::optional<QString> values[] = {std::nullopt, QString(), u""_s, u"ß✓"_s};
    for (int i = 0; i < 4; ++i) {
        insert.bind(1, i);
        insert.bind(2, values[i]);
        QVERIFY(insert.run());
        insert.reset();
    }
    // Row 0 is NULL; rows 1 and 2 (a null QString and "") are both empty text.
    QCOMPARE(rawQuery(m_dir->filePath(u"t.db"_s),
                      "SELECT group_concat(ifnull(typeof(v) || ':' || v, 'null'), '|')"
                      " FROM (SELECT v FROM t ORDER BY ord)"),
             u"null|text:|text:|text:ß✓"_s);
}

void TestProject::statementFailureSticks() {
    rb::SqliteDatabase db;
    QVERIFY(!db.open(m_dir->filePath(u"t.db"_s), rb::SqliteDatabase::Mode::ReadWrite));
    rb::SqliteStatement bad(db, "SELECT * FROM no_such_table");
    QVERIFY(!bad.ok());
    QVERIFY2(bad.error().contains(u"no_such_table"_s), qPrintable(bad.error()));
    QCOMPARE(bad.step(), rb::SqliteStatement::Step::Error);
    rb::SqliteStatement outOfRange(db, "SELECT ?1");
    outOfRange.bind(5, qint64(1)); // no parameter 5
    QCOMPARE(outOfRange.step(), rb::SqliteStatement::Step::Error);
}

// Two test classes: the project file (here) and its lock and disk state.
int main(int argc, char** argv) {
    QCoreApplication app(argc, argv);
    TestProject project;
    const int failed = QTest::qExec(&project, argc, argv);
    return failed + runProjectLockTests(argc, argv);
}
#include "tst_project.moc"
