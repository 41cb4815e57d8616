#include "TrialRun.h"

#include "routing/AnswerReplay.h"
#include "routing/Simulator.h"

namespace rb {

TrialRun::TrialRun(const Instrument& instrument)
    : m_instrument(std::make_unique<Instrument>(instrument)),
      m_routing(std::make_unique<CompiledRouting>(*m_instrument)) {
    m_values.fill(cond::CellValue::notPresented(), m_routing->itemCount());
    advance(0, nullptr);
}

const Item* TrialRun::currentItem() const {
    return m_current < 0 ? nullptr : m_routing->index().at(m_current).item;
}

QList<Code> TrialRun::currentCodes() const {
    return m_current < 0 ? QList<Code>() : m_routing->codes(m_current);
}

QStringList TrialRun::path() const {
    QStringList names;
    for (const Step& step : m_steps)
        names.append(m_routing->index().at(step.position).item->name);
    return names;
}

void TrialRun::setValue(int position, const cond::CellValue& value, Step* step) {
    if (step)
        step->changes.append({position, m_values.at(position)});
    m_values[position] = value;
}

static bool filtersPass(const CompiledRouting::CompiledItem& item, const cond::Environment& env) {
    for (const cond::ExprPtr& filter : item.filters)
        if (!cond::evaluate(*filter, env))
            return false;
    return true;
}

// From `position`, passes over filtered items (they become empty) and stops at
// the next presented one, the end, or the loop guard.
void TrialRun::advance(int position, Step* step) {
    const int count = m_routing->itemCount();
    const qint64 guard = routeStepLimit(count);
    const cond::Environment env = environmentFor(*m_routing, m_values);
    while (position < count) {
        if (++m_guard > guard) {
            m_looped = true;
            m_current = -1;
            return;
        }
        if (filtersPass(m_routing->item(position), env)) {
            m_current = position;
            return;
        }
        setValue(position, cond::CellValue::notPresented(), step);
        ++position;
    }
    m_current = -1;
}

QString TrialRun::answer(const AnswerValue& value) {
    if (m_current < 0)
        return QStringLiteral("the run has ended");
    const Item& item = *currentItem();
    Step step{m_current, value, {}, m_guard - 1, item.type != ItemType::Statement};
    cond::CellValue cell = cond::CellValue::blank(); // statements hold no value
    if (step.hasAnswer) {
        const AnswerCheck check = cellForAnswer(item, currentCodes(), value);
        if (!check.error.isEmpty())
            return check.error;
        cell = check.value;
    }
    setValue(m_current, cell, &step);
    const cond::Environment env = environmentFor(*m_routing, m_values);
    int next = m_current + 1;
    for (const CompiledRouting::CompiledRule& rule : m_routing->item(m_current).rules) {
        if (!rule.usable)
            continue;
        if (!rule.condition || cond::evaluate(*rule.condition, env)) {
            next = rule.target;
            break;
        }
    }
    advance(next, &step);
    m_steps.append(step);
    return {};
}

void TrialRun::back() {
    if (m_steps.isEmpty())
        return;
    const Step step = m_steps.takeLast();
    for (int i = int(step.changes.size()) - 1; i >= 0; --i)
        m_values[step.changes.at(i).position] = step.changes.at(i).previous;
    m_current = step.position;
    m_guard = step.guardBefore + 1; // the visit that presented this item
    m_looped = false;
}

TestRespondent TrialRun::toTestRespondent(const QString& name) const {
    TestRespondent respondent;
    respondent.name = name;
    QHash<QString, int> slot; // lower-case item name -> index in answers
    for (const Step& step : m_steps) {
        const QString item = m_routing->index().at(step.position).item->name;
        respondent.path.append(item);
        if (!step.hasAnswer)
            continue;
        const auto it = slot.constFind(item.toLower());
        if (it != slot.constEnd()) {
            respondent.answers[*it].value = step.answer; // a loop: the last answer counts
            continue;
        }
        slot.insert(item.toLower(), int(respondent.answers.size()));
        respondent.answers.append({item, step.answer});
    }
    return respondent;
}

} // namespace rb
