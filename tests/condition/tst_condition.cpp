// Tests of the condition language: lexer/parser (accept, reject with column and
// message), printer round trip, evaluator truth tables, type checks, limits.
// Every expected value below is worked out by hand from DESIGN.md "Condition
// language" and the task rules, not taken from the program's output.

#include "TreeGenerator.h"

#include "condition/Evaluator.h"
#include "condition/Lexer.h"
#include "condition/Parser.h"
#include "condition/Printer.h"
#include "condition/TypeCheck.h"
#include "instrument/Instrument.h"

#include <QHash>
#include <QSet>
#include <QTest>

#include <cmath>

using namespace Qt::StringLiterals;
using namespace rb;
using namespace rb::cond;

namespace {

ExprPtr parsed(const QString& text) {
    ParseResult r = parseCondition(text);
    if (!r.ok())
        qWarning("parse of '%s' failed at %d: %s", qPrintable(text), r.error->column,
                 qPrintable(r.error->message));
    return r.expr;
}

// A fixed respondent for the truth tables. Names resolve ignoring case, as the
// Environment contract asks; unknown names read as not presented.
struct TestEnvironment {
    QHash<QString, CellValue> cells;
    QHash<QString, QSet<qint64>> missing;

    TestEnvironment() {
        cells[u"b"_s] = CellValue::blank();
        cells[u"n"_s] = CellValue::ofNumber(3); // single, codes 1 2 3 8 9; 8, 9 missing
        cells[u"r"_s] = CellValue::ofNumber(9); // same list: refused
        cells[u"z"_s] = CellValue::ofNumber(0); // integer 0: a value, not missing
        cells[u"neg"_s] = CellValue::ofNumber(-2);
        cells[u"d"_s] = CellValue::ofNumber(2.5); // decimal
        cells[u"d9"_s] = CellValue::ofNumber(9);  // decimal without missing codes
        cells[u"t"_s] = CellValue::ofText(u"Oak"_s);
        cells[u"ts"_s] = CellValue::ofText(u"  "_s);   // text of spaces only: blank
        cells[u"bad"_s] = CellValue::ofText(u"abc"_s); // numeric item, invalid data
        cells[u"dt"_s] = CellValue::ofText(u"2024-05-31"_s);
        cells[u"m"_s] = CellValue::ofCodes({1, 3});
        cells[u"mm"_s] = CellValue::ofCodes({8, 9}); // only missing codes chosen
        cells[u"m0"_s] = CellValue::ofCodes({});     // presented, nothing chosen
        for (const QString& name : {u"n"_s, u"r"_s, u"m"_s, u"mm"_s, u"m0"_s, u"d"_s})
            missing[name] = {8, 9};
    }

    Environment env() const {
        Environment e;
        e.value = [this](const QString& name) {
            return cells.value(name.toLower(), CellValue::notPresented());
        };
        e.isMissingCode = [this](const QString& name, qint64 code) {
            return missing.value(name.toLower()).contains(code);
        };
        return e;
    }
};

Instrument typeCheckInstrument() {
    Instrument instrument;
    Module main;
    main.name = u"household"_s;
    auto add = [&main](const QString& name, ItemType type) {
        Item item;
        item.name = name;
        item.type = type;
        if (type == ItemType::Single || type == ItemType::Multi) {
            item.hasInlineCodes = true;
            item.inlineCodes = {{1, u"One"_s, MissingKind::None},
                                {2, u"Two"_s, MissingKind::None},
                                {9, u"Refused"_s, MissingKind::Refused}};
        }
        main.items.append(item);
    };
    add(u"intro"_s, ItemType::Statement);
    add(u"sing"_s, ItemType::Single);
    add(u"multi"_s, ItemType::Multi);
    add(u"num"_s, ItemType::Integer);
    add(u"dec"_s, ItemType::Decimal);
    add(u"txt"_s, ItemType::Text);
    add(u"day"_s, ItemType::Date);
    instrument.modules.append(main);
    Module garden;
    garden.name = u"garden"_s;
    instrument.modules.append(garden); // an empty module: its name is not an item
    return instrument;
}

QString repeated(const QString& piece, int times) {
    QString s;
    s.reserve(piece.size() * times);
    for (int i = 0; i < times; ++i)
        s += piece;
    return s;
}

} // namespace

class TestCondition : public QObject {
    Q_OBJECT

private slots:
    void acceptsAndPrints_data();
    void acceptsAndPrints();
    void rejects_data();
    void rejects();
    void treeShapes();
    void numberValues_data();
    void numberValues();
    void tokenSpellings();
    void columns();
    void sameTree();
    void printerParenthesizes_data();
    void printerParenthesizes();
    void printValueEscapes();
    void randomRoundTrip();
    void evaluates_data();
    void evaluates();
    void evaluatesWithoutMissingLookup();
    void typeChecks_data();
    void typeChecks();
    void typeCheckReportsEveryAtom();
    void namesReadInOrder();
    void nestingLimit();
    void deepNestingDoesNotCrash();
    void millionCharacterConditions();
};

// ---------------------------------------------------------------- parser

