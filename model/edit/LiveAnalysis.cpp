#include "LiveAnalysis.h"

#include "analysis/RoutingAnalyzer.h"
#include "check/InstrumentCheck.h"
#include "check/StructuralChecks.h"
#include "check/TestRespondentCheck.h"
#include "routing/CompiledRouting.h"

#include <QSet>

namespace rb {

namespace {

// The same findings as checkInstrument, gathered here so the routing analysis
// (the costly part) runs once for both findings and universes. Ids are
// unique per finding; a repeat would only mean two parts reported the same
// thing, so keep one of each.
void mergeFindings(Findings& into, const Findings& more) {
    QSet<QString> seen;
    for (const Finding& f : into)
        seen.insert(f.id());
    for (const Finding& f : more)
        if (!seen.contains(f.id())) {
            seen.insert(f.id());
            into.append(f);
        }
    sortFindings(into);
}

void markFindings(QList<ItemMarks>& marks, const ItemIndex& index, const Findings& findings) {
    for (const Finding& f : findings) {
        if (f.item.isEmpty())
            continue;
        const int position = index.positionOf(f.item);
        if (position < 0)
            continue;
        (f.severity == Severity::Error ? marks[position].hasError : marks[position].hasWarning) =
            true;
    }
}

} // namespace

LiveAnalysis analyseInstrument(const Instrument& instrument, quint64 revision) {
    LiveAnalysis result;
    result.revision = revision;
    const CompiledRouting routing(instrument);
    result.findings = structuralFindings(routing);
    result.findings += testRespondentFindings(routing);
    result.marks.resize(routing.itemCount());

    analysis::RoutingAnalyzer analyzer(routing);
    const RoutingAnalysis routingAnalysis = analyzer.analysis();
    mergeFindings(result.findings, routingAnalysis.findings);
    for (const ItemUniverse& universe : routingAnalysis.universes) {
        if (universe.position < 0 || universe.position >= result.marks.size())
            continue;
        result.marks[universe.position].asked = universe.asked;
        result.marks[universe.position].askedIf = universe.askedIf;
    }
    for (const std::vector<int>& loop : analyzer.loops())
        for (int position : loop)
            if (position >= 0 && position < result.marks.size())
                result.marks[position].inLoop = true;
    markFindings(result.marks, routing.index(), result.findings);
    result.routing = routingAnalysis;
    return result;
}

} // namespace rb
