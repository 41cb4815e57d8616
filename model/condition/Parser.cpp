#include "Parser.h"

#include "Lexer.h"

using namespace Qt::StringLiterals;

namespace rb::cond {

namespace {

// Deeper nesting than this is an error: no sensible condition needs it, and it
// keeps the recursive descent far away from the stack limit.
constexpr int kMaxDepth = 200;

using TK = Token::Kind;

// Recursive descent over the token list. The first error wins: every parse
// function returns nullptr once m_error is set, so the caller just unwinds.
class Parser {
public:
    Parser(const QList<Token>& tokens, const std::function<int(const QString&)>& resolve)
        : m_tokens(tokens), m_resolve(resolve) {}

    ParseResult run() {
        ParseResult result;
        if (peek().kind == TK::End) {
            result.error = ParseError{peek().column, u"empty condition"_s};
            return result;
        }
        ExprPtr expr = parseOr();
        if (expr && peek().kind != TK::End)
            failTrailing();
        if (m_error)
            result.error = m_error;
        else
            result.expr = expr;
        return result;
    }

private:
    const QList<Token>& m_tokens;
    const std::function<int(const QString&)>& m_resolve;
    qsizetype m_pos = 0;
    int m_depth = 0;
    std::optional<ParseError> m_error;

    const Token& peek() const { return m_tokens.at(m_pos); }
    const Token& previous() const { return m_tokens.at(m_pos - 1); }
    const Token& advance() { return m_tokens.at(m_pos++); }
    bool atKeyword(QLatin1String word) const { return peek().isKeyword(word); }

    std::nullptr_t fail(const Token& at, const QString& message) {
        if (!m_error)
            m_error = ParseError{at.column, message};
        return nullptr;
    }

    // ", found 'x'" unless at the end (the column already says "the end").
    static QString found(const Token& t) {
        return t.kind == TK::End ? QString() : u", found %1"_s.arg(describeToken(t));
    }

    // `AND`, `Not`... are names; say so when one shows up where a keyword fits.
    static QString caseHint(const Token& t) {
        if (t.kind != TK::Name)
            return {};
        const QString lower = t.text.toLower();
        static const QStringList words = {u"and"_s,   u"or"_s,       u"not"_s,  u"in"_s,   u"has"_s,
                                          u"asked"_s, u"answered"_s, u"true"_s, u"false"_s};
        if (!words.contains(lower))
            return {};
        return u" (keywords are lower case: write '%1')"_s.arg(lower);
    }

    bool accept(QLatin1String word) {
        if (!atKeyword(word))
            return false;
        advance();
        return true;
    }

    void failTrailing() {
        const Token& t = peek();
        if (t.kind == TK::RParen)
            fail(t, u"unexpected ')'"_s);
        else
            fail(t, u"expected 'and', 'or' or the end of the condition%1%2"_s.arg(found(t),
                                                                                  caseHint(t)));
    }

    static ExprPtr group(Expr::Kind kind, QList<ExprPtr> children, int column) {
        if (children.size() == 1)
            return children.first();
        auto node = std::make_shared<Expr>();
        node->kind = kind;
        node->children = std::move(children);
        node->column = column;
        return node;
    }

    // or := and ("or" and)* — one flat node per chain; parentheses nest.
    ExprPtr parseOr() {
        const int column = peek().column;
        QList<ExprPtr> children;
        do {
            ExprPtr child = parseAnd();
            if (!child)
                return nullptr;
            children.append(child);
        } while (accept("or"_L1));
        return group(Expr::Kind::Or, std::move(children), column);
    }

    ExprPtr parseAnd() {
        const int column = peek().column;
        QList<ExprPtr> children;
        do {
            ExprPtr child = parseUnary();
            if (!child)
                return nullptr;
            children.append(child);
        } while (accept("and"_L1));
        return group(Expr::Kind::And, std::move(children), column);
    }

    // Depth is counted where recursion happens (`not` and `(`).
    struct DepthGuard {
        int& depth;
        explicit DepthGuard(int& d) : depth(++d) {}
        ~DepthGuard() { --depth; }
    };

    ExprPtr parseUnary() {
        DepthGuard guard(m_depth);
        if (m_depth > kMaxDepth)
            return fail(peek(), u"condition nested too deeply (more than %1 levels of 'not' "
                                u"and parentheses)"_s.arg(kMaxDepth));
        const Token& t = peek();
        if (t.isKeyword("not"_L1)) {
            advance();
            ExprPtr child = parseUnary();
            if (!child)
                return nullptr;
            auto node = std::make_shared<Expr>();
            node->kind = Expr::Kind::Not;
            node->children = {child};
            node->column = t.column;
            return node;
        }
        if (t.kind == TK::LParen)
            return parseParenthesized();
        return parseAtom();
    }

    ExprPtr parseParenthesized() {
        const Token& open = advance();
        ExprPtr inner = parseOr();
        if (!inner)
            return nullptr;
        if (peek().kind == TK::RParen) {
            advance();
            return inner;
        }
        if (peek().kind == TK::End)
            return fail(peek(), u"unclosed parenthesis opened at column %1"_s.arg(open.column));
        return fail(peek(), u"expected ')' to close the parenthesis opened at column %1%2%3"_s.arg(
                                QString::number(open.column), found(peek()), caseHint(peek())));
    }