void TestCondition::acceptsAndPrints_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<QString>("printed");
    auto row = [](const char* tag, const QString& text, const QString& printed) {
        QTest::newRow(tag) << text << printed;
    };
    row("plain", u"x = 1"_s, u"x = 1"_s);
    row("no spaces", u"x=1"_s, u"x = 1"_s);
    row("spaces and text", u"  x   <>   \"a b\"  "_s, u"x <> \"a b\""_s);
    row("list with range", u"x in (1,3..5)"_s, u"x in (1, 3..5)"_s);
    row("not in", u"x not in (2)"_s, u"x not in (2)"_s);
    row("has", u"m has 3"_s, u"m has 3"_s);
    row("asked", u"asked(x)"_s, u"asked(x)"_s);
    row("asked spaced", u"asked ( x )"_s, u"asked(x)"_s);
    row("answered", u"answered(x)"_s, u"answered(x)"_s);
    row("true", u"true"_s, u"true"_s);
    row("false", u"false"_s, u"false"_s);
    row("not", u"not x = 1"_s, u"not x = 1"_s);
    row("negative integer", u"x = -3"_s, u"x = -3"_s);
    row("negative decimal, no spaces", u"x>=-0.5"_s, u"x >= -0.5"_s);
    row("less than negative", u"x<-3"_s, u"x < -3"_s);
    // `1..5` must not read as the decimal `1.` followed by `.5`.
    row("range lexing", u"x in (1..5)"_s, u"x in (1..5)"_s);
    row("range spaced", u"x in (1 .. 5)"_s, u"x in (1..5)"_s);
    row("negative range", u"x in (-5..-1)"_s, u"x in (-5..-1)"_s);
    row("decimal range", u"x in (1.5..2.5)"_s, u"x in (1.5..2.5)"_s);
    row("spelling kept", u"x = 3.0"_s, u"x = 3.0"_s);
    row("leading zeros kept", u"x = 007"_s, u"x = 007"_s);
    row("upper-case AND is a name", u"AND = 1"_s, u"AND = 1"_s);
    row("Asked is a name", u"Asked = 1"_s, u"Asked = 1"_s);
    row("name case kept", u"HasCar = 1"_s, u"HasCar = 1"_s);
    row("and binds tighter", u"x = 1 and y = 2 or z = 3"_s, u"(x = 1 and y = 2) or z = 3"_s);
    row("and binds tighter right", u"x = 1 or y = 2 and z = 3"_s, u"x = 1 or (y = 2 and z = 3)"_s);
    row("explicit nesting", u"(x = 1 or y = 2) or z = 3"_s, u"(x = 1 or y = 2) or z = 3"_s);
    row("redundant parentheses", u"((x = 1))"_s, u"x = 1"_s);
    row("not of group", u"not (x = 1 and y = 2)"_s, u"not (x = 1 and y = 2)"_s);
    row("double not", u"not not x = 1"_s, u"not not x = 1"_s);
    row("not binds to atom", u"not x = 1 and y = 2"_s, u"not x = 1 and y = 2"_s);
    row("escaped quote", uR"(x = "say \"hi\"")"_s, uR"(x = "say \"hi\"")"_s);
    row("escaped backslash", uR"(x = "a\\b")"_s, uR"(x = "a\\b")"_s);
    row("empty text", u"x = \"\""_s, u"x = \"\""_s);
    row("raw newline in text", u"x = \"a\nb\""_s, u"x = \"a\nb\""_s);
    row("dots inside text", u"x in (\"a\", \"b..c\")"_s, u"x in (\"a\", \"b..c\")"_s);
    row("text range, no space", u"x in(\"a\"..\"c\")"_s, u"x in (\"a\"..\"c\")"_s);
    row("all operators", u"x<1 or x<=1 or x>1 or x>=1 or x=1 or x<>1"_s,
        u"x < 1 or x <= 1 or x > 1 or x >= 1 or x = 1 or x <> 1"_s);
    row("tab and newline as space", u"x\t=\n1"_s, u"x = 1"_s);
    row("keyword-like text", u"x = \"and\""_s, u"x = \"and\""_s);
    // Keywords are whole words: these names merely start with one.
    row("keyword prefixes", u"order = 1 or notes = 2 and in_city = 3 or hasCar = 1 or truest = 1"_s,
        u"order = 1 or (notes = 2 and in_city = 3) or hasCar = 1 or truest = 1"_s);
    row("not before parenthesis", u"not(x = 1)"_s, u"not x = 1"_s);
    row("no space before keyword", u"asked(x)and x=\"a\"or(y=1)"_s,
        u"(asked(x) and x = \"a\") or y = 1"_s);
}

void TestCondition::acceptsAndPrints() {
    QFETCH(QString, text);
    QFETCH(QString, printed);
    ParseResult r = parseCondition(text);
    QVERIFY2(r.ok(), r.error ? qPrintable(r.error->message) : "no error");
    QCOMPARE(printCondition(*r.expr), printed);
}

