#include "ProjectTestTools.h"

#include <QDir>
#include <QFile>
#include <QFileInfo>

#include <sqlite3.h>

#include <limits>

using namespace Qt::StringLiterals;

namespace projecttest {

namespace {
sqlite3* openRaw(const QString& path) {
    sqlite3* db = nullptr;
    sqlite3_open_v2(QFile::encodeName(path).constData(), &db,
                    SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE, nullptr);
    return db;
}
} // namespace

QString rawExec(const QString& path, const char* sql, bool foreignKeys) {
    sqlite3* db = openRaw(path);
    char* message = nullptr;
    int rc =
        sqlite3_exec(db, foreignKeys ? "PRAGMA foreign_keys = ON" : "PRAGMA foreign_keys = OFF",
                     nullptr, nullptr, &message);
    if (rc == SQLITE_OK)
        rc = sqlite3_exec(db, sql, nullptr, nullptr, &message);
    QString error;
    if (rc != SQLITE_OK)
        error = message ? QString::fromUtf8(message) : u"error %1"_s.arg(rc);
    sqlite3_free(message);
    sqlite3_close(db);
    return error;
}

QString rawQuery(const QString& path, const char* sql) {
    sqlite3* db = openRaw(path);
    sqlite3_stmt* statement = nullptr;
    QString value;
    if (sqlite3_prepare_v2(db, sql, -1, &statement, nullptr) == SQLITE_OK &&
        sqlite3_step(statement) == SQLITE_ROW)
        value = QString::fromUtf8(reinterpret_cast<const char*>(sqlite3_column_text(statement, 0)));
    sqlite3_finalize(statement);
    sqlite3_close(db);
    return value;
}

QByteArray readBytes(const QString& path) {
    QFile file(path);
    if (!file.open(QIODevice::ReadOnly))
        return {};
    return file.readAll();
}

void writeBytes(const QString& path, const QByteArray& bytes) {
    QFile file(path);
    if (file.open(QIODevice::WriteOnly | QIODevice::Truncate))
        file.write(bytes);
}

QDateTime modified(const QString& path) {
    return QFileInfo(path).fileTime(QFileDevice::FileModificationTime);
}

QStringList filesIn(const QString& dir) {
    return QDir(dir).entryList(QDir::Files | QDir::Hidden, QDir::Name);
}

namespace {

// Compares one field and records its path on the first difference.
struct Differ {
    QString first;
    template <typename T> void check(const T& a, const T& b, const QString& path) {
        if (first.isEmpty() && !(a == b))
            first = path;
    }
    template <typename T, typename F>
    void list(const QList<T>& a, const QList<T>& b, const QString& path, F each) {
        check(a.size(), b.size(), path + u".size"_s);
        for (qsizetype i = 0; i < qMin(a.size(), b.size()); ++i)
            each(a.at(i), b.at(i), u"%1[%2]"_s.arg(path).arg(i));
    }
};

void compareItem(Differ& d, const rb::Item& a, const rb::Item& b, const QString& p) {
    d.check(a.name, b.name, p + u".name"_s);
    d.check(a.label, b.label, p + u".label"_s);
    d.check(a.text, b.text, p + u".text"_s);
    d.check(a.instruction, b.instruction, p + u".instruction"_s);
    d.check(a.type, b.type, p + u".type"_s);
    d.check(a.codeListName, b.codeListName, p + u".codeListName"_s);
    d.check(a.inlineCodes, b.inlineCodes, p + u".inlineCodes"_s);
    d.check(a.hasInlineCodes, b.hasInlineCodes, p + u".hasInlineCodes"_s);
    d.check(a.range, b.range, p + u".range"_s);
    d.check(a.missing, b.missing, p + u".missing"_s);
    d.check(a.askIf, b.askIf, p + u".askIf"_s);
    d.check(a.routing, b.routing, p + u".routing"_s);
    d.check(a.whenSkipped, b.whenSkipped, p + u".whenSkipped"_s);
    d.check(a.notes, b.notes, p + u".notes"_s);
    d.check(a, b, p); // catches a field added to Item but not listed above
}

} // namespace

QString firstDifference(const rb::Instrument& a, const rb::Instrument& b) {
    Differ d;
    d.check(a.title, b.title, u"title"_s);
    d.check(a.version, b.version, u"version"_s);
    d.check(a.language, b.language, u"language"_s);
    d.check(a.settings, b.settings, u"settings"_s);
    d.check(a.codeLists, b.codeLists, u"codeLists"_s);
    d.list(a.modules, b.modules, u"modules"_s,
           [&](const rb::Module& x, const rb::Module& y, const QString& p) {
               d.check(x.name, y.name, p + u".name"_s);
               d.check(x.title, y.title, p + u".title"_s);
               d.check(x.askIf, y.askIf, p + u".askIf"_s);
               d.list(x.items, y.items, p + u".items"_s,
                      [&](const rb::Item& i, const rb::Item& j, const QString& q) {
                          compareItem(d, i, j, q);
                      });
           });
    d.check(a.testRespondents, b.testRespondents, u"testRespondents"_s);
    d.check(a, b, u"(instrument)"_s);
    return d.first;
}

rb::Instrument minimalInstrument() {
    rb::Instrument instrument;
    instrument.title = u"Allotment Plot Survey"_s;
    instrument.version = u"1"_s;
    instrument.language = u"en"_s;
    rb::Module module;
    module.name = u"plot"_s;
    rb::Item item;
    item.name = u"plot_size"_s;
    item.text = u"How large is your plot in square metres?"_s;
    item.type = rb::ItemType::Integer;
    module.items.append(item);
    instrument.modules.append(module);
    return instrument;
}

// Every field set, and every optional in both states: absent and present-empty.
rb::Instrument fullInstrument() {
    using rb::Code;
    using rb::MissingKind;
    rb::Instrument in;
    in.title = u"Commuting and Gardening Study — 通勤"_s;
    in.version = u"0.3"_s;
    in.language = u"de-CH"_s;
    in.settings.legitimateSkipCode = u"-1"_s;
    in.codeLists.append({u"yes_no"_s,
                         {{1, u"Yes"_s, MissingKind::None},
                          {2, u"No"_s, MissingKind::None},
                          {8, u"Don't know"_s, MissingKind::DontKnow},
                          {9, u"Refused"_s, MissingKind::Refused}}});
    in.codeLists.append({u"big_codes"_s,
                         {{std::numeric_limits<qint64>::max(), u"max"_s, MissingKind::None},
                          {std::numeric_limits<qint64>::min(), u"min"_s, MissingKind::None},
                          {-7, u"n/a"_s, MissingKind::NotApplicable}}});
    in.codeLists.append({u"empty_list"_s, {}}); // a list with no codes survives

    rb::Module commute;
    commute.name = u"commute"_s;
    commute.title = u"Getting to work"_s;
    commute.askIf = u""_s; // present but empty: must not load as absent

    rb::Item mode;
    mode.name = u"works_outside"_s;
    mode.label = u"Works outside home"_s;
    mode.text = u"Do you travel to a workplace?\nTick one."_s;
    mode.instruction = u"Read all options aloud."_s;
    mode.type = rb::ItemType::Single;
    mode.codeListName = u"YES_NO"_s; // spelled in other case than the list
    mode.routing.append({u"works_outside in (2, 8, 9)"_s, u"garden"_s});
    mode.routing.append({u""_s, u"next"_s}); // empty condition, not absent
    mode.routing.append({std::nullopt, u"END"_s});
    mode.notes = u"emoji 🚲 and a quote \" and ' and NUL-free"_s;
    commute.items.append(mode);

    rb::Item distance;
    distance.name = u"distance_km"_s;
    distance.label = u"One-way distance"_s;
    distance.text = u"How far is it, one way, in kilometres?"_s;
    distance.type = rb::ItemType::Decimal;
    distance.range = std::pair{rb::RangeBound{u"0.5"_s, 0.5}, rb::RangeBound{u"1e3"_s, 1000.0}};
    distance.missing = {{998, u"Don't know"_s, MissingKind::DontKnow},
                        {999, u"Refused"_s, MissingKind::Refused}};
    distance.askIf = u"works_outside = 1"_s;
    distance.whenSkipped = rb::WhenSkipped{u"0"_s, false, u"works_outside = 2"_s};
    commute.items.append(distance);

    rb::Item modes;
    modes.name = u"modes"_s;
    modes.text = u"Which ways of travel do you use?"_s;
    modes.type = rb::ItemType::Multi;
    modes.hasInlineCodes = true;
    modes.inlineCodes = {{1, u"Bicycle"_s, MissingKind::None},
                         {2, u"Train"_s, MissingKind::None},
                         {0, u"Zero code"_s, MissingKind::None}};
    modes.askIf = u""_s;
    modes.whenSkipped = rb::WhenSkipped{u""_s, true, u""_s}; // empty text, empty if
    commute.items.append(modes);

    rb::Item leave;
    leave.name = u"leave_time"_s;
    leave.text = u"When do you usually leave?"_s;
    leave.type = rb::ItemType::Text;
    leave.whenSkipped = rb::WhenSkipped{u"none"_s, true, std::nullopt}; // `if` absent
    commute.items.append(leave);
    in.modules.append(commute);

    rb::Module garden; // no askIf at all
    garden.name = u"garden"_s;
    garden.title = u""_s;
    rb::Item intro;
    intro.name = u"garden_intro"_s;
    intro.text = u"Now some questions about your garden."_s;
    intro.type = rb::ItemType::Statement;
    garden.items.append(intro);
    rb::Item planted;
    planted.name = u"first_planted"_s;
    planted.text = u"When did you first plant?"_s;
    planted.type = rb::ItemType::Date;
    planted.range = std::pair{rb::RangeBound{u""_s, 0.0}, rb::RangeBound{u"-0"_s, -0.0}};
    garden.items.append(planted);
    rb::Item beds;
    beds.name = u"beds"_s;
    beds.text = u"How many beds?"_s;
    beds.type = rb::ItemType::Integer;
    beds.range = std::pair{rb::RangeBound{u"-5"_s, -5.0}, rb::RangeBound{u"007"_s, 7.0}};
    beds.codeListName = u"big_codes"_s;
    beds.hasInlineCodes = true; // both a list and inline codes: kept as given
    beds.inlineCodes = {{3, u"three"_s, MissingKind::NotApplicable}};
    garden.items.append(beds);
    in.modules.append(garden);

    rb::Module empty;
    empty.name = u"empty_module"_s;
    empty.title = u"Nothing here"_s;
    empty.askIf = u"beds > 2"_s;
    in.modules.append(empty);

    rb::TestRespondent cyclist;
    cyclist.name = u"cyclist"_s;
    cyclist.answers = {
        {u"works_outside"_s, {rb::AnswerValue::Kind::Number, u"1"_s, {}}},
        {u"modes"_s,
         {rb::AnswerValue::Kind::List, u""_s, {1, std::numeric_limits<qint64>::min(), 0}}},
        {u"leave_time"_s, {rb::AnswerValue::Kind::Text, u"7:30, early"_s, {}}}};
    cyclist.path = {u"works_outside"_s, u"distance_km"_s, u"modes"_s};
    rb::TestRespondent nobody; // no answers, no path
    nobody.name = u""_s;
    in.testRespondents = {cyclist, nobody};
    return in;
}

rb::Instrument bigInstrument(int items) {
    rb::Instrument in = minimalInstrument();
    in.modules.first().items.clear();
    for (int i = 0; i < items; ++i) {
        rb::Item item;
        item.name = u"item_%1"_s.arg(i);
        item.type = rb::ItemType::Text;
        // Long texts full of 'a' so that a test can rewrite many pages.
        item.text = QString(600, QLatin1Char('a')) + QString::number(i);
        item.routing.append({u"item_%1 = \"x\""_s.arg(i), u"END"_s});
        in.modules.first().items.append(item);
    }
    return in;
}

} // namespace projecttest
