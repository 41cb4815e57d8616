#pragma once

#include "instrument/NameTable.h"

#include <QList>
#include <QString>

#include <optional>

namespace rb {

// Kinds of missing code (DESIGN.md "Code").
enum class MissingKind { None, DontKnow, Refused, NotApplicable };

QString missingKindName(MissingKind kind); // "dont_know", ... ; "" for None
std::optional<MissingKind> missingKindFromName(const QString& name);

struct Code {
    qint64 code = 0;
    QString label;
    MissingKind missing = MissingKind::None;

    bool isMissing() const { return missing != MissingKind::None; }
    bool operator==(const Code&) const = default;
};

struct CodeList {
    QString name;
    QList<Code> codes;
    bool operator==(const CodeList&) const = default;
};

enum class ItemType { Single, Multi, Integer, Decimal, Text, Date, Statement };

QString itemTypeName(ItemType type); // "single", "multi", ...
std::optional<ItemType> itemTypeFromName(const QString& name);

// A routing rule: "if CONDITION go to TARGET". Without a condition it always fires.
struct Rule {
    std::optional<QString> condition; // condition text as written
    QString target;                   // item name, module name or END (any case)
    bool operator==(const Rule&) const = default;
};

// The implied value an analyst may fill in when the item was not presented.
struct WhenSkipped {
    QString value;                    // as written (a number or text)
    bool valueIsText = false;         // true when the YAML value was a string
    std::optional<QString> condition; // `if`; absent = whenever not presented
    bool operator==(const WhenSkipped&) const = default;
};

// A numeric bound kept as written, so YAML round trips are byte-identical.
struct RangeBound {
    QString text;
    double value = 0;
    bool operator==(const RangeBound&) const = default;
};

struct Item {
    // The fields every check and analysis reads come first, so that a pass over
    // thousands of items touches few cache lines of each; the wording follows.
    QString name;
    ItemType type = ItemType::Single;
    bool hasInlineCodes = false;
    // Exactly one of these holds the codes: a shared list by name, or an inline list.
    QString codeListName;
    QList<Code> inlineCodes;
    QList<Code> missing; // extra missing codes of numeric items
    std::optional<QString> askIf;
    QList<Rule> routing;
    std::optional<std::pair<RangeBound, RangeBound>> range;
    std::optional<WhenSkipped> whenSkipped;
    QString label;
    QString text;
    QString instruction;
    QString notes;
    bool operator==(const Item&) const = default;
};

struct Module {
    QString name;
    QString title;
    std::optional<QString> askIf;
    QList<Item> items;
    bool operator==(const Module&) const = default;
};

struct Settings {
    QString legitimateSkipCode; // default "" = blank
    bool operator==(const Settings&) const = default;
};

// One value of a test respondent's answer: a number or text as written, or a
// list of codes for a multi item.
struct AnswerValue {
    enum class Kind { Number, Text, List };
    Kind kind = Kind::Number;
    QString text;
    QList<qint64> codes;
    bool operator==(const AnswerValue&) const = default;
};

struct Answer {
    QString item;
    AnswerValue value;
    bool operator==(const Answer&) const = default;
};

struct TestRespondent {
    QString name;
    QList<Answer> answers; // in the order written
    QStringList path;      // expected presented items
    bool operator==(const TestRespondent&) const = default;
};

struct Instrument {
    QString title;
    QString version;
    QString language;
    Settings settings;
    QList<CodeList> codeLists; // in the order written
    QList<Module> modules;
    QList<TestRespondent> testRespondents;
    bool operator==(const Instrument&) const = default;

    // Lookups ignore case, as names do everywhere in Routebook.
    const CodeList* findCodeList(const QString& name) const;
    // The codes an item may hold: its list (shared or inline) then its extra missing codes.
    QList<Code> codesOf(const Item& item) const;
    // Its list alone (shared or inline; empty when it has none), by reference.
    const QList<Code>& listedCodes(const Item& item) const;
};

// A flat, position-ordered view of the items (the routing order) with their
// modules. Built once; cheap lookups by name ignoring case.
class ItemIndex {
public:
    explicit ItemIndex(const Instrument& instrument);

    struct Entry {
        const Item* item;
        const Module* module;
        int moduleIndex;
        int position; // 0-based flat questionnaire position
        // The item's type, copied here: the analysis asks it of every item a
        // condition reads, and the entries sit together where the items do not.
        ItemType type;
    };

    const QList<Entry>& entries() const { return m_entries; }
    int size() const { return int(m_entries.size()); }
    const Entry& at(int position) const { return m_entries.at(position); }
    // Position of the item with this name (any case), or -1.
    int positionOf(const QString& name) const;
    // Position of the first item of the module with this name (any case), or -1;
    // an empty module gives the position of the next item after it.
    int modulePosition(const QString& name) const;
    // Resolves a goto target: item position, module's first item position, size()
    // for END, -1 unknown. An empty module resolves to the next item after it.
    int resolveTarget(const QString& target) const;

private:
    QList<Entry> m_entries;
    NameTable m_byName;
    NameTable m_moduleFirst;
};

// Names of the 0/1 variables of a multi item: NAME_CODE per non-missing and missing code.
QStringList multiVariableNames(const Instrument& instrument, const Item& item);

bool isConditionKeyword(const QString& word);
bool isValidItemName(const QString& name);

} // namespace rb
