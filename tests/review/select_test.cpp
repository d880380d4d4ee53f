// Choosing records to review (review/select.h): filters and the seeded sample stratified by
// pack entry.
#include <catch2/catch.hpp>

#include <set>

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
  auto s = review::stratified_sample(rs, all, 6, 1);
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
  CHECK(review::stratified_sample(rs, all, 6, 1) == s);
  bool differs = false;
  for (uint64_t seed = 2; seed < 6; ++seed)
    differs = differs || review::stratified_sample(rs, all, 6, seed) != s;
  CHECK(differs);
  CHECK(review::stratified_sample(rs, all, 500, 1) == all);
}
