#include "YamlReader.h"

#include <QRegularExpression>

#include <algorithm>

using namespace Qt::StringLiterals;

namespace rb::yaml {

bool isNumberText(const QString& text) {
    static const QRegularExpression pattern(
        u"^[-+]?([0-9]+(\\.[0-9]*)?|\\.[0-9]+)([eE][-+]?[0-9]+)?$"_s);
    return pattern.match(text).hasMatch();
}

bool isIntegerText(const QString& text) {
    static const QRegularExpression pattern(u"^[-+]?[0-9]+$"_s);
    return pattern.match(text).hasMatch();
}

namespace {

// The keys of each kind of map, in the order the saver writes them.
const QStringList kTopKeys = {u"routebook"_s,  u"instrument"_s, u"settings"_s,
                              u"code_lists"_s, u"modules"_s,    u"test_respondents"_s};
const QStringList kInstrumentKeys = {u"title"_s, u"version"_s, u"language"_s};
const QStringList kSettingsKeys = {u"legitimate_skip_code"_s};
const QStringList kCodeKeys = {u"code"_s, u"label"_s, u"missing"_s};
const QStringList kModuleKeys = {u"name"_s, u"title"_s, u"ask_if"_s, u"items"_s};
const QStringList kItemKeys = {u"name"_s,   u"label"_s,   u"text"_s,         u"instruction"_s,
                               u"type"_s,   u"codes"_s,   u"range"_s,        u"missing"_s,
                               u"ask_if"_s, u"routing"_s, u"when_skipped"_s, u"notes"_s};
const QStringList kRuleKeys = {u"if"_s, u"goto"_s};
const QStringList kWhenSkippedKeys = {u"value"_s, u"if"_s};
const QStringList kRespondentKeys = {u"name"_s, u"answers"_s, u"path"_s};

QString typeNames() {
    QStringList names;
    for (ItemType t : {ItemType::Single, ItemType::Multi, ItemType::Integer, ItemType::Decimal,
                       ItemType::Text, ItemType::Date, ItemType::Statement})
        names.append(itemTypeName(t));
    return names.join(u", "_s);
}

// One pass over the document. Each read* function reports what is wrong with
// its node and carries on, so that one load lists every structural problem.
// Rule for empty values (`key:` with nothing after it): they stand for empty
// text, an empty list or an empty map wherever one of those is allowed.
class Reader {
public:
    explicit Reader(const QString& file) : m_file(file) {}

    std::optional<Instrument> read(const Node& root) {
        if (!root.isMap()) {
            error(root, u"the top level must be a map with the keys %1; found %2"_s.arg(
                            kTopKeys.join(u", "_s), describeKind(root)));
            return std::nullopt;
        }
        checkKeys(root, u"at the top level"_s, kTopKeys);
        Instrument instrument;
        readVersion(root);
        if (const Node* header = required(root, "instrument", u"at the top level"_s))
            readHeader(*header, instrument);
        if (const Node* settings = root.find("settings"_L1))
            readSettings(*settings, instrument.settings);
        if (const Node* lists = root.find("code_lists"_L1))
            readCodeLists(*lists, instrument.codeLists);
        m_codeLists = &instrument.codeLists;
        if (const Node* modules = required(root, "modules", u"at the top level"_s))
            for (const Node& node : list(*modules, u"modules"_s))
                instrument.modules.append(readModule(node));
        if (const Node* respondents = root.find("test_respondents"_L1))
            for (const Node& node : list(*respondents, u"test_respondents"_s))
                instrument.testRespondents.append(readRespondent(node));
        if (!m_errors.isEmpty())
            return std::nullopt;
        return instrument;
    }

    Diagnostics takeErrors() {
        std::stable_sort(m_errors.begin(), m_errors.end(),
                         [](const Diagnostic& a, const Diagnostic& b) {
                             return std::pair(a.line, a.column) < std::pair(b.line, b.column);
                         });
        return m_errors;
    }

private:
    void error(const Node& at, const QString& message) {
        m_errors.append({m_file, at.line, at.column, message});
    }

