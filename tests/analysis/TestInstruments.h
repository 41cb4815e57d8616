#pragma once

// Small builders for instruments in tests (structs, no YAML needed).

#include "instrument/Instrument.h"

#include <QString>

namespace rbtest {

inline rb::Code code(qint64 value, const QString& label,
                     rb::MissingKind missing = rb::MissingKind::None) {
    rb::Code c;
    c.code = value;
    c.label = label;
    c.missing = missing;
    return c;
}

// 1 Yes, 2 No, 8 Don't know, 9 Refused (invented, common practice, no source).
inline rb::CodeList yesNo() {
    return {QStringLiteral("yes_no"),
            {code(1, QStringLiteral("Yes")), code(2, QStringLiteral("No")),
             code(8, QStringLiteral("Don't know"), rb::MissingKind::DontKnow),
             code(9, QStringLiteral("Refused"), rb::MissingKind::Refused)}};
}

inline rb::Item item(const QString& name, rb::ItemType type, const QString& codeList = {}) {
    rb::Item it;
    it.name = name;
    it.text = name + QStringLiteral("?");
    it.type = type;
    it.codeListName = codeList;
    return it;
}

inline rb::Item yesNoItem(const QString& name, const QString& label = {}) {
    rb::Item it = item(name, rb::ItemType::Single, QStringLiteral("yes_no"));
    it.label = label;
    return it;
}

inline rb::Item integerItem(const QString& name, double lo, double hi) {
    rb::Item it = item(name, rb::ItemType::Integer);
    it.range = std::make_pair(rb::RangeBound{QString::number(lo), lo},
                              rb::RangeBound{QString::number(hi), hi});
    return it;
}

inline rb::Item withAskIf(rb::Item it, const QString& condition) {
    it.askIf = condition;
    return it;
}

inline rb::Item withRule(rb::Item it, const std::optional<QString>& condition,
                         const QString& target) {
    it.routing.append(rb::Rule{condition, target});
    return it;
}

inline rb::Module module(const QString& name, const QList<rb::Item>& items,
                         const std::optional<QString>& askIf = std::nullopt) {
    rb::Module m;
    m.name = name;
    m.title = name;
    m.askIf = askIf;
    m.items = items;
    return m;
}

inline rb::Instrument instrument(const QList<rb::Module>& modules,
                                 const QList<rb::CodeList>& lists = {yesNo()}) {
    rb::Instrument ins;
    ins.title = QStringLiteral("Test");
    ins.version = QStringLiteral("1");
    ins.language = QStringLiteral("en");
    ins.codeLists = lists;
    ins.modules = modules;
    return ins;
}

} // namespace rbtest
