#include "DdiDictionary.h"

#include "TextEscape.h"

#include <QSet>

using namespace Qt::StringLiterals;

namespace rb {

namespace {

QString x(const QString& text) {
    return xmlEscaped(text);
}

QString questionId(const DictionaryEntry& e) {
    return u"Q_"_s + e.anchor;
}

class DdiWriter {
public:
    explicit DdiWriter(const Dictionary& d) : m_d(d) {}

    QString document() {
        m_out += u"<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"_s
                 u"<codeBook xmlns=\"ddi:codebook:2_5\" "_s
                 u"xmlns:xsi=\"http://www.w3.org/2001/XMLSchema-instance\" "_s
                 u"xsi:schemaLocation=\"ddi:codebook:2_5 "_s
                 u"http://www.ddialliance.org/Specification/DDI-Codebook/2.5/XMLSchema/"_s
                 u"codebook.xsd\" version=\"2.5\" ID=\"CB\""_s;
        if (!m_d.language.isEmpty())
            m_out += u" xml:lang=\""_s + x(m_d.language) + u'"';
        m_out += u">\n"_s;
        study();
        m_out += u"  <dataDscr>\n"_s;
        groups();
        for (const DictionaryEntry& e : m_d.entries)
            if (e.hasVariable)
                variable(e);
        m_out += u"  </dataDscr>\n</codeBook>\n"_s;
        return m_out;
    }

private:
    void study() {
        const QString date = m_d.generated.toString(Qt::ISODate);
        m_out += u"  <stdyDscr>\n    <citation>\n      <titlStmt>\n        <titl>"_s +
                 x(m_d.title.isEmpty() ? u"(untitled)"_s : m_d.title) +
                 u"</titl>\n      </titlStmt>\n      <prodStmt>\n        <prodDate date=\""_s +
                 date + u"\">"_s + date +
                 u"</prodDate>\n        <software>Routebook</software>\n      </prodStmt>\n"_s;
        if (!m_d.version.isEmpty())
            m_out += u"      <verStmt>\n        <version>"_s + x(m_d.version) +
                     u"</version>\n      </verStmt>\n"_s;
        m_out += u"    </citation>\n  </stdyDscr>\n"_s;
    }

    // One section group per module, one multiple-response group per multi item.
    void groups() {
        for (int m = 0; m < m_d.modules.size(); ++m) {
            const DictionaryModule& mod = m_d.modules.at(m);
            QStringList ids;
            for (int i : mod.entries)
                if (m_d.entries.at(i).hasVariable)
                    ids.append(m_d.entries.at(i).anchor);
            m_out += u"    <varGrp ID=\"G_M"_s + QString::number(m + 1) +
                     u"\" type=\"section\" name=\""_s + x(mod.name) + u'"';
            if (!ids.isEmpty())
                m_out += u" var=\""_s + ids.join(u' ') + u'"';
            m_out += u">\n      <labl>"_s + x(mod.title.isEmpty() ? mod.name : mod.title) +
                     u"</labl>\n"_s;
            if (!mod.askIf.isEmpty())
                m_out +=
                    u"      <txt>Module filter (as written): "_s + x(mod.askIf) + u"</txt>\n"_s;
            m_out += u"    </varGrp>\n"_s;
        }
        multiGroups();
    }

    void multiGroups() {
        QSet<int> done;
        for (const DictionaryEntry& e : m_d.entries) {
            if (e.type != ItemType::Multi || done.contains(e.position))
                continue;
            done.insert(e.position);
            QStringList ids;
            for (const DictionaryEntry& v : m_d.entries)
                if (v.position == e.position)
                    ids.append(v.anchor);
            m_out += u"    <varGrp ID=\"G_I"_s + QString::number(e.position) +
                     u"\" type=\"multipleResp\" name=\""_s + x(e.item) + u"\" var=\""_s +
                     ids.join(u' ') + u"\">\n      <labl>"_s + x(itemLabel(e)) +
                     u"</labl>\n    </varGrp>\n"_s;
        }
    }

    QString itemLabel(const DictionaryEntry& e) const {
        // The multi variables carry "item label: code label"; the group wants the item's own.
        if (e.indicatorOf && e.label.endsWith(u": "_s + e.indicatorOf->label))
            return e.label.left(e.label.size() - e.indicatorOf->label.size() - 2);
        return e.label;
    }

    static bool numeric(const DictionaryEntry& e) {
        return e.type != ItemType::Text && e.type != ItemType::Date;
    }