    // True when `node` is a map (an empty value counts as an empty map);
    // reports a wrong type and every key not in `allowed`.
    // A map entry of a list (code, module, item, rule, respondent): false, with
    // `shape` said, when it is not a map; otherwise its keys are checked.
    bool openMap(const Node& node, const QString& shape, const QString& where,
                 const QStringList& allowed) {
        if (!node.isMap()) {
            error(node, u"%1, not %2"_s.arg(shape, describeKind(node)));
            return false;
        }
        checkKeys(node, where, allowed);
        return true;
    }

    bool checkKeys(const Node& node, const QString& where, const QStringList& allowed) {
        if (node.isNull())
            return true;
        if (!node.isMap()) {
            error(node, u"expected a map %1, found %2"_s.arg(where, describeKind(node)));
            return false;
        }
        for (const Node& key : node.keys)
            if (key.isScalar() && !allowed.contains(key.text))
                error(key, u"unknown key '%1' %2; allowed: %3"_s.arg(key.text, where,
                                                                     allowed.join(u", "_s)));
        return true;
    }

    const Node* required(const Node& map, const char* key, const QString& where) {
        const Node* value = map.find(QLatin1String(key));
        if (!value)
            error(map, u"missing required key '%1' %2"_s.arg(QLatin1String(key), where));
        return value;
    }

    QString text(const Node& node, const QString& key) {
        if (node.isScalar())
            return node.text;
        if (!node.isNull())
            error(node, u"'%1' must be text, not %2"_s.arg(key, describeKind(node)));
        return {};
    }

    QString optionalText(const Node& map, const char* key) {
        const Node* value = map.find(QLatin1String(key));
        return value ? text(*value, QLatin1String(key)) : QString();
    }

    // Conditions stay text; an absent key is "no condition", an empty one is
    // kept as empty text so that `check` can point at it.
    std::optional<QString> condition(const Node& map, const char* key) {
        const Node* value = map.find(QLatin1String(key));
        if (!value)
            return std::nullopt;
        return text(*value, QLatin1String(key));
    }

    const std::vector<Node>& list(const Node& node, const QString& key) {
        static const std::vector<Node> empty;
        if (node.isSequence())
            return node.children;
        if (!node.isNull())
            error(node, u"'%1' must be a list, not %2"_s.arg(key, describeKind(node)));
        return empty;
    }

    void readVersion(const Node& root) {
        const Node* version = required(root, "routebook", u"at the top level"_s);
        if (!version)
            return;
        if (!version->isScalar())
            error(*version, u"'routebook' must be the format version 1, not %1"_s.arg(
                                describeKind(*version)));
        else if (version->text != "1"_L1)
            error(*version, u"unsupported format version 'routebook: %1'; this program reads "
                            u"'routebook: 1'"_s.arg(version->text));
    }

    void readHeader(const Node& node, Instrument& instrument) {
        if (!checkKeys(node, u"in instrument"_s, kInstrumentKeys))
            return;
        if (const Node* title = required(node, "title", u"in instrument"_s))
            instrument.title = text(*title, u"title"_s);
        instrument.version = optionalText(node, "version");
        instrument.language = optionalText(node, "language");
    }

    void readSettings(const Node& node, Settings& settings) {
        if (checkKeys(node, u"in settings"_s, kSettingsKeys))
            settings.legitimateSkipCode = optionalText(node, "legitimate_skip_code");
    }

    void readCodeLists(const Node& node, QList<CodeList>& lists) {
        if (node.isNull())
            return;
        if (!node.isMap()) {
            error(node, u"'code_lists' must be a map of names to lists of codes, not %1"_s.arg(
                            describeKind(node)));
            return;
        }
        for (size_t i = 0; i < node.keys.size(); ++i)
            lists.append({node.keys[i].text, readCodes(node.children[i], node.keys[i].text)});
    }

    QList<Code> readCodes(const Node& node, const QString& key) {
        QList<Code> codes;
        for (const Node& entry : list(node, key))
            codes.append(readCode(entry));
        return codes;
    }