void TestCondition::rejects_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<int>("column");
    QTest::addColumn<QString>("message");
    auto row = [](const char* tag, const QString& text, int column, const QString& message) {
        QTest::newRow(tag) << text << column << message;
    };
    // Columns counted by hand, 1-based; the end of the text is length + 1.
    row("empty", u""_s, 1, u"empty condition"_s);
    row("only spaces", u"   "_s, 4, u"empty condition"_s);
    row("missing value at end", u"x ="_s, 4, u"expected a value after '='"_s);
    row("missing value, trailing space", u"x = "_s, 5, u"expected a value after '='"_s);
    row("name instead of value", u"x = y"_s, 5,
        u"expected a value after '=' (a number or \"text\"), found 'y'"_s);
    row("keyword instead of value", u"x = true"_s, 5, u"found 'true'"_s);
    row("double equals", u"x == 1"_s, 4, u"expected a value after '='"_s);
    row("bang equals", u"x != 1"_s, 3, u"unexpected character '!'"_s);
    row("ampersand", u"x = 1 & y = 2"_s, 7, u"unexpected character '&'"_s);
    row("single quotes", u"x = 'a'"_s, 5, u"text literals use double quotes"_s);
    row("non-ASCII name", u"\u00e9 = 1"_s, 1, u"unexpected character '\u00e9'"_s);
    row("underscore first", u"_x = 1"_s, 1, u"unexpected character '_'"_s);
    row("extra close", u"x = 1)"_s, 6, u"unexpected ')'"_s);
    row("close first", u")"_s, 1, u"unexpected ')'"_s);
    row("unclosed outer", u"((x = 1)"_s, 9, u"unclosed parenthesis opened at column 1"_s);
    row("unclosed later", u"x = 1 and (y = 2"_s, 17, u"unclosed parenthesis opened at column 11"_s);
    row("unclosed with junk", u"(x = 1 y = 2)"_s, 8,
        u"expected ')' to close the parenthesis opened at column 1"_s);
    row("unterminated text", u"x = \"abc"_s, 5, u"unterminated text literal"_s);
    row("escaped quote at end", uR"(x = "abc\")"_s, 5, u"unterminated text literal"_s);
    row("unknown escape", uR"(x = "a\nb")"_s, 7, u"unknown escape"_s);
    row("not without in", u"x not y"_s, 7, u"expected 'in' after 'not'"_s);
    row("not at end", u"x not"_s, 6, u"expected 'in' after 'not'"_s);
    row("in without list", u"x in 1"_s, 6, u"expected '(' after 'in'"_s);
    row("empty list", u"x in ()"_s, 7, u"expected a value after '('"_s);
    row("trailing comma", u"x in (1,)"_s, 9, u"expected a value after ','"_s);
    row("missing comma", u"x in (1 2)"_s, 9, u"expected ',' or ')' in the list"_s);
    row("unclosed list", u"x in (1, 2"_s, 11, u"unclosed parenthesis opened at column 6"_s);
    row("open range", u"x in (1..)"_s, 10, u"expected a value after '..'"_s);
    row("range start missing", u"x in (..5)"_s, 7, u"expected a value after '('"_s);
    row("double range", u"x in (1..2..3)"_s, 11, u"expected ',' or ')' in the list, found '..'"_s);
    row("name alone", u"x"_s, 2,
        u"expected =, <>, <, <=, >, >=, 'in', 'not in' or 'has' after 'x'"_s);
    row("upper-case AND", u"x = 1 AND y = 2"_s, 7, u"keywords are lower case: write 'and'"_s);
    row("two atoms", u"x = 1 y = 2"_s, 7, u"expected 'and', 'or' or the end of the condition"_s);
    row("and at end", u"x = 1 and"_s, 10, u"expected a condition after 'and'"_s);
    row("and first", u"and x = 1"_s, 1, u"expected a condition"_s);
    row("not alone", u"not"_s, 4, u"expected a condition after 'not'"_s);
    row("and not at end", u"x = 1 and not"_s, 14, u"expected a condition after 'not'"_s);
    row("or or", u"x = 1 or or y = 2"_s, 10, u"expected a condition after 'or', found 'or'"_s);
    row("empty parentheses", u"()"_s, 2, u"expected a condition after '(', found ')'"_s);
    row("value first", u"3 = x"_s, 1, u"expected a condition"_s);
    row("asked without parenthesis", u"asked x"_s, 7, u"expected '(' after 'asked'"_s);
    row("asked empty", u"asked()"_s, 7, u"expected an item name inside asked(...)"_s);
    row("asked number", u"asked(1)"_s, 7, u"expected an item name"_s);
    row("asked unclosed", u"asked(x"_s, 8, u"unclosed parenthesis opened at column 6"_s);
    row("answered two names", u"answered(x y)"_s, 12, u"expected ')' after the item name"_s);
    row("has without value", u"x has"_s, 6, u"expected a value after 'has'"_s);
    row("point without digits", u"x = 1."_s, 7, u"expected digits after the decimal point"_s);
    row("point first", u"x = .5"_s, 5, u"unexpected character '.'"_s);
    row("minus then space", u"x = - 3"_s, 5, u"expected a digit after '-'"_s);
    row("letters after number", u"x = 3abc"_s, 6, u"right after a number"_s);
    row("exponent", u"x = 1e5"_s, 6, u"right after a number"_s);
    row("ne at end", u"x <> "_s, 6, u"expected a value after '<>'"_s);
    // 400 nines overflow a double: an error, not an infinite or zero value.
    row("huge number", u"x = "_s + repeated(u"9"_s, 400), 5, u"too large"_s);
}

void TestCondition::rejects() {
    QFETCH(QString, text);
    QFETCH(int, column);
    QFETCH(QString, message);
    ParseResult r = parseCondition(text);
    QVERIFY(!r.ok());
    QVERIFY(r.error.has_value());
    QVERIFY2(r.error->message.contains(message), qPrintable(r.error->message));
    QCOMPARE(r.error->column, column);
}

void TestCondition::treeShapes() {
    // A chain is one flat node.
    ExprPtr chain = parsed(u"a = 1 or b = 1 or c = 1"_s);
    QVERIFY(chain);
    QCOMPARE(chain->kind, Expr::Kind::Or);
    QCOMPARE(chain->children.size(), 3);

    // Parentheses nest: Or[Or[a, b], c].
    ExprPtr nested = parsed(u"(a = 1 or b = 1) or c = 1"_s);
    QVERIFY(nested);
    QCOMPARE(nested->kind, Expr::Kind::Or);
    QCOMPARE(nested->children.size(), 2);
    QCOMPARE(nested->children.at(0)->kind, Expr::Kind::Or);
    QCOMPARE(nested->children.at(0)->children.size(), 2);
    QVERIFY(!nested->sameTree(*chain));

    // `and` binds tighter than `or`; `not` binds to the next unary.
    ExprPtr mixed = parsed(u"not a = 1 and b = 2 or c = 3"_s);
    QVERIFY(mixed);
    QCOMPARE(mixed->kind, Expr::Kind::Or);
    QCOMPARE(mixed->children.at(0)->kind, Expr::Kind::And);
    QCOMPARE(mixed->children.at(0)->children.at(0)->kind, Expr::Kind::Not);
    QCOMPARE(mixed->children.at(1)->kind, Expr::Kind::Compare);

    // Values: kind, spelling and number.
    ExprPtr in = parsed(u"x not in (-2, 1..3.5, \"a\\\"b\")"_s);
    QVERIFY(in);
    QCOMPARE(in->kind, Expr::Kind::In);
    QVERIFY(in->negated);
    QCOMPARE(in->list.size(), 3);
    QCOMPARE(in->list.at(0).low.kind, Value::Kind::Integer);
    QCOMPARE(in->list.at(0).low.number, -2.0);
    QVERIFY(!in->list.at(0).high);
    QCOMPARE(in->list.at(1).low.number, 1.0);
    QCOMPARE(in->list.at(1).high->kind, Value::Kind::Decimal);
    QCOMPARE(in->list.at(1).high->number, 3.5);
    QCOMPARE(in->list.at(2).low.kind, Value::Kind::Text);
    QCOMPARE(in->list.at(2).low.text, u"a\"b"_s); // unescaped content
}

