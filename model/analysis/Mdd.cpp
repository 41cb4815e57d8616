#include "Mdd.h"

#include <QVarLengthArray>

#include <algorithm>
#include <climits>

namespace rb::analysis {

namespace {
constexpr int ConstantVar = INT_MAX;
// The operation cache grows with the diagram (small instruments stay cheap to
// set up; large ones get up to 4M entries).
constexpr std::size_t InitialCache = std::size_t(1) << 12;
constexpr std::size_t MaxCache = std::size_t(1) << 22;

std::uint64_t mix(std::uint64_t h, std::uint64_t v) {
    h ^= v + 0x9e3779b97f4a7c15ULL + (h << 6) + (h >> 2);
    return h;
}
} // namespace

Mdd::Mdd() {
    m_nodes.push_back({ConstantVar, 0}); // False
    m_nodes.push_back({ConstantVar, 0}); // True
    m_table.assign(1 << 12, -1);
    m_cache.resize(InitialCache);
}

int Mdd::addVar(int domainSize) {
    m_domains.push_back(domainSize);
    return int(m_domains.size()) - 1;
}

std::uint64_t Mdd::hashNode(int var, const int* children) const {
    std::uint64_t h = std::uint64_t(var) * 0x100000001b3ULL;
    for (int i = 0; i < m_domains[var]; ++i)
        h = mix(h, std::uint64_t(children[i]));
    return h;
}

void Mdd::growTable() {
    std::vector<int> table(m_table.size() * 2, -1);
    const std::size_t mask = table.size() - 1;
    for (std::size_t id = 2; id < m_nodes.size(); ++id) {
        std::size_t slot = hashNode(m_nodes[id].var, &m_pool[m_nodes[id].offset]) & mask;
        while (table[slot] >= 0)
            slot = (slot + 1) & mask;
        table[slot] = int(id);
    }
    m_table.swap(table);
}

int Mdd::make(int var, const int* children) {
    const int size = m_domains[var];
    bool allSame = true;
    for (int i = 1; i < size && allSame; ++i)
        allSame = children[i] == children[0];
    if (allSame)
        return children[0];
    if ((m_tableUsed + 1) * 2 > m_table.size())
        growTable();
    const std::size_t mask = m_table.size() - 1;
    std::size_t slot = hashNode(var, children) & mask;
    while (m_table[slot] >= 0) {
        const Node& node = m_nodes[m_table[slot]];
        if (node.var == var && std::equal(children, children + size, &m_pool[node.offset]))
            return m_table[slot];
        slot = (slot + 1) & mask;
    }
    const int id = int(m_nodes.size());
    if (m_nodes.size() > 2 * m_cache.size() && m_cache.size() < MaxCache)
        m_cache.assign(m_cache.size() * 4, CacheEntry{}); // lossy: dropping entries is safe
    m_nodes.push_back({var, int(m_pool.size())});
    m_pool.insert(m_pool.end(), children, children + size);
    m_table[slot] = id;
    ++m_tableUsed;
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

int Mdd::lookupCache(int op, int a, int b, int c) const {
    const std::size_t slot =
        mix(mix(mix(std::uint64_t(op), std::uint64_t(a)), std::uint64_t(b)), std::uint64_t(c)) &
        (m_cache.size() - 1);
    const CacheEntry& e = m_cache[slot];
    return (e.op == op && e.a == a && e.b == b && e.c == c) ? e.result : -1;
}

void Mdd::storeCache(int op, int a, int b, int c, int result) {
    const std::size_t slot =
        mix(mix(mix(std::uint64_t(op), std::uint64_t(a)), std::uint64_t(b)), std::uint64_t(c)) &
        (m_cache.size() - 1);
    m_cache[slot] = {op, a, b, c, result};
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
    if (const int cached = lookupCache(op, f, g, 0); cached >= 0)
        return cached;
    const int v = std::min(m_nodes[f].var, m_nodes[g].var);
    QVarLengthArray<int, 16> children(m_domains[v]);
    for (int i = 0; i < m_domains[v]; ++i)
        children[i] = apply(op, childOn(f, v, i), childOn(g, v, i));
    const int result = make(v, children.data());
    storeCache(op, f, g, 0, result);
    return result;
}

int Mdd::restrict(int f, int v, int cell) {
    if (isConstant(f) || m_nodes[f].var > v)
        return f;
    if (m_nodes[f].var == v)
        return child(f, cell);
    if (const int cached = lookupCache(OpRestrict, f, v, cell); cached >= 0)
        return cached;
    const int fv = m_nodes[f].var;
    QVarLengthArray<int, 16> children(m_domains[fv]);
    for (int i = 0; i < m_domains[fv]; ++i)
        children[i] = restrict(child(f, i), v, cell);
    const int result = make(fv, children.data());
    storeCache(OpRestrict, f, v, cell, result);
    return result;
}

int Mdd::exists(int f, int v) {
    if (isConstant(f) || m_nodes[f].var > v)
        return f;
    if (const int cached = lookupCache(OpExists, f, v, 0); cached >= 0)
        return cached;
    int result = False;
    const int fv = m_nodes[f].var;
    if (fv == v) {
        for (int i = 0; i < m_domains[v] && result != True; ++i)
            result = orOp(result, child(f, i));
    } else {
        QVarLengthArray<int, 16> children(m_domains[fv]);
        for (int i = 0; i < m_domains[fv]; ++i)
            children[i] = exists(child(f, i), v);
        result = make(fv, children.data());
    }
    storeCache(OpExists, f, v, 0, result);
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
    std::vector<int> vars, stack{f};
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
