#pragma once

#include <QVarLengthArray>

#include <compare>
#include <cstdint>

namespace rb::analysis {

// A set of cells of one variable, as 64-bit words. A variable has as many
// cells as its conditions tell values apart (a condition listing 1,000 codes
// gives over 1,000 cells), so there is no fixed limit; the first 256 cells live
// inline because almost every variable has a handful and cubes of them are
// copied a lot by the minimiser. Words past the last one stored read as zero:
// sets compare by content, whatever their storage length.
class CellSet {
public:
    void set(int cell);
    void reset(int cell);
    bool test(int cell) const {
        const qsizetype w = cell >> 6;
        return w < m_words.size() && ((m_words[w] >> (cell & 63)) & 1);
    }
    int count() const;
    static CellSet full(int size);
    bool isSubsetOf(const CellSet& o) const;
    CellSet& operator|=(const CellSet& o);

    bool operator==(const CellSet& o) const { return compare(o) == 0; }
    std::strong_ordering operator<=>(const CellSet& o) const { return compare(o) <=> 0; }

private:
    std::uint64_t word(qsizetype i) const { return i < m_words.size() ? m_words[i] : 0; }
    // Lexicographic on words from the lowest cells up (the order of a plain array of words).
    int compare(const CellSet& o) const;

    QVarLengthArray<std::uint64_t, 4> m_words;
};

} // namespace rb::analysis
