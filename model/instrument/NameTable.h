#pragma once

#include <QString>

#include <cstdint>
#include <vector>

namespace rb {

// Names -> small integers, ignoring case the way Routebook's names do
// (QString::toLower()). Built for the lookups every check and analysis makes
// per condition atom: an all-ASCII name is hashed and compared in place, with
// no lower-cased copy. The table is flat: a slot holds the hash, the value and
// where the name's characters sit in one array of all names, so a lookup
// touches one slot and one run of characters (not the caller's strings, which
// lie all over memory in a large instrument). Names outside ASCII take the
// slow, allocating path, with the same answer.
class NameTable {
public:
    void reserve(qsizetype names);
    // Adds name -> value unless a name equal ignoring case is present; returns
    // the value now held for the name (the earlier one when it was present).
    int insert(const QString& name, int value);
    // Asks the memory for the slot `name` hashes to. In a table of tens of
    // thousands of names each slot is a cache miss; a caller inserting names
    // in a loop prefetches a few names ahead, so the misses overlap.
    void prefetch(QStringView name) const {
        __builtin_prefetch(&m_slots[hashName(name) & (m_slots.size() - 1)], 1);
    }
    // Names a caller inserting in a loop prefetches ahead of the one it inserts.
    static constexpr int PrefetchDistance = 8;
    // The value for the name (any case), or `absent`.
    int value(const QString& name, int absent = -1) const;
    qsizetype size() const { return m_size; }

    static bool sameName(QStringView a, QStringView b);
    static std::uint32_t hashName(QStringView name);

private:
    struct Slot {
        std::uint32_t hash = 0;
        std::int32_t value = 0;
        std::uint32_t from = 0;   // the name in m_chars
        std::int32_t length = -1; // -1: empty slot
    };
    QStringView nameOf(const Slot& s) const {
        return QStringView(m_chars.data() + s.from, qsizetype(s.length));
    }
    // The slot holding the name, or the empty slot where it would go.
    std::size_t find(QStringView name, std::uint32_t hash) const;
    void grow();

    std::vector<Slot> m_slots = std::vector<Slot>(16);
    std::vector<char16_t> m_chars; // every name, as given, one after the other
    qsizetype m_size = 0;
};

} // namespace rb
