// Property tests of the routing analysis against the reference simulator
// (DESIGN.md "Routing semantics"): on random instruments and random answer
// vectors, every item is presented exactly when its universe holds, both as
// the decision diagram and as the printed condition re-parsed and evaluated.
// And the minimiser on random conditions: the printed sum of products parses
// back to the very same canonical node (exhaustive equivalence, since equal
// nodes are equal functions over every value cell).

#include "../analysis/TestInstruments.h"
#include "analysis/ConditionAlgebra.h"
#include "analysis/Minimiser.h"
#include "analysis/RoutingAnalyzer.h"
#include "analysis/UniversePrinter.h"
#include "condition/Parser.h"
#include "condition/TypeCheck.h"
#include "routing/Simulator.h"

#include <QRandomGenerator>
#include <QSet>
#include <QtTest>

using namespace rb;
using namespace rb::analysis;
using namespace rbtest;
using namespace Qt::StringLiterals;

namespace {

class Generator {
public:
    explicit Generator(quint32 seed) : m_rng(seed) {}

    int below(int n) { return int(m_rng.bounded(quint32(n))); }
    bool chance(int percent) { return below(100) < percent; }

    static QList<CodeList> lists() {
        CodeList three{u"three"_s, {code(1, u"One"_s), code(2, u"Two"_s), code(3, u"Three"_s)}};
        CodeList modes{u"modes"_s,
                       {code(1, u"Bus"_s), code(2, u"Train"_s), code(3, u"Bike"_s),
                        code(9, u"Refused"_s, MissingKind::Refused)}};
        return {yesNo(), three, modes};
    }

    // An atom reading `it`.
    QString atom(const Item& it) {
        const QString n = it.name;
        if (chance(10))
            return (chance(50) ? u"asked("_s : u"answered("_s) + n + u')';
        switch (it.type) {
        case ItemType::Multi:
            return n + u" has "_s + QString::number(QList<int>{1, 2, 3, 9, 5}.at(below(5)));
        case ItemType::Integer: {
            const int v = below(12);
            switch (below(5)) {
            case 0:
                return n + u" > "_s + QString::number(v) + (chance(30) ? u".5"_s : QString());
            case 1:
                return n + u" <= "_s + QString::number(v);
            case 2:
                return n + u" in ("_s + QString::number(v) + u".."_s +
                       QString::number(v + below(5)) + u')';
            case 3:
                return n + u" = 98"_s;
            default:
                return n + u" <> "_s + QString::number(v);
            }
        }
        case ItemType::Text: {
            const QString lit = QStringList{u"\"a\""_s, u"\"b\""_s, u"\"\""_s}.at(below(3));
            return n + QStringList{u" = "_s, u" <> "_s, u" < "_s}.at(below(3)) + lit;
        }
        default: {
            const QList<int> codes =
                it.codeListName == u"three"_s ? QList<int>{1, 2, 3} : QList<int>{1, 2, 8, 9};
            const QString c1 = QString::number(codes.at(below(int(codes.size()))));
            switch (below(4)) {
            case 0:
                return n + u" = "_s + c1;
            case 1:
                return n + u" <> "_s + c1;
            case 2:
                return n + (chance(50) ? u" in ("_s : u" not in ("_s) + c1 + u", "_s +
                       QString::number(codes.at(below(int(codes.size())))) + u')';
            default:
                return n + u" in (1..2)"_s;
            }
        }
        }
    }

    QString condition(const QList<const Item*>& readable, int depth = 0) {
        if (depth < 2 && chance(40)) {
            const QString a = condition(readable, depth + 1), b = condition(readable, depth + 1);
            switch (below(3)) {
            case 0:
                return u'(' + a + u" and "_s + b + u')';
            case 1:
                return u'(' + a + u" or "_s + b + u')';
            default:
                return u"not ("_s + a + u')';
            }
        }
        return atom(*readable.at(below(int(readable.size()))));
    }

