#include "Simulator.h"

namespace rb {

cond::Environment environmentFor(const CompiledRouting& routing,
                                 const QList<cond::CellValue>& values) {
    cond::Environment env;
    env.value = [&routing, &values](const QString& name) {
        const int position = routing.positionOf(name);
        return position < 0 ? cond::CellValue::notPresented() : values.at(position);
    };
    env.isMissingCode = [&routing](const QString& name, qint64 code) {
        const int position = routing.positionOf(name);
        return position >= 0 && routing.isMissingCode(position, code);
    };
    return env;
}

namespace {

// Filters joined with an `and` evaluated left to right (module's first): the
// first that fails stops the others from being evaluated.
bool filtersPass(const CompiledRouting::CompiledItem& item, int position,
                 const cond::Environment& env, QList<Evaluation>* trace) {
    for (int k = 0; k < item.filters.size(); ++k) {
        if (trace)
            trace->append({position, k, -1});
        if (!cond::evaluate(*item.filters[k], env))
            return false;
    }
    return true;
}

// The position the route moves to after presenting `position`.
int nextPosition(const CompiledRouting::CompiledItem& item, int position,
                 const cond::Environment& env, QList<Evaluation>* trace) {
    for (int k = 0; k < item.rules.size(); ++k) {
        const CompiledRouting::CompiledRule& rule = item.rules[k];
        if (!rule.usable)
            continue;
        if (!rule.condition)
            return rule.target;
        if (trace)
            trace->append({position, -1, k});
        if (cond::evaluate(*rule.condition, env))
            return rule.target;
    }
    return position + 1;
}

} // namespace

RouteResult simulateRoute(const CompiledRouting& routing,
                          const std::function<cond::CellValue(int position)>& answerOf,
                          bool trace) {
    RouteResult result;
    const int count = routing.itemCount();
    result.values.fill(cond::CellValue::notPresented(), count);
    const cond::Environment env = environmentFor(routing, result.values);
    QList<Evaluation>* evaluated = trace ? &result.evaluated : nullptr;
    const qint64 guard = routeStepLimit(count);
    qint64 steps = 0;
    int position = 0;
    while (position < count) {
        if (++steps > guard) {
            result.loop = true;
            break;
        }
        const CompiledRouting::CompiledItem& item = routing.item(position);
        if (!filtersPass(item, position, env, evaluated)) {
            result.values[position] = cond::CellValue::notPresented(); // filtered: empty
            ++position;
            continue;
        }
        result.values[position] = answerOf(position);
        result.path.append(position);
        position = nextPosition(item, position, env, evaluated);
    }
    return result;
}

} // namespace rb
