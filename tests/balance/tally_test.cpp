// Tallies: count bins, leads, signatures, merging shards (equal to the tally of their
// concatenation) and the JSON round trip with its consistency checks.
#include <catch2/catch.hpp>

#include <random>

#include "balance/tally.h"
#include "balance_test_support.h"

using namespace evenhand;
using namespace evenhand::balance;
using balance_test::Rec;

TEST_CASE("count bins are exact up to 8, then powers of two", "[balance][tally]") {
  CHECK(count_bin(0) == 0);
  CHECK(count_bin(8) == 8);
  CHECK(count_bin(9) == 9);
  CHECK(count_bin(16) == 9);
  CHECK(count_bin(17) == 10);
  CHECK(count_bin(32) == 10);
  CHECK(count_bin(33) == 11);
  CHECK(count_bin(UINT32_MAX) == 37);
  CHECK(bin_low(9) == 9);
  CHECK(bin_high(9) == 16);
  CHECK(bin_low(10) == 17);
  CHECK(bin_high(37) == UINT32_MAX);
  // Every count lies in its bin, and the bins tile the counts without gaps.
  for (uint32_t c = 0; c < 70000; ++c) {
    uint8_t b = count_bin(c);
    REQUIRE(bin_low(b) <= c);
    REQUIRE(c <= bin_high(b));
  }
  for (uint8_t b = 0; b < 37; ++b) {
    REQUIRE(bin_high(b) + 1 == bin_low(b + 1));
    REQUIRE(bin_of_low(bin_low(b)) == b);
    REQUIRE(count_bin(static_cast<uint32_t>(bin_high(b))) == b);
  }
  CHECK(bin_of_low(10) == -1);
  CHECK(bin_of_low(16) == -1);
  CHECK(bin_of_low((uint64_t{1} << 33) + 1) == -1);
}

TEST_CASE("a record leads with the group it mentions most", "[balance][tally]") {
  std::vector<uint32_t> a{3, 1}, b{2, 2}, c{0, 0}, d{0, 5, 5}, e{1, 0, 4};
  CHECK(lead_group(a) == 0);
  CHECK(lead_group(b) == kLeadTie);
  CHECK(lead_group(c) == kLeadNone);
  CHECK(lead_group(d) == kLeadTie);
  CHECK(lead_group(e) == 2);
}

TEST_CASE("signatures bin the counts and keep the lead", "[balance][tally]") {
  std::vector<uint32_t> before{12, 11}, after{11, 12};
  Signature s = make_signature(before, after, true, 2);
  CHECK(s.changeable);
  CHECK(s.before == std::vector<uint8_t>{9, 9});
  CHECK(s.after == std::vector<uint8_t>{9, 9});
  CHECK(s.lead_before == 0);
  CHECK(s.lead_after == 1);
  // Records without mentions are never changeable, whatever the caller says.
  std::vector<uint32_t> none{0, 0};
  Signature z = make_signature(none, before, true, 2);
  CHECK_FALSE(z.changeable);
  CHECK(z.after.empty());
  CHECK(z.lead_after == kLeadNone);
  // Short counts are padded with zeros.
  std::vector<uint32_t> one{4};
  Signature p = make_signature(one, {}, false, 3);
  CHECK(p.before == std::vector<uint8_t>{4, 0, 0});
}

TEST_CASE("is_changeable follows mentions, guards and edits", "[balance][tally]") {
  rewrite::RecordResult r;
  r.before = {1, 0};
  r.after = {0, 1};
  CHECK_FALSE(is_changeable(r));  // no edit
  r.edits.push_back(rewrite::Edit{});
  CHECK(is_changeable(r));
  pack::Guard g{"medical history", "medical", {}};
  r.guard = &g;
  CHECK_FALSE(is_changeable(r));
  Tally t = Tally::make("gender", {"female", "male"});
  t.add(r);
  CHECK(t.records == 1);
  CHECK(t.records_guarded == 1);
  CHECK(t.records_changeable == 0);
  CHECK(t.by_group[0].mentions == 1);
  CHECK(t.by_group[0].records == 1);
}

TEST_CASE("a tally counts mentions, leads and signatures", "[balance][tally]") {
  std::vector<Rec> recs = {
      {{2, 0}, {0, 2}, true, false}, {{2, 0}, {0, 2}, true, false}, {{1, 1}, {1, 1}, true, false},
      {{0, 0}, {}, false, false},    {{0, 3}, {}, false, true},     {{20, 1}, {1, 20}, true, false},
  };
  Tally t = balance_test::tally_of(recs, 2);
  CHECK(t.records == 6);
  CHECK(t.records_changeable == 4);
  CHECK(t.records_guarded == 1);
  CHECK(t.records_without_mentions == 1);
  CHECK(t.records_tied == 1);
  CHECK(t.by_group[0].mentions == 25);
  CHECK(t.by_group[1].mentions == 5);
  CHECK(t.by_group[0].records == 3);
  CHECK(t.by_group[1].records == 1);
  CHECK(t.signatures.size() == 5);
  auto it = t.signatures.find(make_signature(recs[0].before, recs[0].after, true, 2));
  REQUIRE(it != t.signatures.end());
  CHECK(it->second.records == 2);
  CHECK(it->second.before == std::vector<uint64_t>{4, 0});
  CHECK(it->second.after == std::vector<uint64_t>{0, 4});
  // The large counts land in bin 17-32 but their sums stay exact.
  auto big = t.signatures.find(make_signature(recs[5].before, recs[5].after, true, 2));
  REQUIRE(big != t.signatures.end());
  CHECK(big->first.before == std::vector<uint8_t>{10, 1});
  CHECK(big->second.before == std::vector<uint64_t>{20, 1});
}