    Instrument instrument() {
        const int count = 4 + below(9);
        const int modules = 1 + below(3);
        QList<Item> items;
        for (int i = 0; i < count; ++i) {
            const int kind = below(100);
            Item it;
            const QString name = u"i"_s + QString::number(i);
            if (kind < 45)
                it = item(name, ItemType::Single, chance(60) ? u"yes_no"_s : u"three"_s);
            else if (kind < 65) {
                it = integerItem(name, 0, 10);
                it.missing = {code(98, u"Don't know"_s, MissingKind::DontKnow)};
            } else if (kind < 80)
                it = item(name, ItemType::Multi, u"modes"_s);
            else if (kind < 92)
                it = item(name, ItemType::Text);
            else
                it = item(name, ItemType::Statement);
            items.append(it);
        }
        // Module boundaries: module k starts at start[k].
        QList<int> start{0};
        for (int k = 1; k < modules; ++k)
            start.append(
                std::min(count - 1, start.last() + 1 + below(std::max(1, count / modules))));
        QList<const Item*> readable;
        for (int i = 0; i < count; ++i) {
            Item& it = items[i];
            // Mostly earlier items; now and then a later one (a forward reference,
            // which reads as empty).
            QList<const Item*> pool = readable;
            if (chance(5))
                for (int j = i; j < count; ++j)
                    if (items[j].type != ItemType::Statement)
                        pool.append(&items[j]);
            if (!pool.isEmpty() && chance(30))
                it.askIf = condition(pool);
            if (it.type != ItemType::Statement) {
                pool.append(&it); // rules may read the item just answered
                readable.append(&it);
            }
            const int rules = chance(35) ? 1 + below(2) : 0;
            for (int r = 0; r < rules; ++r) {
                Rule rule;
                if (!(r == rules - 1 && chance(15)) && !pool.isEmpty())
                    rule.condition = condition(pool);
                const int t = i + 1 + below(count - i + 1); // i+1 .. count (END)
                if (t >= count)
                    rule.target = u"END"_s;
                else if (start.contains(t) && chance(50))
                    rule.target = u"mod"_s + QString::number(start.indexOf(t));
                else
                    rule.target = items[t].name;
                it.routing.append(rule);
            }
        }
        QList<Module> mods;
        for (int k = 0; k < modules; ++k) {
            const int end = k + 1 < start.size() ? start[k + 1] : count;
            Module m = module(u"mod"_s + QString::number(k), items.mid(start[k], end - start[k]));
            if (k > 0 && chance(45)) {
                QList<const Item*> earlier;
                for (int i = 0; i < start[k]; ++i)
                    if (items[i].type != ItemType::Statement)
                        earlier.append(&items[i]);
                if (!earlier.isEmpty())
                    m.askIf = condition(earlier);
            }
            mods.append(m);
        }
        return rbtest::instrument(mods, lists());
    }

    cond::CellValue answer(const Item& it) {
        switch (it.type) {
        case ItemType::Single: {
            const QList<int> codes =
                it.codeListName == u"three"_s ? QList<int>{1, 2, 3} : QList<int>{1, 2, 8, 9};
            return cond::CellValue::ofNumber(codes.at(below(int(codes.size()))));
        }
        case ItemType::Integer:
            return cond::CellValue::ofNumber(chance(10) ? 98 : below(11));
        case ItemType::Multi: {
            QList<qint64> chosen;
            while (chosen.isEmpty())
                for (qint64 c : {1, 2, 3, 9})
                    if (chance(35))
                        chosen.append(c);
            return cond::CellValue::ofCodes(chosen);
        }
        case ItemType::Text:
            return cond::CellValue::ofText(
                QStringList{u"a"_s, u"b"_s, u"c"_s, u""_s, u"ab"_s}.at(below(5)));
        default:
            return cond::CellValue::ofText(QString());
        }
    }

private:
    QRandomGenerator m_rng;
};

// The reads-unasked-item sites (finding ids) at which this route evaluated a
// condition while an earlier item it reads was empty. Routes are forward only,
// so an earlier item's final value is its value when the condition ran.
QSet<QString> emptyReads(const CompiledRouting& routing, const RouteResult& route) {
    QHash<int, int> moduleStart;
    for (int p = routing.itemCount() - 1; p >= 0; --p)
        moduleStart[routing.index().at(p).moduleIndex] = p;
    QSet<QString> sites;
    for (const Evaluation& e : route.evaluated) {
        const ItemIndex::Entry& entry = routing.index().at(e.position);
        const CompiledRouting::CompiledItem& item = routing.item(e.position);
        const bool module = e.filter == 0 && item.hasModuleFilter;
        const cond::ExprPtr expr =
            e.filter >= 0 ? item.filters.at(e.filter) : item.rules.at(e.rule).condition;
        const int limit = module ? moduleStart.value(entry.moduleIndex) : e.position;
        for (const cond::NameUse& use : cond::namesRead(*expr)) {
            const int x = routing.positionOf(use.name);
            if (x >= 0 && x < limit && !route.values.at(x).presented()) {
                sites.insert(u"reads-unasked-item:"_s +
                             (module ? entry.module->name : entry.item->name) + u':' +
                             (e.filter >= 0 ? u"ask_if"_s
                                            : u"routing["_s + QString::number(e.rule) + u"].if"_s));
                break;
            }
        }
    }
    return sites;
}

} // namespace

