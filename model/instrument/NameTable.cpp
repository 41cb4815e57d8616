#include "NameTable.h"

namespace rb {

namespace {
bool isAscii(QStringView s) {
    for (const QChar c : s)
        if (c.unicode() >= 0x80)
            return false;
    return true;
}

char16_t foldAscii(char16_t c) {
    return (c >= u'A' && c <= u'Z') ? char16_t(c + (u'a' - u'A')) : c;
}

// FNV-1a over the UTF-16 units of the lower-cased name, then a final mix so
// that names differing in their last digit spread over the low bits the table
// uses (item names are often numbered).
std::uint32_t fnv(QStringView lower, bool fold) {
    std::uint32_t h = 2166136261u;
    for (const QChar c : lower) {
        h ^= fold ? foldAscii(c.unicode()) : c.unicode();
        h *= 16777619u;
    }
    h ^= h >> 16;
    h *= 0x85ebca6bu;
    h ^= h >> 13;
    h *= 0xc2b2ae35u;
    h ^= h >> 16;
    return h;
}
} // namespace

std::uint32_t NameTable::hashName(QStringView name) {
    // ASCII lower-cases unit by unit, so folding in place equals hashing toLower().
    return isAscii(name) ? fnv(name, true) : fnv(name.toString().toLower(), false);
}

bool NameTable::sameName(QStringView a, QStringView b) {
    if (a.size() == b.size()) {
        const QChar* pa = a.constData();
        const QChar* pb = b.constData();
        bool ascii = true;
        for (qsizetype i = 0; i < a.size() && ascii; ++i) {
            const char16_t ca = pa[i].unicode(), cb = pb[i].unicode();
            if (ca >= 0x80 || cb >= 0x80)
                ascii = false;
            else if (foldAscii(ca) != foldAscii(cb))
                return false;
        }
        if (ascii)
            return true;
    } else if (isAscii(a) && isAscii(b)) {
        return false;
    }
    return a.toString().toLower() == b.toString().toLower(); // lengths may change outside ASCII
}

void NameTable::reserve(qsizetype names) {
    m_chars.reserve(std::size_t(names) * 8);
    while (m_slots.size() < std::size_t(names) * 2)
        grow();
}

std::size_t NameTable::find(QStringView name, std::uint32_t hash) const {
    const std::size_t mask = m_slots.size() - 1;
    std::size_t slot = hash & mask;
    while (m_slots[slot].length >= 0) {
        const Slot& s = m_slots[slot];
        if (s.hash == hash && sameName(nameOf(s), name))
            return slot;
        slot = (slot + 1) & mask;
    }
    return slot;
}

void NameTable::grow() {
    std::vector<Slot> bigger(m_slots.size() * 2);
    const std::size_t mask = bigger.size() - 1;
    for (const Slot& s : m_slots) {
        if (s.length < 0)
            continue;
        std::size_t slot = s.hash & mask;
        while (bigger[slot].length >= 0)
            slot = (slot + 1) & mask;
        bigger[slot] = s;
    }
    m_slots.swap(bigger);
}

int NameTable::insert(const QString& name, int value) {
    const std::uint32_t hash = hashName(name);
    std::size_t slot = find(name, hash);
    if (m_slots[slot].length >= 0)
        return m_slots[slot].value;
    if (std::size_t(m_size + 1) * 2 > m_slots.size()) {
        grow();
        slot = find(name, hash);
    }
    m_slots[slot] = {hash, value, std::uint32_t(m_chars.size()), std::int32_t(name.size())};
    m_chars.insert(m_chars.end(), name.utf16(), name.utf16() + name.size());
    ++m_size;
    return value;
}

int NameTable::value(const QString& name, int absent) const {
    const Slot& s = m_slots[find(name, hashName(name))];
    return s.length >= 0 ? s.value : absent;
}

} // namespace rb