// The value of every number spelling, against QString::toDouble (Qt's own
// C-locale conversion) as the reference: the lexer reads short integers digit
// by digit and hands longer ones to toDouble.
void TestCondition::numberValues_data() {
    QTest::addColumn<QString>("spelling");
    QTest::newRow("zero") << u"0"_s;
    QTest::newRow("negative zero") << u"-0"_s;
    QTest::newRow("leading zeros") << u"007"_s;
    QTest::newRow("negative") << u"-42"_s;
    QTest::newRow("15 digits") << u"999999999999999"_s;
    QTest::newRow("16 digits") << u"1234567890123456"_s;
    QTest::newRow("beyond 2^53") << u"9007199254740993"_s;
    QTest::newRow("negative 20 digits") << u"-12345678901234567890"_s;
    QTest::newRow("decimal") << u"12.25"_s;
    QTest::newRow("negative decimal") << u"-0.1"_s;
}

void TestCondition::numberValues() {
    QFETCH(QString, spelling);
    ExprPtr compare = parsed(u"x = "_s + spelling);
    QVERIFY(compare);
    bool ok = false;
    const double expected = spelling.toDouble(&ok);
    QVERIFY(ok);
    QCOMPARE(compare->value.number, expected);
    QCOMPARE(std::signbit(compare->value.number), std::signbit(expected));
    QCOMPARE(compare->value.text, spelling); // spelling kept as written
}

// Tokens keep their spelling (error messages quote it); keywords are lower
// case only.
void TestCondition::tokenSpellings() {
    const LexResult lexed = lexCondition(u"(a<>1 or AND>=2..3),x<=y"_s);
    QVERIFY(!lexed.error);
    QStringList spellings;
    QList<Token::Kind> kinds;
    for (const Token& t : lexed.tokens) {
        spellings.append(t.text);
        kinds.append(t.kind);
    }
    using K = Token::Kind;
    QCOMPARE(spellings,
             (QStringList{u"("_s, u"a"_s, u"<>"_s, u"1"_s, u"or"_s, u"AND"_s, u">="_s, u"2"_s,
                          u".."_s, u"3"_s, u")"_s, u","_s, u"x"_s, u"<="_s, u"y"_s, QString()}));
    QCOMPARE(kinds, (QList<K>{K::LParen, K::Name, K::Op, K::Integer, K::Keyword, K::Name, K::Op,
                              K::Integer, K::DotDot, K::Integer, K::RParen, K::Comma, K::Name,
                              K::Op, K::Name, K::End}));
    // Whole numbers keep their spelling and value whichever way they are stored
    // (0..99 come from a shared table): every one from 0 to 120, and leading
    // zeros and signs as written.
    for (int v = 0; v <= 120; ++v) {
        const LexResult one = lexCondition(QString::number(v));
        QVERIFY(!one.error);
        QCOMPARE(one.tokens.first().text, QString::number(v));
        QCOMPARE(one.tokens.first().number, double(v));
    }
    const LexResult odd = lexCondition(u"07 00 -5 099"_s);
    QVERIFY(!odd.error);
    QCOMPARE(odd.tokens.at(0).text, u"07"_s);
    QCOMPARE(odd.tokens.at(0).number, 7.0);
    QCOMPARE(odd.tokens.at(1).text, u"00"_s);
    QCOMPARE(odd.tokens.at(2).text, u"-5"_s);
    QCOMPARE(odd.tokens.at(2).number, -5.0);
    QCOMPARE(odd.tokens.at(3).text, u"099"_s);
}

void TestCondition::columns() {
    // a1 =3 1 5 or7 (10 not11 b15 in17 (20 ... and27 asked31 (36 c37 )38 )39
    ExprPtr e = parsed(u"a = 1 or (not b in (1, 2) and asked(c))"_s);
    QVERIFY(e);
    QCOMPARE(e->kind, Expr::Kind::Or);
    QCOMPARE(e->column, 1);
    const Expr& a = *e->children.at(0);
    QCOMPARE(a.column, 1);
    QCOMPARE(a.nameColumn, 1);
    const Expr& group = *e->children.at(1);
    QCOMPARE(group.kind, Expr::Kind::And);
    QCOMPARE(group.column, 11); // first token inside the parentheses
    const Expr& notNode = *group.children.at(0);
    QCOMPARE(notNode.kind, Expr::Kind::Not);
    QCOMPARE(notNode.column, 11);
    QCOMPARE(notNode.children.at(0)->column, 15);
    QCOMPARE(notNode.children.at(0)->nameColumn, 15);
    const Expr& asked = *group.children.at(1);
    QCOMPARE(asked.kind, Expr::Kind::Asked);
    QCOMPARE(asked.column, 31);
    QCOMPARE(asked.nameColumn, 37);

    // Leading spaces shift everything: "   x = 1" has x at column 4.
    ExprPtr shifted = parsed(u"   x = 1"_s);
    QVERIFY(shifted);
    QCOMPARE(shifted->nameColumn, 4);
    // An outer chain whose first operand is parenthesized starts at the '('.
    ExprPtr outer = parsed(u"(a = 1 or b = 1) or c = 1"_s);
    QVERIFY(outer);
    QCOMPARE(outer->column, 1);
    QCOMPARE(outer->children.at(0)->column, 2);
    QCOMPARE(outer->children.at(1)->nameColumn, 21);
}