class TestProperty : public QObject {
    Q_OBJECT

private slots:
    void universesAgreeWithSimulator() {
        Generator gen(20261201);
        const int instruments = 300, respondents = 12;
        long pairs = 0;
        for (int n = 0; n < instruments; ++n) {
            const Instrument ins = gen.instrument();
            const CompiledRouting routing(ins);
            RoutingAnalyzer analyzer(routing);
            QList<ItemUniverse> universes;
            QList<cond::ExprPtr> printed;
            for (int p = 0; p < routing.itemCount(); ++p) {
                universes.append(analyzer.universe(p));
                const ItemUniverse& u = universes.last();
                cond::ExprPtr e;
                if (u.asked == ItemUniverse::Asked::Conditional) {
                    const cond::ParseResult parsed = cond::parseCondition(u.askedIf);
                    QVERIFY2(parsed.ok(), qPrintable(u.askedIf));
                    e = parsed.expr;
                }
                printed.append(e);
            }
            for (int r = 0; r < respondents; ++r) {
                QList<cond::CellValue> answers;
                for (const ItemIndex::Entry& e : routing.index().entries())
                    answers.append(gen.answer(*e.item));
                const RouteResult route =
                    simulateRoute(routing, [&](int p) { return answers.at(p); });
                QVERIFY(!route.loop);
                const std::vector<int> cells = analyzer.algebra().assignmentOf(route.values);
                const cond::Environment env = environmentFor(routing, route.values);
                for (int p = 0; p < routing.itemCount(); ++p) {
                    const bool shown = route.path.contains(p);
                    const bool byDiagram =
                        analyzer.algebra().mdd().evaluate(analyzer.presented(p), cells);
                    const ItemUniverse& u = universes.at(p);
                    const bool byText = u.asked == ItemUniverse::Asked::Always ||
                                        (u.asked == ItemUniverse::Asked::Conditional &&
                                         cond::evaluate(*printed.at(p), env));
                    if (shown != byDiagram || shown != byText) {
                        QString dump;
                        for (const Module& m : ins.modules) {
                            dump += u"module "_s + m.name + u" ask_if "_s +
                                    m.askIf.value_or(u"-"_s) + u'\n';
                            for (const Item& it : m.items) {
                                dump += u"  "_s + it.name + u' ' + itemTypeName(it.type) +
                                        u" ask_if: "_s + it.askIf.value_or(u"-"_s);
                                for (const Rule& rule : it.routing)
                                    dump += u" | if "_s + rule.condition.value_or(u"(always)"_s) +
                                            u" goto "_s + rule.target;
                                dump += u'\n';
                            }
                        }
                        QFAIL(qPrintable(u"instrument "_s + QString::number(n) + u", item "_s +
                                         routing.index().at(p).item->name + u": simulator "_s +
                                         QString::number(shown) + u", diagram "_s +
                                         QString::number(byDiagram) + u", printed '"_s + u.askedIf +
                                         u"' "_s + QString::number(byText) + u'\n' + dump));
                    }
                    ++pairs;
                }
            }
        }
        // The minimum: 200 instruments and 20,000 item-respondent pairs.
        QVERIFY(pairs >= 20000);
        qInfo("%ld item-respondent pairs on %d instruments", pairs, instruments);
    }