    Code readCode(const Node& node) {
        Code code;
        if (!openMap(node, u"a code must be a map {code: N, label: TEXT}"_s, u"in code"_s,
                     kCodeKeys))
            return code;
        if (const Node* value = required(node, "code", u"in code"_s))
            code.code = integer(*value, u"code"_s);
        if (const Node* label = required(node, "label", u"in code"_s))
            code.label = text(*label, u"label"_s);
        if (const Node* kind = node.find("missing"_L1))
            code.missing = missingKind(*kind);
        return code;
    }

    qint64 integer(const Node& node, const QString& key) {
        bool ok = false;
        qint64 value = 0;
        if (node.isScalar() && node.plain && isIntegerText(node.text))
            value = node.text.toLongLong(&ok);
        if (!ok)
            error(node, u"'%1' must be a whole number, not %2"_s.arg(key, shown(node)));
        return value;
    }

    // How a wrong value is named in a message: its text, or its kind.
    static QString shown(const Node& node) {
        if (node.isScalar())
            return (node.plain ? u"'%1'"_s : u"quoted text '%1'"_s).arg(node.text);
        return describeKind(node);
    }

    MissingKind missingKind(const Node& node) {
        const auto kind = missingKindFromName(node.isScalar() ? node.text : QString());
        if (!kind)
            error(node, u"unknown missing kind %1; allowed: dont_know, refused, "
                        u"not_applicable"_s.arg(shown(node)));
        return kind.value_or(MissingKind::None);
    }

    Module readModule(const Node& node) {
        Module module;
        if (!openMap(node, u"a module must be a map with a name and items"_s, u"in module"_s,
                     kModuleKeys))
            return module;
        if (const Node* name = required(node, "name", u"in module"_s))
            module.name = text(*name, u"name"_s);
        module.title = optionalText(node, "title");
        module.askIf = condition(node, "ask_if");
        if (const Node* items = node.find("items"_L1))
            for (const Node& entry : list(*items, u"items"_s))
                module.items.append(readItem(entry));
        return module;
    }

    Item readItem(const Node& node) {
        Item item;
        if (!openMap(node, u"an item must be a map with a name and a type"_s, u"in item"_s,
                     kItemKeys))
            return item;
        if (const Node* name = required(node, "name", u"in item"_s))
            item.name = text(*name, u"name"_s);
        item.label = optionalText(node, "label");
        item.text = optionalText(node, "text");
        item.instruction = optionalText(node, "instruction");
        if (const Node* type = required(node, "type", u"in item"_s))
            item.type = itemType(*type);
        if (const Node* codes = node.find("codes"_L1))
            readItemCodes(*codes, item);
        if (const Node* range = node.find("range"_L1))
            item.range = readRange(*range);
        if (const Node* missing = node.find("missing"_L1))
            item.missing = readCodes(*missing, u"missing"_s);
        item.askIf = condition(node, "ask_if");
        if (const Node* routing = node.find("routing"_L1))
            for (const Node& entry : list(*routing, u"routing"_s))
                item.routing.append(readRule(entry));
        if (const Node* skipped = node.find("when_skipped"_L1))
            item.whenSkipped = readWhenSkipped(*skipped);
        item.notes = optionalText(node, "notes");
        return item;
    }

    ItemType itemType(const Node& node) {
        const auto type = itemTypeFromName(node.isScalar() ? node.text : QString());
        if (!type)
            error(node, u"unknown item type %1; types: %2"_s.arg(shown(node), typeNames()));
        return type.value_or(ItemType::Single);
    }

    void readItemCodes(const Node& node, Item& item) {
        if (node.isScalar()) {
            item.codeListName = node.text;
            if (!m_codeLists->isEmpty() && findList(node.text))
                return;
            QStringList names;
            for (const CodeList& list : *m_codeLists)
                names.append(list.name);
            error(node, names.isEmpty()
                            ? u"unknown code list '%1'; no code lists are defined"_s.arg(node.text)
                            : u"unknown code list '%1'; code lists: %2"_s.arg(node.text,
                                                                              names.join(u", "_s)));
            return;
        }
        if (node.isMap()) {
            error(node, u"'codes' must be a code list name or a list of codes, not a map"_s);
            return;
        }
        item.hasInlineCodes = true;
        item.inlineCodes = readCodes(node, u"codes"_s);
    }

