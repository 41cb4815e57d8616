#include "SqlExport.h"

#include "condition/Expr.h"

#include <QStringList>

namespace rb {

namespace {

// User text inside an SQL `--` comment: any line break would end the comment
// and let the rest run as SQL, so every kind of line break becomes a space.
QString commentText(QString text) {
    for (QChar& c : text)
        if (c == QLatin1Char('\n') || c == QLatin1Char('\r') || c == QChar(0x85) ||
            c == QChar(0x2028) || c == QChar(0x2029))
            c = QLatin1Char(' ');
    return text;
}

using cond::Expr;

QString quoteId(const QString& name) {
    QString n = name;
    n.replace(QLatin1Char('"'), QStringLiteral("\"\""));
    return QLatin1Char('"') + n + QLatin1Char('"');
}

QString quoteText(const QString& text) {
    QString t = text;
    t.replace(QLatin1Char('\''), QStringLiteral("''"));
    return QLatin1Char('\'') + t + QLatin1Char('\'');
}

QString flag(const QString& predicate) {
    return QStringLiteral("(CASE WHEN %1 THEN 1 ELSE 0 END)").arg(predicate);
}

// The number rule of the data check (optional minus, digits, optionally a point
// and digits), written with REPLACE and LIKE only, which every engine has.
QString isNumber(const QString& c) {
    QString rem = c;
    for (char d = '0'; d <= '9'; ++d)
        rem = QStringLiteral("REPLACE(%1, '%2', '')").arg(rem).arg(QLatin1Char(d));
    return QStringLiteral("(%1 IS NOT NULL AND %1 <> '' AND %2 IN ('', '.', '-', '-.') AND %1 NOT "
                          "LIKE '%.' AND %1 NOT LIKE '.%' AND %1 NOT LIKE '-.%' AND %1 <> '-' AND "
                          "(%2 NOT LIKE '-%' OR %1 LIKE '-%'))")
        .arg(c, rem);
}

QString isBlank(const QString& c) {
    return QStringLiteral("(%1 IS NULL OR %1 = '')").arg(c);
}

QString digitsOnly(const QString& c) {
    QString rem = c;
    for (char d = '0'; d <= '9'; ++d)
        rem = QStringLiteral("REPLACE(%1, '%2', '')").arg(rem).arg(QLatin1Char(d));
    return QStringLiteral("(%1 = '')").arg(rem);
}

// YYYY-MM-DD and a real calendar date; nested CASE so that no CAST sees non-digits.
QString isDate(const QString& c) {
    const QString y = QStringLiteral("CAST(SUBSTR(%1, 1, 4) AS INTEGER)").arg(c);
    const QString m = QStringLiteral("CAST(SUBSTR(%1, 6, 2) AS INTEGER)").arg(c);
    const QString d = QStringLiteral("CAST(SUBSTR(%1, 9, 2) AS INTEGER)").arg(c);
    const QString days =
        QStringLiteral("(CASE WHEN %1 = 2 THEN (CASE WHEN (%2 % 4 = 0 AND %2 % 100 <> 0) OR %2 % "
                       "400 = 0 THEN 29 ELSE 28 END) WHEN %1 IN (4, 6, 9, 11) THEN 30 ELSE 31 END)")
            .arg(m, y);
    return QStringLiteral(
               "(CASE WHEN %1 IS NOT NULL AND LENGTH(%1) = 10 AND SUBSTR(%1, 5, 1) = "
               "'-' AND SUBSTR(%1, 8, 1) = '-' AND %2 THEN (CASE WHEN %3 > 0 AND %4 "
               "BETWEEN 1 AND 12 AND %5 BETWEEN 1 AND %6 THEN 1 ELSE 0 END) ELSE 0 END) = 1")
        .arg(c,
             digitsOnly(
                 QStringLiteral("SUBSTR(%1, 1, 4) || SUBSTR(%1, 6, 2) || SUBSTR(%1, 9, 2)").arg(c)),
             y, m, d, days);
}

QString numberList(const QList<qint64>& codes) {
    QStringList parts;
    for (qint64 c : codes)
        parts.append(QString::number(c));
    return parts.join(QStringLiteral(", "));
}

class Writer {
public:
    Writer(const CompiledRouting& routing) : r(routing) {}

