#include "Instrument.h"

#include "condition/Spelling.h"

#include <algorithm>

namespace rb {

namespace {
struct MissingName {
    MissingKind kind;
    const char* name;
};
constexpr MissingName kMissingNames[] = {{MissingKind::DontKnow, "dont_know"},
                                         {MissingKind::Refused, "refused"},
                                         {MissingKind::NotApplicable, "not_applicable"}};

struct TypeName {
    ItemType type;
    const char* name;
};
constexpr TypeName kTypeNames[] = {
    {ItemType::Single, "single"},      {ItemType::Multi, "multi"}, {ItemType::Integer, "integer"},
    {ItemType::Decimal, "decimal"},    {ItemType::Text, "text"},   {ItemType::Date, "date"},
    {ItemType::Statement, "statement"}};

} // namespace

QString missingKindName(MissingKind kind) {
    for (const auto& m : kMissingNames)
        if (m.kind == kind)
            return QString::fromLatin1(m.name);
    return {};
}

std::optional<MissingKind> missingKindFromName(const QString& name) {
    for (const auto& m : kMissingNames)
        if (name == QLatin1String(m.name))
            return m.kind;
    return std::nullopt;
}

QString itemTypeName(ItemType type) {
    for (const auto& t : kTypeNames)
        if (t.type == type)
            return QString::fromLatin1(t.name);
    return {};
}

std::optional<ItemType> itemTypeFromName(const QString& name) {
    for (const auto& t : kTypeNames)
        if (name == QLatin1String(t.name))
            return t.type;
    return std::nullopt;
}

const CodeList* Instrument::findCodeList(const QString& name) const {
    for (const CodeList& list : codeLists)
        if (list.name.compare(name, Qt::CaseInsensitive) == 0)
            return &list;
    return nullptr;
}

const QList<Code>& Instrument::listedCodes(const Item& item) const {
    static const QList<Code> none;
    if (item.hasInlineCodes)
        return item.inlineCodes;
    if (!item.codeListName.isEmpty())
        if (const CodeList* list = findCodeList(item.codeListName))
            return list->codes;
    return none;
}

QList<Code> Instrument::codesOf(const Item& item) const {
    return listedCodes(item) + item.missing;
}

ItemIndex::ItemIndex(const Instrument& instrument) {
    qsizetype items = 0;
    for (const Module& module : instrument.modules)
        items += module.items.size();
    // One pass, sized up front: every check, export and analysis builds an index.
    m_entries.reserve(items);
    m_byName.reserve(items);
    m_moduleFirst.reserve(instrument.modules.size());
    int position = 0;
    for (int m = 0; m < instrument.modules.size(); ++m) {
        const Module& module = instrument.modules.at(m);
        // An empty module's goto lands on whatever follows it.
        m_moduleFirst.insert(module.name, position);
        for (const Item& item : module.items)
            m_entries.append({&item, &module, m, position++, item.type});
    }
    // Duplicate names: keep the first occurrence (a duplicate-name finding
    // reports the rest).
    // Two steps ahead: a name's characters first (the hash reads them), its
    // slot once they have arrived.
    constexpr int ahead = NameTable::PrefetchDistance;
    for (qsizetype i = 0; i < m_entries.size(); ++i) {
        if (i + 2 * ahead < m_entries.size())
            __builtin_prefetch(m_entries[i + 2 * ahead].item->name.constData());
        if (i + ahead < m_entries.size())
            m_byName.prefetch(m_entries[i + ahead].item->name);
        m_byName.insert(m_entries[i].item->name, int(i));
    }
}

int ItemIndex::positionOf(const QString& name) const {
    return m_byName.value(name);
}

int ItemIndex::modulePosition(const QString& name) const {
    return m_moduleFirst.value(name);
}

int ItemIndex::resolveTarget(const QString& target) const {
    if (target.compare(QLatin1String("END"), Qt::CaseInsensitive) == 0)
        return size();
    const int item = positionOf(target);
    if (item >= 0)
        return item;
    return modulePosition(target);
}

QStringList multiVariableNames(const Instrument& instrument, const Item& item) {
    QStringList names;
    for (const Code& code : instrument.codesOf(item))
        names.append(item.name + QLatin1Char('_') + QString::number(code.code));
    return names;
}

bool isConditionKeyword(const QString& word) {
    return cond::keywordSpelled(word) != nullptr;
}

bool isValidItemName(const QString& name) {
    // A letter, then letters, digits or _: by hand, since every check runs this
    // on every name and a regular expression match cost ~2,000 instructions each.
    if (name.isEmpty() || name.size() > 32 || !cond::isAsciiLetter(name.front()) ||
        !std::all_of(name.cbegin() + 1, name.cend(), cond::isNameChar))
        return false;
    return !isConditionKeyword(name) &&
           name.compare(QLatin1String("END"), Qt::CaseInsensitive) != 0;
}

} // namespace rb
