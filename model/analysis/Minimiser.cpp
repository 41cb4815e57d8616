#include "Minimiser.h"

#include <algorithm>
#include <functional>
#include <map>
#include <set>
#include <unordered_map>

namespace rb::analysis {

int Sop::literalCount() const {
    int n = 0;
    for (const SopProduct& p : products)
        n += int(p.literals.size());
    return n;
}

namespace {

using Cube = std::vector<CellSet>; // one set per local variable

constexpr int MaxDistinctChildren = 8;
constexpr std::size_t MaxPrimes = 4000;
constexpr std::size_t MaxTuples = 20000;
constexpr long MaxCoverNodes = 200000;

class Problem {
public:
    Problem(Mdd& mdd, const std::vector<int>& vars) : m_mdd(mdd), m_vars(vars) {
        for (int i = 0; i < int(vars.size()); ++i) {
            m_local[vars[i]] = i;
            m_full.push_back(CellSet::full(mdd.domainSize(vars[i])));
        }
    }

    Cube fullCube() const { return m_full; }
    int literals(const Cube& c) const {
        int n = 0;
        for (std::size_t i = 0; i < c.size(); ++i)
            n += c[i] == m_full[i] ? 0 : 1;
        return n;
    }
    // Questionnaire order: constrained earlier variables first, then cell sets.
    bool before(const Cube& a, const Cube& b) const {
        for (std::size_t i = 0; i < a.size(); ++i) {
            const bool fa = a[i] == m_full[i], fb = b[i] == m_full[i];
            if (fa != fb)
                return !fa;
        }
        return a < b;
    }

    bool cubeImplies(const Cube& cube, int f) {
        std::unordered_map<int, bool> memo;
        return implies(cube, f, memo);
    }

    // Every prime implicant of f, or false when the problem is too large.
    bool primes(int f, std::vector<Cube>& out) {
        if (const auto it = m_primes.find(f); it != m_primes.end()) {
            out = it->second;
            return true;
        }
        if (f == Mdd::False) {
            out.clear();
            return true;
        }
        if (f == Mdd::True) {
            out = {fullCube()};
            return true;
        }
        const int v = m_mdd.var(f);
        const int li = m_local.at(v);
        std::vector<int> children;
        std::vector<CellSet> masks;
        for (int c = 0; c < m_mdd.domainSize(v); ++c) {
            const int child = m_mdd.child(f, c);
            auto it = std::find(children.begin(), children.end(), child);
            if (it == children.end()) {
                children.push_back(child);
                masks.emplace_back();
                it = children.end() - 1;
            }
            masks[it - children.begin()].set(c);
        }
        if (children.size() > MaxDistinctChildren)
            return false;
        std::set<Cube> found;
        for (unsigned subset = 1; subset < (1u << children.size()); ++subset) {
            int g = Mdd::True;
            for (std::size_t d = 0; d < children.size(); ++d)
                if (subset & (1u << d))
                    g = m_mdd.andOp(g, children[d]);
            std::vector<Cube> sub;
            if (!primes(g, sub))
                return false;
            for (Cube q : sub) {
                CellSet s;
                for (std::size_t d = 0; d < children.size(); ++d)
                    if ((subset & (1u << d)) || cubeImplies(q, children[d]))
                        s |= masks[d];
                q[li] = s;
                found.insert(q);
            }
            if (found.size() > MaxPrimes)
                return false;
        }
        out.assign(found.begin(), found.end());
        m_primes.emplace(f, out);
        return true;
    }

    int localOf(int var) const { return m_local.at(var); }
    int varId(int li) const { return m_vars[li]; }
    int size() const { return int(m_vars.size()); }
    int domain(int li) const { return m_mdd.domainSize(m_vars[li]); }
    Mdd& mdd() { return m_mdd; }

private:
    bool implies(const Cube& cube, int f, std::unordered_map<int, bool>& memo) {
        if (f <= Mdd::True)
            return f == Mdd::True;
        if (const auto it = memo.find(f); it != memo.end())
            return it->second;
        const int v = m_mdd.var(f);
        const int li = m_local.at(v);
        bool result = true;
        for (int c = 0; c < m_mdd.domainSize(v) && result; ++c)
            if (cube[li].test(c))
                result = implies(cube, m_mdd.child(f, c), memo);
        memo.emplace(f, result);
        return result;
    }