void TestCondition::sameTree() {
    auto same = [](const QString& a, const QString& b) {
        ExprPtr x = parsed(a), y = parsed(b);
        return x && y && x->sameTree(*y);
    };
    QVERIFY(same(u"x=1"_s, u"  x = 1"_s));      // columns ignored
    QVERIFY(same(u"Age = 1"_s, u"age = 1"_s));  // names ignore case
    QVERIFY(same(u"((x = 1))"_s, u"x = 1"_s));  // no node for parentheses
    QVERIFY(!same(u"x = 3"_s, u"x = 3.0"_s));   // spelling differs
    QVERIFY(!same(u"x = 3"_s, u"x = \"3\""_s)); // kind differs
    QVERIFY(!same(u"x in (1..2)"_s, u"x in (1, 2)"_s));
    QVERIFY(!same(u"x in (1)"_s, u"x not in (1)"_s));
    QVERIFY(!same(u"x < 1"_s, u"x <= 1"_s));
    QVERIFY(!same(u"asked(x)"_s, u"answered(x)"_s));
    QVERIFY(!same(u"x = 1 and y = 1"_s, u"x = 1 or y = 1"_s));
    QVERIFY(!same(u"x = 1 and y = 1"_s, u"y = 1 and x = 1"_s)); // order matters
    QVERIFY(!same(u"x = \"a\""_s, u"x = \"A\""_s));             // text is exact
    QVERIFY(!same(u"x = 1"_s, u"y = 1"_s));
}

void TestCondition::printerParenthesizes_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<QString>("printed");
    QTest::newRow("or in and") << u"(a = 1 or b = 1) and c = 1"_s
                               << u"(a = 1 or b = 1) and c = 1"_s;
    QTest::newRow("and in and") << u"(a = 1 and b = 1) and c = 1"_s
                                << u"(a = 1 and b = 1) and c = 1"_s;
    QTest::newRow("and in or") << u"a = 1 and b = 1 or c = 1"_s << u"(a = 1 and b = 1) or c = 1"_s;
    QTest::newRow("or in or, right")
        << u"a = 1 or (b = 1 or c = 1)"_s << u"a = 1 or (b = 1 or c = 1)"_s;
    QTest::newRow("not of or") << u"not (a = 1 or b = 1)"_s << u"not (a = 1 or b = 1)"_s;
    QTest::newRow("not of not") << u"not (not a = 1)"_s << u"not not a = 1"_s;
    QTest::newRow("not of atom in parens") << u"not (a = 1)"_s << u"not a = 1"_s;
    QTest::newRow("not inside and") << u"not a = 1 and not b = 1"_s << u"not a = 1 and not b = 1"_s;
}

void TestCondition::printerParenthesizes() {
    QFETCH(QString, text);
    QFETCH(QString, printed);
    ExprPtr e = parsed(text);
    QVERIFY(e);
    QCOMPARE(printCondition(*e), printed);
    ExprPtr again = parsed(printed);
    QVERIFY(again);
    QVERIFY(again->sameTree(*e));
}

void TestCondition::printValueEscapes() {
    Value text{Value::Kind::Text, u"a\"b\\c"_s, 0};
    QCOMPARE(printValue(text), uR"("a\"b\\c")"_s);
    // Numbers built in code without a spelling still print readable by the lexer.
    QCOMPARE(printValue(Value{Value::Kind::Integer, {}, 5}), u"5"_s);
    QCOMPARE(printValue(Value{Value::Kind::Integer, {}, -12}), u"-12"_s);
    QCOMPARE(printValue(Value{Value::Kind::Decimal, {}, 2}), u"2.0"_s);
    QCOMPARE(printValue(Value{Value::Kind::Decimal, {}, -0.25}), u"-0.25"_s);
    QCOMPARE(printValue(Value{Value::Kind::Decimal, {}, 1e20}), u"100000000000000000000.0"_s);
    // Spelling wins when present.
    QCOMPARE(printValue(Value{Value::Kind::Decimal, u"3.50"_s, 3.5}), u"3.50"_s);
}

void TestCondition::randomRoundTrip() {
    TreeGenerator generator(20240531u); // fixed seed: the same 2,000 trees every run
    for (int i = 0; i < 2000; ++i) {
        ExprPtr tree = generator.tree(5);
        const QString text = printCondition(*tree);
        ParseResult r = parseCondition(text);
        QVERIFY2(r.ok(), qPrintable(text + u" -> "_s + (r.error ? r.error->message : QString())));
        QVERIFY2(r.expr->sameTree(*tree), qPrintable(text));
        QCOMPARE(printCondition(*r.expr), text);
        // Each name column points at that name in the printed text.
        for (const NameUse& use : namesRead(*r.expr))
            QCOMPARE(text.mid(use.column - 1, use.name.size()), use.name);
    }
}

// ---------------------------------------------------------------- evaluator