TEST_CASE("tallies of shards merge into the tally of their concatenation", "[balance][tally]") {
  std::mt19937_64 rng(20240611);
  for (int round = 0; round < 40; ++round) {
    size_t groups = 2 + round % 2;
    uint32_t max_count = round % 4 == 0 ? 300 : 8;
    auto recs = balance_test::random_records(rng, 500, groups, max_count);
    Tally whole = balance_test::tally_of(recs, groups);

    // Cut into 1 to 6 shards at random points.
    std::uniform_int_distribution<size_t> cut(0, recs.size());
    std::vector<size_t> cuts = {0, recs.size()};
    for (size_t k = 0, n = 1 + round % 6; k + 1 < n; ++k) cuts.push_back(cut(rng));
    std::sort(cuts.begin(), cuts.end());
    std::vector<Tally> shards;
    for (size_t k = 0; k + 1 < cuts.size(); ++k) {
      std::vector<Rec> part(recs.begin() + static_cast<long>(cuts[k]),
                            recs.begin() + static_cast<long>(cuts[k + 1]));
      shards.push_back(balance_test::tally_of(part, groups));
    }
    // Merge in a shuffled order into an empty tally that takes on the header.
    std::shuffle(shards.begin(), shards.end(), rng);
    Tally merged;
    for (const auto& s : shards) REQUIRE(merged.merge(s).ok());
    REQUIRE(merged == whole);
    // And through JSON: each shard written and read back, then merged.
    Tally via_json;
    for (const auto& s : shards) {
      auto back = tally_from_json(tally_to_json(s, 0));
      REQUIRE(back.ok());
      REQUIRE(via_json.merge(*back).ok());
    }
    REQUIRE(via_json == whole);
  }
}

TEST_CASE("merging tallies of different packs is an error", "[balance][tally]") {
  Tally a = Tally::make("gender", {"female", "male"}, "aaa");
  Tally b = Tally::make("gender", {"female", "male", "neutral"}, "aaa");
  Tally c = Tally::make("gender", {"female", "male"}, "bbb");
  CHECK_FALSE(a.merge(b).ok());
  auto s = a.merge(c);
  REQUIRE_FALSE(s.ok());
  CHECK(s.error().kind == ErrorKind::usage);
}

TEST_CASE("a tally round-trips through JSON", "[balance][tally]") {
  std::mt19937_64 rng(7);
  auto recs = balance_test::random_records(rng, 2000, 3, 100);
  Tally t = balance_test::tally_of(recs, 3);
  std::string json = tally_to_json(t);
  auto back = tally_from_json(json, "t.json");
  REQUIRE(back.ok());
  CHECK(*back == t);
  CHECK(tally_to_json(*back) == json);
  CHECK(json.find("\"schema\": \"evenhand.tally/1\"") != std::string::npos);
  // Compact and pretty forms read back alike.
  auto compact = tally_from_json(tally_to_json(t, 0));
  REQUIRE(compact.ok());
  CHECK(*compact == t);
  // An empty tally too.
  Tally e = Tally::make("gender", {"female", "male"});
  auto eb = tally_from_json(tally_to_json(e));
  REQUIRE(eb.ok());
  CHECK(*eb == e);
}

namespace {

std::string replace_once(std::string s, const std::string& from, const std::string& to) {
  size_t at = s.find(from);
  REQUIRE(at != std::string::npos);
  s.replace(at, from.size(), to);
  return s;
}

}  // namespace

TEST_CASE("a broken tally document is rejected with the reason", "[balance][tally]") {
  std::vector<Rec> recs = {{{2, 0}, {0, 2}, true, false}, {{0, 1}, {1, 0}, true, false}};
  Tally t = balance_test::tally_of(recs, 2);
  std::string json = tally_to_json(t, 0);

  auto not_json = tally_from_json("{\"schema\":", "x.json");
  REQUIRE_FALSE(not_json.ok());
  CHECK(not_json.error().kind == ErrorKind::input);
  CHECK(not_json.error().file == "x.json");

  auto other = tally_from_json(replace_once(json, "evenhand.tally/1", "evenhand.tally/9"));
  REQUIRE_FALSE(other.ok());
  CHECK(other.error().reason.find("schema") != std::string::npos);

  auto sum = tally_from_json(replace_once(json, "\"records\":2,", "\"records\":3,"));
  REQUIRE_FALSE(sum.ok());
  CHECK(sum.error().reason.find("records") != std::string::npos);

  // 10 is not the lowest count of a bin (bins above 8 start at 9, 17, 33, ...).
  auto bin = tally_from_json(replace_once(json, "\"before\":[2,0]", "\"before\":[10,0]"));
  REQUIRE_FALSE(bin.ok());
  CHECK(bin.error().reason.find("bin") != std::string::npos);

  // A sum that the binned counts cannot give.
  auto out_of_bin =
      tally_from_json(replace_once(json, "\"sum_before\":[2,0]", "\"sum_before\":[3,0]"));
  REQUIRE_FALSE(out_of_bin.ok());

  auto missing = tally_from_json(replace_once(json, "\"axis\":", "\"axes\":"));
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.error().reason.find("axis") != std::string::npos);
}
