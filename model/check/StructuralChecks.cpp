#include "StructuralChecks.h"

#include "condition/Parser.h"
#include "condition/TypeCheck.h"
#include "instrument/NameTable.h"

#include <QVarLengthArray>

#include <algorithm>
#include <cmath>
#include <deque>
#include <limits>

namespace rb {

using namespace Qt::StringLiterals;

namespace {

// Where a condition or field lives, for the findings about it.
struct Place {
    const Item* item = nullptr; // null for module-level
    const Module* module = nullptr;
    int position = -1;
    QString field;    // a rule's: "if" or "goto", written out as "routing[k].if"
    QString codeList; // set for findings about a shared code list
    int rule = -1;    // the rule's index, for a rule's field

    // The field's text is made only for a finding: every rule of a large
    // instrument has two places, and nearly none of them ever has a finding.
    QString fieldText() const {
        return rule < 0 ? field : u"routing["_s + QString::number(rule) + u"]."_s + field;
    }
};

class Checker {
public:
    explicit Checker(const CompiledRouting& routing)
        : m_routing(routing), m_index(routing.index()) {}

    Findings run() {
        const Instrument& instrument = m_routing.instrument();
        m_names.reserve(m_index.size() + instrument.modules.size());
        m_claimants.reserve(m_index.size() + instrument.modules.size());
        // One pass over the items for every per-item check: on a large
        // instrument each further pass read every item from memory again.
        // (Callers sort the findings, so the order they are found in is free.)
        int position = 0;
        for (const Module& module : instrument.modules) {
            claimModuleName(module);
            for (qsizetype i = 0; i < module.items.size(); ++i) {
                prefetchAhead(position);
                const ItemIndex::Entry& entry = m_index.at(position++);
                claimItemNames(entry);
                noteCodeListUse(*entry.item);
                checkItem(entry);
            }
        }
        checkCodeLists();
        checkModules();
        return m_findings;
    }

private:
    // What the pass reads of later items, two steps ahead: on a large
    // instrument each name, text and tree is a block of its own that is not
    // in the caches. First the blocks the item points to, then (once those
    // have arrived) the name's table slot and the rules' trees.
    void prefetchAhead(int position) const {
        constexpr int ahead = NameTable::PrefetchDistance;
        if (position + 2 * ahead < m_index.size()) {
            const Item& far = *m_index.at(position + 2 * ahead).item;
            __builtin_prefetch(far.name.constData());
            __builtin_prefetch(far.text.constData());
            __builtin_prefetch(far.routing.constData());
            __builtin_prefetch(m_routing.item(position + 2 * ahead).rules.constData());
        }
        if (position + ahead < m_index.size()) {
            m_names.prefetch(m_index.at(position + ahead).item->name);
            for (const CompiledRouting::CompiledRule& rule : m_routing.item(position + ahead).rules)
                __builtin_prefetch(rule.condition.get());
        }
    }
    void add(const Place& place, const QString& check, Severity severity, const QString& message,
             std::optional<int> column = std::nullopt) {
        Finding f;
        f.check = check;
        f.severity = severity;
        f.item = place.item ? place.item->name : QString();
        f.module = place.module ? place.module->name : QString();
        f.field = place.fieldText();
        f.subject = place.codeList;
        f.column = column;
        f.message = message;
        f.position = place.position;
        m_findings.append(f);
    }

    Place itemPlace(const ItemIndex::Entry& e, const QString& field) const {
        return {e.item, e.module, e.position, field, {}};
    }

    // Position of a module: that of its first item, or of whatever follows it.
    int modulePosition(const Module& module) const { return m_index.modulePosition(module.name); }

