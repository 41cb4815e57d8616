#include "RoutingAnalyzer.h"

#include "Scc.h"
#include "UniversePrinter.h"
#include "condition/Printer.h"
#include "condition/TypeCheck.h"
#include "routing/Simulator.h"

#include <QVarLengthArray>

#include <algorithm>
#include <set>

using namespace Qt::StringLiterals;

namespace rb::analysis {

namespace {

// Closure of the care set: how many earlier gate items' conditions are folded
// in before the rest is left as "care" (a larger care set only costs
// simplification, never correctness).
constexpr int CareClosureLimit = 12;
constexpr int ExactGateItems = 12;

QString ruleField(int k, bool condition) {
    return u"routing["_s + QString::number(k) + (condition ? u"].if"_s : u"].goto"_s);
}

} // namespace

RoutingAnalyzer::RoutingAnalyzer(const CompiledRouting& routing)
    : m_routing(routing), m_algebra(routing) {
    run();
    findLoops();
}

int RoutingAnalyzer::filterNode(int position) {
    int f = Mdd::True;
    for (const cond::ExprPtr& filter : m_routing.item(position).filters)
        f = m_algebra.mdd().andOp(f, m_algebra.conditionAt(*filter, position));
    return f;
}

// The filters are joined with an `and` evaluated left to right, module's
// first (as the simulator does): the item's own filter is evaluated only where
// the module's holds.
int RoutingAnalyzer::itemFilterEvaluated(int position) {
    const CompiledRouting::CompiledItem& item = m_routing.item(position);
    if (!item.hasModuleFilter)
        return m_reached.at(position);
    return m_algebra.mdd().andOp(m_reached.at(position),
                                 m_algebra.conditionAt(*item.filters.first(), position));
}

int RoutingAnalyzer::gapEmpty(int from, int to) {
    Mdd& mdd = m_algebra.mdd();
    int acc = Mdd::True;
    // Ascending positions: each later item's variables sit above the ones built so far.
    for (int p = from + 1; p < to; ++p)
        if (m_algebra.isGateItem(p))
            acc = mdd.andOp(m_algebra.emptyOf(p), acc);
    return acc;
}

void RoutingAnalyzer::run() {
    Mdd& mdd = m_algebra.mdd();
    const int n = m_routing.itemCount();
    std::vector<int> pending(n + 1, Mdd::False), loosePending(n + 1, Mdd::False);
    if (n > 0)
        pending[0] = loosePending[0] = Mdd::True;
    m_reached.assign(n, Mdd::False);
    m_consistency.assign(n, -1);
    m_presented.assign(n, Mdd::False);
    m_loose.assign(n, Mdd::False);
    m_looseReached.assign(n, Mdd::False);
    m_filter.assign(n, Mdd::True);
    m_ruleFired.clear();
    m_firstRule.assign(n + 1, 0);
    m_feasible = Digraph();
    m_structural = Digraph();
    m_unaskedReads.clear();
    m_ruleNotes.clear();
    ModuleReads module;
    for (int i = 0; i < n; ++i) {
        addStructuralEdges(i);
        const int r = pending[i], lr = loosePending[i];
        const int filter = filterNode(i);
        m_reached[i] = r;
        m_looseReached[i] = lr;
        m_filter[i] = filter;
        const int shown = mdd.andOp(mdd.andOp(r, filter), m_algebra.presentedOf(i));
        const int looseShown = mdd.andOp(lr, filter);
        m_presented[i] = shown;
        m_loose[i] = looseShown;
        const int passed = mdd.andOp(mdd.diff(r, filter), m_algebra.emptyOf(i));
        pending[i + 1] = mdd.orOp(pending[i + 1], passed);
        loosePending[i + 1] = mdd.orOp(loosePending[i + 1], mdd.diff(lr, filter));
        if (passed != Mdd::False)
            m_feasible.addEdge(i + 1);
        int rest = shown, looseRest = looseShown;
        m_firstRule[i] = int(m_ruleFired.size());
        noteFilterReads(i, module);
        const QList<CompiledRouting::CompiledRule>& rules = m_routing.item(i).rules;
        for (int k = 0; k < rules.size(); ++k) {
            const CompiledRouting::CompiledRule& rule = rules[k];
            RuleSets sets;
            if (rule.usable) {
                const int c =
                    rule.condition ? m_algebra.conditionAt(*rule.condition, i + 1) : Mdd::True;
                sets.evaluated = rest;
                sets.fired = mdd.andOp(rest, c);
                const int looseFired = mdd.andOp(looseRest, c);
                rest = mdd.diff(rest, c);
                looseRest = mdd.diff(looseRest, c);
                noteRuleFiring(i, k, sets, c, rest != Mdd::False);
                if (rule.condition)
                    noteUnaskedReads({rule.condition.get(), i, k, false, i}, sets.evaluated);
                const int t = rule.target;
                if (sets.fired != Mdd::False)
                    m_feasible.addEdge(t);
                if (t > i) {
                    pending[t] = mdd.orOp(pending[t], mdd.andOp(sets.fired, gapEmpty(i, t)));
                    loosePending[t] = mdd.orOp(loosePending[t], looseFired);
                }
            }
            m_ruleFired.push_back(sets.fired);
        }
        pending[i + 1] = mdd.orOp(pending[i + 1], rest);
        loosePending[i + 1] = mdd.orOp(loosePending[i + 1], looseRest);
        if (rest != Mdd::False)
            m_feasible.addEdge(i + 1);
        m_feasible.closeVertex();
    }
    noteModuleReads(module);
    m_feasible.closeVertex(); // END
    m_structural.closeVertex();
    m_firstRule[n] = int(m_ruleFired.size());
}

QList<int> RoutingAnalyzer::positionsOf(const std::vector<int>& vars) const {
    QList<int> positions;
    for (int v : vars) {
        const int p = m_algebra.variable(v).position;
        if (!positions.contains(p))
            positions.append(p);
    }
    std::sort(positions.begin(), positions.end());
    return positions;
}

int RoutingAnalyzer::consistency(int position) {
    if (m_consistency[position] >= 0)
        return m_consistency[position];
    Mdd& mdd = m_algebra.mdd();
    const int loose = m_loose.at(position);
    const int c = mdd.orOp(mdd.andOp(m_algebra.presentedOf(position), loose),
                           mdd.diff(m_algebra.emptyOf(position), loose));
    m_consistency[position] = c;
    return c;
}

// The care set over the kept items: bucket elimination of the consistency
// constraints, latest item first, folding in the items they depend on.
int RoutingAnalyzer::careSet(const QList<int>& keep) {
    Mdd& mdd = m_algebra.mdd();
    std::set<int, std::greater<int>> active(keep.begin(), keep.end());
    std::set<int> folded;
    int care = Mdd::True;
    while (!active.empty()) {
        const int j = *active.begin();
        active.erase(active.begin());
        folded.insert(j);
        care = mdd.andOp(care, consistency(j));
        if (int(folded.size()) < CareClosureLimit)
            for (int p : positionsOf(mdd.support(m_loose.at(j))))
                if (!folded.count(p))
                    active.insert(p);
        if (!keep.contains(j))
            for (int v : m_algebra.varsOf(j))
                care = mdd.exists(care, v);
    }
    for (int v : mdd.support(care))
        if (!keep.contains(m_algebra.variable(v).position))
            care = mdd.exists(care, v);
    return care;
}

ItemUniverse RoutingAnalyzer::universe(int position, Sop* sopOut) {
    ItemUniverse u;
    u.position = position;
    Sop sop;
    if (m_presented.at(position) == Mdd::False) {
        u.asked = ItemUniverse::Asked::Never;
        u.plain = u"never asked"_s;
        if (sopOut)
            *sopOut = sop;
        return u;
    }
    Mdd& mdd = m_algebra.mdd();
    QList<int> keep = positionsOf(mdd.support(m_loose.at(position)));
    int care = careSet(keep);
    int on = mdd.andOp(m_loose.at(position), care);
    // Drop gate items the universe does not need, latest first (so earlier,
    // more basic items are kept when either would do).
    for (int k = int(keep.size()) - 1; k >= 0 && keep.size() > 0; --k) {
        int a = on, b = mdd.diff(care, on), c = care;
        for (int v : m_algebra.varsOf(keep[k])) {
            a = mdd.exists(a, v);
            b = mdd.exists(b, v);
            c = mdd.exists(c, v);
        }
        if (mdd.intersects(a, b))
            continue;
        on = a;
        care = c;
        keep.removeAt(k);
    }
    std::vector<int> vars;
    for (int p : keep) {
        const std::span<const int> vs = m_algebra.varsOf(p);
        vars.insert(vars.end(), vs.begin(), vs.end());
        std::sort(vars.end() - std::ptrdiff_t(vs.size()), vars.end());
    }
    const int limit = keep.size() <= ExactGateItems ? int(vars.size()) : 0;
    sop = minimiseSop(mdd, on, care, vars, limit);
    const UniversePrinter printer(m_algebra);
    preferShorterForms(sop, on, printer);
    u.minimal = sop.exact;
    if (sop.products.size() == 1 && sop.products.front().literals.empty()) {
        u.asked = ItemUniverse::Asked::Always;
    } else {
        u.asked = ItemUniverse::Asked::Conditional;
        u.askedIf = printer.condition(sop);
        u.gatePositions = keep;
    }
    u.plain = printer.words(sop);
    if (sopOut)
        *sopOut = sop;
    return u;
}

namespace {

int productNode(Mdd& mdd, const SopProduct& p) {
    int f = Mdd::True;
    for (const SopLiteral& l : p.literals) {
        std::vector<bool> cells(mdd.domainSize(l.var));
        for (int c = 0; c < int(cells.size()); ++c)
            cells[c] = l.cells.test(c);
        f = mdd.andOp(f, mdd.literal(l.var, cells));
    }
    return f;
}

int elementCount(const QString& literal) {
    return int(literal.count(u", "_s)) + 1;
}

} // namespace

// Primes are maximal, so a literal whose value set could include *empty* (a
// don't-care) does, and would print as `<>` / `not in`. DESIGN.md wants that
// form only when the complement is shorter: otherwise drop empty again when
// the cover still holds the whole on-set.
void RoutingAnalyzer::preferShorterForms(Sop& sop, int on, const UniversePrinter& printer) {
    Mdd& mdd = m_algebra.mdd();
    for (std::size_t i = 0; i < sop.products.size(); ++i) {
        for (SopLiteral& l : sop.products[i].literals) {
            const DecisionVar::Role role = m_algebra.variable(l.var).role;
            if (role == DecisionVar::Role::MultiHas || !l.cells.test(0) || l.cells.count() < 2)
                continue;
            SopLiteral positive = l;
            positive.cells.reset(0);
            const QString withEmpty = printer.literal(l), without = printer.literal(positive);
            // Value lists: fewer elements wins; the status of a multi item: the shorter text.
            if (role == DecisionVar::Role::Value ? elementCount(without) > elementCount(withEmpty)
                                                 : without.size() > withEmpty.size())
                continue;
            const SopLiteral saved = l;
            l = positive;
            int cover = Mdd::False;
            for (const SopProduct& p : sop.products)
                cover = mdd.orOp(cover, productNode(mdd, p));
            if (!mdd.implies(on, cover))
                l = saved;
        }
    }
}

void RoutingAnalyzer::findLoops() {
    const int n = m_routing.itemCount();
    m_inLoop.assign(n, false);
    m_loops.clear();
    for (std::vector<int>& component : stronglyConnectedComponents(m_feasible)) {
        const int v = component.front();
        const std::span<const int> out = m_feasible.targets(v);
        const bool cycle =
            component.size() > 1 || (v < n && std::find(out.begin(), out.end(), v) != out.end());
        if (!cycle)
            continue;
        for (int p : component)
            if (p < n)
                m_inLoop[p] = true;
        m_loops.push_back(std::move(component));
    }
}

// Every usable edge of an item, feasible or not, for unreachable-item's
// wording; added while run() has the item's rules at hand.
void RoutingAnalyzer::addStructuralEdges(int position) {
    const CompiledRouting::CompiledItem& item = m_routing.item(position);
    if (!item.filters.isEmpty())
        m_structural.addEdge(position + 1);
    bool unconditional = false;
    for (const CompiledRouting::CompiledRule& rule : item.rules) {
        if (!rule.usable)
            continue;
        m_structural.addEdge(rule.target);
        if (!rule.condition) {
            unconditional = true;
            break;
        }
    }
    if (!unconditional)
        m_structural.addEdge(position + 1);
    m_structural.closeVertex();
}

std::vector<bool> RoutingAnalyzer::structurallyReachable() const {
    return m_routing.itemCount() > 0 ? reachableFrom(m_structural, 0) : std::vector<bool>(1, true);
}

Finding RoutingAnalyzer::makeFinding(const QString& check, Severity severity, int position,
                                     const QString& field) const {
    const ItemIndex::Entry& entry = m_routing.index().at(position);
    Finding f;
    f.check = check;
    f.severity = severity;
    f.item = entry.item->name;
    f.module = entry.module->name;
    f.field = field;
    f.position = position;
    return f;
}

void RoutingAnalyzer::addLoopFindings(Findings& out) const {
    const int n = m_routing.itemCount();
    for (const std::vector<int>& loop : m_loops) {
        QStringList names;
        for (int p : loop)
            if (p < n)
                names.append(m_routing.index().at(p).item->name);
        // The finding sits on the first rule that jumps back into the loop.
        for (int p : loop) {
            const QList<CompiledRouting::CompiledRule>& rules = m_routing.item(p).rules;
            int k = 0;
            for (; k < rules.size(); ++k)
                if (rules[k].usable && rules[k].target <= p &&
                    std::binary_search(loop.begin(), loop.end(), rules[k].target) &&
                    ruleFired(p, k) != Mdd::False)
                    break;
            if (k == rules.size())
                continue;
            Finding f = makeFinding(u"routing-loop"_s, Severity::Error, p, ruleField(k, false));
            f.message = u"routing loop: a respondent can go round "_s + names.join(u", "_s) +
                        u" for ever (rule "_s + QString::number(k) + u" of "_s +
                        m_routing.index().at(p).item->name + u" goes back to "_s +
                        m_routing.index().at(rules[k].target).item->name + u')';
            out.append(f);
            break;
        }
    }
}

void RoutingAnalyzer::addUnreachable(Findings& out, const std::vector<bool>& reachable) const {
    for (int i = 0; i < m_routing.itemCount(); ++i) {
        if (m_presented[i] != Mdd::False || m_inLoop[i])
            continue;
        Finding f = makeFinding(u"unreachable-item"_s, Severity::Error, i, QString());
        f.message = reachable[i]
                        ? u"no respondent reaches "_s + f.item +
                              u": the conditions along every path to it contradict each other"_s
                        : u"no respondent reaches "_s + f.item +
                              u": no path leads to it (earlier gotos jump over it)"_s;
        out.append(f);
    }
}

// rule-never-fires and rule-always-fires, decided while the programme has the
// rule's sets at hand (a later pass over every rule found them cold).
// `passedOn`: some respondents evaluate the rule and it does not fire.
void RoutingAnalyzer::noteRuleFiring(int item, int k, const RuleSets& sets, int condition,
                                     bool passedOn) {
    if (sets.evaluated == Mdd::False)
        return;
    const bool hasIf = m_routing.item(item).rules.at(k).condition != nullptr;
    const bool later = k + 1 < m_routing.item(item).rules.size();
    if (sets.fired == Mdd::False)
        m_ruleNotes.push_back(
            {item, k,
             condition == Mdd::False ? RuleNote::NeverHolds : RuleNote::NeverWhenEvaluated});
    else if (!hasIf && later)
        m_ruleNotes.push_back({item, k, RuleNote::AlwaysWithoutIf});
    else if (hasIf && !passedOn)
        m_ruleNotes.push_back({item, k, RuleNote::AlwaysWhenEvaluated});
}

void RoutingAnalyzer::addRuleFindings(Findings& out) const {
    for (const RuleNote& note : m_ruleNotes) {
        const int i = note.item, k = note.rule;
        // The rule as written, for the message only.
        const Rule& written = m_routing.index().at(i).item->routing.at(k);
        const bool later = k + 1 < m_routing.item(i).rules.size();
        const bool always =
            note.kind == RuleNote::AlwaysWithoutIf || note.kind == RuleNote::AlwaysWhenEvaluated;
        const bool onIf = note.kind != RuleNote::AlwaysWithoutIf;
        Finding f = makeFinding(always ? u"rule-always-fires"_s : u"rule-never-fires"_s,
                                Severity::Warning, i, ruleField(k, onIf));
        if (onIf)
            f.column = 1;
        f.message = u"rule "_s + QString::number(k) + u" of "_s + f.item;
        if (onIf)
            f.message += u" (if "_s + *written.condition + u" go to "_s + written.target + u')';
        switch (note.kind) {
        case RuleNote::NeverHolds:
            f.message += u" never fires: its condition can never hold"_s;
            break;
        case RuleNote::NeverWhenEvaluated:
            f.message += u" never fires: its condition never holds when the rule is evaluated"_s;
            break;
        case RuleNote::AlwaysWithoutIf:
            f.message += u" has no condition, so the rules after it are never evaluated"_s;
            break;
        case RuleNote::AlwaysWhenEvaluated:
            f.message += u" fires whenever it is evaluated"_s +
                         (later ? u", so the rules after it are never evaluated"_s
                                : u", so its condition is redundant"_s);
            break;
        }
        out.append(f);
    }
}

namespace {

// The witness assignment of a set (Mdd::satOne's: the lowest cell that does not
// lead to false, from the root down), walked only as deep as it is read. The
// exact sets depend on every earlier gate item, so the full path is as long as
// the questionnaire; the path's last items need only its top (latest items),
// which keeps a finding's cost independent of the instrument's length.
class WitnessWalk {
public:
    WitnessWalk(const Mdd& mdd, int set, std::vector<int>& scratch)
        : m_mdd(mdd), m_node(set), m_scratch(scratch) {}
    ~WitnessWalk() {
        for (int v : m_touched)
            m_scratch[v] = 0; // the scratch assignment is all empty between uses
    }
    // Cell of `var` (0, empty, where the walk leaves it free).
    int cell(int var) {
        while (!m_mdd.isConstant(m_node) && m_mdd.var(m_node) <= var) {
            const int v = m_mdd.var(m_node);
            int c = 0;
            while (m_mdd.child(m_node, c) == Mdd::False)
                ++c;
            m_scratch[v] = c;
            m_touched.push_back(v);
            m_node = m_mdd.child(m_node, c);
        }
        return m_scratch[var];
    }
    bool holds(int f) {
        while (!m_mdd.isConstant(f))
            f = m_mdd.child(f, cell(m_mdd.var(f)));
        return f == Mdd::True;
    }

private:
    const Mdd& m_mdd;
    int m_node;
    std::vector<int>& m_scratch;
    std::vector<int> m_touched;
};

} // namespace

std::optional<QString> RoutingAnalyzer::witnessPath(int set, int untilPosition) {
    if (set == Mdd::False)
        return std::nullopt;
    // The last items of the witness's path before the condition's item. On a
    // consistent assignment the loose universe of an item equals its exact one
    // (and has a small support), so each test is cheap; the programme already
    // proved that this agrees with the simulator. Variables the witness leaves
    // free belong to later items: empty at that point (cell 0).
    m_scratch.resize(std::size_t(m_algebra.varCount()), 0);
    WitnessWalk witness(m_algebra.mdd(), set, m_scratch);
    constexpr int Shown = 6; // a long path is cut to its last items
    QStringList names;
    int p = untilPosition - 1;
    for (; p >= 0 && names.size() < Shown; --p)
        if (witness.holds(m_loose[p]))
            names.prepend(m_routing.index().at(p).item->name);
    bool more = false;
    for (; p >= 0 && !more; --p)
        more = witness.holds(m_loose[p]);
    if (more)
        names.prepend(u"..."_s);
    return names.isEmpty() ? u"(no item presented before)"_s : names.join(u", "_s);
}

// The reads of one condition site that can be empty where it is evaluated,
// worked out while the programme has the site's sets and tree at hand (after
// it, on a large instrument, both had left the processor's caches).
void RoutingAnalyzer::noteUnaskedReads(const ConditionSite& site, int evaluatedSet) {
    if (evaluatedSet == Mdd::False)
        return;
    Mdd& mdd = m_algebra.mdd();
    UnaskedRead read{site, {}, std::nullopt, Mdd::False};
    cond::forEachNameRead(*site.expr, [&](const cond::Expr& atom) {
        const int x = m_routing.positionOf(atom);
        if (x < 0 || x >= site.limit || !m_algebra.isGateItem(x) || read.empties.contains(x))
            return;
        const int on = mdd.andOp(evaluatedSet, m_algebra.emptyOf(x));
        if (on == Mdd::False)
            return;
        if (read.empties.isEmpty()) {
            read.column = atom.nameColumn;
            read.witness = on;
        }
        read.empties.append(x);
    });
    if (!read.empties.isEmpty())
        m_unaskedReads.push_back(std::move(read));
}

// The item's own filter (the last of its filters when the module has one too),
// evaluated only where the module's holds.
void RoutingAnalyzer::noteFilterReads(int position, ModuleReads& module) {
    const ItemIndex::Entry& e = m_routing.index().at(position);
    if (e.moduleIndex != module.index) {
        noteModuleReads(module);
        module = {e.moduleIndex, position, Mdd::False};
    }
    // A module's filter is evaluated at every item of the module: one site per module.
    if (e.module->askIf)
        module.evaluated = m_algebra.mdd().orOp(module.evaluated, m_reached[position]);
    const CompiledRouting::CompiledItem& compiled = m_routing.item(position);
    if (compiled.filters.size() > (compiled.hasModuleFilter ? 1 : 0))
        noteUnaskedReads({compiled.filters.last().get(), position, -1, false, position},
                         itemFilterEvaluated(position));
}

void RoutingAnalyzer::noteModuleReads(const ModuleReads& module) {
    if (module.index < 0)
        return;
    const CompiledRouting::CompiledItem& first = m_routing.item(module.first);
    if (first.hasModuleFilter)
        noteUnaskedReads({first.filters.first().get(), module.first, -1, true, module.first},
                         module.evaluated);
}

void RoutingAnalyzer::addUnaskedReads(Findings& out) {
    for (const UnaskedRead& read : m_unaskedReads) {
        const ConditionSite& site = read.site;
        QStringList names;
        for (int x : read.empties)
            names.append(m_routing.index().at(x).item->name);
        Finding f = makeFinding(u"reads-unasked-item"_s, Severity::Warning, site.position,
                                site.rule < 0 ? u"ask_if"_s : ruleField(site.rule, true));
        if (site.module)
            f.item.clear();
        f.column = read.column;
        m_readWitness.insert(f.id(), read.witness);
        const QString path = witnessPath(read.witness, site.position).value_or(QString());
        f.message = u"the condition reads "_s + names.first() +
                    u", which is empty (not presented) on some paths that reach it, e.g. after "_s +
                    path;
        if (names.size() > 1)
            f.message +=
                u"; also reads "_s + names.mid(1).join(u", "_s) + u", which can be empty there"_s;
        out.append(f);
    }
}

std::optional<std::vector<int>> RoutingAnalyzer::unaskedReadWitness(const QString& id) const {
    const auto it = m_readWitness.constFind(id);
    if (it == m_readWitness.constEnd())
        return std::nullopt;
    return m_algebra.mdd().satOne(*it);
}

Findings RoutingAnalyzer::findings() {
    Findings out;
    addLoopFindings(out);
    addUnreachable(out, structurallyReachable());
    addRuleFindings(out);
    addUnaskedReads(out);
    sortFindings(out);
    return out;
}

RoutingAnalysis RoutingAnalyzer::analysis() {
    RoutingAnalysis result;
    // Reserved: growing the list would move every universe (and touch its
    // strings) again at each doubling.
    result.universes.reserve(m_routing.itemCount());
    for (int i = 0; i < m_routing.itemCount(); ++i)
        result.universes.append(universe(i));
    result.findings = findings();
    result.keepNames(m_routing);
    return result;
}

} // namespace rb::analysis

namespace rb {

RoutingAnalysis analyzeRouting(const CompiledRouting& routing) {
    analysis::RoutingAnalyzer analyzer(routing);
    return analyzer.analysis();
}

void RoutingAnalysis::keepNames(const CompiledRouting& routing) {
    m_instrument = routing.instrument();
    m_entries = routing.index().entries();
}

QStringList RoutingAnalysis::gateItems(const ItemUniverse& u) const {
    QStringList names;
    names.reserve(u.gatePositions.size());
    for (int p : u.gatePositions)
        names.append(itemName(p));
    return names;
}

QString askedName(ItemUniverse::Asked asked) {
    switch (asked) {
    case ItemUniverse::Asked::Always:
        return u"always"_s;
    case ItemUniverse::Asked::Conditional:
        return u"conditional"_s;
    case ItemUniverse::Asked::Never:
        return u"never"_s;
    }
    return {};
}

} // namespace rb
