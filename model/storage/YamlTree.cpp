#include "YamlTree.h"

#include <yaml-cpp/eventhandler.h>
#include <yaml-cpp/exceptions.h>
#include <yaml-cpp/mark.h>
#include <yaml-cpp/parser.h>

#include <sstream>

using namespace Qt::StringLiterals;

namespace rb::yaml {

const Node* Node::find(QLatin1String key) const {
    for (size_t i = 0; i < keys.size(); ++i)
        if (keys[i].text == key)
            return &children[i];
    return nullptr;
}

QString describeKind(const Node& node) {
    switch (node.kind) {
    case Node::Kind::Null:
        return u"an empty value"_s;
    case Node::Kind::Scalar:
        return u"text"_s;
    case Node::Kind::Sequence:
        return u"a list"_s;
    case Node::Kind::Map:
        return u"a map"_s;
    }
    return {};
}

namespace {

bool isContinuationByte(char c) {
    return (static_cast<unsigned char>(c) & 0xC0) == 0x80;
}

// yaml-cpp counts columns in bytes; people count characters. Knows where each
// line starts so that a (line, byte column) pair becomes a 1-based position.
class LineMap {
public:
    explicit LineMap(const QByteArray& text) : m_text(text) {
        m_starts.push_back(0);
        for (qsizetype i = 0; i < text.size(); ++i)
            if (text[i] == '\n')
                m_starts.push_back(i + 1);
    }
    // Byte offset of a 0-based (line, byte column), clamped to the text.
    qsizetype offset(int line, int byteColumn) const {
        if (line < 0 || size_t(line) >= m_starts.size())
            return m_text.size();
        return qMin(m_starts[size_t(line)] + qMax(byteColumn, 0), m_text.size());
    }
    // 1-based character column of a 0-based (line, byte column).
    int characterColumn(int line, int byteColumn) const {
        if (line < 0 || size_t(line) >= m_starts.size())
            return byteColumn + 1;
        int column = 1;
        for (qsizetype i = m_starts[size_t(line)]; i < offset(line, byteColumn); ++i)
            if (!isContinuationByte(m_text[i]))
                ++column;
        return column;
    }
    // 0-based byte column of the first tab among a line's leading blanks, or -1.
    int leadingTab(int line) const {
        if (line < 0 || size_t(line) >= m_starts.size())
            return -1;
        for (qsizetype i = m_starts[size_t(line)]; i < m_text.size(); ++i) {
            if (m_text[i] == '\t')
                return int(i - m_starts[size_t(line)]);
            if (m_text[i] != ' ')
                break;
        }
        return -1;
    }
    char at(qsizetype offset) const { return offset < m_text.size() ? m_text[offset] : '\0'; }
    const QByteArray& text() const { return m_text; }

private:
    const QByteArray& m_text;
    std::vector<qsizetype> m_starts;
};

// Offset of the first byte that is not part of well-formed UTF-8, or -1.
qsizetype firstInvalidUtf8(const QByteArray& text) {
    qsizetype i = 0;
    while (i < text.size()) {
        const auto c = static_cast<unsigned char>(text[i]);
        int extra = 0;
        char32_t cp = 0;
        if (c < 0x80) {
            ++i;
            continue;
        } else if ((c & 0xE0) == 0xC0) {
            extra = 1;
            cp = c & 0x1F;
        } else if ((c & 0xF0) == 0xE0) {
            extra = 2;
            cp = c & 0x0F;
        } else if ((c & 0xF8) == 0xF0) {
            extra = 3;
            cp = c & 0x07;
        } else {
            return i;
        }
        if (i + extra >= text.size())
            return i;
        for (int k = 1; k <= extra; ++k) {
            if (!isContinuationByte(text[i + k]))
                return i;
            cp = (cp << 6) | (static_cast<unsigned char>(text[i + k]) & 0x3F);
        }
        static constexpr char32_t kMinimum[] = {0, 0x80, 0x800, 0x10000};
        if (cp < kMinimum[extra] || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF))
            return i;
        i += extra + 1;
    }
    return -1;
}

// Thrown from the event handler to stop yaml-cpp after a refusal that makes
// the rest of the stream meaningless (too deep, a second document).
struct StopParsing {};

// Builds Nodes from yaml-cpp events, refusing what Routebook never needs.
class TreeBuilder : public YAML::EventHandler {
public:
    TreeBuilder(const LineMap& lines, const QString& fileName, Diagnostics& errors)
        : m_lines(lines), m_file(fileName), m_errors(errors) {}