    bool findList(const QString& name) const {
        for (const CodeList& list : *m_codeLists)
            if (list.name.compare(name, Qt::CaseInsensitive) == 0)
                return true;
        return false;
    }

    std::optional<std::pair<RangeBound, RangeBound>> readRange(const Node& node) {
        if (!node.isSequence() || node.children.size() != 2) {
            error(node, u"'range' must be two numbers [min, max], not %1"_s.arg(
                            node.isSequence() ? u"a list of %1"_s.arg(node.children.size())
                                              : describeKind(node)));
            return std::nullopt;
        }
        return std::pair(bound(node.children[0]), bound(node.children[1]));
    }

    RangeBound bound(const Node& node) {
        RangeBound bound;
        if (node.isScalar() && node.plain && isNumberText(node.text)) {
            bound.text = node.text;
            bound.value = node.text.toDouble();
        } else {
            error(node, u"a 'range' bound must be a number, not %1"_s.arg(shown(node)));
        }
        return bound;
    }

    Rule readRule(const Node& node) {
        Rule rule;
        if (!openMap(node, u"a routing rule must be a map {if: CONDITION, goto: TARGET}"_s,
                     u"in routing rule"_s, kRuleKeys))
            return rule;
        rule.condition = condition(node, "if");
        if (const Node* target = required(node, "goto", u"in routing rule"_s))
            rule.target = text(*target, u"goto"_s);
        return rule;
    }

    std::optional<WhenSkipped> readWhenSkipped(const Node& node) {
        if (!checkKeys(node, u"in when_skipped"_s, kWhenSkippedKeys))
            return std::nullopt;
        WhenSkipped skipped;
        if (const Node* value = required(node, "value", u"in when_skipped"_s)) {
            skipped.value = text(*value, u"value"_s);
            skipped.valueIsText = !(value->isScalar() && value->plain && isNumberText(value->text));
        }
        skipped.condition = condition(node, "if");
        return skipped;
    }

    TestRespondent readRespondent(const Node& node) {
        TestRespondent respondent;
        if (!openMap(node, u"a test respondent must be a map {name, answers, path}"_s,
                     u"in test respondent"_s, kRespondentKeys))
            return respondent;
        if (const Node* name = required(node, "name", u"in test respondent"_s))
            respondent.name = text(*name, u"name"_s);
        if (const Node* answers = node.find("answers"_L1))
            readAnswers(*answers, respondent.answers);
        if (const Node* path = node.find("path"_L1))
            for (const Node& entry : list(*path, u"path"_s))
                respondent.path.append(text(entry, u"path"_s));
        return respondent;
    }

    void readAnswers(const Node& node, QList<Answer>& answers) {
        if (node.isNull())
            return;
        if (!node.isMap()) {
            error(node, u"'answers' must be a map of item names to values, not %1"_s.arg(
                            describeKind(node)));
            return;
        }
        for (size_t i = 0; i < node.keys.size(); ++i)
            answers.append({node.keys[i].text, answerValue(node.children[i])});
    }

    AnswerValue answerValue(const Node& node) {
        AnswerValue value;
        if (node.isSequence()) {
            value.kind = AnswerValue::Kind::List;
            for (const Node& code : node.children)
                value.codes.append(integer(code, u"answer code"_s));
        } else if (node.isMap()) {
            error(node, u"an answer must be a number, text or a list of codes, not a map"_s);
        } else {
            const bool number = node.isScalar() && node.plain && isNumberText(node.text);
            value.kind = number ? AnswerValue::Kind::Number : AnswerValue::Kind::Text;
            value.text = node.text;
        }
        return value;
    }

    QString m_file;
    Diagnostics m_errors;
    const QList<CodeList>* m_codeLists = nullptr;
};

} // namespace

LoadResult readInstrument(const Node& root, const QString& fileName) {
    Reader reader(fileName);
    LoadResult result;
    result.instrument = reader.read(root);
    result.errors = reader.takeErrors();
    return result;
}

} // namespace rb::yaml
