#include "ProjectReader.h"

#include "SqliteDatabase.h"
#include "SqliteStatement.h"

#include <QHash>
#include <QStringList>

#include <functional>

namespace rb {

namespace {

using Type = SqliteStatement::Type;
using Step = SqliteStatement::Step;
using Problem = std::optional<QString>;

// Typed getters over the current row. SQLite columns accept any type, so each
// getter checks the stored type and remembers the first column that breaks
// the schema's promise.
class Row {
public:
    Row(const SqliteStatement& statement, const QString& table) : m_s(statement), m_table(table) {}

    QString text(int column) {
        return expect(column, Type::Text) ? m_s.columnText(column) : QString();
    }
    std::optional<QString> optionalText(int column) {
        if (isNull(column))
            return std::nullopt;
        return text(column);
    }
    qint64 integer(int column) {
        return expect(column, Type::Integer) ? m_s.columnInt64(column) : 0;
    }
    std::optional<qint64> optionalInteger(int column) {
        if (isNull(column))
            return std::nullopt;
        return integer(column);
    }
    double real(int column) {
        // SQLite stores an integral REAL as an integer on disk; both are numbers.
        if (m_s.columnType(column) == Type::Integer)
            return double(m_s.columnInt64(column));
        return expect(column, Type::Real) ? m_s.columnDouble(column) : 0.0;
    }
    bool flag(int column) {
        const qint64 value = integer(column);
        if (value != 0 && value != 1)
            fail(column, QStringLiteral("must be 0 or 1"));
        return value == 1;
    }
    bool isNull(int column) const { return m_s.columnType(column) == Type::Null; }

    // Records the first problem of the row (a wrong type or a broken rule).
    void fail(int column, const QString& what) {
        if (!m_problem)
            m_problem =
                QStringLiteral("table %1, column %2 %3").arg(m_table, m_s.columnName(column), what);
    }
    const Problem& problem() const { return m_problem; }

private:
    bool expect(int column, Type type) {
        if (m_s.columnType(column) == type)
            return true;
        fail(column, type == Type::Text   ? QStringLiteral("must hold text")
                     : type == Type::Real ? QStringLiteral("must hold a number")
                                          : QStringLiteral("must hold an integer"));
        return false;
    }

    const SqliteStatement& m_s;
    QString m_table;
    Problem m_problem;
};

std::optional<MissingKind> missingFrom(Row& row, int column) {
    const std::optional<QString> name = row.optionalText(column);
    if (!name)
        return MissingKind::None;
    const std::optional<MissingKind> kind = missingKindFromName(*name);
    if (!kind)
        row.fail(column, QStringLiteral("holds an unknown missing kind '%1'").arg(*name));
    return kind;
}

// Reads "1,-2,3" (see ProjectWriter.cpp); nullopt when the text is not such a list.
std::optional<QList<qint64>> codesFrom(const QString& text) {
    QList<qint64> codes;
    if (text.isEmpty())
        return codes;
    for (const QString& part : text.split(QLatin1Char(','))) {
        bool ok = false;
        const qint64 code = part.toLongLong(&ok);
        if (!ok || QString::number(code) != part)
            return std::nullopt;
        codes.append(code);
    }
    return codes;
}

std::optional<AnswerValue::Kind> answerKindFrom(const QString& name) {
    if (name == QLatin1String("number"))
        return AnswerValue::Kind::Number;
    if (name == QLatin1String("text"))
        return AnswerValue::Kind::Text;
    if (name == QLatin1String("list"))
        return AnswerValue::Kind::List;
    return std::nullopt;
}

QString dangling(const QString& table, qint64 id, const char* parent) {
    return QStringLiteral("table %1 refers to %2 row %3, which does not exist")
        .arg(table, QString::fromLatin1(parent), QString::number(id));
}

class Reader {
public:
    explicit Reader(SqliteDatabase& db) : m_db(db) {}