    QString pres(int p) const { return QStringLiteral("rb_p%1").arg(p); }
    QString reach(int p) const { return QStringLiteral("rb_r%1").arg(p); }
    QString num(int p) const { return QStringLiteral("rb_n%1").arg(p); }
    const Item& item(int p) const { return *r.index().at(p).item; }
    bool numeric(int p) const {
        const ItemType t = item(p).type;
        return t == ItemType::Single || t == ItemType::Integer || t == ItemType::Decimal;
    }
    QString column(int p) const { return quoteId(item(p).name); }
    QString multiColumn(int p, qint64 code) const {
        return quoteId(item(p).name + QLatin1Char('_') + QString::number(code));
    }
    QList<qint64> codes(int p, std::optional<MissingKind> kind = std::nullopt) const {
        QList<qint64> out;
        for (const Code& c : r.codes(p))
            if ((!kind || c.missing == *kind) && !out.contains(c.code))
                out.append(c.code);
        return out;
    }
    QList<qint64> codesWhere(int p, bool missing) const {
        QList<qint64> out;
        for (const Code& c : r.codes(p))
            if (c.isMissing() == missing && !out.contains(c.code))
                out.append(c.code);
        return out;
    }

    // Compare a cell with a literal as the evaluator does (0/1 expression).
    QString compare(int p, cond::CompareOp op, const cond::Value& v) const {
        if (op == cond::CompareOp::Ne)
            return QStringLiteral("(1 - %1)").arg(compare(p, cond::CompareOp::Eq, v));
        if (item(p).type == ItemType::Multi || item(p).type == ItemType::Statement)
            return QStringLiteral("0");
        const QString sqlOp = cond::compareOpText(op);
        const QString c = column(p);
        if (v.isNumber())
            return numeric(p) ? flag(QStringLiteral("%1 = 1 AND %2 IS NOT NULL AND %2 %3 %4")
                                         .arg(pres(p), num(p), sqlOp, v.text))
                              : QStringLiteral("0");
        const QString notNumber =
            numeric(p) ? QStringLiteral(" AND %1 IS NULL").arg(num(p)) : QString();
        return flag(QStringLiteral("%1 = 1 AND NOT %2%3 AND %4 %5 %6")
                        .arg(pres(p), isBlank(c), notNumber, c, sqlOp, quoteText(v.text)));
    }

    QString answered(int p) const {
        const QString c = column(p);
        if (item(p).type == ItemType::Multi) {
            QStringList any;
            for (qint64 code : codesWhere(p, false))
                any.append(QStringLiteral("%1 = '1'").arg(multiColumn(p, code)));
            return any.isEmpty() ? QStringLiteral("0")
                                 : flag(QStringLiteral("%1 = 1 AND (%2)")
                                            .arg(pres(p), any.join(QStringLiteral(" OR "))));
        }
        if (!numeric(p))
            return flag(
                QStringLiteral("%1 = 1 AND %2 IS NOT NULL AND TRIM(%2) <> ''").arg(pres(p), c));
        const QList<qint64> missing = codesWhere(p, true);
        const QString notMissing =
            missing.isEmpty() ? QStringLiteral("1 = 1")
                              : QStringLiteral("%1 NOT IN (%2)").arg(num(p), numberList(missing));
        return flag(
            QStringLiteral(
                "%1 = 1 AND NOT %2 AND (%3 IS NULL AND TRIM(%4) <> '' OR %3 IS NOT NULL AND %5)")
                .arg(pres(p), isBlank(c), num(p), c, notMissing));
    }

