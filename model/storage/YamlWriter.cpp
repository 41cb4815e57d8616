#include "YamlWriter.h"

#include "YamlReader.h"

#include <QLocale>
#include <QRegularExpression>

using namespace Qt::StringLiterals;

namespace rb::yaml {

// Canonical form, so that saving what was loaded gives the same bytes:
// - keys in the fixed order of DESIGN.md; a key whose value is empty or absent
//   is left out, except required keys (routebook, instrument.title, settings
//   with legitimate_skip_code, modules, every name/type/code/label/goto/value);
//   a condition that is present but empty is written as "" (it is a finding);
// - block style, two-space indent; codes, rules and when_skipped in flow style
//   one per line; range, path and list answers as [a, b];
// - quoting: every free text (titles, labels, question text, instructions,
//   notes, conditions, code labels, test respondent names, text values) is
//   double-quoted with escapes, so it never spans lines and never needs a
//   second look; names are plain when they are identifiers and not a YAML
//   keyword (null, true, ...), else quoted; numbers, codes, types and missing
//   kinds are plain. A number kept as written is written as written.

QString quoted(const QString& text) {
    QString out = u"\""_s;
    for (const char32_t c : text.toUcs4()) {
        switch (c) {
        case U'"':
            out += u"\\\""_s;
            break;
        case U'\\':
            out += u"\\\\"_s;
            break;
        case U'\n':
            out += u"\\n"_s;
            break;
        case U'\t':
            out += u"\\t"_s;
            break;
        case U'\r':
            out += u"\\r"_s;
            break;
        default:
            // Other control characters and YAML's extra line breaks (NEL, LS, PS)
            // and the byte-order mark would not survive as they are.
            if (c < 0x20 || c == 0x7F)
                out += u"\\x%1"_s.arg(uint(c), 2, 16, QLatin1Char('0'));
            else if (c == 0x85 || c == 0x2028 || c == 0x2029 || c == 0xFEFF)
                out += u"\\u%1"_s.arg(uint(c), 4, 16, QLatin1Char('0'));
            else
                out += QString::fromUcs4(&c, 1);
        }
    }
    return out + u"\""_s;
}

QString nameToken(const QString& name) {
    static const QRegularExpression identifier(u"^[A-Za-z_][A-Za-z0-9_]*$"_s);
    static const QStringList keywords = {u"null"_s, u"true"_s, u"false"_s, u"yes"_s,
                                         u"no"_s,   u"on"_s,   u"off"_s};
    if (identifier.match(name).hasMatch() && !keywords.contains(name.toLower()))
        return name;
    return quoted(name);
}

namespace {

QString numberToken(const QString& text) {
    return isNumberText(text) ? text : quoted(text);
}

// A bound keeps its spelling; one made in code without a spelling is written
// from its value (shortest exact form), so that the file still loads.
QString boundToken(const RangeBound& bound) {
    if (isNumberText(bound.text))
        return bound.text;
    return QString::number(bound.value, 'g', QLocale::FloatingPointShortest);
}

QString codeFlow(const Code& code) {
    QString out = u"{code: %1, label: %2"_s.arg(code.code).arg(quoted(code.label));
    if (code.isMissing())
        out += u", missing: "_s + missingKindName(code.missing);
    return out + u"}"_s;
}

QString list(const QStringList& tokens) {
    return u"["_s + tokens.join(u", "_s) + u"]"_s;
}

// Appends lines with a fixed indent; keeps the layout code short.
class Lines {
public:
    void add(int indent, const QString& line) {
        m_text += QString(indent, QLatin1Char(' ')) + line + QLatin1Char('\n');
    }
    void text(int indent, const char* key, const QString& value) {
        if (!value.isEmpty())
            add(indent, QLatin1String(key) + u": "_s + quoted(value));
    }
    void condition(int indent, const char* key, const std::optional<QString>& value) {
        if (value)
            add(indent, QLatin1String(key) + u": "_s + quoted(*value));
    }
    void codes(int indent, const QString& key, const QList<Code>& codes) {
        if (codes.isEmpty()) {
            add(indent, key + u": []"_s);
            return;
        }
        add(indent, key + u":"_s);
        for (const Code& code : codes)
            add(indent + 2, u"- "_s + codeFlow(code));
    }
    QByteArray bytes() const { return m_text.toUtf8(); }

private:
    QString m_text;
};

void writeHeader(Lines& out, const Instrument& instrument) {
    out.add(0, u"routebook: 1"_s);
    out.add(0, u"instrument:"_s);
    out.add(2, u"title: "_s + quoted(instrument.title));
    out.text(2, "version", instrument.version);
    out.text(2, "language", instrument.language);
    out.add(0, u"settings:"_s);
    const QString& skip = instrument.settings.legitimateSkipCode;
    out.add(2, u"legitimate_skip_code: "_s + (isNumberText(skip) ? skip : quoted(skip)));
    if (instrument.codeLists.isEmpty())
        return;
    out.add(0, u"code_lists:"_s);
    for (const CodeList& list : instrument.codeLists)
        out.codes(2, nameToken(list.name), list.codes);
}

QString ruleFlow(const Rule& rule) {
    QString out = u"{"_s;
    if (rule.condition)
        out += u"if: "_s + quoted(*rule.condition) + u", "_s;
    return out + u"goto: "_s + nameToken(rule.target) + u"}"_s;
}

QString whenSkippedFlow(const WhenSkipped& skipped) {
    QString out =
        u"{value: "_s + (skipped.valueIsText ? quoted(skipped.value) : numberToken(skipped.value));
    if (skipped.condition)
        out += u", if: "_s + quoted(*skipped.condition);
    return out + u"}"_s;
}

void writeItem(Lines& out, const Item& item) {
    constexpr int in = 8;
    out.add(6, u"- name: "_s + nameToken(item.name));
    out.text(in, "label", item.label);
    out.text(in, "text", item.text);
    out.text(in, "instruction", item.instruction);
    out.add(in, u"type: "_s + itemTypeName(item.type));
    if (item.hasInlineCodes)
        out.codes(in, u"codes"_s, item.inlineCodes);
    else if (!item.codeListName.isEmpty())
        out.add(in, u"codes: "_s + nameToken(item.codeListName));
    if (item.range)
        out.add(in, u"range: "_s +
                        list({boundToken(item.range->first), boundToken(item.range->second)}));
    if (!item.missing.isEmpty())
        out.codes(in, u"missing"_s, item.missing);
    out.condition(in, "ask_if", item.askIf);
    if (!item.routing.isEmpty()) {
        out.add(in, u"routing:"_s);
        for (const Rule& rule : item.routing)
            out.add(in + 2, u"- "_s + ruleFlow(rule));
    }
    if (item.whenSkipped)
        out.add(in, u"when_skipped: "_s + whenSkippedFlow(*item.whenSkipped));
    out.text(in, "notes", item.notes);
}

void writeModules(Lines& out, const QList<Module>& modules) {
    if (modules.isEmpty()) {
        out.add(0, u"modules: []"_s);
        return;
    }
    out.add(0, u"modules:"_s);
    for (const Module& module : modules) {
        out.add(2, u"- name: "_s + nameToken(module.name));
        out.text(4, "title", module.title);
        out.condition(4, "ask_if", module.askIf);
        if (module.items.isEmpty())
            continue;
        out.add(4, u"items:"_s);
        for (const Item& item : module.items)
            writeItem(out, item);
    }
}

QString answerToken(const AnswerValue& value) {
    switch (value.kind) {
    case AnswerValue::Kind::Number:
        return numberToken(value.text);
    case AnswerValue::Kind::Text:
        return quoted(value.text);
    case AnswerValue::Kind::List: {
        QStringList codes;
        for (qint64 code : value.codes)
            codes.append(QString::number(code));
        return list(codes);
    }
    }
    return {};
}

void writeRespondents(Lines& out, const QList<TestRespondent>& respondents) {
    if (respondents.isEmpty())
        return;
    out.add(0, u"test_respondents:"_s);
    for (const TestRespondent& respondent : respondents) {
        out.add(2, u"- name: "_s + quoted(respondent.name));
        if (!respondent.answers.isEmpty()) {
            out.add(4, u"answers:"_s);
            for (const Answer& answer : respondent.answers)
                out.add(6, nameToken(answer.item) + u": "_s + answerToken(answer.value));
        }
        if (!respondent.path.isEmpty()) {
            QStringList names;
            for (const QString& name : respondent.path)
                names.append(nameToken(name));
            out.add(4, u"path: "_s + list(names));
        }
    }
}

} // namespace

QByteArray writeInstrument(const Instrument& instrument) {
    Lines out;
    writeHeader(out, instrument);
    writeModules(out, instrument.modules);
    writeRespondents(out, instrument.testRespondents);
    return out.bytes();
}

} // namespace rb::yaml
