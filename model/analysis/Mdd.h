#pragma once

#include "HugePageAllocator.h"

#include <cstdint>
#include <memory_resource>
#include <optional>
#include <vector>

namespace rb::analysis {

// A reduced, ordered multi-valued decision diagram manager. Each variable has a
// finite domain of cells 0..size-1; a node tests one variable and has one child
// per cell. Nodes are hash-consed in a unique table, so two functions are equal
// exactly when their node ids are equal (the canonical form the analysis relies
// on: equivalent conditions get the same id). Smaller variable ids sit nearer
// the root. Node ids 0 and 1 are the constants false and true.
class Mdd {
public:
    static constexpr int False = 0;
    static constexpr int True = 1;

    Mdd();

    int addVar(int domainSize); // returns the new variable's id
    int varCount() const { return int(m_domains.size()); }
    int domainSize(int var) const { return m_domains.at(var); }

    // The function "var's cell is in `cells`" (cells.size() == domainSize(var)).
    int literal(int var, const std::vector<bool>& cells);
    int literalCell(int var, int cell); // var == cell
    // A node with the given children (reduced: equal children collapse).
    int make(int var, const int* children);

    int andOp(int f, int g) { return apply(OpAnd, f, g); }
    int orOp(int f, int g) { return apply(OpOr, f, g); }
    int diff(int f, int g) { return apply(OpDiff, f, g); } // f and not g
    int notOp(int f) { return apply(OpDiff, True, f); }
    bool implies(int f, int g) { return diff(f, g) == False; }
    bool intersects(int f, int g) { return andOp(f, g) != False; }

    int restrict(int f, int var, int cell); // cofactor f|var=cell
    int exists(int f, int var);             // or of all cofactors on var

    bool isConstant(int f) const { return f <= True; }
    int var(int f) const { return m_nodes[f].var; } // large for constants
    int child(int f, int cell) const { return m_pool[m_nodes[f].offset + cell]; }
    int childOn(int f, int var, int cell) const; // f's cofactor when f tests var, else f

    bool evaluate(int f, const std::vector<int>& cellOfVar) const;
    std::vector<int> support(int f) const; // ascending variable ids
    // One satisfying assignment: cell per variable, -1 where free. Chooses the
    // lowest cell leading to true at every step (deterministic).
    std::optional<std::vector<int>> satOne(int f) const;
    std::size_t nodeCount() const { return m_nodes.size(); }

private:
    enum Op : int { OpAnd = 1, OpOr, OpDiff, OpRestrict, OpExists };
    struct Node {
        int var;
        int offset; // first child in m_pool
    };
    struct CacheEntry {
        int op = 0, a = -1, b = -1, c = -1, result = -1;
    };

    int apply(int op, int f, int g);
    std::optional<int> terminalCase(int op, int f, int g) const;
    std::size_t cacheSlot(int op, int a, int b, int c, int var) const;
    int lookupCache(int op, int a, int b, int c, int var) const;
    void storeCache(int op, int a, int b, int c, int var, int result);
    std::uint64_t hashNode(int var, const int* children) const;
    void growTable(int var);

    std::vector<int> m_domains;
    std::vector<Node, HugePageAllocator<Node>> m_nodes;
    std::vector<int, HugePageAllocator<int>> m_pool;
    // The unique table, one open-addressing table of node ids (-1 empty) per
    // variable: the analysis works on a window of nearby variables at a time,
    // so their small tables stay in the cache where one big table would miss
    // on every probe.
    // The tables come from one arena (a table that grows leaves its old block
    // there): thousands of small blocks, each freed on its own, made releasing
    // a large instrument's analysis walk memory long out of the caches.
    std::pmr::monotonic_buffer_resource m_tableArena;
    struct UniqueTable {
        std::pmr::vector<int> ids;
        std::size_t used = 0;
    };
    std::vector<UniqueTable> m_unique;
    std::vector<CacheEntry, HugePageAllocator<CacheEntry>> m_cache; // lossy, direct mapped
    mutable std::vector<std::uint32_t> m_stamp, m_varStamp;         // visit marks for support()
    mutable std::uint32_t m_generation = 0;
    mutable std::vector<int> m_walk; // support()'s stack, kept for its capacity
};

} // namespace rb::analysis
