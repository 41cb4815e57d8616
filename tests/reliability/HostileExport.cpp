#include "HostileExport.h"

#include "CliRun.h"
#include "storage/InstrumentFile.h"
#include "storage/ProjectFile.h"
#include "storage/YamlFormat.h"

#include <QFile>
#include <QProcess>
#include <QRegularExpression>
#include <QStandardPaths>
#include <QTest>
#include <QXmlStreamReader>

#include <sqlite3.h>

using namespace Qt::StringLiterals;
using namespace reliability;

namespace {

// Strings that break naive exporters. Each is a classic of its kind:
// HTML/XML injection, attribute breakout, CDATA/comment terminators, SQL and
// CSV quoting, C0/C1 control characters, bidirectional overrides, and size.
QString markup() {
    return u"<script>alert('rb')</script><img src=x onerror=alert(1)>"
           u"<a href=\"javascript:alert(2)\">x</a><svg onload=alert(3)>"_s;
}
QString quotes() {
    return u"\"double\" 'single' `back` &amp; &lt; &#60; ]]> --> <!-- \\ \\\" "
           u"'); CREATE TABLE pwned (x); -- \"; DROP TABLE item; --"_s;
}
QString controls() {
    QString s = u"bell"_s + QChar(0x07) + u" esc"_s + QChar(0x1b) + u"[31m tab\t cr\r lf\n"_s +
                u" vt"_s + QChar(0x0b) + u" ff"_s + QChar(0x0c) + u" del"_s + QChar(0x7f) +
                u" nel"_s + QChar(0x85) + u" ls"_s + QChar(0x2028);
    return s;
}
QString rtl() {
    return QString(QChar(0x202E)) + u"evil.exe"_s + QChar(0x202C) + u" "_s + QChar(0x200F) +
           QString::fromUtf8("\u05d2\u05d9\u05e0\u05d4") + QChar(0x2066) + u"iso"_s +
           QChar(0x2069) + QChar(0x200D) + QChar(0xFEFF) +
           QString::fromUtf8("\xf0\x9f\x8c\xb1"); // a seedling, outside the BMP
}
QString huge(int part) {
    return u"Long wording %1 <b>bold?</b> & more. "_s.arg(part).repeated(5000); // ~190 KB
}
QString hostile(int part) {
    return markup() + quotes() + controls() + rtl() + u" #%1"_s.arg(part);
}

rb::Instrument hostileInstrument() {
    rb::Instrument in;
    in.title = hostile(1);
    in.version = hostile(2);
    in.language = u"en"_s;
    in.settings.legitimateSkipCode = u"-1"_s;
    rb::CodeList list;
    list.name = u"answers"_s;
    list.codes = {{1, hostile(3), rb::MissingKind::None},
                  {2, huge(4), rb::MissingKind::None},
                  {9, hostile(5), rb::MissingKind::Refused}};
    in.codeLists.append(list);
    rb::Module module;
    module.name = u"garden"_s;
    module.title = hostile(6) + huge(7);
    rb::Item gate;
    gate.name = u"has_pond"_s;
    gate.label = hostile(8);
    gate.text = hostile(9) + huge(10);
    gate.instruction = hostile(11);
    gate.type = rb::ItemType::Single;
    gate.codeListName = u"answers"_s;
    gate.notes = hostile(12);
    gate.routing.append({u"has_pond = 2"_s, u"END"_s});
    rb::Item depth;
    depth.name = u"pond_depth"_s;
    depth.label = huge(13);
    depth.text = hostile(14);
    depth.type = rb::ItemType::Integer;
    depth.range = std::make_pair(rb::RangeBound{u"0"_s, 0}, rb::RangeBound{u"500"_s, 500});
    depth.askIf = u"has_pond = 1"_s;
    depth.whenSkipped = rb::WhenSkipped{u"0"_s, false, u"has_pond = 2"_s};
    rb::Item name;
    name.name = u"pond_name"_s;
    name.label = hostile(15);
    name.text = hostile(16);
    name.type = rb::ItemType::Text;
    // A text literal full of markup inside a valid condition.
    name.askIf = u"has_pond = 1 and not (has_pond = \"<script>alert(4)</script>\")"_s;
    rb::Item inlineCodes;
    inlineCodes.name = u"fish_kinds"_s;
    inlineCodes.label = hostile(17);
    inlineCodes.text = hostile(18);
    inlineCodes.type = rb::ItemType::Multi;
    inlineCodes.hasInlineCodes = true;
    inlineCodes.inlineCodes = {{1, hostile(19), rb::MissingKind::None},
                               {2, hostile(20), rb::MissingKind::None}};
    inlineCodes.askIf = u"has_pond = 1"_s;
    // A name that is itself markup: an invalid-name finding, but it loads and
    // every exporter must still escape it.
    rb::Item badName;
    badName.name = u"x<script>y"_s;
    badName.label = hostile(21);
    badName.text = hostile(22);
    badName.type = rb::ItemType::Statement;
    module.items = {gate, depth, name, inlineCodes, badName};
    in.modules.append(module);
    return in;
}

// Element and attribute names that run code or load content when a browser
// renders HTML/SVG/XML.
bool activeElement(QStringView name) {
    static const QStringList active = {u"script"_s, u"iframe"_s,        u"object"_s,    u"embed"_s,
                                       u"img"_s,    u"foreignObject"_s, u"svg:script"_s};
    return active.contains(name.toString(), Qt::CaseInsensitive);
}

// Parses XML (SVG, DDI, XHTML) and reports the first problem: not well-formed,
// or an element/attribute from user text that would be active.
QString xmlProblem(const QByteArray& bytes, bool htmlElementsAllowed) {
    QXmlStreamReader xml(bytes);
    while (!xml.atEnd()) {
        xml.readNext();
        if (!xml.isStartElement())
            continue;
        const QStringView name = xml.name();
        if (activeElement(name) && !(htmlElementsAllowed && name == u"img"_s))
            return u"active element <%1> at line %2"_s.arg(name.toString()).arg(xml.lineNumber());
        for (const QXmlStreamAttribute& a : xml.attributes()) {
            if (a.name().startsWith(u"on"_s, Qt::CaseInsensitive))
                return u"event attribute %1 at line %2"_s.arg(a.name().toString())
                    .arg(xml.lineNumber());
            if (a.value().trimmed().startsWith(u"javascript:"_s, Qt::CaseInsensitive))
                return u"javascript: URL at line %1"_s.arg(xml.lineNumber());
        }
    }
    if (xml.hasError())
        return u"not well-formed XML: %1 at line %2, column %3"_s.arg(xml.errorString())
            .arg(xml.lineNumber())
            .arg(xml.columnNumber());
    return {};
}

// xmllint (libxml2) as an independent well-formedness check, when installed.
QString xmllintProblem(const QString& file) {
    const QString tool = QStandardPaths::findExecutable(u"xmllint"_s);
    if (tool.isEmpty())
        return {};
    QProcess p;
    p.start(tool, {u"--noout"_s, u"--huge"_s, file});
    if (!p.waitForFinished(300000) || p.exitCode() != 0)
        return u"xmllint: "_s + QString::fromUtf8(p.readAllStandardError().left(500));
    return {};
}

// Active content in HTML: every real tag (escaped user text has no raw '<')
// is scanned with its attributes. Forbidden: script-like elements, event
// attributes (on...), javascript: URLs, images other than data:image/ ones.
QString activeHtml(const QByteArray& bytes) {
    static const QRegularExpression tag(u"<([A-Za-z][A-Za-z0-9:-]*)([^>]*)>"_s);
    static const QRegularExpression attribute(
        u"([^\\s=/>\"']+)(?:\\s*=\\s*(\"[^\"]*\"|'[^']*'|[^\\s>]+))?"_s);
    const QString text = QString::fromUtf8(bytes);
    for (auto it = tag.globalMatch(text); it.hasNext();) {
        const QRegularExpressionMatch t = it.next();
        const QString name = t.captured(1).toLower();
        if (name == u"script"_s || name == u"iframe"_s || name == u"object"_s ||
            name == u"embed"_s || name == u"foreignobject"_s)
            return u"active element <%1> at offset %2"_s.arg(name).arg(t.capturedStart());
        for (auto at = attribute.globalMatch(t.captured(2)); at.hasNext();) {
            const QRegularExpressionMatch a = at.next();
            const QString attr = a.captured(1).toLower();
            QString value = a.captured(2);
            if (value.startsWith(u'"') || value.startsWith(u'\''))
                value = value.mid(1, value.size() - 2);
            value = value.trimmed().toLower();
            if (attr.startsWith(u"on"_s))
                return u"event attribute %1 in <%2>"_s.arg(attr, name);
            if (value.startsWith(u"javascript:"_s))
                return u"javascript: URL in <%1>"_s.arg(name);
            if (name == u"img"_s && attr == u"src"_s && !value.startsWith(u"data:image/"_s))
                return u"image loaded from '%1'"_s.arg(value.left(80));
        }
    }
    return {};
}

// Markdown renders raw HTML, so outside code (where CommonMark shows text as
// written) no '<' may start a tag.
QString activeMarkdown(const QByteArray& bytes) {
    QString text = QString::fromUtf8(bytes);
    static const QRegularExpression fenced(u"^```.*?^```"_s,
                                           QRegularExpression::MultilineOption |
                                               QRegularExpression::DotMatchesEverythingOption);
    static const QRegularExpression span(u"(`+)[^`].*?\\1"_s,
                                         QRegularExpression::DotMatchesEverythingOption);
    text.remove(fenced);
    text.remove(span);
    // The dictionary's own link targets (ids built from sanitised names, no
    // user text) are the one raw tag Markdown output may hold.
    static const QRegularExpression ownAnchor(u"<a id=\"[A-Za-z0-9_-]+\"></a>"_s);
    text.remove(ownAnchor);
    static const QRegularExpression rawTag(u"<[A-Za-z!/?]"_s);
    const QRegularExpressionMatch m = rawTag.match(text);
    if (!m.hasMatch())
        return {};
    return u"raw markup '%1' in Markdown"_s.arg(text.mid(m.capturedStart(), 40));
}

// C0 control characters other than tab, LF and CR are never well-formed in XML
// 1.0 (not even as &#N; references: XML 1.0, section 2.2 "Characters").
QString rawControlCharacter(const QByteArray& bytes) {
    for (qsizetype i = 0; i < bytes.size(); ++i) {
        const uchar c = uchar(bytes[i]);
        if (c < 0x20 && c != '\t' && c != '\n' && c != '\r')
            return u"raw control character 0x%1 at offset %2"_s.arg(c, 2, 16, QLatin1Char('0'))
                .arg(i);
    }
    return {};
}

// Python's csv module (an independent RFC 4180 reader) in strict mode: every
// record must parse and have as many fields as the header.
QString csvProblem(const QString& file) {
    const QString python = QStandardPaths::findExecutable(u"python3"_s);
    if (python.isEmpty())
        return u"python3 is needed to check CSV"_s;
    const QString script = uR"(
import csv, sys
csv.field_size_limit(sys.maxsize)  # hostile fields are huge on purpose
with open(sys.argv[1], newline='', encoding='utf-8-sig') as f:
    rows = list(csv.reader(f, strict=True))
if not rows: sys.exit('no header')
width = len(rows[0])
for n, r in enumerate(rows, 1):
    if len(r) != width: sys.exit('record %d has %d fields, header has %d' % (n, len(r), width))
)"_s;
    QProcess p;
    p.start(python, {u"-c"_s, script, file});
    if (!p.waitForFinished(300000) || p.exitCode() != 0)
        return u"csv: "_s + QString::fromUtf8(p.readAllStandardError().right(500));
    return {};
}

