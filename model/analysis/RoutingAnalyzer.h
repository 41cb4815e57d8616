#pragma once

#include "ConditionAlgebra.h"
#include "Minimiser.h"
#include "RoutingAnalysis.h"
#include "Scc.h"
#include "UniversePrinter.h"

#include <QHash>
#include <QVarLengthArray>

#include <optional>
#include <vector>

namespace rb::analysis {

// The dynamic programme behind analyzeRouting, exposed for tests. In
// questionnaire order it keeps, per position, the exact set of answer
// assignments that reach the item (every earlier gate item consistent: empty
// exactly when not presented, so skipped gate items are set empty on the
// goto edge) and a "loose" set that ignores emptiness, whose small support
// is where the printed universe looks for its gate items. Never enumerates
// paths: each item costs a few diagram operations.
class RoutingAnalyzer {
public:
    explicit RoutingAnalyzer(const CompiledRouting& routing);

    ConditionAlgebra& algebra() { return m_algebra; }
    int reached(int position) const { return m_reached.at(position); }
    int presented(int position) const { return m_presented.at(position); }
    int loosePresented(int position) const { return m_loose.at(position); }

    // The printed universe of one item (also its Sop, for tests).
    ItemUniverse universe(int position, Sop* sop = nullptr);
    Findings findings();
    RoutingAnalysis analysis();

    // After findings(): for a reads-unasked-item finding (by id), an assignment
    // (cell per variable, -1 where free) on which the condition is evaluated
    // and one of the items it reads is empty.
    std::optional<std::vector<int>> unaskedReadWitness(const QString& findingId) const;

    // Positions of the loops (strongly connected components with a cycle).
    const std::vector<std::vector<int>>& loops() const { return m_loops; }

private:
    // A usable rule's exact sets, while the programme is at its item.
    struct RuleSets {
        int evaluated = Mdd::False; // the rule is reached (earlier rules did not fire)
        int fired = Mdd::False;
    };
    // A rule that never fires or always fires where it is evaluated.
    struct RuleNote {
        int item, rule;
        enum Kind { NeverHolds, NeverWhenEvaluated, AlwaysWithoutIf, AlwaysWhenEvaluated } kind;
    };
    // A condition and where it is evaluated.
    struct ConditionSite {
        const cond::Expr* expr; // owned by m_routing (a pointer: no reference count to touch)
        int position;
        int rule;    // the rule's index, -1 for the ask_if
        bool module; // a module's filter
        int limit;   // reads of items at or after this position are forward references
    };
    // A site that can read an empty gate item (a reads-unasked-item finding).
    struct UnaskedRead {
        ConditionSite site;
        QVarLengthArray<int, 4> empties; // positions of the read items that can be empty there
        std::optional<int> column;       // of the first of them in the condition
        int witness;                     // where it is evaluated and the first one is empty
    };
    // The module whose items the programme is in, and where its filter is evaluated.
    struct ModuleReads {
        int index = -1;
        int first = -1;
        int evaluated = Mdd::False;
    };
    void run();
    int filterNode(int position);
    int itemFilterEvaluated(int position); // where the item's own ask_if is evaluated
    int gapEmpty(int from, int to);        // gate items strictly between are empty
    int consistency(int position);         // C_j: presented iff its loose universe holds
    int careSet(const QList<int>& keep);
    QList<int> positionsOf(const std::vector<int>& vars) const;
    void preferShorterForms(Sop& sop, int on, const UniversePrinter& printer);
    void findLoops();
    void addStructuralEdges(int position);
    std::vector<bool> structurallyReachable() const;
    void addLoopFindings(Findings& out) const;
    void addUnreachable(Findings& out, const std::vector<bool>& reachable) const;
    void noteRuleFiring(int item, int k, const RuleSets& sets, int condition, bool passedOn);
    void addRuleFindings(Findings& out) const;
    void noteUnaskedReads(const ConditionSite& site, int evaluatedSet);
    void noteFilterReads(int position, ModuleReads& module);
    void noteModuleReads(const ModuleReads& module);
    void addUnaskedReads(Findings& out);
    std::optional<QString> witnessPath(int set, int untilPosition);
    Finding makeFinding(const QString& check, Severity severity, int position,
                        const QString& field) const;

    const CompiledRouting& m_routing;
    ConditionAlgebra m_algebra;
    std::vector<int> m_reached, m_presented, m_loose, m_looseReached, m_filter;
    // Where every item's rules fire (false for unusable ones), item after item
    // (one block rather than a vector per item with rules): rule k of item i
    // is m_ruleFired[m_firstRule[i] + k]. The loop findings ask; the rest of a
    // rule's sets is used up by the programme.
    std::vector<int> m_ruleFired;
    std::vector<int> m_firstRule;
    int ruleFired(int item, int k) const { return m_ruleFired[m_firstRule[item] + k]; }
    Digraph m_feasible;   // feasible edges per position (and END, the last vertex)
    Digraph m_structural; // every usable edge, feasible or not
    std::vector<std::vector<int>> m_loops;
    std::vector<bool> m_inLoop;
    std::vector<int> m_consistency;          // per position, -1 until asked for
    std::vector<UnaskedRead> m_unaskedReads; // found by the programme, in its order
    std::vector<RuleNote> m_ruleNotes;       // likewise
    QHash<QString, int> m_readWitness;       // reads-unasked-item id -> witness set
    std::vector<int> m_scratch;              // a cell per variable, all 0 between uses
};

} // namespace rb::analysis
