// The planner: target parsing, minimal plans against an exhaustive search over every choice
// of actions for small random cases, the greedy alone on the two-group mentions case, a
// skewed corpus reaching its target on both bases, infeasible targets with the right error,
// per-record decisions, and the plan's JSON round trip.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>

#include "balance/plan.h"
#include "balance_test_support.h"
#include "base/hash.h"

using namespace evenhand;
using namespace evenhand::balance;
using balance_test::ExactTarget;
using balance_test::Rec;

TEST_CASE("targets parse from group=weight lists", "[balance][plan]") {
  auto t = parse_target("female=2, male=2,neutral=1");
  REQUIRE(t.ok());
  REQUIRE(t->size() == 3);
  CHECK((*t)[0] == TargetWeight{"female", 2});
  CHECK((*t)[2] == TargetWeight{"neutral", 1});
  auto half = parse_target("female=0.5,male=0.5");
  REQUIRE(half.ok());
  CHECK((*half)[1].weight == 0.5);
  for (const char* bad : {"", "female", "female=1,,male=1", "=1,male=1", "female=x,male=1",
                          "female=-1,male=1", "female=1,female=2", "female=inf,male=1"}) {
    auto r = parse_target(bad);
    INFO(bad);
    CHECK_FALSE(r.ok());
    if (!r.ok()) CHECK(r.error().kind == ErrorKind::usage);
  }
  CHECK(parse_basis("records") == Basis::records);
  CHECK_FALSE(parse_basis("words").has_value());
}

namespace {

// A random small case: records, target, basis, tolerance and allowed actions.
struct Case {
  std::vector<Rec> recs;
  size_t groups = 2;
  ExactTarget target;
};

Case random_case(std::mt19937_64& rng, int round) {
  Case c;
  std::uniform_int_distribution<int> pct(0, 99);
  c.groups = pct(rng) < 60 ? 2 : 3;
  int actions = round % 5;  // 0 flip; 1 flip+add; 2 add; 3 flip+drop; 4 all three
  c.target.flip = actions != 2;
  c.target.add = actions == 1 || actions == 2 || actions == 4;
  c.target.drop = actions >= 3;
  int n_actions = int(c.target.flip) + int(c.target.add) + int(c.target.drop);
  size_t max_n = n_actions == 1 ? 16 : n_actions == 2 ? 11 : 9;
  std::uniform_int_distribution<size_t> nrec(1, max_n);
  c.recs = balance_test::random_records(rng, nrec(rng), c.groups, pct(rng) < 50 ? 3 : 8);
  c.target.basis = pct(rng) < 50 ? Basis::mentions : Basis::records;
  const int64_t dens[] = {50, 20, 10, 5};
  c.target.tol_num = pct(rng) < 15 ? 0 : 1;
  c.target.tol_den = dens[pct(rng) % 4];
  // Target over all groups, or over the first two of three.
  size_t tg = (c.groups == 3 && pct(rng) < 30) ? 2 : c.groups;
  std::uniform_int_distribution<int64_t> w(0, 3);
  do {
    c.target.groups.clear();
    c.target.weights.clear();
    for (size_t g = 0; g < tg; ++g) {
      c.target.groups.push_back(g);
      c.target.weights.push_back(w(rng));
    }
  } while (std::all_of(c.target.weights.begin(), c.target.weights.end(),
                       [](int64_t v) { return v == 0; }));
  return c;
}

}  // namespace

