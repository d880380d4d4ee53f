// Helpers shared by the balance tests: seeded random records (per-group mention counts of a
// record and of its counterfactual), and an exhaustive reference solver that tries every
// action for every record and checks the target with exact integer arithmetic, independent
// of the planner's code.
#pragma once

#include <algorithm>
#include <cstdint>
#include <limits>
#include <random>
#include <vector>

#include "balance/plan.h"
#include "balance/tally.h"

namespace balance_test {

struct Rec {
  std::vector<uint32_t> before, after;
  bool changeable = false;
  bool guarded = false;
};

inline evenhand::balance::Tally tally_of(const std::vector<Rec>& recs, size_t groups,
                                         const std::string& axis = "gender") {
  std::vector<std::string> names;
  const char* base[] = {"female", "male", "neutral", "other"};
  for (size_t g = 0; g < groups; ++g) names.push_back(base[g]);
  auto t = evenhand::balance::Tally::make(axis, names, "sha-test");
  for (const auto& r : recs) t.add(r.before, r.after, r.changeable, r.guarded);
  return t;
}

// Random records. Counts 0..max_count, often 0; counterfactuals mostly a permutation of the
// counts (the swap, for two groups), sometimes with a mention lost, sometimes arbitrary.
inline std::vector<Rec> random_records(std::mt19937_64& rng, size_t n, size_t groups,
                                       uint32_t max_count) {
  std::vector<Rec> out;
  std::uniform_int_distribution<uint32_t> cnt(0, max_count);
  std::uniform_int_distribution<int> pct(0, 99);
  for (size_t i = 0; i < n; ++i) {
    Rec r;
    r.before.resize(groups);
    for (auto& c : r.before) c = pct(rng) < 40 ? 0 : cnt(rng);
    bool any = std::any_of(r.before.begin(), r.before.end(), [](uint32_t c) { return c > 0; });
    int kind = pct(rng);
    if (any && kind < 80) {
      r.changeable = true;
      r.after = r.before;
      if (groups == 2) {
        std::swap(r.after[0], r.after[1]);
      } else {
        std::shuffle(r.after.begin(), r.after.end(), rng);
      }
      int twist = pct(rng);
      if (twist < 15) {
        for (auto& c : r.after)
          if (c > 0) {
            --c;
            break;
          }
      } else if (twist < 30) {
        for (auto& c : r.after) c = cnt(rng);
      }
    } else if (any && kind < 90) {
      r.guarded = true;
    }
    out.push_back(std::move(r));
  }
  return out;
}

// Lead of a record, computed here independently: group index, -1 tie, -2 none.
inline int lead_of(const std::vector<uint32_t>& c) {
  uint32_t best = 0;
  int lead = -2;
  for (size_t g = 0; g < c.size(); ++g) {
    if (c[g] == 0) continue;
    if (c[g] > best) {
      best = c[g];
      lead = static_cast<int>(g);
    } else if (c[g] == best) {
      lead = -1;
    }
  }
  return lead;
}

// A target with integer weights and a rational tolerance tol_num / tol_den.
struct ExactTarget {
  std::vector<size_t> groups;    // group indices in the target
  std::vector<int64_t> weights;  // same order
  int64_t tol_num = 1, tol_den = 50;
  evenhand::balance::Basis basis = evenhand::balance::Basis::mentions;
  bool flip = true, add = true, drop = false;
};

// The contribution of record r under action a (0 keep, 1 flip, 2 add, 3 drop) to the
// per-target-group totals.
inline void contribution(const Rec& r, int a, const ExactTarget& t, std::vector<int64_t>& x,
                         int sign) {
  auto add_counts = [&](const std::vector<uint32_t>& c) {
    if (t.basis == evenhand::balance::Basis::mentions) {
      for (size_t i = 0; i < t.groups.size(); ++i) x[i] += sign * int64_t(c[t.groups[i]]);
    } else {
      int lead = lead_of(c);
      for (size_t i = 0; i < t.groups.size(); ++i)
        if (lead == static_cast<int>(t.groups[i])) x[i] += sign;
    }
  };
  if (a == 0 || a == 2) add_counts(r.before);
  if (a == 1 || a == 2) add_counts(r.after);
}

// The target is reached: some mass, and |x_i / T - w_i / W| <= tol for every target group,
// checked as |x_i W - w_i T| * tol_den <= tol_num * T * W.
inline bool reached(const std::vector<int64_t>& x, const ExactTarget& t) {
  int64_t T = 0, W = 0;
  for (int64_t v : x) T += v;
  for (int64_t w : t.weights) W += w;
  if (T < 1) return false;
  for (size_t i = 0; i < x.size(); ++i) {
    int64_t diff = x[i] * W - t.weights[i] * T;
    if (diff < 0) diff = -diff;
    if (diff * t.tol_den > t.tol_num * T * W) return false;
  }
  return true;
}

// The fewest records changed (flip, add or drop each count one) over every assignment of
// actions to records; -1 when no assignment reaches the target. Branches are cut only when
// they already change as many records as the best found, which cannot hide a better one.
inline int exhaustive_min(const std::vector<Rec>& recs, const ExactTarget& t) {
  std::vector<int64_t> x(t.groups.size(), 0);
  for (const auto& r : recs) contribution(r, 0, t, x, +1);
  int best = std::numeric_limits<int>::max();
  auto rec = [&](auto&& self, size_t i, int cost) -> void {
    if (cost >= best) return;
    if (i == recs.size()) {
      if (reached(x, t)) best = cost;
      return;
    }
    self(self, i + 1, cost);  // keep
    const Rec& r = recs[i];
    for (int a = 1; a <= 3; ++a) {
      if (a == 1 && !(t.flip && r.changeable)) continue;
      if (a == 2 && !(t.add && r.changeable)) continue;
      if (a == 3 && !t.drop) continue;
      contribution(r, 0, t, x, -1);
      contribution(r, a, t, x, +1);
      self(self, i + 1, cost + 1);
      contribution(r, a, t, x, -1);
      contribution(r, 0, t, x, +1);
    }
  };
  rec(rec, 0, 0);
  return best == std::numeric_limits<int>::max() ? -1 : best;
}

inline evenhand::balance::PlanOptions options_of(const ExactTarget& t,
                                                 const evenhand::balance::Tally& tally) {
  evenhand::balance::PlanOptions o;
  for (size_t i = 0; i < t.groups.size(); ++i)
    o.target.push_back({tally.groups[t.groups[i]], static_cast<double>(t.weights[i])});
  o.basis = t.basis;
  o.tolerance = static_cast<double>(t.tol_num) / static_cast<double>(t.tol_den);
  o.allow_flip = t.flip;
  o.allow_add = t.add;
  o.allow_drop = t.drop;
  return o;
}

// Applies a plan's counts to the records themselves: in each signature, the first records
// get the flips, the next ones the adds, then the drops. Returns the exact totals.
inline std::vector<int64_t> apply_counts(const std::vector<Rec>& recs,
                                         const evenhand::balance::Plan& plan,
                                         const ExactTarget& t) {
  std::map<evenhand::balance::Signature, evenhand::balance::BinPlan> left = plan.bins;
  std::vector<int64_t> x(t.groups.size(), 0);
  for (const auto& r : recs) {
    auto sig =
        evenhand::balance::make_signature(r.before, r.after, r.changeable, plan.groups.size());
    int a = 0;
    auto it = left.find(sig);
    if (it != left.end()) {
      auto& b = it->second;
      if (b.flip) {
        --b.flip;
        a = 1;
      } else if (b.add) {
        --b.add;
        a = 2;
      } else if (b.drop) {
        --b.drop;
        a = 3;
      }
    }
    contribution(r, a, t, x, +1);
  }
  return x;
}

}  // namespace balance_test