    std::variant<Instrument, QString> read() {
        using ReadStep = Problem (Reader::*)();
        for (ReadStep step : {&Reader::readHeader, &Reader::readSettings, &Reader::readCodeLists,
                              &Reader::readCodes, &Reader::readModules, &Reader::readItems,
                              &Reader::readItemCodes, &Reader::readRules, &Reader::readRespondents,
                              &Reader::readAnswers, &Reader::readPaths})
            if (Problem problem = (this->*step)())
                return *problem;
        return m_instrument;
    }

private:
    // Runs SQL and hands each row to READ; stops at the first problem.
    Problem forEachRow(const char* sql, const QString& table,
                       const std::function<Problem(Row&)>& read) {
        SqliteStatement statement(m_db, sql);
        Step step;
        while ((step = statement.step()) == Step::Row) {
            Row row(statement, table);
            Problem problem = read(row);
            if (!problem)
                problem = row.problem();
            if (problem)
                return problem;
        }
        if (step == Step::Error)
            return QStringLiteral("cannot read table %1: %2").arg(table, statement.error());
        return std::nullopt;
    }

    Problem readHeader() {
        int rows = 0;
        Problem problem = forEachRow("SELECT title, version, language FROM instrument",
                                     QStringLiteral("instrument"), [&](Row& row) -> Problem {
                                         ++rows;
                                         m_instrument.title = row.text(0);
                                         m_instrument.version = row.text(1);
                                         m_instrument.language = row.text(2);
                                         return std::nullopt;
                                     });
        if (!problem && rows != 1)
            problem =
                QStringLiteral("table instrument must hold exactly one row, not %1").arg(rows);
        return problem;
    }

    Problem readSettings() {
        bool seenSkipCode = false;
        Problem problem = forEachRow(
            "SELECT key, value FROM settings ORDER BY key", QStringLiteral("settings"),
            [&](Row& row) -> Problem {
                const QString key = row.text(0);
                if (key != QLatin1String("legitimate_skip_code"))
                    return QStringLiteral("table settings holds an unknown setting '%1'").arg(key);
                seenSkipCode = true;
                m_instrument.settings.legitimateSkipCode = row.text(1);
                return std::nullopt;
            });
        if (!problem && !seenSkipCode)
            problem = QStringLiteral("table settings has no legitimate_skip_code row");
        return problem;
    }

    Problem readCodeLists() {
        return forEachRow("SELECT id, name FROM code_list ORDER BY ord",
                          QStringLiteral("code_list"), [&](Row& row) -> Problem {
                              m_listIndex.insert(row.integer(0),
                                                 int(m_instrument.codeLists.size()));
                              m_instrument.codeLists.append({row.text(1), {}});
                              return std::nullopt;
                          });
    }

    Problem readCodes() {
        const QString table = QStringLiteral("code");
        return forEachRow(
            "SELECT code_list_id, code, label, missing FROM code ORDER BY code_list_id, ord", table,
            [&](Row& row) -> Problem {
                const qint64 listId = row.integer(0);
                const auto list = m_listIndex.constFind(listId);
                if (list == m_listIndex.cend())
                    return dangling(table, listId, "code_list");
                Code code{row.integer(1), row.text(2),
                          missingFrom(row, 3).value_or(MissingKind::None)};
                m_instrument.codeLists[*list].codes.append(code);
                return std::nullopt;
            });
    }

    Problem readModules() {
        return forEachRow("SELECT id, name, title, ask_if FROM module ORDER BY ord",
                          QStringLiteral("module"), [&](Row& row) -> Problem {
                              m_moduleIndex.insert(row.integer(0),
                                                   int(m_instrument.modules.size()));
                              Module module;
                              module.name = row.text(1);
                              module.title = row.text(2);
                              module.askIf = row.optionalText(3);
                              m_instrument.modules.append(module);
                              return std::nullopt;
                          });
    }

