#pragma once

#include "RouteMapPainter.h"

#include "analysis/RoutingAnalysis.h"
#include "instrument/Instrument.h"
#include "util/Diagnostic.h"

#include <QByteArray>
#include <QDateTime>
#include <QList>
#include <QString>
#include <QStringList>

#include <optional>

namespace rb {

// The data dictionary (DESIGN.md "Data dictionary") as one plain structure,
// built once and read by every renderer (HTML, PDF, Markdown, CSV, DDI), so
// that the formats can never disagree about a universe.

struct DictionaryCode {
    qint64 code = 0;
    QString label;
    MissingKind missing = MissingKind::None;
};

// One rule that leaves the item: "if CONDITION go to TARGET".
struct DictionaryRoute {
    QString condition;    // as written; empty = always (an unconditional goto)
    QString target;       // as written
    QString targetItem;   // the item it lands on ("END" for the end); empty when unknown
    int targetEntry = -1; // index into Dictionary::entries of that item, -1 for END/unknown
    bool usable = true;   // false: broken condition or unknown target, never fires
};

// A gate item read by the universe, resolved for links.
struct DictionaryGate {
    QString name;
    QString label;
    int entry = -1; // index into Dictionary::entries, -1 when not found
};

// One entry: a variable of the data file, or a statement (shown, no variable).
// A multi item gives one entry per 0/1 variable, each carrying the item's universe.
struct DictionaryEntry {
    QString variable; // the column name in the data (statements: the item name)
    QString item;     // the item it belongs to
    bool hasVariable = true;
    QString anchor; // unique, stable identifier for links (HTML ids, DDI IDs)
    QString label;
    QString text;
    QString instruction;
    QString notes;
    ItemType type = ItemType::Single;
    QString typeWords; // e.g. "single choice", "0/1 indicator of a multi-choice item"
    QString module;
    QString moduleTitle;
    int position = 0; // 1-based questionnaire position of the item
    QList<DictionaryCode> codes;
    std::optional<QString> rangeMin, rangeMax;
    // For a 0/1 variable of a multi item: the code it stands for.
    std::optional<DictionaryCode> indicatorOf;

    ItemUniverse::Asked asked = ItemUniverse::Asked::Always;
    QString askedIf; // condition language; empty unless conditional
    QString plain;   // the analysis's words
    QList<DictionaryGate> gates;
    QString notPresented; // what respondents who were not asked hold, in words
    std::optional<WhenSkipped> implied;
    QList<DictionaryRoute> routing;

    bool isConditional() const { return asked == ItemUniverse::Asked::Conditional; }
};

struct DictionaryModule {
    QString name;
    QString title;
    QString askIf;
    QList<int> entries; // indexes into Dictionary::entries, questionnaire order
};

struct DictionaryCounts {
    int items = 0;     // every item incl. statements
    int variables = 0; // columns in the data (multi items expanded)
    int conditionalItems = 0;
    int conditionalVariables = 0;
    int neverAskedItems = 0;
    int modules = 0;
    int errors = 0;
    int warnings = 0;
};

struct Dictionary {
    QString title;
    QString version;
    QString language;
    QDateTime generated; // UTC
    QString legitimateSkipCode;
    DictionaryCounts counts;
    QList<DictionaryModule> modules;
    QList<DictionaryEntry> entries;
    QByteArray routeMapSvg; // empty when no picture is available
    // The same map laid out, for renderers that draw it themselves (PDF).
    std::optional<RouteMapDrawing> routeMap;
};

// Builds the dictionary from the analysis (universes are never recomputed here).
Dictionary buildDictionary(const CompiledRouting& routing, const RoutingAnalysis& analysis,
                           const Findings& findings, const QDateTime& generated,
                           const QByteArray& routeMapSvg);

// The whole pipeline for the command line: analysis, findings, route map.
Dictionary buildDictionary(const CompiledRouting& routing, const QDateTime& generated);

// The generation time: SOURCE_DATE_EPOCH (seconds since 1970, UTC) when set, so
// that exports are reproducible; otherwise now. A malformed value is an error.
struct GenerationTime {
    QDateTime time;
    std::optional<Diagnostic> error;
};
GenerationTime generationTime();

// Words for the pieces every renderer prints the same way.
QString missingKindWords(MissingKind kind); // "don't know", "refused", "not applicable"
QString
askedWords(const DictionaryEntry& entry); // "Asked of everyone" / "CONDITIONAL" / "Never asked"
QString routeWords(const DictionaryRoute& route); // "if C go to T" / "always go to T"
QString impliedWords(const WhenSkipped& implied);

} // namespace rb