TEST_CASE("the planner changes as few records as an exhaustive search", "[balance][plan]") {
  // Reference: balance_test::exhaustive_min tries every action for every record (common
  // practice for checking an optimiser on small instances).
  std::mt19937_64 rng(9001);
  int solved = 0, infeasible = 0, nonzero = 0;
  for (int round = 0; round < 600; ++round) {
    Case c = random_case(rng, round);
    Tally tally = balance_test::tally_of(c.recs, c.groups);
    PlanOptions opt = balance_test::options_of(c.target, tally);
    int best = balance_test::exhaustive_min(c.recs, c.target);
    Infeasibility why = Infeasibility::none;
    auto plan = make_plan(tally, opt, &why);
    INFO("round " << round << ", records " << c.recs.size() << ", groups " << c.groups << ", basis "
                  << basis_name(c.target.basis) << ", tolerance " << c.target.tol_num << "/"
                  << c.target.tol_den << ", exhaustive " << best << ", planner "
                  << (plan.ok() ? std::to_string(plan->changed) : plan.error().reason));
    if (best < 0) {
      ++infeasible;
      REQUIRE_FALSE(plan.ok());
      CHECK(plan.error().kind == ErrorKind::usage);
      CHECK(why != Infeasibility::none);
      CHECK(why != Infeasibility::bad_target);
      CHECK(why != Infeasibility::search_limit);
      continue;
    }
    ++solved;
    if (best > 0) ++nonzero;
    REQUIRE(plan.ok());
    CHECK(why == Infeasibility::none);
    CHECK(plan->changed == static_cast<uint64_t>(best));
    CHECK(plan->minimal);
    CHECK(plan->lower_bound == plan->changed);
    CHECK(plan->reached);
    CHECK(plan->changed == plan->flip + plan->add + plan->drop);
    // The plan's counts, applied to the records themselves, reach the target exactly.
    auto x = balance_test::apply_counts(c.recs, *plan, c.target);
    CHECK(balance_test::reached(x, c.target));
    for (const auto& [sig, b] : plan->bins) {
      CHECK(b.flip + b.add + b.drop <= b.records);
      if (!sig.changeable) CHECK(b.flip + b.add == 0);
    }
  }
  // The random cases cover all three outcomes.
  CHECK(solved > 100);
  CHECK(nonzero > 100);
  CHECK(infeasible > 20);
}

TEST_CASE(
    "with two groups and a window wider than any record's move the greedy alone is "
    "minimal",
    "[balance][plan]") {
  // The header's exchange argument: on the mentions basis, flips that keep a record's
  // number of mentions (the swap), and 2 x tolerance x mentions at least the largest move,
  // the largest movers first need no search. search_limit 0 turns the search off, so any
  // gap would show as minimal == false or a count above the exhaustive one.
  std::mt19937_64 rng(4242);
  int checked = 0;
  for (int round = 0; round < 400; ++round) {
    std::uniform_int_distribution<size_t> nrec(4, 16);
    auto recs = balance_test::random_records(rng, nrec(rng), 2, 6);
    int64_t T = 0, max_move = 0;
    for (auto& r : recs) {
      if (r.changeable) r.after = {r.before[1], r.before[0]};
      T += r.before[0] + r.before[1];
      max_move = std::max<int64_t>(max_move, std::abs(int64_t(r.before[0]) - r.before[1]));
    }
    ExactTarget t;
    t.groups = {0, 1};
    t.weights = {1 + round % 3, 1 + (round / 3) % 2};
    t.flip = true;
    t.add = false;
    t.tol_num = 1;
    t.tol_den = 10;
    if (T == 0 || 2 * T * t.tol_num < max_move * t.tol_den) continue;
    int best = balance_test::exhaustive_min(recs, t);
    if (best < 0) continue;
    Tally tally = balance_test::tally_of(recs, 2);
    PlanOptions opt = balance_test::options_of(t, tally);
    opt.search_limit = 0;
    auto plan = make_plan(tally, opt);
    INFO("round " << round << ", exhaustive " << best);
    REQUIRE(plan.ok());
    CHECK(plan->minimal);
    CHECK(plan->changed == static_cast<uint64_t>(best));
    ++checked;
  }
  CHECK(checked > 100);
}

namespace {

// A corpus where 80% of the mentions (and of the leading records) are male: 2000 records,
// each with 1 to `most` mentions; counterfactuals swap the two groups.
std::vector<Rec> skewed_corpus(uint32_t most = 4) {
  std::mt19937_64 rng(80 + most);
  std::uniform_int_distribution<int> pct(0, 99);
  std::uniform_int_distribution<uint32_t> few(1, most);
  std::vector<Rec> recs;
  for (int i = 0; i < 2000; ++i) {
    Rec r;
    int k = pct(rng);
    if (k < 10) {
      r.before = {0, 0};
    } else if (k < 82) {
      r.before = {0, few(rng)};
    } else {
      r.before = {few(rng), 0};
    }
    if (r.before[0] + r.before[1] > 0 && pct(rng) < 95) {
      r.changeable = true;
      r.after = {r.before[1], r.before[0]};
    } else if (r.before[0] + r.before[1] > 0) {
      r.guarded = true;
    }
    recs.push_back(r);
  }
  return recs;
}

int action_code(Action a) {
  return a == Action::keep ? 0 : a == Action::flip ? 1 : a == Action::add ? 2 : 3;
}

}  // namespace

