// Choosing records to review (review/select.h): filters and the seeded sample stratified by
// pack entry, which must choose what the in-memory algorithm below chooses.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <map>
#include <random>
#include <set>

#include "audit/manifest.h"
#include "base/hash.h"
#include "review/select.h"

using namespace evenhand;

namespace {

review::ReviewRecord rec(uint64_t line, std::vector<std::pair<std::string, std::string>> edits) {
  review::ReviewRecord r;
  r.input = "c.jsonl";
  r.line = line;
  r.action = "added";
  for (auto& [rule, why] : edits) r.edits.push_back({"/text", 0, 1, "x", "y", rule, why, "", {}});
  return r;
}

// The sampler over records in memory: both passes over `candidates` (indexes into `records`);
// returns the indexes it chose, in log order.
std::vector<size_t> sample_of(const std::vector<review::ReviewRecord>& records,
                              const std::vector<size_t>& candidates, size_t n, uint64_t seed) {
  review::StratifiedSampler sampler(n, seed);
  for (size_t i : candidates) sampler.count(records[i]);
  for (size_t i : candidates) {
    review::ReviewRecord copy = records[i];
    copy.log_line = i;  // to find it again
    sampler.offer(copy);
  }
  std::vector<size_t> out;
  for (const auto& r : sampler.take()) out.push_back(r.log_line);
  return out;
}

// The reference: the sample as `review --sample` chose it when it held the whole log in
// memory (every candidate sorted within its stratum), kept here to check the sampler.
std::vector<size_t> reference_sample(const std::vector<review::ReviewRecord>& records,
                                     const std::vector<size_t>& candidates, size_t n,
                                     uint64_t seed) {
  if (n >= candidates.size()) return candidates;
  std::map<std::string, size_t> rule_count;
  for (size_t i : candidates)
    for (const auto& e : records[i].edits)
      if (!e.rule.empty()) ++rule_count[e.rule];
  auto stratum = [&](const review::ReviewRecord& r) {
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

}  // namespace

TEST_CASE("filters: rule, reason, field, flag, guard") {
  std::vector<review::ReviewRecord> rs = {
      rec(1, {{"words.txt:67", "lexicon"}}),
      rec(2, {{"names.txt:5", "name"}, {"words.txt:68", "context"}})};
  rs.push_back(rec(3, {}));
  rs[2].action.clear();
  rs[2].guard = "medical";
  rs.push_back(rec(4, {}));
  rs[3].flags.push_back({"unsettled_verb", "she lead"});
  review::Filter none;
  for (const auto& r : rs) CHECK(review::passes(r, none));
  review::Filter by_rule;
  by_rule.rules = {"words.txt:68"};
  CHECK_FALSE(review::passes(rs[0], by_rule));
  CHECK(review::passes(rs[1], by_rule));
  review::Filter both;  // one edit must match every list
  both.rules = {"names.txt:5"};
  both.whys = {"context"};
  CHECK_FALSE(review::passes(rs[1], both));
  both.whys = {"name"};
  CHECK(review::passes(rs[1], both));
  review::Filter field;
  field.fields = {"/title"};
  CHECK_FALSE(review::passes(rs[0], field));
  review::Filter guard;
  guard.guards = {"any"};
  CHECK(review::passes(rs[2], guard));
  CHECK_FALSE(review::passes(rs[0], guard));
  review::Filter flag;
  flag.flags = {"unsettled_verb"};
  CHECK(review::passes(rs[3], flag));
  CHECK_FALSE(review::passes(rs[2], flag));
}

TEST_CASE("the sample covers every pack entry before repeating one, and is seeded") {
  // 90 records by a frequent entry, 5 by a rare one, 1 by a third.
  std::vector<review::ReviewRecord> rs;
  for (uint64_t i = 0; i < 90; ++i) rs.push_back(rec(i + 1, {{"words.txt:67", "lexicon"}}));
  for (uint64_t i = 0; i < 5; ++i)
    rs.push_back(rec(100 + i, {{"words.txt:67", "lexicon"}, {"names.txt:9", "name"}}));
  rs.push_back(rec(200, {{"words.txt:300", "lexicon"}}));
  std::vector<size_t> all;
  for (size_t i = 0; i < rs.size(); ++i) all.push_back(i);
  auto s = sample_of(rs, all, 6, 1);
  REQUIRE(s.size() == 6);
  CHECK(std::is_sorted(s.begin(), s.end()));
  std::set<std::string> strata;
  size_t rare = 0;
  for (size_t i : s) {
    bool has_name = rs[i].edits.size() == 2;
    if (has_name) ++rare;
    strata.insert(has_name ? "names" : rs[i].edits[0].rule);
  }
  CHECK(strata.size() == 3);  // every entry is seen
  CHECK(rare == 3);           // strata names, :67, :300 in rule order: 1+1+1, 1+1, 1
  CHECK(sample_of(rs, all, 6, 1) == s);
  bool differs = false;
  for (uint64_t seed = 2; seed < 6; ++seed) differs = differs || sample_of(rs, all, 6, seed) != s;
  CHECK(differs);
  CHECK(sample_of(rs, all, 500, 1) == all);
}

TEST_CASE("the two-pass sampler chooses what the in-memory algorithm chose, on random logs") {
  // Invented logs: Zipf-like rule frequencies, records with 0-4 edits, some guarded or
  // flagged without edits, repeated (input, line) ids (hash ties), filters taking subsets.
  std::mt19937_64 rng(20240611);
  size_t compared = 0, cut = 0;
  for (int trial = 0; trial < 300; ++trial) {
    size_t rules = 1 + rng() % 40, count = rng() % 400;
    std::vector<review::ReviewRecord> rs;
    for (size_t i = 0; i < count; ++i) {
      review::ReviewRecord r;
      r.input = rng() % 5 == 0 ? "b.jsonl" : "a.jsonl";
      r.line = rng() % 10 == 0 ? 7 : i + 1;
      size_t kind = rng() % 10;
      if (kind == 0) {
        r.guard = rng() % 2 ? "medical" : "legal";
      } else if (kind == 1) {
        r.flags.push_back({rng() % 2 ? "unsettled_verb" : "contraction", "x"});
      } else {
        r.action = "added";
        size_t edits = rng() % 5;
        for (size_t k = 0; k < edits; ++k) {
          size_t u = rng() % (rules * rules);
          size_t rule = static_cast<size_t>(std::sqrt(double(u)));  // more of the high ones
          std::string name = rng() % 3 ? "words.txt:" : "names.txt:";
          r.edits.push_back({"/text",
                             0,
                             1,
                             "x",
                             "y",
                             rng() % 20 ? name + std::to_string(rule) : "",
                             "lexicon",
                             "",
                             {}});
        }
      }
      rs.push_back(std::move(r));
    }
    std::vector<size_t> candidates;
    bool every = rng() % 2;
    for (size_t i = 0; i < rs.size(); ++i)
      if (every || rng() % 3) candidates.push_back(i);
    size_t n = rng() % 4 == 0 ? rng() % 3 : rng() % 60;
    uint64_t seed = rng() % 4;
    auto want = reference_sample(rs, candidates, n, seed);
    INFO("trial " << trial << ", " << candidates.size() << " candidates, n " << n);
    REQUIRE(sample_of(rs, candidates, n, seed) == want);
    ++compared;
    if (want.size() < candidates.size()) ++cut;
  }
  CHECK(compared == 300);
  CHECK(cut > 100);  // most trials sample, rather than take every candidate
}
