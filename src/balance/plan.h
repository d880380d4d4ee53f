// Rebalancing plans: from a merged tally and a target mix over groups, decide for every
// signature how many of its records to flip (replace by the counterfactual), add (keep and add
// the counterfactual) or drop, changing as few records as possible; then decide per record,
// from the plan and the record's identity hash alone, so that shards apply one plan
// independently. Plans round-trip through JSON ("evenhand.plan/1").
//
// The problem. Let x be the per-group totals over the target's groups in the chosen basis
// (mentions, or records that lead with the group), T their sum and p_g = weight_g / sum of
// weights. The target is reached when T >= 1 and |x_g / T - p_g| <= tolerance for every
// target group; each bound is a linear inequality a_j . x + b_j >= 0, so with V(x) the sum of
// the amounts by which these inequalities are violated, the target is reached exactly when
// V(x) = 0. A record of signature s changes x by a fixed vector per action (flip: after -
// before; add: after; drop: -before; the per-record mean of the signature's exact sums), and
// a plan picks counts per signature and action, at most the signature's records in all.
//
// The method, in three steps:
// 1. Greedy: repeatedly take the action that lowers V the most per record (the record that
//    moves the most mass toward the target, net of any overshoot), as many records of it as
//    keep lowering V (V is convex and piecewise linear along that direction, so the best count
//    is read off its breakpoints), until V = 0 or no action lowers V. Then changes that are
//    no longer needed (an early step's move that later steps made up for) are taken back.
// 2. Lower bound (an exchange argument): to satisfy a violated inequality j short by D_j,
//    each changed record contributes at most its best a_j . d over the allowed actions, and
//    exchanging a chosen record for a larger contributor never needs more records, so no
//    plan changes fewer records than the fewest largest contributors that reach D_j. The
//    bound is the largest such count over the violated inequalities and over the sums of
//    any subset of them (a sum of inequalities that hold holds too; with three or more groups
//    the sums see that a record raising one group's share does not raise another's). When
//    some inequality cannot be met even by all records together, the target is infeasible
//    and the error says why.
//    Two groups on the mentions basis: the violated inequalities are the two faces of one
//    share bound, a flip whose counterfactual keeps the record's number of mentions moves it
//    by the record's own mass, and the greedy takes the largest movers first, so it stops at
//    exactly the bound's count, i.e. it is minimal, whenever the last mover cannot overshoot
//    the window: when 2 x tolerance x mentions is at least the largest single record's move
//    (any corpus where tolerance x mentions exceeds one record's mentions). Elsewhere (tight
//    windows, adds that change the total, several groups) the greedy is an upper bound; on
//    skewed synthetic corpora of 200,000 records it came within a few per cent of the bound
//    with three groups and equal to it with two.
// 3. Exact search: when the greedy failed or changed more records than the bound, a
//    branch-and-bound search over the counts per group of interchangeable signatures (pruned
//    by the same bound, memoised on the totals reached) looks for a plan with fewer changes
//    and proves the minimum, within PlanOptions::search_limit steps. Small or tight cases
//    (where one record can overshoot the window, or several groups pull against each other)
//    are settled exactly; when the limit stops it, the plan says minimal = false and gives
//    the bound, so the gap is known.
//
// Per-record decisions are probabilistic: a record of a signature with n records of which
// the plan flips f, adds a and drops d is flipped when u < f/n, else added when
// u < (f+a)/n, else dropped when u < (f+a+d)/n, else kept, where u = hash_unit(h) and
// h = stable_hash(seed, identity). The counts therefore match the plan in expectation, and
// the totals' spread is reported per group (GroupOutcome::sd). An exact scheme (exactly f of
// the n records) is not possible without coordination: a shard sees only its own records of
// a signature, and knowing which f of all n hashes are the smallest takes either all the
// hashes or a shared threshold, i.e. another pass. In one process that sees all records, a
// sequential selection (flip the i-th of n with probability (f - flipped) / (n - i)) would be
// exact; it is not offered here because the pipeline's workers do not see records in a
// single order.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "balance/tally.h"
#include "base/status.h"

