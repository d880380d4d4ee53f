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

void StratifiedSampler::count(const ReviewRecord& r) {
  for (const auto& e : r.edits)
    if (!e.rule.empty()) ++rule_count_[e.rule];
}

std::string StratifiedSampler::stratum_of(const ReviewRecord& r) const {
  const std::string* best = nullptr;
  size_t best_n = 0;
  for (const auto& e : r.edits) {
    if (e.rule.empty()) continue;
    auto it = rule_count_.find(e.rule);
    size_t c = it == rule_count_.end() ? 0 : it->second;
    if (!best || c < best_n || (c == best_n && audit::rule_less(e.rule, *best))) {
      best = &e.rule;
      best_n = c;
    }
  }
  if (best) return *best;
  if (!r.guard.empty()) return "guard:" + r.guard;
  if (!r.flags.empty()) return "flag:" + r.flags.front().code;
  return "other";
}

namespace {

bool kept_less(uint64_t ha, uint64_t oa, uint64_t hb, uint64_t ob) {
  return ha < hb || (ha == hb && oa < ob);
}

}  // namespace

void StratifiedSampler::offer(ReviewRecord& r) {
  uint64_t ordinal = offered_++;
  if (n_ == 0) return;
  std::string key = stratum_of(r);
  auto [it, fresh] = pos_.emplace(key, strata_.size());
  if (fresh) strata_.push_back({std::move(key), {}});
  auto& best = strata_[it->second].best;
  uint64_t hash = stable_hash(seed_, r.input + ":" + std::to_string(r.line));
  auto less = [](const Kept& a, const Kept& b) {
    return kept_less(a.hash, a.ordinal, b.hash, b.ordinal);
  };
  if (best.size() == n_) {
    if (!kept_less(hash, ordinal, best.front().hash, best.front().ordinal)) return;
    std::pop_heap(best.begin(), best.end(), less);
    best.pop_back();
  }
  best.push_back({hash, ordinal, std::move(r)});
  std::push_heap(best.begin(), best.end(), less);
}

std::vector<ReviewRecord> StratifiedSampler::take() {
  // Strata sorted as they were first seen, then by rule_less: keys rule_less holds equal
  // ("guard:A", "guard:B") keep the order std::sort gives that sequence.
  std::sort(strata_.begin(), strata_.end(),
            [](const Stratum& a, const Stratum& b) { return audit::rule_less(a.key, b.key); });
  auto less = [](const Kept& a, const Kept& b) {
    return kept_less(a.hash, a.ordinal, b.hash, b.ordinal);
  };
  for (auto& s : strata_) std::sort_heap(s.best.begin(), s.best.end(), less);
  std::vector<Kept*> picked;
  for (size_t round = 0; picked.size() < n_; ++round) {
    bool any = false;
    for (auto& s : strata_) {
      if (round < s.best.size() && picked.size() < n_) {
        picked.push_back(&s.best[round]);
        any = true;
      }
    }
    if (!any) break;
  }
  std::sort(picked.begin(), picked.end(),
            [](const Kept* a, const Kept* b) { return a->ordinal < b->ordinal; });
  std::vector<ReviewRecord> out;
  out.reserve(picked.size());
  for (Kept* k : picked) out.push_back(std::move(k->record));
  strata_.clear();
  pos_.clear();
  rule_count_.clear();
  offered_ = 0;
  return out;
}

}  // namespace evenhand::review
