#include "Lexer.h"

#include "Spelling.h"

using namespace Qt::StringLiterals;

namespace rb::cond {

namespace {

// Punctuation and operators are spelled alike every time: a shared static
// string each rather than a copy of the source per token (every condition of
// an instrument is lexed whenever it is checked).
QString punctuationSpelling(QStringView s) {
    static const QString spellings[] = {u"("_s,  u")"_s, u","_s,  u"="_s, u"<>"_s,
                                        u"<="_s, u"<"_s, u">="_s, u">"_s, u".."_s};
    for (const QString& p : spellings)
        if (p == s)
            return p;
    return s.toString();
}

// Whole numbers 0..99 (the codes and thresholds most conditions use) are
// spelled from one static table: no allocation per literal, and copies of
// the spelling share static data without a reference count to update.
QString smallIntegerSpelling(QStringView s) {
    static const char16_t digits[] =
        u"00010203040506070809101112131415161718192021222324252627282930"
        u"31323334353637383940414243444546474849505152535455565758596061"
        u"626364656667686970717273747576777879808182838485868788899091"
        u"9293949596979899";
    const auto value = [](QChar c) { return int(c.unicode() - u'0'); };
    if (s.size() == 1 && isAsciiDigit(s[0]))
        return QString::fromRawData(reinterpret_cast<const QChar*>(digits + 2 * value(s[0]) + 1),
                                    1);
    if (s.size() == 2 && isAsciiDigit(s[0]) && s[0] != u'0' && isAsciiDigit(s[1]))
        return QString::fromRawData(
            reinterpret_cast<const QChar*>(digits + 2 * (value(s[0]) * 10 + value(s[1]))), 2);
    return s.toString();
}

// The value of a run of digits (with an optional leading '-') short enough
// to be exact in a double; nullopt for longer ones (QString::toDouble then).
std::optional<double> smallInteger(QStringView digits) {
    const bool negative = digits.startsWith(u'-');
    const QStringView body = negative ? digits.mid(1) : digits;
    if (body.size() > 15)
        return std::nullopt;
    double value = 0;
    for (QChar c : body)
        value = value * 10 + (c.unicode() - u'0');
    return negative ? -value : value;
}

// A hint for characters people often type from other languages.
QString hintFor(QChar c) {
    switch (c.unicode()) {
    case u'&':
        return u" (write 'and')"_s;
    case u'|':
        return u" (write 'or')"_s;
    case u'!':
        return u" (write 'not', or '<>' for not equal)"_s;
    case u'\'':
        return u" (text literals use double quotes)"_s;
    default:
        return {};
    }
}

class Lexer {
public:
    explicit Lexer(const QString& text) : m_text(text) {}

    LexResult run() {
        LexResult result;
        result.tokens.reserve(m_text.size() / 3 + 2); // "q1 = 1" is 4 tokens in 6 characters
        while (!m_error) {
            skipSpace();
            if (m_pos >= m_text.size())
                break;
            result.tokens.append(next());
        }
        if (m_error) {
            result.tokens.clear();
            result.error = m_error;
            return result;
        }
        Token end;
        end.kind = Token::Kind::End;
        end.column = int(m_text.size()) + 1;
        result.tokens.append(end);
        return result;
    }

private:
    const QString& m_text;
    qsizetype m_pos = 0;
    std::optional<ParseError> m_error;

    QChar at(qsizetype i) const { return i < m_text.size() ? m_text.at(i) : QChar(); }
    int column(qsizetype i) const { return int(i) + 1; }

    void fail(qsizetype i, const QString& message) {
        if (!m_error)
            m_error = ParseError{column(i), message};
    }

    void skipSpace() {
        while (m_pos < m_text.size() && m_text.at(m_pos).isSpace())
            ++m_pos;
    }

    Token make(Token::Kind kind, qsizetype start, qsizetype length) {
        Token t;
        t.kind = kind;
        t.column = column(start);
        m_pos = start + length;
        const QStringView spelling = QStringView(m_text).mid(start, length);
        switch (kind) {
        case Token::Kind::Name:
            if (const QString* keyword = keywordSpelled(spelling)) {
                t.kind = Token::Kind::Keyword;
                t.text = *keyword;
                return t;
            }
            break;
        case Token::Kind::Op:
        case Token::Kind::LParen:
        case Token::Kind::RParen:
        case Token::Kind::Comma:
        case Token::Kind::DotDot:
            t.text = punctuationSpelling(spelling);
            return t;
        case Token::Kind::Integer:
            t.text = smallIntegerSpelling(spelling);
            return t;
        default:
            break;
        }
        t.text = spelling.toString();
        return t;
    }