    std::optional<Node> root;
    int documents = 0;

    void OnDocumentStart(const YAML::Mark& mark) override {
        if (++documents > 1) {
            error(mark, u"only one YAML document is allowed in a file"_s);
            throw StopParsing{};
        }
    }
    void OnDocumentEnd() override {}

    void OnNull(const YAML::Mark& mark, YAML::anchor_t) override {
        attach(leaf(mark, Node::Kind::Null));
    }
    void OnAlias(const YAML::Mark& mark, YAML::anchor_t) override {
        // Aliases are never needed in an instrument and make alias bombs possible.
        error(mark, u"aliases are not supported"_s);
        attach(leaf(mark, Node::Kind::Null));
    }
    void OnScalar(const YAML::Mark& mark, const std::string& tag, YAML::anchor_t,
                  const std::string& value) override {
        checkTag(mark, tag);
        checkQuoteCloses(mark);
        Node node = leaf(mark, Node::Kind::Scalar);
        node.text = QString::fromStdString(value);
        node.plain = tag == "?";
        attach(std::move(node));
    }
    void OnSequenceStart(const YAML::Mark& mark, const std::string& tag, YAML::anchor_t,
                         YAML::EmitterStyle::value) override {
        open(mark, tag, Node::Kind::Sequence);
    }
    void OnSequenceEnd() override { close(); }
    void OnMapStart(const YAML::Mark& mark, const std::string& tag, YAML::anchor_t,
                    YAML::EmitterStyle::value) override {
        open(mark, tag, Node::Kind::Map);
    }
    void OnMapEnd() override { close(); }

private:
    struct Frame {
        Node node;
        bool haveKey = false; // maps: a key is waiting for its value
    };

    Node leaf(const YAML::Mark& mark, Node::Kind kind) const {
        Node node;
        node.kind = kind;
        node.line = mark.line + 1;
        node.column = m_lines.characterColumn(mark.line, mark.column);
        return node;
    }

    void error(const YAML::Mark& mark, const QString& message) {
        m_errors.append(
            {m_file, mark.line + 1, m_lines.characterColumn(mark.line, mark.column), message});
    }

    void checkTag(const YAML::Mark& mark, const std::string& tag) {
        // "?" = plain, "!" = quoted or block scalar; anything else was written by hand.
        if (tag != "?" && tag != "!" && !tag.empty())
            error(mark,
                  u"YAML tags are not supported (found '%1')"_s.arg(QString::fromStdString(tag)));
    }

    // yaml-cpp accepts a quoted scalar that runs to the end of the file; that
    // is always a forgotten closing quote.
    void checkQuoteCloses(const YAML::Mark& mark) {
        const qsizetype start = m_lines.offset(mark.line, mark.column);
        const char quote = m_lines.at(start);
        if (quote != '"' && quote != '\'')
            return;
        const QByteArray& text = m_lines.text();
        for (qsizetype i = start + 1; i < text.size(); ++i) {
            if (quote == '"' && text[i] == '\\')
                ++i;
            else if (text[i] == quote && quote == '\'' && i + 1 < text.size() &&
                     text[i + 1] == '\'')
                ++i;
            else if (text[i] == quote)
                return;
        }
        error(mark, u"unclosed quoted text: the closing %1 is missing"_s.arg(QLatin1Char(quote)));
    }