    // Names are claimed in questionnaire order: a module before its items, an
    // item before its multi variables.
    void checkNameIsValid(const QString& name, const Place& place, const QString& whose);
    void claimModuleName(const Module& module);
    void claimItemNames(const ItemIndex::Entry& entry);
    // Who holds a name; worded only when a duplicate needs the message (every
    // item claims one, so building the words up front cost a string apiece).
    // The names by address (the instrument's, or m_variableNames's): a copy
    // per item touched every name string once more when the checker was freed.
    struct Claimant {
        enum class Kind { Module, Item, Variable } kind;
        const QString* name;
        const QString* item = nullptr; // Variable: the multi item it belongs to
        QString words() const;
    };
    void claimName(const QString& name, const Place& place, const Claimant& who);
    void noteCodeListUse(const Item& item);
    void checkCodeLists();
    // Reports codes already in `seen` (kept sorted) and adds the others to it.
    void checkCodes(const QList<Code>& codes, const Place& place, const QString& fieldPrefix,
                    std::vector<qint64>& seen);
    void checkItem(const ItemIndex::Entry& entry);
    void checkItemCodes(const ItemIndex::Entry& entry);
    void checkRange(const ItemIndex::Entry& entry);
    void checkRules(const ItemIndex::Entry& entry);
    void checkModules();
    // Parses, type-checks and looks for forward references and unknown codes.
    // `limit`: the condition may read items at positions < limit only.
    // `compiled`: the routing's tree of this text when it compiled (then it
    // has neither syntax nor type problems, and is not parsed again).
    void checkCondition(const QString& text, const Place& place, int limit, const QString& why,
                        const cond::ExprPtr& compiled = nullptr);
    void checkUnknownCodes(const cond::Expr& expr, const Place& place);

