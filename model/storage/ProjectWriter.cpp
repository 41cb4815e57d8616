#include "ProjectWriter.h"

#include "SqliteDatabase.h"
#include "SqliteStatement.h"

#include <QStringList>

namespace rb {

namespace {

// Children before parents, so no foreign key is ever left dangling mid-way.
constexpr const char* kDeleteAll = "DELETE FROM test_path; DELETE FROM test_answer;"
                                   "DELETE FROM test_respondent; DELETE FROM rule;"
                                   "DELETE FROM item_code; DELETE FROM item;"
                                   "DELETE FROM module; DELETE FROM code; DELETE FROM code_list;"
                                   "DELETE FROM settings; DELETE FROM instrument;";

constexpr const char* kInsertItem =
    "INSERT INTO item (id, module_id, ord, name, label, text, instruction, type,"
    " code_list_id, code_list_spelling, has_inline_codes, range_min_text, range_min_value,"
    " range_max_text, range_max_value, ask_if, notes, has_when_skipped, when_skipped_value,"
    " when_skipped_is_text, when_skipped_if)"
    " VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17, ?18,"
    " ?19, ?20, ?21)";
constexpr const char* kInsertItemCode =
    "INSERT INTO item_code (item_id, ord, code, label, missing, kind)"
    " VALUES (?1, ?2, ?3, ?4, ?5, ?6)";
constexpr const char* kInsertRule =
    "INSERT INTO rule (item_id, ord, condition, target) VALUES (?1, ?2, ?3, ?4)";

std::optional<QString> missingName(MissingKind kind) {
    if (kind == MissingKind::None)
        return std::nullopt;
    return missingKindName(kind);
}

// "1,-2,3": a list of int64 codes as text, exact for every value (JSON numbers
// would pass through double and lose large codes).
QString codesText(const QList<qint64>& codes) {
    QStringList parts;
    for (qint64 code : codes)
        parts.append(QString::number(code));
    return parts.join(QLatin1Char(','));
}

QString answerKindName(AnswerValue::Kind kind) {
    switch (kind) {
    case AnswerValue::Kind::Number:
        return QStringLiteral("number");
    case AnswerValue::Kind::Text:
        return QStringLiteral("text");
    case AnswerValue::Kind::List:
        return QStringLiteral("list");
    }
    return {};
}

// Runs one bound row and resets the statement; CONTEXT names the row in errors.
std::optional<QString> runRow(SqliteStatement& statement, const QString& context) {
    const bool ok = statement.run();
    statement.reset();
    if (!ok)
        return QStringLiteral("cannot save %1: %2").arg(context, statement.error());
    return std::nullopt;
}

class Writer {
public:
    Writer(SqliteDatabase& db, const Instrument& instrument)
        : m_db(db), m_instrument(instrument), m_item(db, kInsertItem),
          m_itemCode(db, kInsertItemCode), m_rule(db, kInsertRule) {}

    std::optional<QString> write() {
        // Per-item statements are prepared once; a failed prepare shows up here.
        for (const SqliteStatement* statement : {&m_item, &m_itemCode, &m_rule})
            if (!statement->ok())
                return statement->error();
        if (auto error = m_db.exec(kDeleteAll))
            return error;
        if (auto error = writeHeader())
            return error;
        if (auto error = writeCodeLists())
            return error;
        if (auto error = writeModules())
            return error;
        return writeTestRespondents();
    }

private:
    std::optional<QString> writeHeader() {
        SqliteStatement row(
            m_db, "INSERT INTO instrument (id, title, version, language) VALUES (1, ?1, ?2, ?3)");
        row.bind(1, m_instrument.title);
        row.bind(2, m_instrument.version);
        row.bind(3, m_instrument.language);
        if (auto error = runRow(row, QStringLiteral("the instrument")))
            return error;
        SqliteStatement setting(m_db, "INSERT INTO settings (key, value) VALUES (?1, ?2)");
        setting.bind(1, QStringLiteral("legitimate_skip_code"));
        setting.bind(2, m_instrument.settings.legitimateSkipCode);
        return runRow(setting, QStringLiteral("the settings"));
    }

