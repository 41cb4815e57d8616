#include "CompiledRouting.h"

#include "condition/Parser.h"
#include "condition/TypeCheck.h"

namespace rb {

CompiledRouting::CompiledRouting(const Instrument& instrument)
    : m_instrument(&instrument), m_index(instrument) {
    m_items.reserve(m_index.size());
    m_codes.reserve(m_index.size());
    for (const ItemIndex::Entry& entry : m_index.entries()) {
        CompiledItem compiled;
        if (entry.module->askIf)
            if (cond::ExprPtr expr = compileCondition(*entry.module->askIf)) {
                compiled.filters.append(expr);
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
        m_codes.append(instrument.codesOf(*entry.item));
    }
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
    for (const Code& c : m_codes.at(position))
        if (c.code == code)
            return c.isMissing();
    return false;
}

} // namespace rb