    const CompiledRouting& m_routing;
    const ItemIndex& m_index;
    Findings m_findings;
    NameTable m_names; // name (any case) -> index in m_claimants
    QList<Claimant> m_claimants;
    std::deque<QString> m_variableNames; // multi items' variables (addresses stay put)
    std::vector<qint64> m_seen;          // checkItemCodes's codes so far, reused from item to item
    NameTable m_usedLists;               // code lists that items name (any case)
    const QString* m_lastList = nullptr; // the list name noted last
};

QString Checker::Claimant::words() const {
    switch (kind) {
    case Kind::Module:
        return QStringLiteral("module '%1'").arg(*name);
    case Kind::Item:
        return QStringLiteral("item '%1'").arg(*name);
    case Kind::Variable:
        return QStringLiteral("variable '%1' of multi item '%2'").arg(*name, *item);
    }
    return {};
}

void Checker::claimName(const QString& name, const Place& place, const Claimant& who) {
    const int next = int(m_claimants.size());
    const int holder = m_names.insert(name, next);
    if (holder != next) {
        add(place, QStringLiteral("duplicate-name"), Severity::Error,
            QStringLiteral("the name '%1' of %2 is already used by %3 (names must be unique "
                           "ignoring case)")
                .arg(name, who.words(), m_claimants.at(holder).words()));
        return;
    }
    m_claimants.append(who);
}

void Checker::checkNameIsValid(const QString& name, const Place& place, const QString& whose) {
    if (!isValidItemName(name))
        add(place, QStringLiteral("invalid-name"), Severity::Error,
            QStringLiteral("%1 name '%2' is not a valid name (a letter, then letters, digits or _, "
                           "at most 32, not a keyword nor END)")
                .arg(whose, name));
}

void Checker::claimModuleName(const Module& module) {
    const Place place{nullptr, &module, modulePosition(module), QStringLiteral("name"), {}};
    checkNameIsValid(module.name, place, QStringLiteral("module"));
    claimName(module.name, place, {Claimant::Kind::Module, &module.name});
}

void Checker::claimItemNames(const ItemIndex::Entry& e) {
    const Item& item = *e.item;
    const Place ip = itemPlace(e, QStringLiteral("name"));
    checkNameIsValid(item.name, ip, QStringLiteral("item"));
    claimName(item.name, ip, {Claimant::Kind::Item, &item.name});
    if (item.type == ItemType::Multi)
        for (const QString& variable : multiVariableNames(m_routing.instrument(), item)) {
            const QString& kept = m_variableNames.emplace_back(variable);
            claimName(kept, ip, {Claimant::Kind::Variable, &kept, &item.name});
        }
}

void Checker::checkCodes(const QList<Code>& codes, const Place& place, const QString& fieldPrefix,
                         std::vector<qint64>& seen) {
    for (int i = 0; i < codes.size(); ++i) {
        const qint64 code = codes.at(i).code;
        const auto at = std::lower_bound(seen.begin(), seen.end(), code);
        if (at != seen.end() && *at == code) {
            Place p = place;
            p.field = QStringLiteral("%1[%2]").arg(fieldPrefix).arg(i);
            add(p, QStringLiteral("duplicate-code"), Severity::Error,
                QStringLiteral("code %1 appears more than once").arg(code));
        } else {
            seen.insert(at, code);
        }
    }
}

void Checker::noteCodeListUse(const Item& item) {
    // Consecutive items mostly share a list, and a name equal to the last one
    // needs no lookup; the table compares names ignoring case without making a
    // lower-case copy per item.
    const QString& name = item.codeListName;
    if (item.hasInlineCodes || name.isEmpty() || (m_lastList && name == *m_lastList))
        return;
    m_usedLists.insert(name, 0);
    m_lastList = &name;
}

void Checker::checkCodeLists() {
    const Instrument& instrument = m_routing.instrument();
    for (const CodeList& list : instrument.codeLists) {
        Place place{nullptr, nullptr, -1, QStringLiteral("code_lists.%1").arg(list.name),
                    list.name};
        if (list.codes.isEmpty())
            add(place, QStringLiteral("empty-code-list"), Severity::Error,
                QStringLiteral("code list '%1' has no codes").arg(list.name));
        std::vector<qint64> seen;
        checkCodes(list.codes, place, place.field, seen);
        if (m_usedLists.value(list.name) < 0)
            add(place, QStringLiteral("unused-code-list"), Severity::Warning,
                QStringLiteral("code list '%1' is used by no item").arg(list.name));
    }
}

bool isCoded(ItemType type) {
    return type == ItemType::Single || type == ItemType::Multi;
}
bool isNumeric(ItemType type) {
    return type == ItemType::Integer || type == ItemType::Decimal;
}

void Checker::checkItemCodes(const ItemIndex::Entry& e) {
    const Item& item = *e.item;
    std::vector<qint64>& seen = m_seen;
    seen.clear();
    if (item.hasInlineCodes) {
        checkCodes(item.inlineCodes, itemPlace(e, {}), QStringLiteral("codes"), seen);
    } else if (!item.missing.isEmpty()) {
        if (const CodeList* list = m_routing.instrument().findCodeList(item.codeListName))
            for (const Code& c : list->codes)
                seen.push_back(c.code);
        std::sort(seen.begin(), seen.end());
    }
    checkCodes(item.missing, itemPlace(e, {}), QStringLiteral("missing"), seen);
    if (isCoded(item.type)) {
        // The routing's codes of the item: the codes and missing codes it holds.
        if (m_routing.codes(e.position).isEmpty())
            add(itemPlace(e, QStringLiteral("codes")), QStringLiteral("empty-code-list"),
                Severity::Error,
                QStringLiteral("%1 item '%2' has no codes")
                    .arg(itemTypeName(item.type), item.name));
    }
}

void Checker::checkRange(const ItemIndex::Entry& e) {
    const Item& item = *e.item;
    if (!item.range)
        return;
    const Place place = itemPlace(e, QStringLiteral("range"));
    const auto& [low, high] = *item.range;
    if (!isNumeric(item.type))
        add(place, QStringLiteral("bad-range"), Severity::Error,
            QStringLiteral("a range is only for integer and decimal items, not %1")
                .arg(itemTypeName(item.type)));
    else if (low.value > high.value)
        add(place, QStringLiteral("bad-range"), Severity::Error,
            QStringLiteral("range [%1, %2] is empty: the minimum is above the maximum")
                .arg(low.text, high.text));
    else if (item.type == ItemType::Integer &&
             (std::floor(low.value) != low.value || std::floor(high.value) != high.value))
        add(place, QStringLiteral("bad-range"), Severity::Error,
            QStringLiteral(
                "range [%1, %2] of an integer item has a bound that is not a whole number")
                .arg(low.text, high.text));
}

void Checker::checkRules(const ItemIndex::Entry& e) {
    const Item& item = *e.item;
    const QList<CompiledRouting::CompiledRule>& compiled = m_routing.item(e.position).rules;
    for (int k = 0; k < item.routing.size(); ++k) {
        const Rule& rule = item.routing.at(k);
        Place ifPlace = itemPlace(e, u"if"_s);
        ifPlace.rule = k;
        if (rule.condition)
            // A rule is evaluated after its item is presented: it may read the item itself.
            checkCondition(*rule.condition, ifPlace, e.position + 1, QStringLiteral("a later item"),
                           compiled.at(k).condition);
        Place goPlace = itemPlace(e, u"goto"_s);
        goPlace.rule = k;
        const int target = compiled.at(k).target;
        if (target < 0)
            add(goPlace, QStringLiteral("unknown-target"), Severity::Error,
                QStringLiteral("goto '%1' names no item, module or END").arg(rule.target));
        else if (target == e.position + 1)
            add(goPlace, QStringLiteral("redundant-goto"), Severity::Warning,
                QStringLiteral("goto '%1' leads where the questionnaire goes anyway")
                    .arg(rule.target));
    }
}

void Checker::checkItem(const ItemIndex::Entry& e) {
    const Item& item = *e.item;
    // Read in place: trimmed() would copy (or share) every item's text.
    const bool blank =
        std::all_of(item.text.cbegin(), item.text.cend(), [](QChar c) { return c.isSpace(); });
    if (blank)
        add(itemPlace(e, QStringLiteral("text")), QStringLiteral("missing-text"), Severity::Warning,
            QStringLiteral("item '%1' has no question text").arg(item.name));
    checkItemCodes(e);
    checkRange(e);
    if (item.askIf) {
        // A filter is evaluated before its item is presented: earlier items only.
        // The routing keeps the item's own filter last when it compiled.
        const CompiledRouting::CompiledItem& c = m_routing.item(e.position);
        const bool ownCompiled = c.filters.size() > (c.hasModuleFilter ? 1 : 0);
        checkCondition(*item.askIf, itemPlace(e, QStringLiteral("ask_if")), e.position,
                       QStringLiteral("the item itself or a later item"),
                       ownCompiled ? c.filters.last() : nullptr);
    }
    checkRules(e);
    if (item.whenSkipped && item.whenSkipped->condition)
        checkCondition(*item.whenSkipped->condition,
                       itemPlace(e, QStringLiteral("when_skipped.if")), m_index.size(), {});
}

void Checker::checkModules() {
    for (const Module& module : m_routing.instrument().modules) {
        const int position = modulePosition(module);
        if (module.items.isEmpty())
            add({nullptr, &module, position, QStringLiteral("items"), {}},
                QStringLiteral("empty-module"), Severity::Warning,
                QStringLiteral("module '%1' has no items").arg(module.name));
        if (module.askIf)
            // A module filter is evaluated at each of its items: items before the module only.
            checkCondition(*module.askIf,
                           {nullptr, &module, position, QStringLiteral("ask_if"), {}}, position,
                           QStringLiteral("an item of this module or a later one"));
    }
}

void Checker::checkCondition(const QString& text, const Place& place, int limit, const QString& why,
                             const cond::ExprPtr& compiled) {
    cond::ExprPtr expr = compiled;
    QList<cond::ConditionProblem> problems;
    if (!expr) {
        const cond::ParseResult parsed = cond::parseCondition(text);
        if (!parsed.ok()) {
            add(place, QStringLiteral("syntax"), Severity::Error,
                parsed.error ? parsed.error->message : QStringLiteral("cannot parse the condition"),
                parsed.error ? parsed.error->column : 1);
            return;
        }
        expr = parsed.expr;
        problems = cond::typeCheck(*expr, m_index);
    }
    for (const cond::ConditionProblem& p : problems)
        add(place, p.check, Severity::Error, p.message, p.column);
    cond::forEachNameRead(*expr, [&](const cond::Expr& atom) {
        if (m_routing.positionOf(atom) >= limit)
            add(place, QStringLiteral("forward-reference"), Severity::Error,
                QStringLiteral("the condition reads '%1', which is %2: it is not asked yet when "
                               "the condition is evaluated")
                    .arg(atom.name, why),
                atom.nameColumn);
    });
    if (problems.isEmpty())
        checkUnknownCodes(*expr, place);
}

// The values an item may hold when presented, as closed intervals (codes are points).
using Interval = std::pair<double, double>;
// On the stack for the usual few codes: asked once per atom of every condition.
using Intervals = QVarLengthArray<Interval, 16>;
Intervals possibleValues(const Item& item, const QList<Code>& codes) {
    Intervals values;
    for (const Code& c : codes)
        if (isCoded(item.type) || c.isMissing())
            values.append({double(c.code), double(c.code)});
    if (isNumeric(item.type)) {
        const double inf = std::numeric_limits<double>::infinity();
        values.append(item.range ? Interval{item.range->first.value, item.range->second.value}
                                 : Interval{-inf, inf});
    }
    return values;
}

bool meets(const Intervals& values, Interval wanted, bool openLow, bool openHigh) {
    for (const Interval& v : values) {
        const bool aboveLow = openLow ? v.second > wanted.first : v.second >= wanted.first;
        const bool belowHigh = openHigh ? v.first < wanted.second : v.first <= wanted.second;
        if (aboveLow && belowHigh)
            return true;
    }
    return false;
}

// The literal's value set, tested against what the item can hold.
bool literalMeetsItem(const cond::Expr& atom, const Intervals& values,
                      const cond::ListElement* element) {
    const double inf = std::numeric_limits<double>::infinity();
    if (element) {
        const double high = element->high ? element->high->number : element->low.number;
        return meets(values, {element->low.number, high}, false, false);
    }
    const double v = atom.value.number;
    switch (atom.op) {
    case cond::CompareOp::Eq:
    case cond::CompareOp::Ne:
        return meets(values, {v, v}, false, false);
    case cond::CompareOp::Lt:
        return meets(values, {-inf, v}, true, true);
    case cond::CompareOp::Le:
        return meets(values, {-inf, v}, true, false);
    case cond::CompareOp::Gt:
        return meets(values, {v, inf}, true, true);
    case cond::CompareOp::Ge:
        return meets(values, {v, inf}, false, true);
    }
    return true;
}

void Checker::checkUnknownCodes(const cond::Expr& expr, const Place& place) {
    for (const cond::ExprPtr& child : expr.children)
        checkUnknownCodes(*child, place);
    using K = cond::Expr::Kind;
    if (expr.kind != K::Compare && expr.kind != K::In && expr.kind != K::Has)
        return;
    const int position = m_routing.positionOf(expr);
    if (position < 0)
        return;
    const Item& item = *m_index.at(position).item;
    if (!isCoded(item.type) && !isNumeric(item.type))
        return;
    const Intervals values = possibleValues(item, m_routing.codes(position));
    auto report = [&](const QString& literal) {
        add(place, QStringLiteral("unknown-code"), Severity::Warning,
            QStringLiteral("'%1' is compared with %2, which holds none of its %3")
                .arg(expr.name, literal,
                     isCoded(item.type) ? QStringLiteral("codes")
                                        : QStringLiteral("range and missing codes")),
            expr.column);
    };
    if (expr.kind == K::In) {
        for (const cond::ListElement& element : expr.list)
            if (element.low.isNumber() && !literalMeetsItem(expr, values, &element))
                report(element.high ? element.low.text + QStringLiteral("..") + element.high->text
                                    : element.low.text);
    } else if (expr.value.isNumber() && !literalMeetsItem(expr, values, nullptr)) {
        report(expr.kind == K::Compare
                   ? cond::compareOpText(expr.op) + QLatin1Char(' ') + expr.value.text
                   : expr.value.text);
    }
}

} // namespace

Findings structuralFindings(const CompiledRouting& routing) {
    return Checker(routing).run();
}

} // namespace rb
