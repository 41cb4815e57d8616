#include "CellSet.h"

#include <algorithm>
#include <bit>

namespace rb::analysis {

void CellSet::set(int cell) {
    const qsizetype w = cell >> 6;
    if (w >= m_words.size())
        m_words.resize(w + 1, 0);
    m_words[w] |= std::uint64_t(1) << (cell & 63);
}

void CellSet::reset(int cell) {
    const qsizetype w = cell >> 6;
    if (w < m_words.size())
        m_words[w] &= ~(std::uint64_t(1) << (cell & 63));
}

int CellSet::count() const {
    int n = 0;
    for (std::uint64_t w : m_words)
        n += std::popcount(w);
    return n;
}

CellSet CellSet::full(int size) {
    CellSet s;
    if (size <= 0)
        return s;
    s.m_words.resize((size + 63) / 64, ~std::uint64_t(0));
    if (const int tail = size & 63)
        s.m_words.back() = (std::uint64_t(1) << tail) - 1;
    return s;
}

bool CellSet::isSubsetOf(const CellSet& o) const {
    for (qsizetype i = 0; i < m_words.size(); ++i)
        if (m_words[i] & ~o.word(i))
            return false;
    return true;
}

CellSet& CellSet::operator|=(const CellSet& o) {
    if (o.m_words.size() > m_words.size())
        m_words.resize(o.m_words.size(), 0);
    for (qsizetype i = 0; i < o.m_words.size(); ++i)
        m_words[i] |= o.m_words[i];
    return *this;
}

int CellSet::compare(const CellSet& o) const {
    const qsizetype n = std::max(m_words.size(), o.m_words.size());
    for (qsizetype i = 0; i < n; ++i) {
        const std::uint64_t a = word(i), b = o.word(i);
        if (a != b)
            return a < b ? -1 : 1;
    }
    return 0;
}

} // namespace rb::analysis