    QString condition(const Expr& e) const {
        switch (e.kind) {
        case Expr::Kind::Or:
        case Expr::Kind::And: {
            QStringList parts;
            for (const cond::ExprPtr& child : e.children)
                parts.append(condition(*child));
            return e.kind == Expr::Kind::And
                       ? QLatin1Char('(') + parts.join(QStringLiteral(" * ")) + QLatin1Char(')')
                       : flag(QLatin1Char('(') + parts.join(QStringLiteral(" + ")) +
                              QStringLiteral(") > 0"));
        }
        case Expr::Kind::Not:
            return QStringLiteral("(1 - %1)").arg(condition(*e.children.at(0)));
        case Expr::Kind::True:
            return QStringLiteral("1");
        case Expr::Kind::False:
            return QStringLiteral("0");
        default:
            break;
        }
        const int p = r.positionOf(e);
        if (p < 0)
            return QStringLiteral("0");
        switch (e.kind) {
        case Expr::Kind::Compare:
            return compare(p, e.op, e.value);
        case Expr::Kind::In: {
            QStringList parts;
            for (const cond::ListElement& el : e.list)
                parts.append(el.high ? QStringLiteral("(%1 * %2)")
                                           .arg(compare(p, cond::CompareOp::Ge, el.low),
                                                compare(p, cond::CompareOp::Le, *el.high))
                                     : compare(p, cond::CompareOp::Eq, el.low));
            const QString any = flag(QLatin1Char('(') + parts.join(QStringLiteral(" + ")) +
                                     QStringLiteral(") > 0"));
            return e.negated ? QStringLiteral("(1 - %1)").arg(any) : any;
        }
        case Expr::Kind::Has: {
            if (item(p).type != ItemType::Multi || !e.value.isNumber() ||
                !codes(p).contains(qint64(e.value.number)) ||
                double(qint64(e.value.number)) != e.value.number)
                return QStringLiteral("0");
            return flag(QStringLiteral("%1 = 1 AND %2 = '1'")
                            .arg(pres(p), multiColumn(p, qint64(e.value.number))));
        }
        case Expr::Kind::Asked:
            return pres(p);
        case Expr::Kind::Answered:
            return answered(p);
        default:
            return QStringLiteral("0");
        }
    }

    // 0/1: the route leaves q (presented) for p.
    QString goesTo(int q, int p) const {
        QStringList ways;
        QStringList earlier; // rules before: none of them fired
        for (const CompiledRouting::CompiledRule& rule : r.item(q).rules) {
            if (!rule.usable)
                continue;
            const QString fires = rule.condition ? condition(*rule.condition) : QStringLiteral("1");
            QString thisOne = fires;
            for (const QString& e : earlier)
                thisOne += QStringLiteral(" * (1 - %1)").arg(e);
            if (rule.target == p)
                ways.append(QLatin1Char('(') + thisOne + QLatin1Char(')'));
            earlier.append(fires);
        }
        if (q + 1 == p) {
            QString none = QStringLiteral("1");
            for (const QString& e : earlier)
                none += QStringLiteral(" * (1 - %1)").arg(e);
            ways.append(QLatin1Char('(') + none + QLatin1Char(')'));
        }
        if (ways.isEmpty())
            return {};
        return QStringLiteral("%1 * %2").arg(
            pres(q),
            flag(QLatin1Char('(') + ways.join(QStringLiteral(" + ")) + QStringLiteral(") > 0")));
    }

    QString classOf(int p) const;

