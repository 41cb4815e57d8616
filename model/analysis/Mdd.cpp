#include "Mdd.h"

#include <QVarLengthArray>

#include <algorithm>
#include <climits>

namespace rb::analysis {

namespace {
constexpr int ConstantVar = INT_MAX;
// The operation cache grows with the diagram (small instruments stay cheap to
// set up) up to 64K entries, 1.25 MB: one that fits in the processor's
// second-level cache answered faster than a larger one that hit more often
// (measured at 50,000 items: 241-267 ms with up to 4M entries, 225-237 ms with
// 32K-128K; bench_analysis).
constexpr std::size_t InitialCache = std::size_t(1) << 12;
constexpr std::size_t MaxCache = std::size_t(1) << 16;
constexpr std::size_t kCacheBank = 64;

std::uint64_t mix(std::uint64_t h, std::uint64_t v) {
    h ^= v + 0x9e3779b97f4a7c15ULL + (h << 6) + (h >> 2);
    return h;
}
} // namespace

Mdd::Mdd() {
    m_nodes.push_back({ConstantVar, 0}); // False
    m_nodes.push_back({ConstantVar, 0}); // True
    m_cache.resize(InitialCache);
}

int Mdd::addVar(int domainSize) {
    m_domains.push_back(domainSize);
    m_unique.push_back({std::pmr::vector<int>(4, -1, &m_tableArena), 0});
    return int(m_domains.size()) - 1;
}

std::uint64_t Mdd::hashNode(int var, const int* children) const {
    std::uint64_t h = std::uint64_t(var) * 0x100000001b3ULL;
    for (int i = 0; i < m_domains[var]; ++i)
        h = mix(h, std::uint64_t(children[i]));
    return h;
}

void Mdd::growTable(int var) {
    UniqueTable& unique = m_unique[var];
    std::pmr::vector<int> table(unique.ids.size() * 2, -1, &m_tableArena);
    const std::size_t mask = table.size() - 1;
    for (int id : unique.ids) {
        if (id < 0)
            continue;
        std::size_t slot = hashNode(var, &m_pool[m_nodes[id].offset]) & mask;
        while (table[slot] >= 0)
            slot = (slot + 1) & mask;
        table[slot] = id;
    }
    unique.ids.swap(table);
}

int Mdd::make(int var, const int* children) {
    const int size = m_domains[var];
    bool allSame = true;
    for (int i = 1; i < size && allSame; ++i)
        allSame = children[i] == children[0];
    if (allSame)
        return children[0];
    if ((m_unique[var].used + 1) * 2 > m_unique[var].ids.size())
        growTable(var);
    std::pmr::vector<int>& table = m_unique[var].ids;
    const std::size_t mask = table.size() - 1;
    std::size_t slot = hashNode(var, children) & mask;
    while (table[slot] >= 0) {
        const Node& node = m_nodes[table[slot]];
        if (std::equal(children, children + size, &m_pool[node.offset]))
            return table[slot];
        slot = (slot + 1) & mask;
    }
    const int id = int(m_nodes.size());
    if (m_nodes.size() > 2 * m_cache.size() && m_cache.size() < MaxCache)
        m_cache.assign(m_cache.size() * 4, CacheEntry{}); // lossy: dropping entries is safe
    m_nodes.push_back({var, int(m_pool.size())});
    m_pool.insert(m_pool.end(), children, children + size);
    table[slot] = id;
    ++m_unique[var].used;
    return id;
}

int Mdd::literal(int var, const std::vector<bool>& cells) {
    QVarLengthArray<int, 16> children(m_domains[var]);
    for (int i = 0; i < m_domains[var]; ++i)
        children[i] = cells[i] ? True : False;
    return make(var, children.data());
}

int Mdd::literalCell(int var, int cell) {
    std::vector<bool> cells(m_domains[var], false);
    cells[cell] = true;
    return literal(var, cells);
}

int Mdd::childOn(int f, int v, int cell) const {
    return m_nodes[f].var == v ? child(f, cell) : f;
}

// Entries whose top variable is the same share a bank of kCacheBank slots: the
// analysis works on a window of nearby variables at a time, whose banks then
// stay in the processor's cache where slots spread over the whole table would
// miss on nearly every lookup.
std::size_t Mdd::cacheSlot(int op, int a, int b, int c, int var) const {
    const std::uint64_t h =
        mix(mix(mix(std::uint64_t(op), std::uint64_t(a)), std::uint64_t(b)), std::uint64_t(c));
    return (std::size_t(var) * kCacheBank + (h & (kCacheBank - 1))) & (m_cache.size() - 1);
}

int Mdd::lookupCache(int op, int a, int b, int c, int var) const {
    const CacheEntry& e = m_cache[cacheSlot(op, a, b, c, var)];
    return (e.op == op && e.a == a && e.b == b && e.c == c) ? e.result : -1;
}

void Mdd::storeCache(int op, int a, int b, int c, int var, int result) {
    m_cache[cacheSlot(op, a, b, c, var)] = {op, a, b, c, result};
}

std::optional<int> Mdd::terminalCase(int op, int f, int g) const {
    switch (op) {
    case OpAnd:
        if (f == False || g == False)
            return False;
        if (f == True)
            return g;
        if (g == True || f == g)
            return f;
        break;
    case OpOr:
        if (f == True || g == True)
            return True;
        if (f == False)
            return g;
        if (g == False || f == g)
            return f;
        break;
    case OpDiff:
        if (f == False || g == True || f == g)
            return False;
        if (g == False)
            return f;
        if (f == True && g == False)
            return True;
        break;
    default:
        break;
    }
    return std::nullopt;
}

int Mdd::apply(int op, int f, int g) {
    if (const std::optional<int> t = terminalCase(op, f, g))
        return *t;
    if (op != OpDiff && f > g)
        std::swap(f, g); // and/or commute: one cache entry
    const int v = std::min(m_nodes[f].var, m_nodes[g].var);
    if (const int cached = lookupCache(op, f, g, 0, v); cached >= 0)
        return cached;
    QVarLengthArray<int, 16> children(m_domains[v]);
    for (int i = 0; i < m_domains[v]; ++i)
        children[i] = apply(op, childOn(f, v, i), childOn(g, v, i));
    const int result = make(v, children.data());
    storeCache(op, f, g, 0, v, result);
    return result;
}

int Mdd::restrict(int f, int v, int cell) {
    if (isConstant(f) || m_nodes[f].var > v)
        return f;
    if (m_nodes[f].var == v)
        return child(f, cell);
    const int fv = m_nodes[f].var;
    if (const int cached = lookupCache(OpRestrict, f, v, cell, fv); cached >= 0)
        return cached;
    QVarLengthArray<int, 16> children(m_domains[fv]);
    for (int i = 0; i < m_domains[fv]; ++i)
        children[i] = restrict(child(f, i), v, cell);
    const int result = make(fv, children.data());
    storeCache(OpRestrict, f, v, cell, fv, result);
    return result;
}

int Mdd::exists(int f, int v) {
    if (isConstant(f) || m_nodes[f].var > v)
        return f;
    const int fv = m_nodes[f].var;
    if (const int cached = lookupCache(OpExists, f, v, 0, fv); cached >= 0)
        return cached;
    int result = False;
    if (fv == v) {
        for (int i = 0; i < m_domains[v] && result != True; ++i)
            result = orOp(result, child(f, i));
    } else {
        QVarLengthArray<int, 16> children(m_domains[fv]);
        for (int i = 0; i < m_domains[fv]; ++i)
            children[i] = exists(child(f, i), v);
        result = make(fv, children.data());
    }
    storeCache(OpExists, f, v, 0, fv, result);
    return result;
}

bool Mdd::evaluate(int f, const std::vector<int>& cellOfVar) const {
    while (!isConstant(f))
        f = child(f, cellOfVar.at(m_nodes[f].var));
    return f == True;
}

std::vector<int> Mdd::support(int f) const {
    // Generation stamps instead of a set: support is asked per item of a large
    // instrument and must cost the size of f, not of the whole manager.
    if (m_stamp.size() < m_nodes.size())
        m_stamp.resize(m_nodes.size() * 2, 0);
    if (m_varStamp.size() < m_domains.size())
        m_varStamp.resize(m_domains.size() * 2 + 1, 0);
    const std::uint32_t generation = ++m_generation;
    // The walk's stack is kept between calls (support is asked some ten times
    // per item): a fresh one cost its allocation and regrowth every time.
    std::vector<int>& stack = m_walk;
    stack.assign(1, f);
    std::vector<int> vars;
    vars.reserve(8);
    while (!stack.empty()) {
        const int n = stack.back();
        stack.pop_back();
        if (isConstant(n) || m_stamp[n] == generation)
            continue;
        m_stamp[n] = generation;
        const int v = m_nodes[n].var;
        if (m_varStamp[v] != generation) {
            m_varStamp[v] = generation;
            vars.push_back(v);
        }
        for (int i = 0; i < m_domains[v]; ++i)
            stack.push_back(child(n, i));
    }
    std::sort(vars.begin(), vars.end());
    return vars;
}

std::optional<std::vector<int>> Mdd::satOne(int f) const {
    if (f == False)
        return std::nullopt;
    std::vector<int> cells(m_domains.size(), -1);
    while (!isConstant(f)) {
        const int v = m_nodes[f].var;
        for (int i = 0; i < m_domains[v]; ++i) {
            if (child(f, i) != False) {
                cells[v] = i;
                f = child(f, i);
                break;
            }
        }
    }
    return cells;
}

} // namespace rb::analysis
