#include "RecordChecker.h"

#include "routing/Simulator.h"

#include <QSet>

namespace rb {

namespace {

void collectNames(const cond::Expr& expr, QStringList& names) {
    if (!expr.name.isEmpty())
        names.append(expr.name);
    for (const cond::ExprPtr& child : expr.children)
        collectNames(*child, names);
}

void addGates(const CompiledRouting& routing, const cond::ExprPtr& expr, QList<int>& gates) {
    if (!expr)
        return;
    QStringList names;
    collectNames(*expr, names);
    for (const QString& name : names) {
        const int p = routing.positionOf(name);
        if (p >= 0 && !gates.contains(p))
            gates.append(p);
    }
}

} // namespace

QList<int> skipGates(const CompiledRouting& routing, int position) {
    // Direct gates: the item's filters, and the rules of earlier items that can
    // jump over it. (An item skipped because its gate was itself skipped after
    // a missing answer inherits that through the gate's own flag.)
    QList<int> gates;
    for (const cond::ExprPtr& filter : routing.item(position).filters)
        addGates(routing, filter, gates);
    for (int q = 0; q < position; ++q)
        for (const CompiledRouting::CompiledRule& rule : routing.item(q).rules)
            if (rule.usable && rule.target > position)
                addGates(routing, rule.condition, gates);
    return gates;
}

RecordChecker::RecordChecker(const CompiledRouting& routing, const HeaderMapping& mapping)
    : m_routing(routing), m_cells(routing, mapping) {
    const int count = routing.itemCount();
    m_plans.resize(size_t(count));
    for (int p = 0; p < count; ++p) {
        ItemPlan& plan = m_plans[size_t(p)];
        const Item& item = *routing.index().at(p).item;
        plan.hasVariable = m_cells.hasVariable(p);
        if (!plan.hasVariable)
            continue;
        plan.gates = skipGates(routing, p);
        if (item.whenSkipped) {
            plan.hasImplied = true;
            if (item.whenSkipped->condition) {
                plan.impliedIf = routing.compileCondition(*item.whenSkipped->condition);
                plan.impliedBroken = plan.impliedIf == nullptr;
            }
        }
    }
}

RecordClassification RecordChecker::classify(RecordFields fields) const {
    const int count = m_routing.itemCount();
    std::vector<CellReading> readings{size_t(count)};
    for (int p = 0; p < count; ++p)
        readings[size_t(p)] = m_cells.read(p, fields);
    const RouteResult route =
        simulateRoute(m_routing, [&](int p) { return readings[size_t(p)].value; });
    RecordClassification r;
    r.path = route.path;
    r.loop = route.loop;
    r.presented.assign(size_t(count), 0);
    for (int p : route.path)
        r.presented[size_t(p)] = 1;
    r.classes.assign(size_t(count), CellClass::Answered);
    r.unknownSkip.assign(size_t(count), 0);
    r.implied.assign(size_t(count), 0);
    r.counted.resize(size_t(count));
    const cond::Environment env = environmentFor(m_routing, route.values);
    for (int p = 0; p < count; ++p) {
        const ItemPlan& plan = m_plans[size_t(p)];
        if (!plan.hasVariable)
            continue;
        const CellReading& reading = readings[size_t(p)];
        CellClass& c = r.classes[size_t(p)];
        if (r.presented[size_t(p)]) {
            c = reading.presented;
            r.counted[size_t(p)] = reading.counted;
            if (c != CellClass::Blank)
                r.anyValue = true;
            continue;
        }
        if (!reading.skipIsLegitimate) {
            c = CellClass::RoutingViolation;
            continue;
        }
        c = CellClass::LegitimateSkip;
        for (int g : plan.gates) {
            const bool gateMissing = r.presented[size_t(g)] ? isNonresponse(r.classes[size_t(g)])
                                                            : bool(r.unknownSkip[size_t(g)]);
            if (gateMissing) {
                r.unknownSkip[size_t(p)] = 1;
                break;
            }
        }
        if (plan.hasImplied && !plan.impliedBroken &&
            (!plan.impliedIf || cond::evaluate(*plan.impliedIf, env)))
            r.implied[size_t(p)] = 1;
    }
    // Break-off: the presented items are blank from some item to the end (at least
    // two of them, so that one unanswered last question is not a break-off).
    int runStart = -1, runLength = 0;
    QSet<int> seen;
    for (int p : route.path) {
        if (!m_plans[size_t(p)].hasVariable || seen.contains(p))
            continue;
        seen.insert(p);
        if (r.classes[size_t(p)] == CellClass::Blank) {
            if (runLength++ == 0)
                runStart = p;
        } else {
            runLength = 0;
        }
    }
    r.breakOffStart = runLength >= 2 ? runStart : -1;
    return r;
}

} // namespace rb