namespace evenhand::balance {

// What the target's shares are measured in.
enum class Basis : uint8_t {
  mentions,  // mentions of each group
  records,   // records that lead with each group (ties and records without mentions aside)
};
// Returns "mentions" or "records".
const char* basis_name(Basis b);
// Returns the basis named `s`, or nullopt.
std::optional<Basis> parse_basis(std::string_view s);

// What is done with one record.
enum class Action : uint8_t {
  keep,  // written as read
  flip,  // replaced by its counterfactual
  add,   // written as read, followed by its counterfactual
  drop,  // not written
};
// Returns "keep", "flip", "add" or "drop".
const char* action_name(Action a);

struct TargetWeight {
  std::string group;
  double weight = 0;
  bool operator==(const TargetWeight&) const = default;
};

// Parses a target mix such as "female=1,male=1" or "female=2, male=2, neutral=1": comma
// separated group=weight pairs, weights finite and >= 0. Returns an Error (kind usage) for
// bad syntax, a repeated group or a bad weight. Names are checked against a tally later.
Result<std::vector<TargetWeight>> parse_target(std::string_view spec);

struct PlanOptions {
  // The mix to reach. Groups of the axis that the target does not name stay out of the
  // shares (their mentions or records count toward no group's share).
  std::vector<TargetWeight> target;
  Basis basis = Basis::mentions;
  double tolerance = 0.02;  // allowed |share - target share|, in [0, 1)
  bool allow_flip = true;
  bool allow_add = true;
  bool allow_drop = false;
  // Work allowed to the exact search (step 3 above): nodes visited plus inequalities and
  // signature groups looked at by its bound; the default takes well under a second.
  uint64_t search_limit = 5'000'000;
};

// Why no plan was made.
enum class Infeasibility : uint8_t {
  none,
  bad_target,      // unknown or repeated group, bad weight or tolerance, < 2 groups
  group_absent,    // a target group is never mentioned, not even in counterfactuals
  no_mover,        // a share must move and no allowed change of any record moves it that way
  not_enough,      // changing every record that helps still falls short
  no_combination,  // each share alone can be reached, but not all at once
  search_limit,    // the greedy failed and the exact search stopped before finding a plan
};
// Returns the enum's name ("group_absent", ...).
const char* infeasibility_name(Infeasibility i);

// How many records of one signature get each action (the rest are kept).
struct BinPlan {
  uint64_t records = 0;  // records of the signature in the tally
  uint64_t flip = 0;
  uint64_t add = 0;
  uint64_t drop = 0;
  bool operator==(const BinPlan&) const = default;
};

// The expected result for one target group, in the plan's basis.
struct GroupOutcome {
  std::string group;
  double target_share = 0;
  double before = 0;        // total before the plan
  double after = 0;         // expected total after it
  double share_before = 0;  // among the target groups (0 when there is nothing to share)
  double share_after = 0;
  // Standard deviation of `after` under the per-record decisions, treating the records of
  // one signature as alike: exact when every count is at most 8, else a lower estimate.
  double sd = 0;
  bool operator==(const GroupOutcome&) const = default;
};

struct Plan {
  std::string axis;
  std::vector<std::string> groups;
  std::string pack_sha256;
  std::vector<TargetWeight> target;
  Basis basis = Basis::mentions;
  double tolerance = 0;
  bool allow_flip = false, allow_add = false, allow_drop = false;

  uint64_t tally_records = 0;  // records in the tally the plan was made from
  uint64_t changed = 0;        // flip + add + drop
  uint64_t flip = 0, add = 0, drop = 0;
  uint64_t lower_bound = 0;           // no plan reaches the target with fewer changed records
  bool minimal = false;               // changed == lower_bound
  bool reached = false;               // the expected totals are within tolerance of the target
  std::vector<GroupOutcome> outcome;  // one per target group, in target order
  std::map<Signature, BinPlan> bins;  // the signatures with at least one change

  // Returns what to do with a record of signature `s` whose identity hash is `hash`
  // (stable_hash(seed, identity) from base/hash.h): see the header comment. Signatures the
  // plan does not list are kept.
  Action decide(const Signature& s, uint64_t hash) const;
  // The same for an engine result (its signature over this plan's groups).
  Action decide(const rewrite::RecordResult& r, uint64_t hash) const;

  bool operator==(const Plan&) const = default;
};

// Plans the least change that brings `tally` to `options.target`. Returns an Error (kind
// usage) when the target is bad or cannot be reached, its reason saying why; `why`, when
// given, receives the kind of failure (Infeasibility::none on success).
Result<Plan> make_plan(const Tally& tally, const PlanOptions& options,
                       Infeasibility* why = nullptr);

// The schema name written into and expected in plan documents.
inline constexpr const char* kPlanSchema = "evenhand.plan/1";

// Returns the plan as a JSON document (`indent` as for audit::JsonWriter).
std::string plan_to_json(const Plan& p, int indent = 2);

// Parses a plan document. Returns an Error (kind input, naming `file`) when it is not valid
// JSON, has another schema, or is inconsistent (counts above a signature's records, flips of
// a signature that is not changeable, totals that do not add up).
Result<Plan> plan_from_json(std::string_view json, const std::string& file = {});

}  // namespace evenhand::balance
