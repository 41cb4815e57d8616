// Tests of the name lookups every check and analysis relies on: NameTable,
// ItemIndex and the positions CompiledRouting resolves into its trees. Names are equal ignoring
// case as DESIGN.md says; the expected answers below follow from that rule and are worked out by
// hand.

#include "condition/Parser.h"
#include "instrument/Instrument.h"
#include "instrument/NameTable.h"
#include "routing/CompiledRouting.h"
#include "storage/YamlFormat.h"

#include <QRandomGenerator>
#include <QTest>

#include <functional>
#include <map>

using namespace Qt::StringLiterals;
using namespace rb;

class TestInstrument : public QObject {
    Q_OBJECT
private slots:
    void validItemName_data();
    void validItemName();
    void sameName_data();
    void sameName();
    void firstInsertWins();
    void growsAndKeepsEveryName();
    void itemIndexLookups();
    void compiledAtomsCarryTheirPositions();
};

// DESIGN.md's rule for names: `[A-Za-z][A-Za-z0-9_]*`, at most 32 characters,
// not a keyword (keywords are lower case only) nor END in any case.
void TestInstrument::validItemName_data() {
    QTest::addColumn<QString>("name");
    QTest::addColumn<bool>("valid");
    QTest::newRow("one letter") << u"a"_s << true;
    QTest::newRow("letters digits _") << u"Car_km2"_s << true;
    QTest::newRow("32 characters") << QString(32, u'z') << true;
    QTest::newRow("33 characters") << QString(33, u'z') << false;
    QTest::newRow("empty") << QString() << false;
    QTest::newRow("digit first") << u"2nd_bed"_s << false;
    QTest::newRow("_ first") << u"_x"_s << false;
    QTest::newRow("hyphen") << u"car-km"_s << false;
    QTest::newRow("space") << u"car km"_s << false;
    QTest::newRow("non-ASCII letter") << u"gr\u00f6\u00dfe"_s << false;
    QTest::newRow("non-ASCII digit") << u"q\u0663"_s << false; // ARABIC-INDIC DIGIT THREE
    QTest::newRow("keyword") << u"asked"_s << false;
    QTest::newRow("keyword upper case is a name") << u"AND"_s << true;
    QTest::newRow("END") << u"END"_s << false;
    QTest::newRow("end any case") << u"eNd"_s << false;
    QTest::newRow("longer than END") << u"ending"_s << true;
}

void TestInstrument::validItemName() {
    QFETCH(QString, name);
    QFETCH(bool, valid);
    QCOMPARE(isValidItemName(name), valid);
}

void TestInstrument::sameName_data() {
    QTest::addColumn<QString>("a");
    QTest::addColumn<QString>("b");
    QTest::addColumn<bool>("same");
    QTest::newRow("exact") << u"car_km"_s << u"car_km"_s << true;
    QTest::newRow("case") << u"Car_KM"_s << u"cAR_km"_s << true;
    QTest::newRow("digits and _ do not fold") << u"q1_"_s << u"Q1_"_s << true;
    QTest::newRow("different") << u"car_km"_s << u"car_kn"_s << false;
    QTest::newRow("prefix") << u"car"_s << u"car_km"_s << false;
    // '@' (0x40) and '`' (0x60) differ by the ASCII case bit but are not letters.
    QTest::newRow("case bit on non-letters") << u"a@"_s << u"a`"_s << false;
    QTest::newRow("[ is not {") << u"x["_s << u"x{"_s << false;
    QTest::newRow("non-ASCII case") << u"Größe"_s << u"GRÖSSE"_s.replace(u"SS"_s, u"ß"_s) << true;
    QTest::newRow("non-ASCII different") << u"één"_s << u"een"_s << false;
    QTest::newRow("empty") << QString() << u""_s << true;
}

void TestInstrument::sameName() {
    QFETCH(QString, a);
    QFETCH(QString, b);
    QFETCH(bool, same);
    // The reference rule: equal after QString::toLower().
    QCOMPARE(a.toLower() == b.toLower(), same);
    QCOMPARE(NameTable::sameName(a, b), same);
    QCOMPARE(NameTable::sameName(b, a), same);
    if (same)
        QCOMPARE(NameTable::hashName(a), NameTable::hashName(b));
    NameTable table;
    table.insert(a, 7);
    QCOMPARE(table.value(b), same ? 7 : -1);
}

void TestInstrument::firstInsertWins() {
    NameTable table;
    QCOMPARE(table.insert(u"heat"_s, 1), 1);
    QCOMPARE(table.insert(u"HEAT"_s, 2), 1); // already held: the first value stays
    QCOMPARE(table.insert(u"solar"_s, 3), 3);
    QCOMPARE(table.size(), 2);
    QCOMPARE(table.value(u"Heat"_s), 1);
    QCOMPARE(table.value(u"SOLAR"_s), 3);
    QCOMPARE(table.value(u"wind"_s, -9), -9);
}