    void variable(const DictionaryEntry& e) {
        const bool decimal = e.type == ItemType::Decimal;
        const QString representation = e.type == ItemType::Single || e.type == ItemType::Multi
                                           ? u"code"_s
                                       : e.type == ItemType::Text ? u"text"_s
                                       : e.type == ItemType::Date ? u"datetime"_s
                                                                  : u"numeric"_s;
        m_out += u"    <var ID=\""_s + e.anchor + u"\" name=\""_s + x(e.variable) +
                 u"\" intrvl=\""_s + (decimal ? u"contin"_s : u"discrete"_s) +
                 u"\" representationType=\""_s + representation + u"\">\n"_s;
        if (!e.label.isEmpty())
            m_out += u"      <labl>"_s + x(e.label) + u"</labl>\n"_s;
        question(e);
        range(e);
        universe(e);
        categories(e);
        format(e);
        notes(e);
        m_out += u"    </var>\n"_s;
    }

    void question(const DictionaryEntry& e) {
        m_out += u"      <qstn ID=\""_s + questionId(e) + u"\" seqNo=\""_s +
                 QString::number(e.position) + u"\">\n"_s;
        if (!e.text.isEmpty())
            m_out += u"        <qstnLit>"_s + x(e.text) + u"</qstnLit>\n"_s;
        for (const DictionaryRoute& r : e.routing) {
            m_out += u"        <forward"_s;
            if (r.targetEntry >= 0 && m_d.entries.at(r.targetEntry).hasVariable)
                m_out += u" qstn=\""_s + questionId(m_d.entries.at(r.targetEntry)) + u'"';
            m_out += u'>' + x(routeWords(r)) + u"</forward>\n"_s;
        }
        if (!e.instruction.isEmpty())
            m_out += u"        <ivuInstr>"_s + x(e.instruction) + u"</ivuInstr>\n"_s;
        m_out += u"      </qstn>\n"_s;
    }

    void range(const DictionaryEntry& e) {
        if (!e.rangeMin && !e.rangeMax)
            return;
        m_out += u"      <valrng>\n        <range UNITS=\""_s +
                 (e.type == ItemType::Decimal ? u"REAL"_s : u"INT"_s) + u'"';
        if (e.rangeMin)
            m_out += u" min=\""_s + x(*e.rangeMin) + u'"';
        if (e.rangeMax)
            m_out += u" max=\""_s + x(*e.rangeMax) + u'"';
        m_out += u"/>\n      </valrng>\n"_s;
    }

    void universe(const DictionaryEntry& e) {
        QString text;
        switch (e.asked) {
        case ItemUniverse::Asked::Always:
            text = u"Asked of everyone."_s;
            break;
        case ItemUniverse::Asked::Never:
            text = u"Never asked: no respondent reaches this item."_s;
            break;
        case ItemUniverse::Asked::Conditional:
            text = u"CONDITIONAL: "_s + e.plain + u". Condition: "_s + e.askedIf;
            break;
        }
        m_out += u"      <universe clusion=\"I\">"_s + x(text) + u"</universe>\n"_s;
    }

    void categories(const DictionaryEntry& e) {
        for (const DictionaryCode& c : e.codes) {
            m_out += u"      <catgry"_s;
            if (c.missing != MissingKind::None)
                m_out += u" missing=\"Y\" missType=\""_s + missingKindName(c.missing) + u'"';
            m_out += u"><catValu>"_s + QString::number(c.code) + u"</catValu><labl>"_s +
                     x(c.label) + u"</labl></catgry>\n"_s;
        }
        // Respondents outside the universe hold the legitimate-skip code: say so
        // as a missing category, unless it is blank (no value to describe).
        if (e.asked != ItemUniverse::Asked::Always && !m_d.legitimateSkipCode.isEmpty())
            m_out += u"      <catgry missing=\"Y\" missType=\"legitimate_skip\"><catValu>"_s +
                     x(m_d.legitimateSkipCode) +
                     u"</catValu><labl>Not asked (legitimate skip)</labl></catgry>\n"_s;
    }

    void format(const DictionaryEntry& e) {
        if (e.type == ItemType::Date)
            m_out += u"      <varFormat type=\"character\" schema=\"ISO\" "_s
                     u"formatname=\"YYYY-MM-DD\" category=\"date\">ISO 8601 date</varFormat>\n"_s;
        else
            m_out += u"      <varFormat type=\""_s + (numeric(e) ? u"numeric"_s : u"character"_s) +
                     u"\"/>\n"_s;
    }

    void notes(const DictionaryEntry& e) {
        m_out += u"      <notes type=\"not-asked\">"_s + x(e.notPresented) + u"</notes>\n"_s;
        if (e.implied)
            m_out += u"      <notes type=\"implied-value\">"_s + x(impliedWords(*e.implied)) +
                     u"</notes>\n"_s;
        if (!e.notes.isEmpty())
            m_out += u"      <notes>"_s + x(e.notes) + u"</notes>\n"_s;
    }

    const Dictionary& m_d;
    QString m_out;
};

} // namespace

QByteArray exportDdiDictionary(const Dictionary& dictionary) {
    return DdiWriter(dictionary).document().toUtf8();
}

} // namespace rb
