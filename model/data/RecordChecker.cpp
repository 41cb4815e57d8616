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

int kindIndex(CellClass c) {
    switch (c) {
    case CellClass::DontKnow:
        return 1;
    case CellClass::Refused:
        return 2;
    case CellClass::NotApplicable:
        return 3;
    default:
        return 0;
    }
}

QByteArray flagOf(CellClass c, bool implied) {
    switch (c) {
    case CellClass::Answered:
        return "answered";
    case CellClass::Invalid:
        return "invalid";
    case CellClass::LegitimateSkip:
        return implied ? "implied" : "skipped";
    case CellClass::RoutingViolation:
        return "violation";
    default:
        return "nonresponse";
    }
}

} // namespace

RecordChecker::RecordChecker(const CompiledRouting& routing, const HeaderMapping& mapping,
                             const QString& fileName, const DataCheckOptions& options,
                             const AnalysisOptions& analysisOptions)
    : m_routing(routing), m_mapping(mapping), m_fileName(fileName), m_options(options),
      m_analysis(analysisOptions), m_cells(routing, mapping),
      m_skipCode(routing.instrument().settings.legitimateSkipCode.toUtf8()) {
    const int count = routing.itemCount();
    m_plans.resize(size_t(count));
    int resultIndex = 0;
    for (int p = 0; p < count; ++p) {
        ItemPlan& plan = m_plans[size_t(p)];
        const Item& item = *routing.index().at(p).item;
        plan.hasVariable = m_cells.hasVariable(p);
        if (!plan.hasVariable)
            continue;
        plan.resultIndex = resultIndex++;
        // Frequencies for items with codes (in code order); numbers without codes have none.
        for (const Code& code : routing.codes(p))
            if (!plan.frequencyIndex.contains(code.code))
                plan.frequencyIndex.insert(code.code, int(plan.frequencyIndex.size()));
        // Direct gates: the item's filters, and the rules of earlier items that can
        // jump over it. (An item skipped because its gate was itself skipped after
        // a missing answer inherits that through the gate's own flag.)
        for (const cond::ExprPtr& filter : routing.item(p).filters)
            addGates(routing, filter, plan.gates);
        for (int q = 0; q < p; ++q)
            for (const CompiledRouting::CompiledRule& rule : routing.item(q).rules)
                if (rule.usable && rule.target > p)
                    addGates(routing, rule.condition, plan.gates);
        if (item.whenSkipped) {
            plan.hasImplied = true;
            plan.impliedValue = item.whenSkipped->value.toUtf8();
            if (item.whenSkipped->condition) {
                plan.impliedIf = routing.compileCondition(*item.whenSkipped->condition);
                plan.impliedBroken = plan.impliedIf == nullptr;
            }
        }
    }
}

DataCheckResult RecordChecker::emptyResult() const {
    DataCheckResult result;
    result.unknownColumns = m_mapping.unknownColumns;
    result.missingColumns = m_mapping.missingColumns;
    for (int p = 0; p < m_routing.itemCount(); ++p) {
        if (!m_plans[size_t(p)].hasVariable)
            continue;
        const Item& item = *m_routing.index().at(p).item;
        ItemCounts counts;
        counts.name = item.name;
        counts.type = itemTypeName(item.type);
        counts.position = p;
        QSet<qint64> listed; // a duplicate code (a check finding) is counted once
        for (const Code& code : m_routing.codes(p))
            if (!listed.contains(code.code)) {
                listed.insert(code.code);
                counts.frequencies.append({code.code, code.label, code.missing, 0});
            }
        result.items.append(counts);
    }
    return result;
}

QStringList RecordChecker::analysisHeader() const {
    QStringList columns = m_mapping.headerNames;
    if (m_analysis.flags)
        for (int p = 0; p < m_routing.itemCount(); ++p)
            if (m_plans[size_t(p)].hasVariable)
                columns.append(m_routing.index().at(p).item->name + QStringLiteral("_flag"));
    return columns;
}

void RecordChecker::note(ProblemRecords& problems, const QString& id) const {
    if (problems.first.size() < m_options.firstRecordsKept)
        problems.first.append(id);
    ++problems.count;
}

QString RecordChecker::recordId(const std::vector<QByteArrayView>& fields, qint64 record) const {
    if (m_mapping.idColumn >= 0)
        return QString::fromUtf8(fields[size_t(m_mapping.idColumn)]);
    return QString::number(record);
}

