#pragma once

#include "condition/Evaluator.h"
#include "instrument/Instrument.h"
#include "routing/CompiledRouting.h"

#include <memory>

namespace rb {

// Plays an instrument as a respondent, one presented item at a time, by the
// routing semantics of DESIGN.md (the same steps as simulateRoute): filtered
// items are passed over, the answer to the presented item is recorded, the
// first rule that holds jumps. Every step can be taken back. Works on its own
// copy of the instrument, so later edits do not disturb a run in progress.
class TrialRun {
public:
    explicit TrialRun(const Instrument& instrument);

    const Instrument& instrument() const { return *m_instrument; }
    // Flat position of the item being asked, or -1 when the run has ended.
    int current() const { return m_current; }
    bool finished() const { return m_current < 0; }
    bool looped() const { return m_looped; } // the 4 x items guard stopped it
    const Item* currentItem() const;
    QList<Code> currentCodes() const;
    // Names of the items presented so far (answered), in order.
    QStringList path() const;

    // Records the answer to the current item and moves on. Returns why the
    // answer does not fit the item (then nothing changes), or an empty string.
    // A statement takes any answer (it holds no value).
    QString answer(const AnswerValue& value);
    bool canGoBack() const { return !m_steps.isEmpty(); }
    void back();

    // The answers given (the last one per item) and the path, ready to be
    // stored and replayed by `check`.
    TestRespondent toTestRespondent(const QString& name) const;

private:
    struct Change {
        int position;
        cond::CellValue previous;
    };
    struct Step {
        int position;       // the item answered
        AnswerValue answer; // as given
        QList<Change> changes;
        qint64 guardBefore;
        bool hasAnswer; // false for statements
    };
    void advance(int position, Step* step);
    void setValue(int position, const cond::CellValue& value, Step* step);

    std::unique_ptr<Instrument> m_instrument;
    std::unique_ptr<CompiledRouting> m_routing;
    QList<cond::CellValue> m_values;
    QList<Step> m_steps;
    int m_current = -1;
    bool m_looped = false;
    qint64 m_guard = 0; // positions visited, as the simulator counts them
};

} // namespace rb