    Problem readItems() {
        const QString table = QStringLiteral("item");
        return forEachRow(
            "SELECT id, module_id, name, label, text, instruction, type, code_list_id,"
            " code_list_spelling, has_inline_codes, range_min_text, range_min_value,"
            " range_max_text, range_max_value, ask_if, notes, has_when_skipped,"
            " when_skipped_value, when_skipped_is_text, when_skipped_if"
            " FROM item ORDER BY module_id, ord",
            table, [&](Row& row) -> Problem {
                const qint64 moduleId = row.integer(1);
                const auto module = m_moduleIndex.constFind(moduleId);
                if (module == m_moduleIndex.cend())
                    return dangling(table, moduleId, "module");
                Item item;
                item.name = row.text(2);
                item.label = row.text(3);
                item.text = row.text(4);
                item.instruction = row.text(5);
                if (Problem problem = readType(row, item))
                    return problem;
                if (Problem problem = readCodeListRef(row, item))
                    return problem;
                item.hasInlineCodes = row.flag(9);
                readRange(row, item);
                item.askIf = row.optionalText(14);
                item.notes = row.text(15);
                readWhenSkipped(row, item);
                QList<Item>& items = m_instrument.modules[*module].items;
                m_itemIndex.insert(row.integer(0), {*module, int(items.size())});
                items.append(item);
                return std::nullopt;
            });
    }

    static Problem readType(Row& row, Item& item) {
        const QString name = row.text(6);
        const std::optional<ItemType> type = itemTypeFromName(name);
        if (!type && !row.problem())
            return QStringLiteral("item '%1' has an unknown type '%2'").arg(item.name, name);
        item.type = type.value_or(ItemType::Single);
        return std::nullopt;
    }

    // Columns 7 and 8: the shared list by id, and the item's own spelling of its
    // name when that differs from the list's name (see ProjectWriter.cpp).
    Problem readCodeListRef(Row& row, Item& item) {
        const std::optional<qint64> listId = row.optionalInteger(7);
        const std::optional<QString> spelling = row.optionalText(8);
        if (!listId) {
            if (spelling)
                return QStringLiteral(
                           "item '%1' spells a code list name but refers to no code list")
                    .arg(item.name);
            return std::nullopt;
        }
        const auto list = m_listIndex.constFind(*listId);
        if (list == m_listIndex.cend())
            return dangling(QStringLiteral("item"), *listId, "code_list");
        const QString name = m_instrument.codeLists.at(*list).name;
        if (spelling && spelling->compare(name, Qt::CaseInsensitive) != 0)
            return QStringLiteral("item '%1' spells its code list '%2', but the list is '%3'")
                .arg(item.name, *spelling, name);
        item.codeListName = spelling.value_or(name);
        return std::nullopt;
    }

    // Columns 10 to 13: all NULL (no range) or a text and a value for each bound.
    static void readRange(Row& row, Item& item) {
        const bool hasMin = !row.isNull(10);
        const bool hasMax = !row.isNull(12);
        if (hasMin != hasMax) {
            row.fail(hasMin ? 12 : 10, QStringLiteral("is NULL, but the other bound is not"));
            return;
        }
        if (hasMin)
            item.range = std::pair{RangeBound{row.text(10), row.real(11)},
                                   RangeBound{row.text(12), row.real(13)}};
    }

    // Columns 16 to 19.
    static void readWhenSkipped(Row& row, Item& item) {
        if (!row.flag(16)) {
            for (int column = 17; column <= 19; ++column)
                if (!row.isNull(column))
                    row.fail(column, QStringLiteral("must be NULL when has_when_skipped is 0"));
            return;
        }
        item.whenSkipped = WhenSkipped{row.text(17), row.flag(18), row.optionalText(19)};
    }

    Item* itemOf(qint64 id) {
        const auto found = m_itemIndex.constFind(id);
        if (found == m_itemIndex.cend())
            return nullptr;
        return &m_instrument.modules[found->first].items[found->second];
    }