TEST_CASE("a skewed corpus reaches an even mix on both bases", "[balance][plan]") {
  for (uint32_t most : {4u, 60u}) {
    auto recs = skewed_corpus(most);
    Tally tally = balance_test::tally_of(recs, 2);
    const double male_share = double(tally.by_group[1].mentions) /
                              double(tally.by_group[0].mentions + tally.by_group[1].mentions);
    REQUIRE(male_share > 0.77);
    REQUIRE(male_share < 0.83);

    for (Basis basis : {Basis::mentions, Basis::records}) {
      INFO(basis_name(basis) << ", up to " << most << " mentions a record");
      PlanOptions opt;
      opt.target = {{"female", 1}, {"male", 1}};
      opt.basis = basis;
      opt.tolerance = 0.02;
      auto plan = make_plan(tally, opt);
      REQUIRE(plan.ok());
      CHECK(plan->reached);
      CHECK(plan->minimal);
      CHECK(plan->changed > 0);
      for (const auto& o : plan->outcome) {
        CHECK(std::abs(o.share_after - 0.5) <= 0.02 + 1e-9);
        CHECK(std::abs(o.share_before - 0.5) > 0.2);
      }
      ExactTarget t;
      t.groups = {0, 1};
      t.weights = {1, 1};
      t.basis = basis;
      t.flip = true;
      t.add = true;
      // With every count at most 8 the signatures are exact, so the planned counts applied
      // to the records themselves reach the target exactly.
      if (most <= 8) CHECK(balance_test::reached(balance_test::apply_counts(recs, *plan, t), t));

      // Per-record decisions from identity hashes, and the exact spread of the totals they
      // give, computed here from the records: each record independently takes action a with
      // probability count_a / n of its signature, so the variance of a total is the sum over
      // records of E[v^2] - E[v]^2 (variance of a sum of independent variables; source: W.
      // Feller, An Introduction to Probability Theory and Its Applications, vol. 1; from
      // memory).
      std::vector<int64_t> x(2, 0);
      std::vector<double> mean(2, 0), var(2, 0);
      for (size_t i = 0; i < recs.size(); ++i) {
        Signature sig = make_signature(recs[i].before, recs[i].after, recs[i].changeable, 2);
        uint64_t h = stable_hash(17, "record-" + std::to_string(i));
        balance_test::contribution(recs[i], action_code(plan->decide(sig, h)), t, x, +1);
        double pr[4] = {1, 0, 0, 0};
        auto it = plan->bins.find(sig);
        if (it != plan->bins.end()) {
          const BinPlan& b = it->second;
          const double n = double(b.records);
          pr[1] = double(b.flip) / n;
          pr[2] = double(b.add) / n;
          pr[3] = double(b.drop) / n;
          pr[0] = 1 - pr[1] - pr[2] - pr[3];
        }
        double m1[2] = {0, 0}, m2[2] = {0, 0};
        for (int a = 0; a < 4; ++a) {
          if (pr[a] == 0) continue;  // flips and adds only for changeable records
          std::vector<int64_t> v(2, 0);
          balance_test::contribution(recs[i], a, t, v, +1);
          for (size_t g = 0; g < 2; ++g) {
            m1[g] += pr[a] * double(v[g]);
            m2[g] += pr[a] * double(v[g]) * double(v[g]);
          }
        }
        for (size_t g = 0; g < 2; ++g) {
          mean[g] += m1[g];
          var[g] += m2[g] - m1[g] * m1[g];
        }
      }
      for (size_t g = 0; g < 2; ++g) {
        const auto& o = plan->outcome[g];
        const double sd = std::sqrt(var[g]);
        CHECK(o.after == Approx(mean[g]).epsilon(1e-9));
        // The plan's spread treats a signature's records as alike: exact for exact bins, a
        // lower estimate (variance is convex in the values) for binned ones.
        if (most <= 8) {
          CHECK(o.sd == Approx(sd).epsilon(1e-6));
        } else {
          CHECK(o.sd <= sd * (1 + 1e-9));
        }
        CHECK(sd > 0);
        CHECK(std::abs(double(x[g]) - mean[g]) <= 5 * sd);
      }
    }
  }
}

namespace {

Infeasibility failure_of(const Tally& t, const PlanOptions& o, std::string* reason = nullptr) {
  Infeasibility why = Infeasibility::none;
  auto plan = make_plan(t, o, &why);
  REQUIRE_FALSE(plan.ok());
  CHECK(plan.error().kind == ErrorKind::usage);
  if (reason) *reason = plan.error().reason;
  return why;
}

PlanOptions even(std::vector<std::string> groups) {
  PlanOptions o;
  for (auto& g : groups) o.target.push_back({g, 1});
  return o;
}

}  // namespace