// The input table the SQL data check reads (SqlExport.h): "responses", one
// text column per variable (multi items: NAME_CODE), identifiers quoted.
QByteArray responsesTable(const rb::Instrument& in) {
    auto quoted = [](const QString& name) {
        return u'"' + QString(name).replace(u'"', u"\"\""_s) + u'"';
    };
    QStringList columns;
    for (const rb::Module& m : in.modules)
        for (const rb::Item& item : m.items) {
            if (item.type == rb::ItemType::Statement)
                continue;
            if (item.type != rb::ItemType::Multi) {
                columns.append(quoted(item.name) + u" TEXT"_s);
                continue;
            }
            for (const rb::Code& c : in.codesOf(item))
                columns.append(quoted(item.name + u'_' + QString::number(c.code)) + u" TEXT"_s);
        }
    return (u"CREATE TABLE responses (%1);"_s.arg(columns.join(u", "_s))).toUtf8();
}

// Runs the SQL script in a fresh in-memory database holding an empty input
// table: it must run, and it must not have run the statement hidden in the
// user text (table `pwned`).
QString sqlProblem(const QByteArray& script, const rb::Instrument& in) {
    sqlite3* db = nullptr;
    sqlite3_open(":memory:", &db);
    char* message = nullptr;
    QString problem;
    if (sqlite3_exec(db, responsesTable(in).constData(), nullptr, nullptr, &message) != SQLITE_OK)
        problem = u"cannot make the input table: "_s + QString::fromUtf8(message ? message : "?");
    sqlite3_free(message);
    message = nullptr;
    if (problem.isEmpty() &&
        sqlite3_exec(db, script.constData(), nullptr, nullptr, &message) != SQLITE_OK)
        problem = u"the SQL does not run: "_s + QString::fromUtf8(message ? message : "?");
    sqlite3_free(message);
    sqlite3_stmt* st = nullptr;
    sqlite3_prepare_v2(db, "SELECT count(*) FROM sqlite_schema WHERE name = 'pwned'", -1, &st,
                       nullptr);
    if (sqlite3_step(st) == SQLITE_ROW && sqlite3_column_int(st, 0) != 0)
        problem = u"user text was executed as SQL (table pwned exists)"_s;
    sqlite3_finalize(st);
    sqlite3_close(db);
    return problem;
}

