#pragma once

#include "util/Diagnostic.h"

#include <QByteArray>
#include <QString>

#include <optional>
#include <vector>

namespace rb::yaml {

// A YAML document as plain data: what the instrument reader needs and nothing
// more. Built from yaml-cpp's event stream, so that hostile input (aliases,
// tags, deep nesting, several documents, duplicate keys) is refused here, in
// one place, with a position the user can jump to.
struct Node {
    enum class Kind { Null, Scalar, Sequence, Map };
    Kind kind = Kind::Null;
    int line = 0;   // 1-based
    int column = 0; // 1-based, in characters (not bytes)
    // Scalars: the text, and whether it was written plain. A quoted or block
    // scalar is always text; a plain one may be a number.
    QString text;
    bool plain = true;
    // Sequences: the entries. Maps: keys[i] maps to children[i], in file order.
    std::vector<Node> children;
    std::vector<Node> keys;

    bool isNull() const { return kind == Kind::Null; }
    bool isScalar() const { return kind == Kind::Scalar; }
    bool isSequence() const { return kind == Kind::Sequence; }
    bool isMap() const { return kind == Kind::Map; }
    // The value of a map key, or nullptr.
    const Node* find(QLatin1String key) const;
};

// Deeper nesting than this is refused before yaml-cpp sees it (a Routebook file
// needs about 8 levels); it keeps recursion in the parser and here bounded.
inline constexpr int kMaxNesting = 100;

struct ParsedDocument {
    std::optional<Node> root; // set when the text is one well-formed YAML document
    Diagnostics errors;
};

// Parses UTF-8 YAML text. Never throws.
ParsedDocument parseYamlDocument(const QByteArray& text, const QString& fileName);

// "sequence", "map", "text", "empty value": for messages.
QString describeKind(const Node& node);

} // namespace rb::yaml