void TestCondition::evaluates_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<bool>("expected");
    auto row = [](const QString& text, bool expected) {
        QTest::newRow(qPrintable(text)) << text << expected;
    };
    // e is not presented (empty): only the negated forms hold.
    row(u"e = 1"_s, false);
    row(u"e <> 1"_s, true);
    row(u"e < 1"_s, false);
    row(u"e <= 1"_s, false);
    row(u"e > 1"_s, false);
    row(u"e >= 1"_s, false);
    row(u"e in (1)"_s, false);
    row(u"e in (-100..100)"_s, false);
    row(u"e not in (1)"_s, true);
    row(u"e has 1"_s, false);
    row(u"e = \"a\""_s, false);
    row(u"e <> \"a\""_s, true);
    row(u"asked(e)"_s, false);
    row(u"answered(e)"_s, false);
    row(u"not e = 1"_s, true);
    row(u"not e <> 1"_s, false);
    row(u"nosuch <> 1"_s, true); // unknown names read as not presented
    // b is blank (presented, nothing recorded): like empty, but asked.
    row(u"b = 1"_s, false);
    row(u"b <> 1"_s, true);
    row(u"b < 1"_s, false);
    row(u"b >= 1"_s, false);
    row(u"b in (1..9)"_s, false);
    row(u"b not in (1..9)"_s, true);
    row(u"b has 1"_s, false);
    row(u"asked(b)"_s, true);
    row(u"answered(b)"_s, false);
    // Missing codes compare as ordinary values; they are not answers.
    row(u"r = 9"_s, true);
    row(u"r <> 9"_s, false);
    row(u"r in (8, 9)"_s, true);
    row(u"r > 5"_s, true);
    row(u"asked(r)"_s, true);
    row(u"answered(r)"_s, false);
    row(u"answered(n)"_s, true);
    row(u"answered(z)"_s, true);  // 0 is a value, not a missing code
    row(u"answered(d9)"_s, true); // 9 is missing only for items that say so
    row(u"answered(d)"_s, true);
    // n = 3: comparisons by value, ranges inclusive at both ends.
    row(u"n = 3"_s, true);
    row(u"n = 3.0"_s, true);
    row(u"n = 3.00"_s, true);
    row(u"n <= 3.0"_s, true);
    row(u"n < 3.0"_s, false);
    row(u"n > 2.999"_s, true);
    row(u"n >= 4"_s, false);
    row(u"n in (1..3)"_s, true);
    row(u"n in (3..5)"_s, true);
    row(u"n in (4..5)"_s, false);
    row(u"n in (1..2, 4)"_s, false);
    row(u"n in (1, 2, 3)"_s, true);
    row(u"n not in (1..2, 4)"_s, true);
    row(u"n in (2.5..3.5)"_s, true);
    row(u"n in (5..1)"_s, false); // a reversed range holds no value
    row(u"N = 3"_s, true);        // names ignore case
    row(u"d in (2.5..3)"_s, true);
    row(u"d in (2..2.5)"_s, true);
    row(u"d in (2.51..3)"_s, false);
    row(u"d in (2..2.49)"_s, false);
    row(u"d = 2.50"_s, true);
    row(u"neg in (-3..-1)"_s, true);
    row(u"neg in (-1..3)"_s, false);
    row(u"neg < 0"_s, true);
    // Text against numbers never matches; the negations then hold.
    row(u"n = \"3\""_s, false);
    row(u"n <> \"3\""_s, true);
    row(u"t = 3"_s, false);
    row(u"t <> 3"_s, true);
    row(u"bad = 3"_s, false);
    row(u"bad <> 3"_s, true);
    row(u"bad < 3"_s, false);
    row(u"bad > 3"_s, false);
    row(u"bad in (1..100)"_s, false);
    row(u"bad not in (1..100)"_s, true);
    row(u"answered(bad)"_s, true); // it holds something, if not a number
    // Text against text: exact strings, ordered by character code.
    row(u"t = \"Oak\""_s, true);
    row(u"t = \"oak\""_s, false);
    row(u"t <> \"oak\""_s, true);
    row(u"t < \"Pine\""_s, true); // 'O' (79) < 'P' (80)
    row(u"t > \"Pine\""_s, false);
    row(u"t in (\"Ash\"..\"Pine\")"_s, true);
    row(u"t in (\"Ash\", \"Elm\")"_s, false);
    row(u"dt < \"2024-06-01\""_s, true);
    row(u"dt >= \"2024-05-31\""_s, true);
    row(u"dt in (\"2024-01-01\"..\"2024-12-31\")"_s, true);
    row(u"answered(t)"_s, true);
    row(u"answered(ts)"_s, false); // blank text
    row(u"asked(ts)"_s, true);
    // Multi: `has` tests one chosen code; a set equals no single value.
    row(u"m has 3"_s, true);
    row(u"m has 2"_s, false);
    row(u"m has 3.0"_s, true);
    row(u"m has \"3\""_s, false);
    row(u"mm has 9"_s, true);
    row(u"n has 3"_s, false); // `has` on a single item (a type error) never holds
    row(u"m = 1"_s, false);
    row(u"m <> 1"_s, true);
    row(u"m in (1..3)"_s, false);
    row(u"answered(m)"_s, true);
    row(u"answered(mm)"_s, false); // only missing codes chosen
    row(u"answered(m0)"_s, false); // nothing chosen
    row(u"asked(m0)"_s, true);
    // Logic.
    row(u"true"_s, true);
    row(u"false"_s, false);
    row(u"not true"_s, false);
    row(u"not not n = 3"_s, true);
    row(u"n = 3 and t = \"Oak\""_s, true);
    row(u"n = 3 and e = 1"_s, false);
    row(u"e = 1 or n = 3"_s, true);
    row(u"e = 1 or b = 1 or r = 8"_s, false);
    row(u"not (e = 1 or n = 3)"_s, false);
    row(u"(e <> 1 and b <> 1) and not answered(r)"_s, true);
}

