#include "Fixtures.h"

#include <random>

using namespace Qt::StringLiterals;

namespace reliability {

namespace {

rb::CodeList frequencyList() {
    rb::CodeList list;
    list.name = u"frequency"_s;
    const char* labels[] = {"Never", "Rarely", "Monthly", "Weekly", "Daily"};
    for (int i = 0; i < 5; ++i)
        list.codes.append({i + 1, QString::fromLatin1(labels[i]), rb::MissingKind::None});
    list.codes.append({8, u"Don't know"_s, rb::MissingKind::DontKnow});
    list.codes.append({9, u"Refused"_s, rb::MissingKind::Refused});
    return list;
}

rb::Item gardenItem(int module, int index, int variant) {
    rb::Item item;
    item.name = u"m%1_q%2"_s.arg(module).arg(index);
    item.label = u"Garden task %1.%2"_s.arg(module).arg(index);
    // Long, variant-specific wording: a save rewrites many pages.
    item.text = u"Variant %1: how often do you tend bed %2 of plot %3? "_s.arg(variant)
                    .arg(index)
                    .arg(module)
                    .repeated(4);
    item.instruction = u"Read the options aloud."_s;
    if (index % 3 == 2) {
        item.type = rb::ItemType::Integer;
        item.range = std::make_pair(rb::RangeBound{u"0"_s, 0}, rb::RangeBound{u"99"_s, 99});
        item.whenSkipped =
            rb::WhenSkipped{u"0"_s, false, u"m%1_q%2 = 1"_s.arg(module).arg(index - 2)};
    } else {
        item.type = rb::ItemType::Single;
        item.codeListName = u"frequency"_s;
    }
    if (index % 3 == 1)
        item.askIf = u"m%1_q%2 in (2..5)"_s.arg(module).arg(index - 1);
    if (index % 7 == 0 && index > 0)
        item.routing.append(
            {u"m%1_q%2 = 1"_s.arg(module).arg(index), u"m%1_q%2"_s.arg(module).arg(index + 2)});
    item.notes = u"note %1"_s.arg(variant);
    return item;
}

} // namespace

rb::Instrument largeInstrument(int variant, int modules, int itemsPerModule) {
    rb::Instrument instrument;
    instrument.title = u"Allotment Gardening Survey"_s;
    instrument.version = u"%1.0"_s.arg(variant);
    instrument.language = u"en"_s;
    instrument.codeLists.append(frequencyList());
    // Variant 1 has a few more items per module than variant 0.
    const int items = itemsPerModule + (variant % 2) * 5;
    for (int m = 0; m < modules; ++m) {
        rb::Module module;
        module.name = u"plot%1"_s.arg(m);
        module.title = u"Plot %1"_s.arg(m);
        for (int i = 0; i < items; ++i)
            module.items.append(gardenItem(m, i, variant));
        instrument.modules.append(module);
    }
    return instrument;
}

static QByteArray yamlQuoted(const QString& text) {
    QByteArray out = "\"";
    for (QChar c : text) {
        if (c == u'"' || c == u'\\')
            out += '\\';
        out += QString(c).toUtf8();
    }
    return out + '"';
}

QByteArray yamlWithCondition(const QString& askIf) {
    return "routebook: 1\n"
           "instrument: {title: Compost Habits, version: \"1\", language: en}\n"
           "modules:\n"
           "  - name: compost\n"
           "    title: Compost\n"
           "    items:\n"
           "      - name: a\n"
           "        label: Composts at home\n"
           "        text: Do you compost at home?\n"
           "        type: integer\n"
           "        range: [0, 100000]\n"
           "      - name: b\n"
           "        label: Compost bins\n"
           "        text: How many compost bins do you have?\n"
           "        type: integer\n"
           "        range: [0, 20]\n"
           "        ask_if: " +
           yamlQuoted(askIf) + "\n";
}

QByteArray yamlAliasBomb(int nesting) {
    QByteArray out = "routebook: 1\nl0: &l0 [lol]\n";
    for (int level = 1; level <= nesting; ++level) {
        out += "l" + QByteArray::number(level) + ": &l" + QByteArray::number(level) + " [";
        for (int i = 0; i < 10; ++i)
            out += (i ? ", *l" : "*l") + QByteArray::number(level - 1);
        out += "]\n";
    }
    return out;
}

QByteArray yamlDeepFlow(int depth) {
    return "routebook: 1\nmodules: " + QByteArray(depth, '[') + QByteArray(depth, ']') + "\n";
}

QByteArray yamlDeepBlock(int depth) {
    // "- - - x": each "- " opens a block sequence inside the one before.
    return "routebook: 1\nmodules:\n" + QByteArray("- ").repeated(depth) + "x\n";
}

QByteArray yamlHuge(qint64 bytes) {
    const QByteArray head = "routebook: 1\n"
                            "instrument: {title: Pond Survey, version: \"1\", language: en}\n"
                            "modules:\n"
                            "  - name: pond\n"
                            "    title: Pond\n"
                            "    items:\n"
                            "      - name: fish\n"
                            "        label: Fish in the pond\n"
                            "        type: integer\n"
                            "        range: [0, 500]\n"
                            "        text: \"";
    QByteArray padding;
    padding.reserve(bytes);
    while (padding.size() < bytes)
        padding += "How many fish live in the garden pond? ";
    return head + padding + "\"\n";
}

QString deepParentheses(int depth) {
    return QString(depth, u'(') + u"a = 1"_s + QString(depth, u')');
}

QString longCondition(int length) {
    QString out = u"a = 0"_s;
    out.reserve(length + 32);
    for (int value = 1; out.size() < length; ++value)
        out += u" or a = "_s + QString::number(value % 100000);
    return out;
}

QByteArray pseudoRandomBytes(int size, quint32 seed) {
    std::mt19937 generator(seed);
    QByteArray out(size, '\0');
    for (char& c : out)
        c = char(generator() & 0xff);
    return out;
}

} // namespace reliability