    static std::shared_ptr<Expr> atomNode(Expr::Kind kind, const Token& at) {
        auto node = std::make_shared<Expr>();
        node->kind = kind;
        node->column = at.column;
        return node;
    }

    ExprPtr parseAtom() {
        const Token& t = peek();
        if (t.isKeyword("true"_L1) || t.isKeyword("false"_L1)) {
            advance();
            return atomNode(t.text == "true"_L1 ? Expr::Kind::True : Expr::Kind::False, t);
        }
        if (t.isKeyword("asked"_L1) || t.isKeyword("answered"_L1))
            return parsePresence();
        if (t.kind == TK::Name)
            return parseNameAtom();
        if (t.kind == TK::RParen && m_pos == 0)
            return fail(t, u"unexpected ')'"_s);
        return failExpectedCondition(t);
    }

    std::nullptr_t failExpectedCondition(const Token& t) {
        if (m_pos == 0)
            return fail(t, u"expected a condition (for example x = 1)%1"_s.arg(found(t)));
        return fail(t,
                    u"expected a condition after %1%2"_s.arg(describeToken(previous()), found(t)));
    }

    // asked(NAME) / answered(NAME)
    ExprPtr parsePresence() {
        const Token& keyword = advance();
        auto node = atomNode(keyword.text == "asked"_L1 ? Expr::Kind::Asked : Expr::Kind::Answered,
                             keyword);
        if (peek().kind != TK::LParen)
            return fail(peek(), u"expected '(' after '%1'%2"_s.arg(keyword.text, found(peek())));
        const Token& open = advance();
        if (peek().kind != TK::Name)
            return fail(peek(), u"expected an item name inside %1(...)%2"_s.arg(keyword.text,
                                                                                found(peek())));
        const Token& name = advance();
        node->name = name.text;
        node->nameColumn = name.column;
        if (m_resolve)
            node->position = m_resolve(node->name);
        if (peek().kind == TK::RParen) {
            advance();
            return node;
        }
        if (peek().kind == TK::End)
            return fail(peek(), u"unclosed parenthesis opened at column %1"_s.arg(open.column));
        return fail(peek(), u"expected ')' after the item name in %1(...)%2"_s.arg(keyword.text,
                                                                                   found(peek())));
    }

    // NAME op value | NAME [not] in (list) | NAME has value
    ExprPtr parseNameAtom() {
        const Token& name = advance();
        const Token& t = peek();
        std::shared_ptr<Expr> node;
        if (t.kind == TK::Op) {
            advance();
            node = atomNode(Expr::Kind::Compare, name);
            node->op = t.op;
            if (!parseValue(node->value))
                return nullptr;
        } else if (t.isKeyword("has"_L1)) {
            advance();
            node = atomNode(Expr::Kind::Has, name);
            if (!parseValue(node->value))
                return nullptr;
        } else if (t.isKeyword("in"_L1) || t.isKeyword("not"_L1)) {
            node = atomNode(Expr::Kind::In, name);
            if (!parseInList(*node))
                return nullptr;
        } else {
            return fail(
                t, u"expected =, <>, <, <=, >, >=, 'in', 'not in' or 'has' after '%1'%2%3"_s.arg(
                       name.text, found(t), caseHint(t)));
        }
        node->name = name.text;
        node->nameColumn = name.column;
        if (m_resolve)
            node->position = m_resolve(node->name);
        return node;
    }

    bool parseValue(Value& value) {
        const Token& t = peek();
        switch (t.kind) {
        case TK::Integer:
            value.kind = Value::Kind::Integer;
            break;
        case TK::Decimal:
            value.kind = Value::Kind::Decimal;
            break;
        case TK::Text:
            value.kind = Value::Kind::Text;
            break;
        default:
            fail(t, u"expected a value after %1 (a number or \"text\")%2"_s.arg(
                        describeToken(previous()), found(t)));
            return false;
        }
        advance();
        value.text = t.text;
        value.number = t.number;
        return true;
    }

    // [not] in ( item ("," item)* )
    bool parseInList(Expr& node) {
        if (atKeyword("not"_L1)) {
            advance();
            if (!atKeyword("in"_L1)) {
                fail(peek(), u"expected 'in' after 'not'%1"_s.arg(found(peek())));
                return false;
            }
            node.negated = true;
        }
        advance(); // `in`
        if (peek().kind != TK::LParen) {
            fail(peek(), u"expected '(' after 'in'%1"_s.arg(found(peek())));
            return false;
        }
        const Token& open = advance();
        for (;;) {
            ListElement element;
            if (!parseValue(element.low))
                return false;
            if (peek().kind == TK::DotDot) {
                advance();
                element.high.emplace();
                if (!parseValue(*element.high))
                    return false;
            }
            node.list.append(element);
            if (peek().kind == TK::RParen) {
                advance();
                return true;
            }
            if (peek().kind != TK::Comma) {
                if (peek().kind == TK::End)
                    fail(peek(), u"unclosed parenthesis opened at column %1"_s.arg(open.column));
                else
                    fail(peek(), u"expected ',' or ')' in the list%1"_s.arg(found(peek())));
                return false;
            }
            advance();
        }
    }
};

} // namespace

ParseResult parseCondition(const QString& text, const std::function<int(const QString&)>& resolve) {
    LexResult lexed = lexCondition(text);
    if (lexed.error) {
        ParseResult result;
        result.error = lexed.error;
        return result;
    }
    return Parser(lexed.tokens, resolve).run();
}

} // namespace rb::cond