void TestInstrument::growsAndKeepsEveryName() {
    // Against std::map on lower-cased keys, through many growths of the table.
    QRandomGenerator rng(20261202);
    NameTable table;
    std::map<QString, int> reference;
    for (int i = 0; i < 5000; ++i) {
        QString name;
        const int length = 1 + int(rng.bounded(6));
        for (int c = 0; c < length; ++c)
            name += QChar(u"aBcDeF_1"[rng.bounded(8)]);
        const int held = table.insert(name, i);
        const auto [it, added] = reference.emplace(name.toLower(), i);
        QCOMPARE(held, it->second);
        Q_UNUSED(added);
    }
    QCOMPARE(table.size(), qsizetype(reference.size()));
    for (const auto& [lower, value] : reference) {
        QCOMPARE(table.value(lower), value);
        QCOMPARE(table.value(lower.toUpper()), value);
    }
    QCOMPARE(table.value(u"zz"_s), -1); // 'z' is never drawn above
}

namespace {
Module moduleOf(const QString& name, const QStringList& itemNames) {
    Module m;
    m.name = name;
    for (const QString& itemName : itemNames) {
        Item item;
        item.name = itemName;
        m.items.append(item);
    }
    return m;
}
} // namespace

void TestInstrument::itemIndexLookups() {
    Instrument instrument;
    // "ROOMS" duplicates "rooms": the first occurrence keeps the name.
    instrument.modules = {moduleOf(u"home"_s, {u"rooms"_s, u"Floors"_s}), moduleOf(u"garden"_s, {}),
                          moduleOf(u"travel"_s, {u"car"_s, u"ROOMS"_s})};
    const ItemIndex index(instrument);
    QCOMPARE(index.size(), 4);
    QCOMPARE(index.positionOf(u"floors"_s), 1);
    QCOMPARE(index.positionOf(u"Rooms"_s), 0);
    QCOMPARE(index.positionOf(u"CAR"_s), 2);
    QCOMPARE(index.positionOf(u"bike"_s), -1);
    QCOMPARE(index.modulePosition(u"TRAVEL"_s), 2);
    // An empty module resolves to the next item after it (here position 2).
    QCOMPARE(index.modulePosition(u"garden"_s), 2);
    QCOMPARE(index.resolveTarget(u"end"_s), 4);
    QCOMPARE(index.resolveTarget(u"Home"_s), 0);
    QCOMPARE(index.resolveTarget(u"nowhere"_s), -1);
}

// Every atom of every compiled condition holds the position its name looks up
// to (the analysis reads it instead of the name); a tree parsed without a
// resolver holds none and falls back to the name.
void TestInstrument::compiledAtomsCarryTheirPositions() {
    // At least one atom per ask_if / routing condition of the file (10 and 5,
    // counted in the YAML by hand, when_skipped conditions left out: they are
    // not routing); module filters count once per item.
    const QList<std::pair<const char*, int>> samples = {{"household-energy.yaml", 10},
                                                        {"commuting.yaml", 5}};
    for (const auto& [sample, conditions] : samples) {
        LoadResult loaded =
            loadYamlFile(QStringLiteral(ROUTEBOOK_SAMPLES_DIR "/") + QString::fromLatin1(sample));
        QVERIFY(loaded.ok());
        const CompiledRouting routing(*loaded.instrument);
        int atoms = 0;
        std::function<void(const cond::Expr&)> check = [&](const cond::Expr& e) {
            if (e.isAtom()) {
                ++atoms;
                QVERIFY(e.position >= 0);
                QCOMPARE(e.position, routing.positionOf(e.name));
                QCOMPARE(routing.positionOf(e), e.position);
            }
            for (const cond::ExprPtr& child : e.children)
                check(*child);
        };
        for (int p = 0; p < routing.itemCount(); ++p) {
            for (const cond::ExprPtr& f : routing.item(p).filters)
                check(*f);
            for (const CompiledRouting::CompiledRule& r : routing.item(p).rules)
                if (r.condition)
                    check(*r.condition);
        }
        QVERIFY2(atoms >= conditions, sample);
    }
    const cond::ParseResult plain = cond::parseCondition(u"Has_Vehicle = 1"_s);
    QVERIFY(plain.ok());
    QCOMPARE(plain.expr->position, cond::Expr::kUnresolved);
    const cond::ParseResult resolved = cond::parseCondition(
        u"a = 1 or b = 2"_s, [](const QString& n) { return n == u"a"_s ? 7 : -1; });
    QVERIFY(resolved.ok());
    QCOMPARE(resolved.expr->children.at(0)->position, 7);
    QCOMPARE(resolved.expr->children.at(1)->position, -1);
}

QTEST_GUILESS_MAIN(TestInstrument)
#include "tst_instrument.moc"