    Mdd& m_mdd;
    std::vector<int> m_vars;
    std::unordered_map<int, int> m_local;
    Cube m_full;
    std::unordered_map<int, std::vector<Cube>> m_primes;
};

// Exact cover by branch and bound: fewest cubes, then fewest literals.
class Cover {
public:
    Cover(const std::vector<std::vector<int>>& coveredBy, const std::vector<int>& cost, int primes)
        : m_coveredBy(coveredBy), m_cost(cost), m_count(primes, 0) {}

    std::vector<int> solve(bool& exact) {
        std::vector<int> chosen;
        std::vector<int> coverCount(m_coveredBy.size(), 0);
        search(chosen, coverCount, 0);
        exact = m_nodes <= MaxCoverNodes;
        return m_best;
    }

private:
    void search(std::vector<int>& chosen, std::vector<int>& coverCount, int literals) {
        if (++m_nodes > MaxCoverNodes && !m_best.empty())
            return;
        int pick = -1;
        for (std::size_t t = 0; t < m_coveredBy.size(); ++t)
            if (coverCount[t] == 0 &&
                (pick < 0 || m_coveredBy[t].size() < m_coveredBy[pick].size()))
                pick = int(t);
        if (pick < 0) {
            if (m_best.empty() || chosen.size() < m_best.size() ||
                (chosen.size() == m_best.size() && literals < m_bestLiterals)) {
                m_best = chosen;
                m_bestLiterals = literals;
            }
            return;
        }
        for (int p : m_coveredBy[pick]) {
            const std::size_t size = chosen.size() + 1;
            if (!m_best.empty() &&
                (size > m_best.size() ||
                 (size == m_best.size() && literals + m_cost[p] >= m_bestLiterals)))
                continue;
            chosen.push_back(p);
            mark(p, coverCount, +1);
            search(chosen, coverCount, literals + m_cost[p]);
            mark(p, coverCount, -1);
            chosen.pop_back();
        }
    }
    void mark(int p, std::vector<int>& coverCount, int delta) {
        for (std::size_t t = 0; t < m_coveredBy.size(); ++t)
            if (std::find(m_coveredBy[t].begin(), m_coveredBy[t].end(), p) != m_coveredBy[t].end())
                coverCount[t] += delta;
    }

