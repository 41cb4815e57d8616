#include "CompiledRouting.h"

#include "condition/Parser.h"
#include "condition/TypeCheck.h"
#include "instrument/NameTable.h"

namespace rb {

CompiledRouting::CompiledRouting(const Instrument& instrument)
    : m_instrument(&instrument), m_index(instrument) {
    m_items.reserve(m_index.size());
    m_codes.reserve(m_index.size());
    // A module's filter is compiled once and its tree shared by its items.
    int filterModule = -1;
    cond::ExprPtr moduleFilter;
    const QList<ItemIndex::Entry>& entries = m_index.entries();
    for (qsizetype i = 0; i < entries.size(); ++i) {
        // Two steps ahead: an item's rules first, their texts once they are here.
        constexpr qsizetype ahead = NameTable::PrefetchDistance;
        if (i + 2 * ahead < entries.size())
            prefetchRules(*entries[i + 2 * ahead].item);
        if (i + ahead < entries.size())
            prefetchConditions(*entries[i + ahead].item);
        const ItemIndex::Entry& entry = entries[i];
        CompiledItem compiled;
        if (entry.moduleIndex != filterModule) {
            filterModule = entry.moduleIndex;
            moduleFilter = entry.module->askIf ? compileCondition(*entry.module->askIf) : nullptr;
        }
        if (moduleFilter) {
            compiled.filters.append(moduleFilter);
            compiled.hasModuleFilter = true;
        }
        if (entry.item->askIf)
            if (cond::ExprPtr expr = compileCondition(*entry.item->askIf))
                compiled.filters.append(expr);
        for (const Rule& rule : entry.item->routing) {
            CompiledRule c;
            c.target = m_index.resolveTarget(rule.target);
            if (rule.condition) {
                c.condition = compileCondition(*rule.condition);
                c.usable = c.condition != nullptr;
            }
            if (c.target < 0)
                c.usable = false;
            compiled.rules.append(c);
        }
        m_items.append(compiled);
        m_codes.push_back(codesOf(*entry.item));
    }
}

// The texts the loop above is about to parse, fetched while it parses earlier
// ones: on a large instrument each sits in its own block of memory, and
// waiting for every one in turn cost about a tenth of the compile at 50,000
// items.
void CompiledRouting::prefetchRules(const Item& item) {
    __builtin_prefetch(item.routing.constData());
    __builtin_prefetch(item.codeListName.constData());
    if (item.askIf)
        __builtin_prefetch(item.askIf->constData());
}

void CompiledRouting::prefetchConditions(const Item& item) {
    for (const Rule& rule : item.routing) {
        __builtin_prefetch(rule.target.constData());
        if (rule.condition)
            __builtin_prefetch(rule.condition->constData());
    }
}

// The same codes as Instrument::codesOf, without a copy where one list holds them.
const QList<Code>* CompiledRouting::codesOf(const Item& item) {
    const QList<Code>& listed = m_instrument->listedCodes(item);
    if (item.missing.isEmpty())
        return &listed;
    if (listed.isEmpty())
        return &item.missing;
    return &m_joinedCodes.emplace_back(listed + item.missing);
}

cond::ExprPtr CompiledRouting::compileCondition(const QString& text) const {
    // Atoms come out resolved to positions: the analysis, the checks and the
    // data check read them per use instead of looking the name up each time.
    cond::ParseResult parsed =
        cond::parseCondition(text, [this](const QString& name) { return positionOf(name); });
    if (!parsed.ok() || !cond::typeCheck(*parsed.expr, m_index).isEmpty())
        return nullptr;
    return parsed.expr;
}

int CompiledRouting::positionOf(const QString& name) const {
    return m_index.positionOf(name);
}

bool CompiledRouting::isMissingCode(int position, qint64 code) const {
    for (const Code& c : codes(position))
        if (c.code == code)
            return c.isMissing();
    return false;
}

} // namespace rb