QString dotProblem(const QString& file) {
    const QString tool = QStandardPaths::findExecutable(u"dot"_s);
    if (tool.isEmpty())
        return {};
    QProcess p;
    p.start(tool, {u"-Tsvg"_s, file});
    if (!p.waitForFinished(300000) || p.exitCode() != 0)
        return u"dot rejects the file: "_s + QString::fromUtf8(p.readAllStandardError().left(500));
    return xmlProblem(p.readAllStandardOutput(), false);
}

} // namespace

void TestHostileExport::initTestCase() {
    QVERIFY(m_dir.isValid());
    m_project = m_dir.filePath(u"hostile.routebook"_s);
    const auto error = rb::saveProjectFile(hostileInstrument(), m_project);
    QVERIFY2(!error, error ? qPrintable(error->toString()) : "");
}

void TestHostileExport::exportFormat_data() {
    QTest::addColumn<QString>("format");
    QTest::addColumn<QString>("source");
    const QString handWritten = QStringLiteral(ROUTEBOOK_TESTDATA_DIR "/hostile/markup.yaml");
    for (const char* f : {"yaml", "dot", "svg", "html", "md", "csv", "ddi", "sql", "pdf"}) {
        const QString format = QString::fromLatin1(f);
        QTest::newRow(qPrintable(format + u"/generated"_s)) << format << m_project;
        QTest::newRow(qPrintable(format + u"/markup.yaml"_s)) << format << handWritten;
    }
}