void RecordChecker::check(const std::vector<QByteArrayView>& fields, qint64 record, qint64 line,
                          DataCheckResult& into, QList<QByteArray>* analysisRow) const {
    const int count = m_routing.itemCount();
    std::vector<CellReading> readings{size_t(count)};
    for (int p = 0; p < count; ++p)
        readings[size_t(p)] = m_cells.read(p, fields);
    const RouteResult route =
        simulateRoute(m_routing, [&](int p) { return readings[size_t(p)].value; });
    std::vector<char> presented(size_t(count), 0);
    for (int p : route.path)
        presented[size_t(p)] = 1;

    std::vector<CellClass> classes(size_t(count), CellClass::Answered);
    std::vector<char> unknownSkip(size_t(count), 0), implied(size_t(count), 0);
    bool anyViolation = false, anyInvalid = false, anyValue = false;
    const cond::Environment env = environmentFor(m_routing, route.values);
    for (int p = 0; p < count; ++p) {
        const ItemPlan& plan = m_plans[size_t(p)];
        if (!plan.hasVariable)
            continue;
        const CellReading& r = readings[size_t(p)];
        CellClass& c = classes[size_t(p)];
        ItemCounts& counts = into.items[plan.resultIndex];
        if (presented[size_t(p)]) {
            c = r.presented;
            ++counts.presented;
            if (c == CellClass::Answered)
                ++counts.answered;
            else if (c == CellClass::Invalid)
                ++counts.invalid;
            else
                ++counts.nonresponseByKind[size_t(kindIndex(c))];
            if (c != CellClass::Blank)
                anyValue = true;
            for (qint64 code : r.counted)
                if (const auto it = plan.frequencyIndex.constFind(code);
                    it != plan.frequencyIndex.constEnd())
                    ++counts.frequencies[*it].count;
            if (c == CellClass::Invalid) {
                anyInvalid = true;
                if (into.invalidCells.size() < m_options.invalidCellsKept) {
                    const int column = m_mapping.column[size_t(p)];
                    const QString value =
                        column >= 0 ? QString::fromUtf8(fields[size_t(column)]) : QString();
                    into.invalidCells.append(Diagnostic{
                        m_fileName, int(line), column >= 0 ? column + 1 : 0,
                        QStringLiteral("record %1: invalid value%2 for %3 item '%4' (expected %5)")
                            .arg(record)
                            .arg(value.isEmpty() ? QString() : QStringLiteral(" '%1'").arg(value))
                            .arg(counts.type, counts.name, m_cells.domainOf(p))});
                }
            }
            continue;
        }
        if (!r.skipIsLegitimate) {
            c = CellClass::RoutingViolation;
            ++counts.routingViolation;
            anyViolation = true;
            continue;
        }
        c = CellClass::LegitimateSkip;
        ++counts.legitimateSkip;
        for (int g : plan.gates) {
            const bool gateMissing = presented[size_t(g)] ? isNonresponse(classes[size_t(g)])
                                                          : bool(unknownSkip[size_t(g)]);
            if (gateMissing) {
                unknownSkip[size_t(p)] = 1;
                ++counts.skipAfterMissingGate;
                break;
            }
        }
        if (plan.hasImplied && !plan.impliedBroken &&
            (!plan.impliedIf || cond::evaluate(*plan.impliedIf, env))) {
            implied[size_t(p)] = 1;
            ++counts.implied;
        }
    }

    // Break-off: the presented items are blank from some item to the end (at least
    // two of them, so that one unanswered last question is not a break-off).
    int runStart = -1, runLength = 0;
    QSet<int> seen;
    for (int p : route.path) {
        if (!m_plans[size_t(p)].hasVariable || seen.contains(p))
            continue;
        seen.insert(p);
        if (classes[size_t(p)] == CellClass::Blank) {
            if (runLength++ == 0)
                runStart = p;
        } else {
            runLength = 0;
        }
    }
    const QString id = recordId(fields, record);
    if (!anyValue)
        note(into.emptyRecords, id);
    else if (runLength >= 2) {
        note(into.breakOffs, id);
        ++into.items[m_plans[size_t(runStart)].resultIndex].breakOffStarts;
    }
    if (anyViolation)
        note(into.violations, id);
    if (anyInvalid)
        note(into.invalid, id);
    if (route.loop)
        note(into.loops, id);
    if (analysisRow)
        writeRow(fields, classes, implied, *analysisRow);
}

void RecordChecker::writeRow(const std::vector<QByteArrayView>& fields,
                             const std::vector<CellClass>& classes,
                             const std::vector<char>& implied, QList<QByteArray>& row) const {
    row.clear();
    for (QByteArrayView f : fields)
        row.append(f.toByteArray());
    for (int p = 0; p < m_routing.itemCount(); ++p) {
        const ItemPlan& plan = m_plans[size_t(p)];
        if (!plan.hasVariable || classes[size_t(p)] != CellClass::LegitimateSkip)
            continue;
        const QByteArray value = implied[size_t(p)] ? plan.impliedValue : m_skipCode;
        if (m_routing.index().at(p).item->type == ItemType::Multi) {
            for (int c : m_mapping.multiColumns[size_t(p)])
                if (c >= 0)
                    row[c] = value;
        } else if (const int c = m_mapping.column[size_t(p)]; c >= 0) {
            row[c] = value;
        }
    }
    if (m_analysis.flags)
        for (int p = 0; p < m_routing.itemCount(); ++p)
            if (m_plans[size_t(p)].hasVariable)
                row.append(flagOf(classes[size_t(p)], implied[size_t(p)]));
}

} // namespace rb