    const CompiledRouting& r;
    QString skipCode;
};

QString Writer::classOf(int p) const {
    const Item& it = item(p);
    const QString c = column(p);
    const QString skip =
        skipCode.isEmpty() ? QString() : QStringLiteral(" OR %1 = %2").arg(c, quoteText(skipCode));
    if (it.type == ItemType::Multi) {
        QStringList cols;
        for (qint64 code : codes(p))
            cols.append(multiColumn(p, code));
        const QString skipList =
            skipCode.isEmpty() ? QString() : QStringLiteral(", ") + quoteText(skipCode);
        QStringList bad, chosen, kinds;
        for (qsizetype k = 0; k < cols.size(); ++k) {
            bad.append(QStringLiteral("COALESCE(%1, '') NOT IN ('', '0', '1'%2)")
                           .arg(cols.at(k), skipList));
            chosen.append(QStringLiteral("%1 = '1'").arg(cols.at(k)));
        }
        QString firstKind = QStringLiteral("CASE");
        for (const Code& code : r.codes(p))
            firstKind +=
                QStringLiteral(" WHEN %1 = '1' THEN '%2'")
                    .arg(multiColumn(p, code.code), code.isMissing() ? missingKindName(code.missing)
                                                                     : QStringLiteral("answered"));
        firstKind += QStringLiteral(" ELSE 'blank' END");
        const QString anyBad =
            bad.isEmpty() ? QStringLiteral("1 = 0") : bad.join(QStringLiteral(" OR "));
        const QString anyChosen =
            chosen.isEmpty() ? QStringLiteral("1 = 0") : chosen.join(QStringLiteral(" OR "));
        QStringList notLegit; // not presented: anything but 0, blank or the skip code
        for (const QString& col : cols)
            notLegit.append(
                QStringLiteral("COALESCE(%1, '') NOT IN ('', '0'%2)").arg(col, skipList));
        return QStringLiteral(
                   "CASE WHEN %1 = 0 THEN (CASE WHEN %2 THEN 'routing_violation' ELSE "
                   "'legitimate_skip' END) WHEN %3 THEN 'invalid' WHEN NOT (%4) THEN 'blank' "
                   "WHEN %5 = 1 THEN 'answered' ELSE %6 END")
            .arg(pres(p),
                 notLegit.isEmpty() ? QStringLiteral("1 = 0")
                                    : notLegit.join(QStringLiteral(" OR ")),
                 anyBad, anyChosen, answered(p), firstKind);
    }
    QString legit = isBlank(c) + skip;
    QString presented = QStringLiteral("WHEN %1 THEN 'blank'").arg(isBlank(c));
    if (numeric(p)) {
        const QList<qint64> na = codes(p, MissingKind::NotApplicable);
        if (!na.isEmpty())
            legit += QStringLiteral(" OR %1 IN (%2)").arg(num(p), numberList(na));
        for (MissingKind k :
             {MissingKind::DontKnow, MissingKind::Refused, MissingKind::NotApplicable}) {
            const QList<qint64> list = codes(p, k);
            if (!list.isEmpty())
                presented += QStringLiteral(" WHEN %1 IN (%2) THEN '%3'")
                                 .arg(num(p), numberList(list), missingKindName(k));
        }
        const QList<qint64> valid = codesWhere(p, false);
        QStringList ok;
        if (!valid.isEmpty())
            ok.append(QStringLiteral("%1 IN (%2)").arg(num(p), numberList(valid)));
        if (it.type != ItemType::Single) {
            QString inDomain = QStringLiteral("%1 IS NOT NULL").arg(num(p));
            if (it.type == ItemType::Integer)
                inDomain +=
                    QStringLiteral(" AND ABS(%1) < 9e15 AND %1 = CAST(%1 AS BIGINT)").arg(num(p));
            if (it.range)
                inDomain += QStringLiteral(" AND %1 >= %2 AND %1 <= %3")
                                .arg(num(p), it.range->first.text, it.range->second.text);
            ok.append(QLatin1Char('(') + inDomain + QLatin1Char(')'));
        }
        if (!ok.isEmpty())
            presented +=
                QStringLiteral(" WHEN %1 THEN 'answered'").arg(ok.join(QStringLiteral(" OR ")));
    } else if (it.type == ItemType::Date) {
        presented += QStringLiteral(" WHEN %1 THEN 'answered'").arg(isDate(c));
    }
    presented += it.type == ItemType::Text ? QStringLiteral(" ELSE 'answered'")
                                           : QStringLiteral(" ELSE 'invalid'");
    return QStringLiteral("CASE WHEN %1 = 0 THEN (CASE WHEN %2 THEN 'legitimate_skip' ELSE "
                          "'routing_violation' END) %3 END")
        .arg(pres(p), legit, presented);
}

} // namespace

SqlExport exportSql(const CompiledRouting& routing, const QString& tableName) {
    SqlExport out;
    const QString table = quoteId(tableName.isEmpty() ? QStringLiteral("responses") : tableName);
    const int count = routing.itemCount();
    for (int q = 0; q < count; ++q)
        for (const CompiledRouting::CompiledRule& rule : routing.item(q).rules)
            if (rule.usable && rule.target <= q) {
                out.error = QStringLiteral("item '%1' has a goto back to '%2' (a loop): the SQL "
                                           "replay needs forward routing")
                                .arg(routing.index().at(q).item->name,
                                     routing.index().at(rule.target).item->name);
                return out;
            }
    Writer w(routing);
    w.skipCode = routing.instrument().settings.legitimateSkipCode;
    QStringList sql;
    sql.append(
        QStringLiteral("-- Routebook data check in SQL: %1 %2.\n-- Input: table %3, one text "
                       "column per variable. Output: the last SELECT.")
            .arg(commentText(routing.instrument().title), commentText(routing.instrument().version),
                 table));
    QStringList extra;
    for (int p = 0; p < count; ++p) {
        extra.append(QStringLiteral("0 AS %1, 0 AS %2").arg(w.reach(p), w.pres(p)));
        if (w.numeric(p))
            extra.append(QStringLiteral("CAST(NULL AS DOUBLE PRECISION) AS %1").arg(w.num(p)));
    }
    sql.append(QStringLiteral("DROP TABLE IF EXISTS rb_work;"));
    sql.append(QStringLiteral("CREATE TABLE rb_work AS SELECT t.*, %1 FROM %2 t;")
                   .arg(extra.join(QStringLiteral(", ")), table));
    for (int p = 0; p < count; ++p)
        if (w.numeric(p))
            sql.append(QStringLiteral("UPDATE rb_work SET %1 = CASE WHEN %2 THEN CAST(%3 AS DOUBLE "
                                      "PRECISION) END;")
                           .arg(w.num(p), isNumber(w.column(p)), w.column(p)));
    for (int p = 0; p < count; ++p) {
        // Reached: the first item, or filtered out just before, or left for p by a presented item.
        QStringList ways;
        if (p == 0)
            ways.append(QStringLiteral("1"));
        else
            ways.append(QStringLiteral("%1 * (1 - %2)").arg(w.reach(p - 1), w.pres(p - 1)));
        for (int q = 0; q < p; ++q)
            if (const QString g = w.goesTo(q, p); !g.isEmpty())
                ways.append(g);
        sql.append(
            QStringLiteral("-- %1\nUPDATE rb_work SET %2 = CASE WHEN (%3) > 0 THEN 1 ELSE 0 END;")
                .arg(commentText(w.item(p).name), w.reach(p), ways.join(QStringLiteral(" + "))));
        QString filters = w.reach(p);
        for (const cond::ExprPtr& f : routing.item(p).filters)
            filters += QStringLiteral(" * ") + w.condition(*f);
        sql.append(QStringLiteral("UPDATE rb_work SET %1 = CASE WHEN (%2) > 0 THEN 1 ELSE 0 END;")
                       .arg(w.pres(p), filters));
    }
    QStringList selects;
    for (int p = 0; p < count; ++p) {
        if (w.item(p).type == ItemType::Statement)
            continue;
        QStringList sums;
        for (const char* k : {"answered", "blank", "dont_know", "refused", "not_applicable",
                              "invalid", "legitimate_skip", "routing_violation"})
            sums.append(QStringLiteral("SUM(CASE WHEN cls = '%1' THEN 1 ELSE 0 END) AS %1")
                            .arg(QLatin1String(k)));
        selects.append(
            QStringLiteral("SELECT %1 AS position, %2 AS item, SUM(pres) AS presented, %3 "
                           "FROM (SELECT %4 AS pres, %5 AS cls FROM rb_work) s%1")
                .arg(p)
                .arg(quoteText(w.item(p).name), sums.join(QStringLiteral(", ")), w.pres(p),
                     w.classOf(p)));
    }
    sql.append(selects.join(QStringLiteral("\nUNION ALL\n")) +
               QStringLiteral("\nORDER BY position;"));
    out.sql = sql.join(QStringLiteral("\n")).toUtf8() + '\n';
    return out;
}

} // namespace rb