    Token next() {
        const QChar c = m_text.at(m_pos);
        if (isAsciiLetter(c))
            return name();
        if (isAsciiDigit(c) || c == u'-')
            return number();
        if (c == u'"')
            return textLiteral();
        return punctuation();
    }

    Token name() {
        qsizetype end = m_pos;
        while (end < m_text.size() && isNameChar(m_text.at(end)))
            ++end;
        return make(Token::Kind::Name, m_pos, end - m_pos); // or a keyword
    }

    // integer := -?digits ; decimal := -?digits.digits ; "1..5" is 1 .. 5.
    Token number() {
        const qsizetype start = m_pos;
        qsizetype i = start;
        if (at(i) == u'-')
            ++i;
        if (!isAsciiDigit(at(i))) {
            fail(start, u"expected a digit after '-' (a negative number is written -3)"_s);
            return {};
        }
        while (isAsciiDigit(at(i)))
            ++i;
        Token::Kind kind = Token::Kind::Integer;
        if (at(i) == u'.' && isAsciiDigit(at(i + 1))) {
            kind = Token::Kind::Decimal;
            i += 1;
            while (isAsciiDigit(at(i)))
                ++i;
        } else if (at(i) == u'.' && at(i + 1) != u'.') {
            fail(i + 1, u"expected digits after the decimal point"_s);
            return {};
        }
        if (isAsciiLetter(at(i)) || at(i) == u'_') {
            fail(i, u"unexpected character '%1' right after a number"_s.arg(at(i)));
            return {};
        }
        Token t = make(kind, start, i - start);
        bool ok = true;
        const std::optional<double> exact =
            kind == Token::Kind::Integer ? smallInteger(t.text) : std::nullopt;
        t.number = exact ? *exact : t.text.toDouble(&ok);
        if (!ok)
            fail(start, u"number '%1' is too large"_s.arg(t.text.left(40)));
        return t;
    }

    Token textLiteral() {
        const qsizetype start = m_pos;
        QString content;
        qsizetype i = start + 1;
        while (i < m_text.size()) {
            const QChar c = m_text.at(i);
            if (c == u'"') {
                Token t = make(Token::Kind::Text, start, i + 1 - start);
                t.text = content;
                return t;
            }
            if (c == u'\\') {
                const QChar escaped = at(i + 1);
                if (escaped != u'"' && escaped != u'\\') {
                    fail(i, u"unknown escape in text literal (only \\\" and \\\\ are escapes)"_s);
                    return {};
                }
                content.append(escaped);
                i += 2;
                continue;
            }
            content.append(c);
            ++i;
        }
        fail(start, u"unterminated text literal"_s);
        return {};
    }

    Token punctuation() {
        const QChar c = m_text.at(m_pos);
        const QChar d = at(m_pos + 1);
        switch (c.unicode()) {
        case u'(':
            return make(Token::Kind::LParen, m_pos, 1);
        case u')':
            return make(Token::Kind::RParen, m_pos, 1);
        case u',':
            return make(Token::Kind::Comma, m_pos, 1);
        case u'=':
            return op(CompareOp::Eq, 1);
        case u'<':
            if (d == u'>')
                return op(CompareOp::Ne, 2);
            if (d == u'=')
                return op(CompareOp::Le, 2);
            return op(CompareOp::Lt, 1);
        case u'>':
            if (d == u'=')
                return op(CompareOp::Ge, 2);
            return op(CompareOp::Gt, 1);
        case u'.':
            if (d == u'.')
                return make(Token::Kind::DotDot, m_pos, 2);
            break;
        default:
            break;
        }
        fail(m_pos, u"unexpected character '%1'%2"_s.arg(c).arg(hintFor(c)));
        return {};
    }

    Token op(CompareOp which, qsizetype length) {
        Token t = make(Token::Kind::Op, m_pos, length);
        t.op = which;
        return t;
    }
};

} // namespace

LexResult lexCondition(const QString& text) {
    return Lexer(text).run();
}

QString describeToken(const Token& token) {
    switch (token.kind) {
    case Token::Kind::End:
        return u"the end of the condition"_s;
    case Token::Kind::Text: {
        QString shown = token.text.left(30);
        if (shown.size() < token.text.size())
            shown += u"..."_s;
        return u"'\"%1\"'"_s.arg(shown);
    }
    default:
        return u"'%1'"_s.arg(token.text.left(40));
    }
}

} // namespace rb::cond