void TestCondition::evaluates() {
    QFETCH(QString, text);
    QFETCH(bool, expected);
    static const TestEnvironment respondent;
    ExprPtr e = parsed(text);
    QVERIFY(e);
    QCOMPARE(evaluate(*e, respondent.env()), expected);
}

void TestCondition::evaluatesWithoutMissingLookup() {
    // Without a missing-code lookup every value counts as an answer.
    Environment env;
    env.value = [](const QString&) { return CellValue::ofNumber(9); };
    QVERIFY(evaluate(*parsed(u"answered(x)"_s), env));
    QVERIFY(evaluate(*parsed(u"x = 9"_s), env));
    // Without any lookup every item is empty.
    Environment none;
    QVERIFY(!evaluate(*parsed(u"asked(x)"_s), none));
    QVERIFY(evaluate(*parsed(u"x <> 9"_s), none));
}

// ---------------------------------------------------------------- type checks

void TestCondition::typeChecks_data() {
    QTest::addColumn<QString>("text");
    QTest::addColumn<QString>("check"); // "" = no problem
    QTest::addColumn<int>("column");
    QTest::addColumn<QString>("message");
    auto ok = [](const QString& text) {
        QTest::newRow(qPrintable(text)) << text << QString() << 0 << QString();
    };
    auto bad = [](const QString& text, const char* check, int column, const QString& message) {
        QTest::newRow(qPrintable(text)) << text << QString::fromLatin1(check) << column << message;
    };
    ok(u"num = 3"_s);
    ok(u"NUM = 3"_s); // names resolve ignoring case
    ok(u"sing in (1, 2..9)"_s);
    ok(u"sing not in (9)"_s);
    ok(u"dec = 2"_s);   // an integer literal for a decimal item
    ok(u"num < 2.5"_s); // a decimal literal for an integer item
    ok(u"multi has 2"_s);
    ok(u"asked(multi) and answered(multi)"_s);
    ok(u"txt = \"a\""_s);
    ok(u"txt < \"m\""_s); // ordering text is allowed: string order
    ok(u"txt in (\"a\", \"b\")"_s);
    ok(u"day < \"2024-01-01\""_s);
    ok(u"day in (\"2024-01-01\"..\"2024-12-31\")"_s); // ISO dates order as strings
    ok(u"asked(intro)"_s);
    ok(u"true or false"_s);

    bad(u"foo = 1"_s, "unknown-variable", 1, u"unknown item 'foo'"_s);
    // n1 u2 m3 =5 1 7 and9 foo13
    bad(u"num = 1 and foo = 2"_s, "unknown-variable", 13, u"unknown item 'foo'"_s);
    bad(u"asked(foo)"_s, "unknown-variable", 7, u"unknown item 'foo'"_s);
    bad(u"garden = 1"_s, "unknown-variable", 1, u"is a module"_s);
    bad(u"multi_2 = 1"_s, "unknown-variable", 1, u"write 'multi has 2'"_s);
    bad(u"sing has 1"_s, "type-mismatch", 1,
        u"'has' is for multi items; 'sing' is a single item"_s);
    bad(u"num has 1"_s, "type-mismatch", 1, u"'has' is for multi items"_s);
    bad(u"multi = 1"_s, "type-mismatch", 1, u"use 'has'"_s);
    bad(u"multi <> 1"_s, "type-mismatch", 1, u"use 'has'"_s);
    bad(u"multi < 2"_s, "type-mismatch", 1, u"use 'has'"_s);
    bad(u"multi in (1, 2)"_s, "type-mismatch", 1, u"use 'has'"_s);
    bad(u"multi not in (1)"_s, "type-mismatch", 1, u"use 'has'"_s);
    bad(u"multi has \"a\""_s, "type-mismatch", 1, u"not text"_s);
    bad(u"sing = \"1\""_s, "type-mismatch", 1,
        u"'sing' is a single item; compare it with a number"_s);
    bad(u"num in (1, \"2\")"_s, "type-mismatch", 1, u"not text"_s);
    bad(u"num in (1..\"9\")"_s, "type-mismatch", 1, u"not text"_s);
    bad(u"dec > \"x\""_s, "type-mismatch", 1, u"'dec' is a decimal item"_s);
    bad(u"txt = 1"_s, "type-mismatch", 1, u"compare it with \"text\""_s);
    bad(u"txt in (\"a\"..\"m\")"_s, "type-mismatch", 1, u"a range (..) cannot be used with text"_s);
    bad(u"day = 5"_s, "type-mismatch", 1, u"date item"_s);
    bad(u"day = \"2024-13-01\""_s, "type-mismatch", 1, u"not a date in the form YYYY-MM-DD"_s);
    bad(u"day = \"31/05/2024\""_s, "type-mismatch", 1, u"not a date"_s);
    bad(u"intro = 1"_s, "type-mismatch", 1, u"'intro' is a statement"_s);
    bad(u"intro has 1"_s, "type-mismatch", 1, u"statement"_s);
    // answered1-8 (9 intro10
    bad(u"answered(intro)"_s, "type-mismatch", 10, u"never true"_s);
    // t1 r2 u3 e4 or6 not9 (13 sing14
    bad(u"true or not (sing = \"x\")"_s, "type-mismatch", 14, u"not text"_s);
}

void TestCondition::typeChecks() {
    QFETCH(QString, text);
    QFETCH(QString, check);
    QFETCH(int, column);
    QFETCH(QString, message);
    static const Instrument instrument = typeCheckInstrument();
    static const ItemIndex index(instrument);
    ExprPtr e = parsed(text);
    QVERIFY(e);
    const QList<ConditionProblem> problems = typeCheck(*e, index);
    if (check.isEmpty()) {
        QVERIFY2(problems.isEmpty(), qPrintable(problems.value(0).message));
        return;
    }
    QCOMPARE(problems.size(), 1);
    QCOMPARE(problems.at(0).check, check);
    QCOMPARE(problems.at(0).column, column);
    QVERIFY2(problems.at(0).message.contains(message), qPrintable(problems.at(0).message));
}