TEST_CASE("infeasible targets give the reason instead of a plan", "[balance][plan]") {
  std::vector<Rec> recs = {{{0, 5, 0}, {5, 0, 0}, true, false},
                           {{0, 3, 0}, {3, 0, 0}, true, false},
                           {{1, 0, 0}, {0, 1, 0}, true, false}};
  Tally t = balance_test::tally_of(recs, 3);
  std::string reason;

  SECTION("a group the axis does not have") {
    CHECK(failure_of(t, even({"female", "nonbinary"}), &reason) == Infeasibility::bad_target);
    CHECK(reason.find("'nonbinary' is not a group of axis 'gender'") != std::string::npos);
    CHECK(reason.find("female, male, neutral") != std::string::npos);
  }
  SECTION("bad weights and tolerance") {
    PlanOptions zero = even({"female", "male"});
    zero.target[0].weight = zero.target[1].weight = 0;
    CHECK(failure_of(t, zero) == Infeasibility::bad_target);
    PlanOptions tol = even({"female", "male"});
    tol.tolerance = 1.5;
    CHECK(failure_of(t, tol) == Infeasibility::bad_target);
    CHECK(failure_of(t, even({"female"})) == Infeasibility::bad_target);
  }
  SECTION("a group never mentioned, not even in counterfactuals") {
    CHECK(failure_of(t, even({"female", "male", "neutral"}), &reason) ==
          Infeasibility::group_absent);
    CHECK(reason.find("'neutral'") != std::string::npos);
    CHECK(reason.find("forms") != std::string::npos);
  }
  SECTION("no record's counterfactual moves mentions toward the group") {
    // Every counterfactual only adds male mentions: female cannot rise.
    std::vector<Rec> toward_male = {
        {{0, 5}, {0, 5}, true, false}, {{1, 3}, {0, 4}, true, false}, {{0, 2}, {}, false, true}};
    Tally tm = balance_test::tally_of(toward_male, 2);
    CHECK(failure_of(tm, even({"female", "male"}), &reason) == Infeasibility::no_mover);
    CHECK(reason.find("share of 'female' by mentions is 0.091") != std::string::npos);
    // Guarded records only: nothing can change at all.
    std::vector<Rec> guarded = {{{0, 5}, {}, false, true}, {{1, 0}, {}, false, true}};
    CHECK(failure_of(balance_test::tally_of(guarded, 2), even({"female", "male"})) ==
          Infeasibility::no_mover);
  }
  SECTION("more change than all records can give") {
    std::vector<Rec> few = {
        {{0, 2}, {2, 0}, true, false}, {{0, 9}, {}, false, true}, {{0, 9}, {}, false, true}};
    CHECK(failure_of(balance_test::tally_of(few, 2), even({"female", "male"}), &reason) ==
          Infeasibility::not_enough);
    CHECK(reason.find("even changing every record that would raise it (1 of them)") !=
          std::string::npos);
  }
  SECTION("each share alone reachable, but not all at once") {
    // One record: keeping it gives female 0, flipping it gives female 1, and adds are not
    // allowed, so 0.5 +- 0.02 is out of reach although either bound alone can be met.
    std::vector<Rec> one = {{{0, 10}, {10, 0}, true, false}};
    PlanOptions o = even({"female", "male"});
    o.allow_add = false;
    Tally t1 = balance_test::tally_of(one, 2);
    CHECK(failure_of(t1, o) == Infeasibility::no_combination);
    // With adds allowed it is one added record.
    auto plan = make_plan(t1, even({"female", "male"}));
    REQUIRE(plan.ok());
    CHECK(plan->changed == 1);
    CHECK(plan->add == 1);
    // With the search cut short, the failure says so instead.
    o.search_limit = 1;
    CHECK(failure_of(t1, o) == Infeasibility::search_limit);
  }
}

TEST_CASE("a target already met needs no change", "[balance][plan]") {
  std::vector<Rec> recs = {{{2, 0}, {0, 2}, true, false}, {{0, 2}, {2, 0}, true, false}};
  auto plan = make_plan(balance_test::tally_of(recs, 2), even({"female", "male"}));
  REQUIRE(plan.ok());
  CHECK(plan->changed == 0);
  CHECK(plan->bins.empty());
  CHECK(plan->minimal);
  CHECK(plan->reached);
  CHECK(plan->decide(make_signature(recs[0].before, recs[0].after, true, 2), 0) == Action::keep);
}

