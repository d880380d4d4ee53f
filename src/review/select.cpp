#include "review/select.h"

#include <algorithm>
#include <map>

#include "audit/manifest.h"
#include "base/hash.h"

namespace evenhand::review {

namespace {

bool has(const std::vector<std::string>& list, const std::string& v) {
  return std::find(list.begin(), list.end(), v) != list.end();
}

}  // namespace

bool passes(const ReviewRecord& r, const Filter& f) {
  if (!f.flags.empty()) {
    bool any = false;
    for (const auto& fl : r.flags) any = any || has(f.flags, fl.code) || has(f.flags, "any");
    if (!any) return false;
  }
  if (!f.guards.empty()) {
    if (r.guard.empty() || !(has(f.guards, r.guard) || has(f.guards, "any"))) return false;
  }
  if (f.rules.empty() && f.whys.empty() && f.fields.empty()) return true;
  for (const auto& e : r.edits) {
    if (!f.rules.empty() && !has(f.rules, e.rule)) continue;
    if (!f.whys.empty() && !has(f.whys, e.why)) continue;
    if (!f.fields.empty() && !has(f.fields, e.field)) continue;
    return true;
  }
  return false;
}

std::vector<size_t> stratified_sample(const std::vector<ReviewRecord>& records,
                                      const std::vector<size_t>& candidates, size_t n,
                                      uint64_t seed) {
  if (n >= candidates.size()) return candidates;
  std::map<std::string, size_t> rule_count;
  for (size_t i : candidates)
    for (const auto& e : records[i].edits)
      if (!e.rule.empty()) ++rule_count[e.rule];
  auto stratum = [&](const ReviewRecord& r) {
    std::string best;
    size_t best_n = 0;
    for (const auto& e : r.edits) {
      if (e.rule.empty()) continue;
      size_t c = rule_count[e.rule];
      if (best.empty() || c < best_n || (c == best_n && audit::rule_less(e.rule, best))) {
        best = e.rule;
        best_n = c;
      }
    }
    if (!best.empty()) return best;
    if (!r.guard.empty()) return "guard:" + r.guard;
    if (!r.flags.empty()) return "flag:" + r.flags.front().code;
    return std::string("other");
  };
  struct Strat {
    std::string key;
    std::vector<std::pair<uint64_t, size_t>> items;  // hash, index
  };
  std::map<std::string, size_t> pos;
  std::vector<Strat> strata;
  for (size_t i : candidates) {
    std::string key = stratum(records[i]);
    auto [it, fresh] = pos.emplace(key, strata.size());
    if (fresh) strata.push_back({key, {}});
    std::string id = records[i].input + ":" + std::to_string(records[i].line);
    strata[it->second].items.emplace_back(stable_hash(seed, id), i);
  }
  std::sort(strata.begin(), strata.end(),
            [](const Strat& a, const Strat& b) { return audit::rule_less(a.key, b.key); });
  for (auto& s : strata) std::sort(s.items.begin(), s.items.end());
  std::vector<size_t> out;
  for (size_t round = 0; out.size() < n; ++round) {
    bool any = false;
    for (auto& s : strata) {
      if (round < s.items.size() && out.size() < n) {
        out.push_back(s.items[round].second);
        any = true;
      }
    }
    if (!any) break;
  }
  std::sort(out.begin(), out.end());
  return out;
}

}  // namespace evenhand::review
