#include "Cascades.h"

#include "ConditionRewrite.h"
#include "Document.h"
#include "SetAttributeCommand.h"
#include "StructureCommands.h"

#include <QCoreApplication>

#include <functional>

namespace rb {

namespace {

QString tr(const char* text) {
    return QCoreApplication::translate("rb::Commands", text);
}

bool sameName(const QString& a, const QString& b) {
    return a.compare(b, Qt::CaseInsensitive) == 0;
}

using Rewriter = std::function<ConditionRewrite(const QString&)>;

// Applies `rewriter` to every condition of the instrument and adds one child
// command per changed attribute. Rule targets go through `retarget`.
class ConditionSweep {
public:
    ConditionSweep(Document* document, QUndoCommand* parent, CascadeReport* report)
        : m_document(document), m_parent(parent), m_report(report) {}

    void run(const Rewriter& rewriter, const std::function<QString(const QString&)>& retarget) {
        const Instrument& instrument = m_document->instrument();
        for (int m = 0; m < instrument.modules.size(); ++m) {
            const Module& module = instrument.modules.at(m);
            if (auto askIf =
                    rewriteOptional(module.askIf, rewriter, module.name, QStringLiteral("ask_if")))
                add(AttributeKey::ofModule(m, Field::ModuleAskIf), *askIf);
            for (int i = 0; i < module.items.size(); ++i)
                sweepItem(m, i, rewriter, retarget);
        }
    }

private:
    void sweepItem(int m, int i, const Rewriter& rewriter,
                   const std::function<QString(const QString&)>& retarget) {
        const Item& item = m_document->instrument().modules.at(m).items.at(i);
        if (auto askIf = rewriteOptional(item.askIf, rewriter, item.name, QStringLiteral("ask_if")))
            add(AttributeKey::ofItem(m, i, Field::ItemAskIf), *askIf);
        QList<Rule> rules = item.routing;
        bool rulesChanged = false;
        for (int r = 0; r < rules.size(); ++r) {
            const QString field = QStringLiteral("routing[%1].if").arg(r);
            if (auto c = rewriteOptional(rules[r].condition, rewriter, item.name, field)) {
                rules[r].condition = *c;
                rulesChanged = true;
            }
            if (retarget) {
                const QString target = retarget(rules[r].target);
                if (target != rules[r].target) {
                    rules[r].target = target;
                    rulesChanged = true;
                    if (m_report)
                        ++m_report->targetsRewritten;
                }
            }
        }
        if (rulesChanged)
            add(AttributeKey::ofItem(m, i, Field::ItemRouting), rules);
        if (item.whenSkipped) {
            WhenSkipped skipped = *item.whenSkipped;
            if (auto c = rewriteOptional(skipped.condition, rewriter, item.name,
                                         QStringLiteral("when_skipped.if"))) {
                skipped.condition = *c;
                add(AttributeKey::ofItem(m, i, Field::ItemWhenSkipped),
                    std::optional<WhenSkipped>(skipped));
            }
        }
    }

    // The rewritten condition when it changed, otherwise nothing.
    std::optional<std::optional<QString>> rewriteOptional(const std::optional<QString>& condition,
                                                          const Rewriter& rewriter,
                                                          const QString& owner,
                                                          const QString& field) {
        if (!condition || !rewriter)
            return std::nullopt;
        const ConditionRewrite result = rewriter(*condition);
        if ((result.unparsable || result.rangeTouched) && m_report)
            m_report->leftAsWritten.append(QStringLiteral("%1: %2").arg(owner, field));
        if (!result.changed)
            return std::nullopt;
        if (m_report)
            ++m_report->conditionsRewritten;
        return std::optional<QString>(result.text);
    }

    void add(const AttributeKey& key, AttributeValue value) {
        new SetAttributeCommand(m_document, key, std::move(value), QString(), m_parent);
    }