void TestCondition::typeCheckReportsEveryAtom() {
    const Instrument instrument = typeCheckInstrument();
    const ItemIndex index(instrument);
    // f1 o2 o3 =5 1 7 or9 sing12 has17 2 21 or23 txt26
    ExprPtr e = parsed(u"foo = 1 or sing has 2 or txt = \"ok\""_s);
    QVERIFY(e);
    const QList<ConditionProblem> problems = typeCheck(*e, index);
    QCOMPARE(problems.size(), 2);
    QCOMPARE(problems.at(0).check, u"unknown-variable"_s);
    QCOMPARE(problems.at(0).column, 1);
    QCOMPARE(problems.at(1).check, u"type-mismatch"_s);
    QCOMPARE(problems.at(1).column, 12);
}

void TestCondition::namesReadInOrder() {
    // a1 ... b15 ... c37 (see columns()); `B` keeps its spelling.
    ExprPtr e = parsed(u"a = 1 or (not B in (1, 2) and asked(c)) or true or m has 1"_s);
    QVERIFY(e);
    const QList<NameUse> names = namesRead(*e);
    QCOMPARE(names.size(), 4);
    QCOMPARE(names.at(0).name, u"a"_s);
    QCOMPARE(names.at(0).column, 1);
    QCOMPARE(names.at(1).name, u"B"_s);
    QCOMPARE(names.at(1).column, 15);
    QCOMPARE(names.at(2).name, u"c"_s);
    QCOMPARE(names.at(2).column, 37);
    // " or true or m has 1" follows ")" at 39: or41 true44 or49 m52
    QCOMPARE(names.at(3).name, u"m"_s);
    QCOMPARE(names.at(3).column, 52);
}

// ---------------------------------------------------------------- limits

void TestCondition::nestingLimit() {
    // 199 parentheses + the atom = 200 levels: accepted; one more is too deep.
    const QString ok = repeated(u"("_s, 199) + u"x = 1"_s + repeated(u")"_s, 199);
    QVERIFY(parseCondition(ok).ok());
    const QString deep = repeated(u"("_s, 200) + u"x = 1"_s + repeated(u")"_s, 200);
    ParseResult r = parseCondition(deep);
    QVERIFY(!r.ok());
    QVERIFY(r.error->message.contains(u"nested too deeply"_s));
    QCOMPARE(r.error->column, 201); // the 201st level starts at the 201st character
    // `not` counts as a level too: "not " is 4 characters, level 201 at 801.
    ParseResult nots = parseCondition(repeated(u"not "_s, 200) + u"x = 1"_s);
    QVERIFY(!nots.ok());
    QCOMPARE(nots.error->column, 801);
    QVERIFY(parseCondition(repeated(u"not "_s, 199) + u"x = 1"_s).ok());
}

void TestCondition::deepNestingDoesNotCrash() {
    const QString parens = repeated(u"("_s, 10000) + u"x = 1"_s + repeated(u")"_s, 10000);
    ParseResult r = parseCondition(parens);
    QVERIFY(!r.ok());
    QVERIFY(r.error->message.contains(u"nested too deeply"_s));
    ParseResult unclosed = parseCondition(repeated(u"("_s, 10000));
    QVERIFY(!unclosed.ok());
    ParseResult nots = parseCondition(repeated(u"not "_s, 10000) + u"x = 1"_s);
    QVERIFY(!nots.ok());
}

void TestCondition::millionCharacterConditions() {
    // "x = 1 or " is 9 characters: 111,112 of them + "x = 2" is just over 1,000,000.
    const int n = 111112;
    const QString chain = repeated(u"x = 1 or "_s, n) + u"x = 2"_s;
    QVERIFY(chain.size() >= 1000000);
    ParseResult r = parseCondition(chain);
    QVERIFY(r.ok());
    QCOMPARE(r.expr->kind, Expr::Kind::Or);
    QCOMPARE(r.expr->children.size(), n + 1);
    Environment env;
    env.value = [](const QString&) { return CellValue::ofNumber(2); };
    QVERIFY(evaluate(*r.expr, env)); // only the last operand holds
    QCOMPARE(printCondition(*r.expr), chain);

    // One huge text literal, one huge name, and an unterminated literal.
    const QString bigText = repeated(u"ab"_s, 500000);
    ParseResult text = parseCondition(u"x = \""_s + bigText + u"\""_s);
    QVERIFY(text.ok());
    QCOMPARE(text.expr->value.text.size(), 1000000);
    ParseResult name = parseCondition(repeated(u"n"_s, 1000000) + u" = 1"_s);
    QVERIFY(name.ok());
    QCOMPARE(name.expr->name.size(), 1000000);
    ParseResult open = parseCondition(u"x = \""_s + bigText);
    QVERIFY(!open.ok());
    QCOMPARE(open.error->column, 5);
    // A million characters of junk fails at the first one.
    ParseResult junk = parseCondition(repeated(u"&"_s, 1000000));
    QVERIFY(!junk.ok());
    QCOMPARE(junk.error->column, 1);
    // A million-character list.
    const QString list = u"x in ("_s + repeated(u"1, "_s, 333333) + u"2)"_s;
    ParseResult in = parseCondition(list);
    QVERIFY(in.ok());
    QCOMPARE(in.expr->list.size(), 333334);
    QVERIFY(evaluate(*in.expr, env));
}

QTEST_GUILESS_MAIN(TestCondition)
#include "tst_condition.moc"
