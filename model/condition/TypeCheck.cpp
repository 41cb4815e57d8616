#include "TypeCheck.h"

#include <QDate>
#include <QRegularExpression>

using namespace Qt::StringLiterals;

namespace rb::cond {

namespace {

// Items whose values are numbers (codes count as numbers) and those whose
// values are text. Dates are text in ISO form, so ordering them as strings
// orders them as dates; `<` on plain text is allowed too (string order).
bool holdsNumbers(ItemType t) {
    return t == ItemType::Single || t == ItemType::Multi || t == ItemType::Integer ||
           t == ItemType::Decimal;
}

bool isIsoDate(const QString& text) {
    static const QRegularExpression shape(u"^[0-9]{4}-[0-9]{2}-[0-9]{2}$"_s);
    return shape.match(text).hasMatch() && QDate::fromString(text, Qt::ISODate).isValid();
}

class Checker {
public:
    explicit Checker(const ItemIndex& index) : m_index(index) {}

    void walk(const Expr& e) {
        if (e.isAtom())
            checkAtom(e);
        for (const ExprPtr& child : e.children)
            walk(*child);
    }

    QList<ConditionProblem> problems;

private:
    const ItemIndex& m_index;

    void report(const Expr& atom, const QString& check, const QString& message) {
        problems.append({check, atom.nameColumn, message});
    }

    // A hint for the two names people most often write by mistake: a module
    // name, or the stored variable name of one code of a multi item (m_3).
    QString unknownHint(const QString& name) const {
        if (m_index.modulePosition(name) != -1)
            return u" ('%1' is a module; conditions read items)"_s.arg(name);
        const qsizetype cut = name.lastIndexOf(u'_');
        if (cut > 0) {
            bool isCode = false;
            const qint64 code = name.mid(cut + 1).toLongLong(&isCode);
            const int position = m_index.positionOf(name.left(cut));
            if (isCode && position >= 0 && m_index.at(position).type == ItemType::Multi)
                return u" (to test one code of multi item '%1', write '%1 has %2')"_s.arg(
                    m_index.at(position).item->name, QString::number(code));
        }
        return {};
    }

    void checkAtom(const Expr& atom) {
        // Resolved when parsed for this instrument: looking every name up again
        // cost a probe of the name table per atom.
        const int position =
            atom.position != Expr::kUnresolved ? atom.position : m_index.positionOf(atom.name);
        if (position < 0) {
            report(atom, u"unknown-variable"_s,
                   u"unknown item '%1'%2"_s.arg(atom.name, unknownHint(atom.name)));
            return;
        }
        // The type from the index entry, not the item: entries sit together.
        if (const QString problem = typeProblem(atom, m_index.at(position).type);
            !problem.isEmpty())
            report(atom, u"type-mismatch"_s, problem);
    }

    // The first type problem of one atom, or "" (one problem per atom is
    // enough to act on; more would repeat the same mistake).
    static QString typeProblem(const Expr& atom, ItemType type) {
        if (atom.kind == Expr::Kind::Asked)
            return {};
        if (type == ItemType::Statement) {
            if (atom.kind == Expr::Kind::Answered)
                return u"'%1' is a statement and holds no value, so answered(%1) is never true; "
                       u"use asked(%1)"_s.arg(atom.name);
            return u"'%1' is a statement and holds no value; conditions cannot read it"_s.arg(
                atom.name);
        }
        if (atom.kind == Expr::Kind::Answered)
            return {};
        if (atom.kind == Expr::Kind::Has && type != ItemType::Multi)
            return u"'has' is for multi items; '%1' is a %2 item (use '=' or 'in')"_s.arg(
                atom.name, itemTypeName(type));
        if (atom.kind != Expr::Kind::Has && type == ItemType::Multi)
            return u"'%1' is a multi item; use 'has' to test a chosen code (%1 has CODE)"_s.arg(
                atom.name);
        if (atom.kind == Expr::Kind::In)
            return listProblem(atom, type);
        return valueProblem(atom.value, atom.name, type);
    }

    static QString listProblem(const Expr& atom, ItemType type) {
        for (const ListElement& element : atom.list) {
            if (element.high && type == ItemType::Text)
                return u"a range (..) cannot be used with text item '%1'"_s.arg(atom.name);
            QString problem = valueProblem(element.low, atom.name, type);
            if (problem.isEmpty() && element.high)
                problem = valueProblem(*element.high, atom.name, type);
            if (!problem.isEmpty())
                return problem;
        }
        return {};
    }

    static QString valueProblem(const Value& value, const QString& name, ItemType type) {
        if (holdsNumbers(type) && !value.isNumber())
            return u"'%1' is a %2 item; compare it with a number, not text"_s.arg(
                name, itemTypeName(type));
        if (type == ItemType::Text && value.isNumber())
            return u"'%1' is a text item; compare it with \"text\", not a number"_s.arg(name);
        if (type == ItemType::Date && value.isNumber())
            return u"'%1' is a date item; compare it with a date in quotes, e.g. \"2024-05-31\""_s
                .arg(name);
        if (type == ItemType::Date && !isIsoDate(value.text))
            return u"'%1' is not a date in the form YYYY-MM-DD (item '%2' is a date)"_s.arg(
                value.text, name);
        return {};
    }
};

} // namespace

QList<ConditionProblem> typeCheck(const Expr& expr, const ItemIndex& index) {
    Checker checker(index);
    checker.walk(expr);
    return checker.problems;
}

QList<NameUse> namesRead(const Expr& expr) {
    QList<NameUse> names;
    forEachNameRead(expr, [&](const Expr& atom) {
        names.append({atom.name, atom.nameColumn, atom.position});
    });
    return names;
}

} // namespace rb::cond
