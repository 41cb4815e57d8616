#include "RandomInstrument.h"

#include <QList>
#include <QRandomGenerator>

namespace {

struct Generated {
    QByteArray name;
    QByteArray type;
    QList<int> codes;
};

class Maker {
public:
    explicit Maker(quint32 seed) : m_rng(seed) {}

    QByteArray yaml() {
        const int count = 6 + int(m_rng.bounded(14));
        static const QList<QByteArray> types = {"single",  "single", "multi", "integer",
                                                "decimal", "text",   "date",  "statement",
                                                "single",  "integer"};
        for (int i = 0; i < count; ++i)
            m_items.append({"q" + QByteArray::number(i), types.at(int(m_rng.bounded(10))), {}});
        QByteArray out = "routebook: 1\ninstrument: {title: \"Random\", version: \"1\", "
                         "language: \"en\"}\n";
        if (m_rng.bounded(2))
            out += "settings: {legitimate_skip_code: \"-1\"}\n";
        out += "modules:\n";
        for (int i = 0; i < count; ++i) {
            if (i == 0 || m_rng.bounded(6) == 0) {
                out += "  - name: m" + QByteArray::number(i) + "\n";
                if (i > 0 && m_rng.bounded(3) == 0)
                    out += "    ask_if: '" + condition(i) + "'\n";
                out += "    items:\n";
            }
            out += item(i, count);
        }
        return out;
    }

private:
    int pick(int n) { return int(m_rng.bounded(n)); }

    QByteArray codesYaml(Generated& g) {
        QByteArray out = "        codes:\n";
        const int n = 2 + pick(3);
        for (int c = 1; c <= n; ++c) {
            g.codes.append(c);
            out += "          - {code: " + QByteArray::number(c) + ", label: \"C" +
                   QByteArray::number(c) + "\"}\n";
        }
        static const QList<QByteArray> kinds = {"dont_know", "refused", "not_applicable"};
        for (int k = 0; k < 3; ++k)
            if (pick(2)) {
                const int code = 7 + k;
                g.codes.append(code);
                out += "          - {code: " + QByteArray::number(code) + ", label: \"M" +
                       QByteArray::number(code) + "\", missing: " + kinds.at(k) + "}\n";
            }
        return out;
    }

    QByteArray number() { return QByteArray::number(pick(12)); }

    // An atom reading item `target`.
    QByteArray atom(int target) {
        const Generated& g = m_items.at(target);
        static const QList<QByteArray> ops = {"=", "<>", "<", "<=", ">", ">="};
        const int form = pick(6);
        if (g.type == "statement" || form == 0)
            return (pick(2) ? "asked(" : "answered(") + g.name + ")";
        if (g.type == "multi")
            return g.name + " has " +
                   QByteArray::number(g.codes.isEmpty() ? 1 // a later item: codes not made yet
                                                        : g.codes.at(pick(int(g.codes.size())))) +
                   (pick(4) == 0 ? " or answered(" + g.name + ")" : QByteArray());
        if (g.type == "text" || g.type == "date") {
            static const QList<QByteArray> texts = {"\"fine\"", "\"x y\"", "\"2024-02-29\"",
                                                    "\"b\""};
            return g.name + ' ' + ops.at(pick(6)) + ' ' + texts.at(pick(4));
        }
        if (form == 1)
            return g.name + (pick(2) ? " not in (" : " in (") + number() + ", " + number() + ".." +
                   number() + ")";
        return g.name + ' ' + ops.at(pick(6)) + ' ' + number();
    }

    // A condition over items before `position` (sometimes after it: empty then).
    QByteArray condition(int position) {
        auto target = [&] {
            if (position > 0 && pick(8) != 0)
                return pick(position);
            return pick(int(m_items.size()));
        };
        QByteArray c = atom(target());
        const int more = pick(3);
        for (int k = 0; k < more; ++k)
            c = (pick(3) == 0 ? "not (" + c + ")" : c) + (pick(2) ? " and " : " or ") +
                atom(target());
        return c;
    }

    QByteArray item(int i, int count) {
        Generated& g = m_items[i];
        QByteArray out = "      - name: " + g.name + "\n        text: \"Question " +
                         QByteArray::number(i) + "?\"\n        type: " + g.type + "\n";
        if (g.type == "single" || g.type == "multi")
            out += codesYaml(g);
        if (g.type == "integer" || g.type == "decimal") {
            out += "        range: [0, " + QByteArray::number(5 + pick(20)) + "]\n";
            if (pick(2)) {
                g.codes.append(98);
                out += "        missing:\n          - {code: 98, label: \"DK\", missing: "
                       "dont_know}\n";
            }
        }
        if (i > 0 && pick(3) != 0)
            out += "        ask_if: '" + condition(i) + "'\n";
        if (g.type != "statement" && g.type != "multi" && pick(4) == 0)
            out += "        when_skipped: {value: 0" +
                   (pick(2) ? ", if: '" + condition(i) + "'" : QByteArray()) + "}\n";
        if (pick(3) == 0) {
            out += "        routing:\n";
            const int rules = 1 + pick(2);
            for (int r = 0; r < rules; ++r) {
                QByteArray target;
                const int kind = pick(10);
                if (kind == 0)
                    target = "END";
                else if (kind == 1 && i > 0)
                    target = m_items.at(pick(i)).name; // back: a possible loop
                else
                    target = i + 1 < count ? "q" + QByteArray::number(i + 1 + pick(count - i - 1))
                                           : QByteArray("END");
                out += "          - {" +
                       (r == rules - 1 && pick(3) == 0 ? QByteArray()
                                                       : "if: '" + condition(i + 1) + "', ") +
                       "goto: " + target + "}\n";
            }
        }
        return out;
    }

    QRandomGenerator m_rng;
    QList<Generated> m_items;
};

} // namespace

QByteArray randomInstrumentYaml(quint32 seed) {
    return Maker(seed).yaml();
}
