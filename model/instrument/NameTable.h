#pragma once

#include <QString>

#include <cstdint>
#include <vector>

namespace rb {

// Names -> small integers, ignoring case the way Routebook's names do
// (QString::toLower()). Built for the lookups every check and analysis makes
// per condition atom: an all-ASCII name is hashed and compared in place, with
// no lower-cased copy, and the table is flat (8 bytes a slot) so that large
// instruments stay in the CPU caches. Names outside ASCII take the slow,
// allocating path, with the same answer.
class NameTable {
public:
    void reserve(qsizetype names);
    // Adds name -> value unless a name equal ignoring case is present; returns
    // the value now held for the name (the earlier one when it was present).
    int insert(const QString& name, int value);
    // The value for the name (any case), or `absent`.
    int value(const QString& name, int absent = -1) const;
    qsizetype size() const { return qsizetype(m_entries.size()); }

    static bool sameName(const QString& a, const QString& b);
    static std::uint32_t hashName(const QString& name);

private:
    struct Slot {
        std::uint32_t hash = 0;
        std::int32_t entry = -1; // index into m_entries; -1 empty
    };
    struct Entry {
        QString name;
        int value;
    };
    // The slot holding the name, or the empty slot where it would go.
    std::size_t find(const QString& name, std::uint32_t hash) const;
    void grow();

    std::vector<Slot> m_slots = std::vector<Slot>(16);
    std::vector<Entry> m_entries;
};

} // namespace rb