    void open(const YAML::Mark& mark, const std::string& tag, Node::Kind kind) {
        checkTag(mark, tag);
        if (m_stack.size() >= size_t(kMaxNesting)) {
            error(mark, u"nesting deeper than %1 levels is not supported"_s.arg(kMaxNesting));
            throw StopParsing{};
        }
        m_stack.push_back({leaf(mark, kind), false});
    }

    void close() {
        Node node = std::move(m_stack.back().node);
        m_stack.pop_back();
        attach(std::move(node));
    }

    void attach(Node node) {
        if (m_stack.empty()) {
            root = std::move(node);
            return;
        }
        Frame& top = m_stack.back();
        if (top.node.isSequence()) {
            top.node.children.push_back(std::move(node));
        } else if (!top.haveKey) {
            addKey(top, std::move(node));
        } else {
            // yaml-cpp places an empty value at the next token; its key is the better spot.
            if (node.isNull()) {
                node.line = top.node.keys.back().line;
                node.column = top.node.keys.back().column;
            }
            top.node.children.push_back(std::move(node));
            top.haveKey = false;
        }
    }

    void addKey(Frame& frame, Node key) {
        if (!key.isScalar()) {
            m_errors.append({m_file, key.line, key.column,
                             u"keys must be plain text, not %1"_s.arg(describeKind(key))});
        } else {
            for (const Node& other : frame.node.keys)
                if (other.text == key.text) {
                    m_errors.append(
                        {m_file, key.line, key.column, u"duplicate key '%1'"_s.arg(key.text)});
                    break;
                }
        }
        frame.node.keys.push_back(std::move(key));
        frame.haveKey = true;
    }

    const LineMap& m_lines;
    QString m_file;
    Diagnostics& m_errors;
    std::vector<Frame> m_stack;
};

Diagnostic parserError(const LineMap& lines, const QString& file, const YAML::Mark& mark,
                       const std::string& message) {
    if (mark.is_null())
        return {file, 0, 0, u"malformed YAML: %1"_s.arg(QString::fromStdString(message))};
    // yaml-cpp's message for a tab in the indentation does not say so.
    const int tab = lines.leadingTab(mark.line);
    if (tab >= 0)
        return {file, mark.line + 1, lines.characterColumn(mark.line, tab),
                u"malformed YAML: a tab character is used for indentation (YAML indents with "
                u"spaces only)"_s};
    return {file, mark.line + 1, lines.characterColumn(mark.line, mark.column),
            u"malformed YAML: %1"_s.arg(QString::fromStdString(message))};
}

} // namespace

ParsedDocument parseYamlDocument(const QByteArray& text, const QString& fileName) {
    ParsedDocument result;
    const LineMap lines(text);
    if (const qsizetype bad = firstInvalidUtf8(text); bad >= 0) {
        const int line = int(text.left(bad).count('\n'));
        const int byteColumn = int(bad - (text.lastIndexOf('\n', bad - 1) + 1));
        result.errors.append({fileName, line + 1, lines.characterColumn(line, byteColumn),
                              u"the file is not valid UTF-8 text"_s});
        return result;
    }
    TreeBuilder builder(lines, fileName, result.errors);
    try {
        std::istringstream stream(text.toStdString());
        YAML::Parser parser(stream);
        while (parser.HandleNextDocument(builder)) {
        }
    } catch (const StopParsing&) {
    } catch (const YAML::Exception& e) {
        result.errors.append(parserError(lines, fileName, e.mark, e.msg));
    } catch (const std::exception& e) {
        result.errors.append(
            {fileName, 0, 0, u"cannot read YAML: %1"_s.arg(QString::fromLocal8Bit(e.what()))});
    }
    if (result.errors.isEmpty() && !builder.root)
        result.errors.append(
            {fileName, 1, 1, u"the file is empty: expected 'routebook: 1' and an instrument"_s});
    if (result.errors.isEmpty())
        result.root = std::move(builder.root);
    return result;
}

} // namespace rb::yaml
