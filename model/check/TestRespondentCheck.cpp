#include "TestRespondentCheck.h"

#include "routing/AnswerReplay.h"

namespace rb {

static QStringList pathNames(const CompiledRouting& routing, const RouteResult& route) {
    QStringList names;
    for (int position : route.path)
        names.append(routing.index().at(position).item->name);
    return names;
}

static QString describeDifference(const QStringList& expected, const QStringList& actual) {
    int i = 0;
    while (i < expected.size() && i < actual.size() &&
           expected.at(i).compare(actual.at(i), Qt::CaseInsensitive) == 0)
        ++i;
    const QString want = i < expected.size() ? expected.at(i) : QStringLiteral("the end");
    const QString got = i < actual.size() ? actual.at(i) : QStringLiteral("the end");
    return QStringLiteral("step %1 of the path is %2, expected %3").arg(i + 1).arg(got, want);
}

Findings testRespondentFindings(const CompiledRouting& routing) {
    Findings findings;
    const QList<TestRespondent>& respondents = routing.instrument().testRespondents;
    for (int r = 0; r < respondents.size(); ++r) {
        const TestRespondent& respondent = respondents.at(r);
        const ReplayResult replay = replayAnswers(routing, answersByLowerName(respondent.answers));
        const QStringList actual = pathNames(routing, replay.route);
        QString problem;
        if (!replay.error.isEmpty())
            problem = replay.error;
        else if (replay.route.loop)
            problem = QStringLiteral("the route does not end (it loops)");
        else if (actual.size() != respondent.path.size() ||
                 !std::equal(actual.begin(), actual.end(), respondent.path.begin(),
                             [](const QString& a, const QString& b) {
                                 return a.compare(b, Qt::CaseInsensitive) == 0;
                             }))
            problem = describeDifference(respondent.path, actual);
        if (problem.isEmpty())
            continue;
        Finding f;
        f.check = QStringLiteral("test-respondent-fails");
        f.severity = Severity::Error;
        f.subject = respondent.name;
        f.field = QStringLiteral("test_respondents[%1]").arg(r);
        f.message = QStringLiteral("test respondent '%1': %2").arg(respondent.name, problem);
        f.position = routing.itemCount(); // after every item
        findings.append(f);
    }
    return findings;
}

} // namespace rb