    const std::vector<std::vector<int>>& m_coveredBy;
    const std::vector<int>& m_cost;
    std::vector<int> m_count;
    std::vector<int> m_best;
    int m_bestLiterals = 0;
    long m_nodes = 0;
};

// The on-set as tuples of class representatives (cells that lie in the same
// primes are interchangeable for covering). False when too many.
bool requiredTuples(Problem& pb, int on, const std::vector<Cube>& primes,
                    std::vector<std::vector<int>>& tuples) {
    const int n = pb.size();
    std::vector<std::vector<int>> classOf(n); // class id per cell, per variable
    for (int li = 0; li < n; ++li) {
        std::map<std::vector<bool>, int> classes;
        for (int c = 0; c < pb.domain(li); ++c) {
            std::vector<bool> key;
            for (const Cube& p : primes)
                key.push_back(p[li].test(c));
            classOf[li].push_back(classes.emplace(key, c).first->second);
        }
    }
    // Visit variables in diagram order (ascending ids) so restriction is a walk.
    std::vector<int> order(n);
    for (int i = 0; i < n; ++i)
        order[i] = i;
    std::vector<int> tuple(n, 0);
    std::set<std::vector<int>> seen;
    long steps = 0;
    bool ok = true;
    Mdd& mdd = pb.mdd();
    auto varOf = [&](int f) { return f <= Mdd::True ? -1 : pb.localOf(mdd.var(f)); };
    // Every on-set minterm, kept once per tuple of classes (a class stands for
    // cells that lie in the same primes, so they are covered alike).
    std::function<void(int, int)> walk = [&](int depth, int f) {
        if (!ok || f == Mdd::False)
            return;
        if (++steps > long(MaxTuples) * 50) {
            ok = false;
            return;
        }
        if (depth == n) {
            if (seen.insert(tuple).second)
                tuples.push_back(tuple);
            ok = tuples.size() <= MaxTuples;
            return;
        }
        const int li = order[depth];
        const bool tests = varOf(f) == li;
        for (int c = 0; c < pb.domain(li); ++c) {
            if (!tests && classOf[li][c] != c)
                continue; // f does not look at this variable: one cell per class will do
            tuple[li] = classOf[li][c];
            walk(depth + 1, tests ? mdd.child(f, c) : f);
        }
    };
    std::sort(order.begin(), order.end(), [&](int a, int b) { return pb.varId(a) < pb.varId(b); });
    walk(0, on);
    return ok;
}

std::vector<Cube> heuristicCover(Problem& pb, int on, int upper) {
    std::vector<Cube> paths;
    Mdd& mdd = pb.mdd();
    std::function<void(int, Cube&)> walk = [&](int f, Cube& cube) {
        if (f == Mdd::False)
            return;
        if (f == Mdd::True) {
            paths.push_back(cube);
            return;
        }
        const int v = mdd.var(f), li = pb.localOf(v);
        std::vector<int> children;
        std::vector<CellSet> masks;
        for (int c = 0; c < mdd.domainSize(v); ++c) {
            const int child = mdd.child(f, c);
            auto it = std::find(children.begin(), children.end(), child);
            if (it == children.end()) {
                children.push_back(child);
                masks.emplace_back();
                it = children.end() - 1;
            }
            masks[it - children.begin()].set(c);
        }
        const CellSet saved = cube[li];
        for (std::size_t d = 0; d < children.size(); ++d) {
            cube[li] = masks[d];
            walk(children[d], cube);
        }
        cube[li] = saved;
    };
    Cube start = pb.fullCube();
    walk(on, start);
    const Cube full = pb.fullCube();
    for (Cube& cube : paths) {
        for (int li = 0; li < pb.size(); ++li) {
            const CellSet saved = cube[li];
            cube[li] = full[li];
            if (pb.cubeImplies(cube, upper))
                continue;
            cube[li] = saved;
            for (int c = 0; c < pb.domain(li); ++c) {
                if (cube[li].test(c))
                    continue;
                const CellSet before = cube[li];
                cube[li].set(c);
                if (!pb.cubeImplies(cube, upper))
                    cube[li] = before;
            }
        }
    }
    std::vector<Cube> kept;
    for (std::size_t i = 0; i < paths.size(); ++i) {
        bool absorbed = false;
        for (std::size_t j = 0; j < paths.size() && !absorbed; ++j) {
            if (i == j)
                continue;
            bool subset = true;
            for (int li = 0; li < pb.size() && subset; ++li)
                subset = paths[i][li].isSubsetOf(paths[j][li]);
            absorbed = subset && (paths[i] != paths[j] || j < i);
        }
        if (!absorbed)
            kept.push_back(paths[i]);
    }
    return kept;
}

} // namespace

Sop minimiseSop(Mdd& mdd, int on, int care, const std::vector<int>& vars, int exactLimit) {
    Sop result;
    if (on == Mdd::False)
        return result;
    const int upper = mdd.orOp(on, mdd.notOp(care));
    if (upper == Mdd::True || mdd.implies(care, on)) {
        result.products.push_back({});
        return result;
    }
    Problem pb(mdd, vars);
    std::vector<Cube> chosen;
    std::vector<Cube> primes;
    std::vector<std::vector<int>> tuples;
    bool exact = int(vars.size()) <= exactLimit && pb.primes(upper, primes) &&
                 requiredTuples(pb, on, primes, tuples);
    if (exact) {
        std::sort(primes.begin(), primes.end(),
                  [&](const Cube& a, const Cube& b) { return pb.before(a, b); });
        std::vector<std::vector<int>> coveredBy(tuples.size());
        for (std::size_t t = 0; t < tuples.size(); ++t)
            for (std::size_t p = 0; p < primes.size(); ++p) {
                bool in = true;
                for (int li = 0; li < pb.size() && in; ++li)
                    in = primes[p][li].test(tuples[t][li]);
                if (in)
                    coveredBy[t].push_back(int(p));
            }
        std::vector<int> cost;
        for (const Cube& p : primes)
            cost.push_back(pb.literals(p));
        Cover cover(coveredBy, cost, int(primes.size()));
        bool coverExact = true;
        for (int p : cover.solve(coverExact))
            chosen.push_back(primes[p]);
        exact = coverExact;
        if (chosen.empty())
            chosen = heuristicCover(pb, on, upper);
    } else {
        chosen = heuristicCover(pb, on, upper);
    }
    std::sort(chosen.begin(), chosen.end(),
              [&](const Cube& a, const Cube& b) { return pb.before(a, b); });
    const Cube full = pb.fullCube();
    for (const Cube& cube : chosen) {
        SopProduct product;
        for (int li = 0; li < pb.size(); ++li)
            if (!(cube[li] == full[li]))
                product.literals.push_back({vars[li], cube[li]});
        result.products.push_back(product);
    }
    result.exact = exact;
    return result;
}

} // namespace rb::analysis