    Problem readItemCodes() {
        const QString table = QStringLiteral("item_code");
        return forEachRow(
            "SELECT item_id, kind, code, label, missing FROM item_code ORDER BY item_id, ord",
            table, [&](Row& row) -> Problem {
                Item* item = itemOf(row.integer(0));
                if (!item)
                    return dangling(table, row.integer(0), "item");
                const QString kind = row.text(1);
                Code code{row.integer(2), row.text(3),
                          missingFrom(row, 4).value_or(MissingKind::None)};
                if (kind == QLatin1String("inline"))
                    item->inlineCodes.append(code);
                else if (kind == QLatin1String("missing"))
                    item->missing.append(code);
                else
                    row.fail(1, QStringLiteral("holds an unknown kind '%1'").arg(kind));
                return std::nullopt;
            });
    }

    Problem readRules() {
        const QString table = QStringLiteral("rule");
        return forEachRow("SELECT item_id, condition, target FROM rule ORDER BY item_id, ord",
                          table, [&](Row& row) -> Problem {
                              Item* item = itemOf(row.integer(0));
                              if (!item)
                                  return dangling(table, row.integer(0), "item");
                              item->routing.append({row.optionalText(1), row.text(2)});
                              return std::nullopt;
                          });
    }

    Problem readRespondents() {
        return forEachRow("SELECT id, name FROM test_respondent ORDER BY ord",
                          QStringLiteral("test_respondent"), [&](Row& row) -> Problem {
                              m_respondentIndex.insert(row.integer(0),
                                                       int(m_instrument.testRespondents.size()));
                              m_instrument.testRespondents.append({row.text(1), {}, {}});
                              return std::nullopt;
                          });
    }

    TestRespondent* respondentOf(qint64 id) {
        const auto found = m_respondentIndex.constFind(id);
        return found == m_respondentIndex.cend() ? nullptr : &m_instrument.testRespondents[*found];
    }

    Problem readAnswers() {
        const QString table = QStringLiteral("test_answer");
        return forEachRow(
            "SELECT respondent_id, item, kind, text, codes FROM test_answer"
            " ORDER BY respondent_id, ord",
            table, [&](Row& row) -> Problem {
                TestRespondent* respondent = respondentOf(row.integer(0));
                if (!respondent)
                    return dangling(table, row.integer(0), "test_respondent");
                Answer answer;
                answer.item = row.text(1);
                const QString kind = row.text(2);
                const auto valueKind = answerKindFrom(kind);
                if (!valueKind)
                    row.fail(2, QStringLiteral("holds an unknown answer kind '%1'").arg(kind));
                answer.value.kind = valueKind.value_or(AnswerValue::Kind::Number);
                answer.value.text = row.text(3);
                const auto codes = codesFrom(row.text(4));
                if (!codes)
                    row.fail(4, QStringLiteral("is not a comma-separated list of integers"));
                answer.value.codes = codes.value_or(QList<qint64>());
                respondent->answers.append(answer);
                return std::nullopt;
            });
    }

    Problem readPaths() {
        const QString table = QStringLiteral("test_path");
        return forEachRow("SELECT respondent_id, item FROM test_path ORDER BY respondent_id, ord",
                          table, [&](Row& row) -> Problem {
                              TestRespondent* respondent = respondentOf(row.integer(0));
                              if (!respondent)
                                  return dangling(table, row.integer(0), "test_respondent");
                              respondent->path.append(row.text(1));
                              return std::nullopt;
                          });
    }

    SqliteDatabase& m_db;
    Instrument m_instrument;
    QHash<qint64, int> m_listIndex;
    QHash<qint64, int> m_moduleIndex;
    QHash<qint64, std::pair<int, int>> m_itemIndex; // module index, item index
    QHash<qint64, int> m_respondentIndex;
};

} // namespace

std::variant<Instrument, QString> readProjectRows(SqliteDatabase& db) {
    return Reader(db).read();
}

} // namespace rb