void TestHostileExport::exportFormat() {
    QFETCH(QString, format);
    QFETCH(QString, source);
    const rb::LoadResult original = rb::loadInstrumentFile(source);
    QVERIFY2(original.ok(), qPrintable(rb::formatDiagnostics(original.errors)));
    const QString out = m_dir.filePath(u"out."_s + format);
    QFile::remove(out);
    const CliOutcome run = runCli({u"export"_s, source, u"--format"_s, format, u"-o"_s, out}, 600);
    QVERIFY2(!run.crashed && !run.timedOut, qPrintable(run.describe()));
    if (run.exitCode == 2 && run.err.contains("--format"))
        QSKIP(qPrintable(u"the CLI does not export %1 yet"_s.arg(format)));
    QVERIFY2(run.exitCode == 0, qPrintable(run.describe()));
    QFile file(out);
    QVERIFY(file.open(QIODevice::ReadOnly));
    const QByteArray bytes = file.readAll();
    QVERIFY(!bytes.isEmpty());
    QString problem;
    if (format == u"yaml"_s) {
        const rb::LoadResult back = rb::loadYamlText(bytes, out);
        QVERIFY2(back.ok(), qPrintable(rb::formatDiagnostics(back.errors)));
        QVERIFY2(*back.instrument == *original.instrument, "YAML lost or changed hostile text");
    } else if (format == u"dot"_s) {
        // HTML-like labels (label=<...>) would let markup through to renderers.
        QVERIFY2(!bytes.contains("label=<"), "DOT uses an HTML-like label");
        problem = dotProblem(out);
    } else if (format == u"svg"_s || format == u"ddi"_s) {
        problem = rawControlCharacter(bytes);
        if (problem.isEmpty())
            problem = xmlProblem(bytes, false);
        if (problem.isEmpty())
            problem = xmllintProblem(out);
    } else if (format == u"html"_s) {
        problem = activeHtml(bytes);
        // User text must be there, as text: the escaped form of the markup.
        if (problem.isEmpty() && !bytes.contains("&lt;script&gt;"))
            problem = u"the escaped user text is missing"_s;
    } else if (format == u"md"_s) {
        problem = activeMarkdown(bytes);
    } else if (format == u"csv"_s) {
        problem = csvProblem(out);
    } else if (format == u"sql"_s) {
        problem = sqlProblem(bytes, *original.instrument);
    } else if (format == u"pdf"_s) {
        if (!bytes.startsWith("%PDF-") || !bytes.contains("%%EOF"))
            problem = u"not a PDF file"_s;
        // PDF actions that run code or programs (ISO 32000-1, 12.6.4).
        for (const char* action : {"/JavaScript", "/JS ", "/Launch"})
            if (bytes.contains(action))
                problem = u"PDF holds the action %1"_s.arg(QString::fromLatin1(action));
    }
    QVERIFY2(problem.isEmpty(), qPrintable(problem));
}

// The YAML file format itself: hostile text survives save and load exactly.
void TestHostileExport::yamlFileRoundTrip() {
    const QString path = m_dir.filePath(u"hostile.yaml"_s);
    const auto error = rb::saveYamlFile(hostileInstrument(), path);
    QVERIFY2(!error, error ? qPrintable(error->toString()) : "");
    const rb::LoadResult back = rb::loadYamlFile(path);
    QVERIFY2(back.ok(), qPrintable(rb::formatDiagnostics(back.errors)));
    QVERIFY(*back.instrument == hostileInstrument());
}