    std::optional<QString> writeCodeLists() {
        SqliteStatement list(m_db, "INSERT INTO code_list (id, ord, name) VALUES (?1, ?2, ?3)");
        SqliteStatement code(m_db, "INSERT INTO code (code_list_id, ord, code, label, missing)"
                                   " VALUES (?1, ?2, ?3, ?4, ?5)");
        for (int l = 0; l < m_instrument.codeLists.size(); ++l) {
            const CodeList& codeList = m_instrument.codeLists.at(l);
            const QString context = QStringLiteral("code list '%1'").arg(codeList.name);
            list.bind(1, listId(l));
            list.bind(2, l);
            list.bind(3, codeList.name);
            if (auto error = runRow(list, context))
                return error;
            for (int c = 0; c < codeList.codes.size(); ++c) {
                const Code& value = codeList.codes.at(c);
                code.bind(1, listId(l));
                code.bind(2, c);
                code.bind(3, value.code);
                code.bind(4, value.label);
                code.bind(5, missingName(value.missing));
                if (auto error = runRow(code, context))
                    return error;
            }
        }
        return std::nullopt;
    }

    std::optional<QString> writeModules() {
        SqliteStatement module(
            m_db, "INSERT INTO module (id, ord, name, title, ask_if) VALUES (?1, ?2, ?3, ?4, ?5)");
        for (int m = 0; m < m_instrument.modules.size(); ++m) {
            const Module& value = m_instrument.modules.at(m);
            module.bind(1, qint64(m + 1));
            module.bind(2, m);
            module.bind(3, value.name);
            module.bind(4, value.title);
            module.bind(5, value.askIf);
            if (auto error = runRow(module, QStringLiteral("module '%1'").arg(value.name)))
                return error;
            for (int i = 0; i < value.items.size(); ++i)
                if (auto error = writeItem(m + 1, i, value.items.at(i)))
                    return error;
        }
        return std::nullopt;
    }

    std::optional<QString> writeItem(qint64 moduleId, int ord, const Item& item) {
        const qint64 id = ++m_lastItemId;
        const QString context = QStringLiteral("item '%1'").arg(item.name);
        SqliteStatement& row = m_item;
        row.bind(1, id);
        row.bind(2, moduleId);
        row.bind(3, ord);
        row.bind(4, item.name);
        row.bind(5, item.label);
        row.bind(6, item.text);
        row.bind(7, item.instruction);
        row.bind(8, itemTypeName(item.type));
        if (auto error = bindCodeList(row, item))
            return QStringLiteral("cannot save %1: %2").arg(context, *error);
        row.bind(11, item.hasInlineCodes);
        bindRange(row, item);
        row.bind(16, item.askIf);
        row.bind(17, item.notes);
        bindWhenSkipped(row, item);
        if (auto error = runRow(row, context))
            return error;
        if (auto error = writeItemCodes(id, item, context))
            return error;
        return writeRules(id, item, context);
    }

    // Parameters 9 and 10. The item refers to a shared list by id; the spelling
    // is kept only where it differs from the list's own name (names match
    // ignoring case), so loading gives back the name exactly as written.
    std::optional<QString> bindCodeList(SqliteStatement& row, const Item& item) {
        row.bindNull(9);
        row.bindNull(10);
        if (item.codeListName.isEmpty())
            return std::nullopt;
        const CodeList* list = m_instrument.findCodeList(item.codeListName);
        if (!list)
            return QStringLiteral("it names code list '%1', which the instrument does not have")
                .arg(item.codeListName);
        row.bind(9, listId(int(list - m_instrument.codeLists.constData())));
        if (list->name != item.codeListName)
            row.bind(10, item.codeListName);
        return std::nullopt;
    }

    // Parameters 12 to 15: all NULL when the item has no range.
    static void bindRange(SqliteStatement& row, const Item& item) {
        if (!item.range) {
            for (int p = 12; p <= 15; ++p)
                row.bindNull(p);
            return;
        }
        row.bind(12, item.range->first.text);
        row.bind(13, item.range->first.value);
        row.bind(14, item.range->second.text);
        row.bind(15, item.range->second.value);
    }

