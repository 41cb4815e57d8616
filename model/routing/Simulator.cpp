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

static bool filtersPass(const CompiledRouting::CompiledItem& item, const cond::Environment& env) {
    for (const cond::ExprPtr& filter : item.filters)
        if (!cond::evaluate(*filter, env))
            return false;
    return true;
}

// The position the route moves to after presenting `position`.
static int nextPosition(const CompiledRouting::CompiledItem& item, int position,
                        const cond::Environment& env) {
    for (const CompiledRouting::CompiledRule& rule : item.rules) {
        if (!rule.usable)
            continue;
        if (!rule.condition || cond::evaluate(*rule.condition, env))
            return rule.target;
    }
    return position + 1;
}

RouteResult simulateRoute(const CompiledRouting& routing,
                          const std::function<cond::CellValue(int position)>& answerOf) {
    RouteResult result;
    const int count = routing.itemCount();
    result.values.fill(cond::CellValue::notPresented(), count);
    const cond::Environment env = environmentFor(routing, result.values);
    const qint64 guard = 4 * qint64(count);
    qint64 steps = 0;
    int position = 0;
    while (position < count) {
        if (++steps > guard) {
            result.loop = true;
            break;
        }
        const CompiledRouting::CompiledItem& item = routing.item(position);
        if (!filtersPass(item, env)) {
            result.values[position] = cond::CellValue::notPresented(); // filtered: empty
            ++position;
            continue;
        }
        result.values[position] = answerOf(position);
        result.path.append(position);
        position = nextPosition(item, position, env);
    }
    return result;
}

} // namespace rb
