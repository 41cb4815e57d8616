// libFuzzer target: the condition parser. Any input must parse or give an
// error with a column inside the text (+1 for "the end"); a parsed condition
// must print to text that parses again to the same tree (the printer is the
// canonical form the analysis and exports rely on).
#include "condition/Parser.h"
#include "condition/Printer.h"

#include <cstdint>
#include <cstdlib>

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
    if (size > 64 * 1024)
        return 0; // longer conditions are covered by the reliability tests
    const QString text = QString::fromUtf8(reinterpret_cast<const char*>(data), qsizetype(size));
    const rb::cond::ParseResult parsed = rb::cond::parseCondition(text);
    if (!parsed.ok()) {
        if (!parsed.error || parsed.error->column < 1 || parsed.error->column > text.size() + 1 ||
            parsed.error->message.isEmpty())
            std::abort(); // an error must say where and what
        return 0;
    }
    const QString printed = rb::cond::printCondition(*parsed.expr);
    const rb::cond::ParseResult again = rb::cond::parseCondition(printed);
    if (!again.ok() || !again.expr->sameTree(*parsed.expr))
        std::abort(); // printing lost or changed meaning
    return 0;
}