    Document* m_document;
    QUndoCommand* m_parent;
    CascadeReport* m_report;
};

QList<Rule> withoutRulesTo(const QList<Rule>& rules,
                           const std::function<bool(const QString&)>& hit) {
    QList<Rule> kept;
    for (const Rule& rule : rules)
        if (!hit(rule.target))
            kept.append(rule);
    return kept;
}

// Adds children that drop every rule whose target satisfies `hit`.
void dropRulesTo(Document* document, QUndoCommand* parent,
                 const std::function<bool(const QString&)>& hit) {
    const Instrument& instrument = document->instrument();
    for (int m = 0; m < instrument.modules.size(); ++m)
        for (int i = 0; i < instrument.modules.at(m).items.size(); ++i) {
            const QList<Rule>& rules = instrument.modules.at(m).items.at(i).routing;
            const QList<Rule> kept = withoutRulesTo(rules, hit);
            if (kept.size() != rules.size())
                new SetAttributeCommand(document, AttributeKey::ofItem(m, i, Field::ItemRouting),
                                        kept, QString(), parent);
        }
}

QList<TestRespondent> renameInRespondents(QList<TestRespondent> respondents, const QString& from,
                                          const QString& to, int& changed) {
    for (TestRespondent& respondent : respondents) {
        bool touched = false;
        for (Answer& answer : respondent.answers)
            if (sameName(answer.item, from)) {
                answer.item = to;
                touched = true;
            }
        for (QString& step : respondent.path)
            if (sameName(step, from)) {
                step = to;
                touched = true;
            }
        changed += touched ? 1 : 0;
    }
    return respondents;
}

} // namespace

QUndoCommand* renameItemCommand(Document* document, int module, int item, const QString& newName,
                                CascadeReport* report) {
    const Instrument& instrument = document->instrument();
    const QString oldName = instrument.modules.at(module).items.at(item).name;
    auto* parent = new QUndoCommand(tr("Rename item %1 to %2").arg(oldName, newName));
    new SetAttributeCommand(document, AttributeKey::ofItem(module, item, Field::ItemName), newName,
                            QString(), parent);
    ConditionSweep(document, parent, report)
        .run([&](const QString& c) { return renameInCondition(c, oldName, newName); },
             [&](const QString& target) { return sameName(target, oldName) ? newName : target; });
    int respondents = 0;
    QList<TestRespondent> renamed =
        renameInRespondents(instrument.testRespondents, oldName, newName, respondents);
    if (respondents > 0)
        new SetAttributeCommand(document, AttributeKey::instrument(Field::TestRespondents), renamed,
                                QString(), parent);
    if (report)
        report->respondentsRewritten += respondents;
    return parent;
}

QUndoCommand* renameModuleCommand(Document* document, int module, const QString& newName,
                                  CascadeReport* report) {
    const QString oldName = document->instrument().modules.at(module).name;
    auto* parent = new QUndoCommand(tr("Rename module %1 to %2").arg(oldName, newName));
    new SetAttributeCommand(document, AttributeKey::ofModule(module, Field::ModuleName), newName,
                            QString(), parent);
    ConditionSweep(document, parent, report).run(nullptr, [&](const QString& target) {
        return sameName(target, oldName) ? newName : target;
    });
    return parent;
}

QUndoCommand* renameCodeListCommand(Document* document, int codeList, const QString& newName) {
    const Instrument& instrument = document->instrument();
    const QString oldName = instrument.codeLists.at(codeList).name;
    auto* parent = new QUndoCommand(tr("Rename code list %1 to %2").arg(oldName, newName));
    new SetAttributeCommand(document, AttributeKey::ofCodeList(codeList, Field::CodeListName),
                            newName, QString(), parent);
    for (int m = 0; m < instrument.modules.size(); ++m)
        for (int i = 0; i < instrument.modules.at(m).items.size(); ++i) {
            const Item& item = instrument.modules.at(m).items.at(i);
            if (item.hasInlineCodes || !sameName(item.codeListName, oldName))
                continue;
            new SetAttributeCommand(document, AttributeKey::ofItem(m, i, Field::ItemCodes),
                                    CodeSource{newName, false, {}}, QString(), parent);
        }
    return parent;
}

QUndoCommand* deleteItemCommand(Document* document, int module, int item) {
    const QString name = document->instrument().modules.at(module).items.at(item).name;
    auto* parent = new QUndoCommand(tr("Delete item %1").arg(name));
    dropRulesTo(document, parent, [&](const QString& target) { return sameName(target, name); });
    ItemCommand::remove(document, module, item, parent);
    return parent;
}

QUndoCommand* deleteModuleCommand(Document* document, int module) {
    const Module& doomed = document->instrument().modules.at(module);
    auto* parent = new QUndoCommand(tr("Delete module %1").arg(doomed.name));
    QStringList names{doomed.name};
    for (const Item& item : doomed.items)
        names.append(item.name);
    dropRulesTo(document, parent,
                [&](const QString& target) { return names.contains(target, Qt::CaseInsensitive); });
    ModuleCommand::remove(document, module, parent);
    return parent;
}

QUndoCommand* deleteCodeListCommand(Document* document, int codeList) {
    const Instrument& instrument = document->instrument();
    const CodeList& list = instrument.codeLists.at(codeList);
    auto* parent = new QUndoCommand(tr("Delete code list %1").arg(list.name));
    for (int m = 0; m < instrument.modules.size(); ++m)
        for (int i = 0; i < instrument.modules.at(m).items.size(); ++i) {
            const Item& item = instrument.modules.at(m).items.at(i);
            if (item.hasInlineCodes || !sameName(item.codeListName, list.name))
                continue;
            new SetAttributeCommand(document, AttributeKey::ofItem(m, i, Field::ItemCodes),
                                    CodeSource{QString(), true, list.codes}, QString(), parent);
        }
    CodeListCommand::remove(document, codeList, parent);
    return parent;
}

namespace {

// Lower-case names of the items whose codes live at `where`.
QSet<QString> itemsUsing(const Instrument& instrument, const CodeLocation& where) {
    QSet<QString> names;
    if (where.kind != CodeLocation::Kind::SharedList) {
        names.insert(instrument.modules.at(where.module).items.at(where.item).name.toLower());
        return names;
    }
    const QString list = instrument.codeLists.at(where.codeList).name;
    for (const Module& module : instrument.modules)
        for (const Item& item : module.items)
            if (!item.hasInlineCodes && sameName(item.codeListName, list))
                names.insert(item.name.toLower());
    return names;
}

QList<TestRespondent> recodeRespondents(QList<TestRespondent> respondents,
                                        const QSet<QString>& items, qint64 from, qint64 to,
                                        int& changed) {
    const QString fromText = QString::number(from);
    for (TestRespondent& respondent : respondents) {
        bool touched = false;
        for (Answer& answer : respondent.answers) {
            if (!items.contains(answer.item.toLower()))
                continue;
            if (answer.value.kind == AnswerValue::Kind::Number && answer.value.text == fromText) {
                answer.value.text = QString::number(to);
                touched = true;
            }
            for (qint64& code : answer.value.codes)
                if (code == from) {
                    code = to;
                    touched = true;
                }
        }
        changed += touched ? 1 : 0;
    }
    return respondents;
}

} // namespace

QUndoCommand* recodeCommand(Document* document, const CodeLocation& where, int row, qint64 newCode,
                            CascadeReport* report) {
    const Instrument& instrument = document->instrument();
    QList<Code> codes = codesAt(instrument, where);
    const qint64 oldCode = codes.at(row).code;
    auto* parent = new QUndoCommand(tr("Change code %1 to %2").arg(oldCode).arg(newCode));
    codes[row].code = newCode;
    const AttributeKey key = codesKey(where);
    new SetAttributeCommand(document, key, codesValue(where, codes), QString(), parent);
    const QSet<QString> items = itemsUsing(instrument, where);
    ConditionSweep(document, parent, report)
        .run([&](const QString& c) { return recodeInCondition(c, items, oldCode, newCode); },
             nullptr);
    int respondents = 0;
    QList<TestRespondent> recoded =
        recodeRespondents(instrument.testRespondents, items, oldCode, newCode, respondents);
    if (respondents > 0)
        new SetAttributeCommand(document, AttributeKey::instrument(Field::TestRespondents), recoded,
                                QString(), parent);
    if (report)
        report->respondentsRewritten += respondents;
    return parent;
}

} // namespace rb