    // Parameters 18 to 21.
    static void bindWhenSkipped(SqliteStatement& row, const Item& item) {
        row.bind(18, item.whenSkipped.has_value());
        if (!item.whenSkipped) {
            for (int p = 19; p <= 21; ++p)
                row.bindNull(p);
            return;
        }
        row.bind(19, item.whenSkipped->value);
        row.bind(20, item.whenSkipped->valueIsText);
        row.bind(21, item.whenSkipped->condition);
    }

    std::optional<QString> writeItemCodes(qint64 itemId, const Item& item, const QString& context) {
        SqliteStatement& row = m_itemCode;
        int ord = 0;
        // Inline codes first, then the extra missing codes; `kind` tells them apart.
        const std::pair<const QList<Code>*, QString> groups[] = {
            {&item.inlineCodes, QStringLiteral("inline")},
            {&item.missing, QStringLiteral("missing")}};
        for (const auto& [codes, kind] : groups) {
            for (const Code& code : *codes) {
                row.bind(1, itemId);
                row.bind(2, ord++);
                row.bind(3, code.code);
                row.bind(4, code.label);
                row.bind(5, missingName(code.missing));
                row.bind(6, kind);
                if (auto error = runRow(row, context))
                    return error;
            }
        }
        return std::nullopt;
    }

    std::optional<QString> writeRules(qint64 itemId, const Item& item, const QString& context) {
        SqliteStatement& row = m_rule;
        for (int r = 0; r < item.routing.size(); ++r) {
            row.bind(1, itemId);
            row.bind(2, r);
            row.bind(3, item.routing.at(r).condition);
            row.bind(4, item.routing.at(r).target);
            if (auto error = runRow(row, context))
                return error;
        }
        return std::nullopt;
    }

    std::optional<QString> writeTestRespondents() {
        SqliteStatement respondent(
            m_db, "INSERT INTO test_respondent (id, ord, name) VALUES (?1, ?2, ?3)");
        SqliteStatement answer(m_db, "INSERT INTO test_answer (respondent_id, ord, item, kind,"
                                     " text, codes) VALUES (?1, ?2, ?3, ?4, ?5, ?6)");
        SqliteStatement path(
            m_db, "INSERT INTO test_path (respondent_id, ord, item) VALUES (?1, ?2, ?3)");
        for (int t = 0; t < m_instrument.testRespondents.size(); ++t) {
            const TestRespondent& value = m_instrument.testRespondents.at(t);
            const QString context = QStringLiteral("test respondent '%1'").arg(value.name);
            const qint64 id = t + 1;
            respondent.bind(1, id);
            respondent.bind(2, t);
            respondent.bind(3, value.name);
            if (auto error = runRow(respondent, context))
                return error;
            for (int a = 0; a < value.answers.size(); ++a) {
                const Answer& given = value.answers.at(a);
                answer.bind(1, id);
                answer.bind(2, a);
                answer.bind(3, given.item);
                answer.bind(4, answerKindName(given.value.kind));
                answer.bind(5, given.value.text);
                answer.bind(6, codesText(given.value.codes));
                if (auto error = runRow(answer, context))
                    return error;
            }
            for (int p = 0; p < value.path.size(); ++p) {
                path.bind(1, id);
                path.bind(2, p);
                path.bind(3, value.path.at(p));
                if (auto error = runRow(path, context))
                    return error;
            }
        }
        return std::nullopt;
    }

    static qint64 listId(int index) { return qint64(index) + 1; }

    SqliteDatabase& m_db;
    const Instrument& m_instrument;
    SqliteStatement m_item;
    SqliteStatement m_itemCode;
    SqliteStatement m_rule;
    qint64 m_lastItemId = 0;
};

} // namespace

std::optional<QString> writeProjectRows(SqliteDatabase& db, const Instrument& instrument) {
    return Writer(db, instrument).write();
}

} // namespace rb