TEST_CASE("a record's decision follows its hash against the plan's fractions", "[balance][plan]") {
  Plan p;
  p.groups = {"female", "male"};
  std::vector<uint32_t> b{0, 2}, a{2, 0};
  Signature s = make_signature(b, a, true, 2);
  p.bins[s] = BinPlan{1000, 300, 100, 50};
  // hash_unit keeps the top 53 bits: ceil(u * 2^53) shifted left by 11 gives the hash with
  // the smallest hash_unit not below u.
  auto hash_for = [](double u) { return static_cast<uint64_t>(std::ceil(u * 0x1.0p53)) << 11; };
  CHECK(hash_unit(hash_for(0.25)) == 0.25);
  CHECK(hash_unit(hash_for(0.3)) >= 0.3);
  CHECK(p.decide(s, hash_for(0.0)) == Action::flip);
  CHECK(p.decide(s, hash_for(0.299)) == Action::flip);
  CHECK(p.decide(s, hash_for(0.3)) == Action::add);
  CHECK(p.decide(s, hash_for(0.399)) == Action::add);
  CHECK(p.decide(s, hash_for(0.4)) == Action::drop);
  CHECK(p.decide(s, hash_for(0.449)) == Action::drop);
  CHECK(p.decide(s, hash_for(0.45)) == Action::keep);
  CHECK(p.decide(s, hash_for(0.99)) == Action::keep);
  // A signature the plan does not list is kept.
  std::vector<uint32_t> other{1, 1};
  CHECK(p.decide(make_signature(other, other, true, 2), hash_for(0.0)) == Action::keep);
  // Over many identities the fractions come out in expectation: within 5 standard
  // deviations of n p (binomial spread n p (1 - p); from memory, Feller vol. 1).
  std::map<Action, int> seen;
  const int n = 20000;
  for (int i = 0; i < n; ++i) ++seen[p.decide(s, stable_hash(3, "id-" + std::to_string(i)))];
  for (auto [act, frac] : {std::pair{Action::flip, 0.3}, std::pair{Action::add, 0.1},
                           std::pair{Action::drop, 0.05}, std::pair{Action::keep, 0.55}}) {
    double sd = std::sqrt(n * frac * (1 - frac));
    CHECK(std::abs(seen[act] - n * frac) <= 5 * sd);
  }
  // Engine results decide through their signature.
  rewrite::RecordResult r;
  r.before = b;
  r.after = a;
  r.edits.push_back(rewrite::Edit{});
  CHECK(p.decide(r, hash_for(0.1)) == Action::flip);
}

TEST_CASE("a plan round-trips through JSON", "[balance][plan]") {
  auto recs = skewed_corpus();
  Tally tally = balance_test::tally_of(recs, 2);
  PlanOptions opt = even({"female", "male"});
  opt.allow_drop = true;
  opt.basis = Basis::records;
  opt.tolerance = 0.01;
  auto plan = make_plan(tally, opt);
  REQUIRE(plan.ok());
  std::string json = plan_to_json(*plan);
  auto back = plan_from_json(json, "p.json");
  REQUIRE(back.ok());
  CHECK(*back == *plan);
  CHECK(plan_to_json(*back) == json);
  CHECK(json.find("\"schema\": \"evenhand.plan/1\"") != std::string::npos);

  // Broken documents.
  std::string compact = plan_to_json(*plan, 0);
  auto edit = [&](const std::string& from, const std::string& to) {
    std::string s = compact;
    size_t at = s.find(from);
    REQUIRE(at != std::string::npos);
    s.replace(at, from.size(), to);
    return plan_from_json(s);
  };
  CHECK_FALSE(edit("evenhand.plan/1", "evenhand.tally/1").ok());
  CHECK_FALSE(edit("\"basis\":\"records\"", "\"basis\":\"words\"").ok());
  CHECK_FALSE(edit("\"changed\":", "\"changed\":1").ok());
  CHECK_FALSE(edit("\"group\":\"female\",\"weight\"", "\"group\":\"woman\",\"weight\"").ok());
  auto bad_bins = edit("\"bins\":[",
                       "\"bins\":[{\"changeable\":false,\"before\":[0,1],"
                       "\"after\":[],\"lead_before\":1,\"lead_after\":-2,"
                       "\"records\":3,\"flip\":1,\"add\":0,\"drop\":0},");
  REQUIRE_FALSE(bad_bins.ok());
  CHECK(bad_bins.error().reason.find("not changeable") != std::string::npos);
}