    // reads-unasked-item against the simulator's trace of evaluated conditions
    // (filters joined left to right, module's first): every empty read a
    // random respondent makes is reported, and every report's witness
    // assignment, replayed, makes one.
    void unaskedReadsAgreeWithSimulator() {
        Generator gen(20261202);
        const int instruments = 300, respondents = 12;
        int confirmed = 0, sampled = 0;
        for (int n = 0; n < instruments; ++n) {
            const Instrument ins = gen.instrument();
            const CompiledRouting routing(ins);
            RoutingAnalyzer analyzer(routing);
            QSet<QString> reported;
            for (const Finding& f : analyzer.findings())
                if (f.check == u"reads-unasked-item"_s)
                    reported.insert(f.id());
            for (int r = 0; r < respondents; ++r) {
                QList<cond::CellValue> answers;
                for (const ItemIndex::Entry& e : routing.index().entries())
                    answers.append(gen.answer(*e.item));
                const RouteResult route = simulateRoute(
                    routing, [&](int p) { return answers.at(p); }, true);
                for (const QString& id : emptyReads(routing, route)) {
                    QVERIFY2(reported.contains(id),
                             qPrintable(u"instrument "_s + QString::number(n) +
                                        u": not reported "_s + id));
                    ++sampled;
                }
            }
            QStringList ids = reported.values();
            ids.sort(); // a set's order varies by run; the random stream must not
            for (const QString& id : ids) {
                const std::optional<std::vector<int>> cells = analyzer.unaskedReadWitness(id);
                QVERIFY2(cells, qPrintable(id));
                const RouteResult route = simulateRoute(
                    routing,
                    [&](int p) {
                        return analyzer.algebra().isGateItem(p)
                                   ? analyzer.algebra().sampleValue(p, *cells)
                                   : gen.answer(*routing.index().at(p).item);
                    },
                    true);
                QVERIFY2(emptyReads(routing, route).contains(id),
                         qPrintable(u"instrument "_s + QString::number(n) +
                                    u": witness does not read an empty item for "_s + id));
                ++confirmed;
            }
        }
        // Enough of both directions to mean something (counts of this seed).
        QVERIFY(confirmed >= 100);
        QVERIFY(sampled >= 100);
        qInfo("%d reported empty reads replayed, %d sampled empty reads reported", confirmed,
              sampled);
    }

    void printedMinimumParsesToTheSameNode() {
        Generator gen(7);
        const Instrument ins = gen.instrument();
        int checked = 0;
        for (int round = 0; round < 400; ++round) {
            const Instrument random = gen.instrument();
            const CompiledRouting routing(random);
            QList<const Item*> readable;
            for (const ItemIndex::Entry& e : routing.index().entries())
                if (e.item->type != ItemType::Statement)
                    readable.append(e.item);
            if (readable.isEmpty())
                continue;
            const QString text = gen.condition(readable);
            const cond::ExprPtr expr = routing.compileCondition(text);
            QVERIFY2(expr, qPrintable(text));
            ConditionAlgebra algebra(routing, {expr});
            const int f = algebra.condition(*expr);
            std::vector<int> vars = algebra.mdd().support(f);
            std::sort(vars.begin(), vars.end(), [&](int a, int b) {
                const int pa = algebra.variable(a).position, pb = algebra.variable(b).position;
                return pa != pb ? pa < pb : a < b;
            });
            const Sop sop = minimiseSop(algebra.mdd(), f, Mdd::True, vars);
            const QString printed = UniversePrinter(algebra).condition(sop);
            const int back = algebra.conditionText(printed);
            QVERIFY2(back == f, qPrintable(text + u" printed as "_s + printed));
            ++checked;
        }
        Q_UNUSED(ins);
        QVERIFY(checked >= 300);
    }
};

QTEST_GUILESS_MAIN(TestProperty)
#include "tst_property.moc"
