#include "InstrumentCheck.h"

#include "StructuralChecks.h"
#include "TestRespondentCheck.h"
#include "analysis/RoutingAnalysis.h"

namespace rb {

Findings checkInstrument(const CompiledRouting& routing) {
    Findings findings = structuralFindings(routing);
    findings += analyzeRouting(routing).findings;
    findings += testRespondentFindings(routing);
    sortFindings(findings);
    return findings;
}

FindingCounts countFindings(const Findings& findings) {
    FindingCounts counts;
    for (const Finding& f : findings)
        (f.severity == Severity::Error ? counts.errors : counts.warnings)++;
    return counts;
}

} // namespace rb
