#pragma once

#include "Simulator.h"

#include <QHash>

namespace rb {

// Turns a respondent's stated answer into the value the item holds, or says
// why the answer does not fit the item (not a code, out of range, wrong kind).
struct AnswerCheck {
    cond::CellValue value;
    QString error; // empty when the answer fits
};
AnswerCheck cellForAnswer(const Item& item, const QList<Code>& codes, const AnswerValue& answer);

// Runs the route with answers given by item name (keys lower case). A
// presented item without an answer, or with one that does not fit, stops the
// replay with an error naming the item.
struct ReplayResult {
    RouteResult route;
    QString error; // empty on success
};
ReplayResult replayAnswers(const CompiledRouting& routing,
                           const QHash<QString, AnswerValue>& answersByLowerName);

QHash<QString, AnswerValue> answersByLowerName(const QList<Answer>& answers);

} // namespace rb
