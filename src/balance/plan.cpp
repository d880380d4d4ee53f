#include "balance/plan.h"

#include <algorithm>
#include <array>
#include <bit>
#include <charconv>
#include <cmath>
#include <cstring>
#include <limits>
#include <unordered_map>

#include "base/hash.h"

namespace evenhand::balance {

const char* basis_name(Basis b) {
  switch (b) {
    case Basis::mentions:
      return "mentions";
    case Basis::records:
      return "records";
  }
  return "unknown";
}

std::optional<Basis> parse_basis(std::string_view s) {
  if (s == "mentions") return Basis::mentions;
  if (s == "records") return Basis::records;
  return std::nullopt;
}

const char* action_name(Action a) {
  switch (a) {
    case Action::keep:
      return "keep";
    case Action::flip:
      return "flip";
    case Action::add:
      return "add";
    case Action::drop:
      return "drop";
  }
  return "unknown";
}

const char* infeasibility_name(Infeasibility i) {
  switch (i) {
    case Infeasibility::none:
      return "none";
    case Infeasibility::bad_target:
      return "bad_target";
    case Infeasibility::group_absent:
      return "group_absent";
    case Infeasibility::no_mover:
      return "no_mover";
    case Infeasibility::not_enough:
      return "not_enough";
    case Infeasibility::no_combination:
      return "no_combination";
    case Infeasibility::search_limit:
      return "search_limit";
  }
  return "unknown";
}

namespace {

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  return s;
}

}  // namespace

Result<std::vector<TargetWeight>> parse_target(std::string_view spec) {
  std::vector<TargetWeight> out;
  auto bad = [&](const std::string& why) {
    return make_error(ErrorKind::usage, "", "target '" + std::string(spec) + "': " + why);
  };
  if (trim(spec).empty()) return bad("empty (expected group=weight pairs, e.g. female=1,male=1)");
  size_t pos = 0;
  while (pos <= spec.size()) {
    size_t comma = spec.find(',', pos);
    if (comma == std::string_view::npos) comma = spec.size();
    std::string_view item = trim(spec.substr(pos, comma - pos));
    pos = comma + 1;
    size_t eq = item.find('=');
    if (eq == std::string_view::npos)
      return bad("'" + std::string(item) + "' is not of the form group=weight");
    std::string_view name = trim(item.substr(0, eq));
    std::string_view num = trim(item.substr(eq + 1));
    if (name.empty()) return bad("a weight without a group name");
    double w = 0;
    auto r = std::from_chars(num.data(), num.data() + num.size(), w);
    if (num.empty() || r.ec != std::errc() || r.ptr != num.data() + num.size())
      return bad("weight '" + std::string(num) + "' of '" + std::string(name) +
                 "' is not a number");
    if (!std::isfinite(w) || w < 0)
      return bad("weight of '" + std::string(name) + "' must be finite and not negative");
    for (const auto& t : out)
      if (t.group == name) return bad("names '" + std::string(name) + "' twice");
    out.push_back({std::string(name), w});
    if (comma == spec.size()) break;
  }
  return out;
}

Action Plan::decide(const Signature& s, uint64_t hash) const {
  auto it = bins.find(s);
  if (it == bins.end() || it->second.records == 0) return Action::keep;
  const BinPlan& b = it->second;
  const double n = static_cast<double>(b.records);
  const double u = hash_unit(hash);
  if (u < static_cast<double>(b.flip) / n) return Action::flip;
  if (u < static_cast<double>(b.flip + b.add) / n) return Action::add;
  if (u < static_cast<double>(b.flip + b.add + b.drop) / n) return Action::drop;
  return Action::keep;
}

Action Plan::decide(const rewrite::RecordResult& r, uint64_t hash) const {
  return decide(signature_of(r, groups.size()), hash);
}

namespace {

// Slack added to every tolerance bound, so that a share exactly on the bound (0.52 against
// 0.5 +- 0.02) counts as inside despite rounding.
constexpr double kSlack = 1e-9;
constexpr uint64_t kNone = std::numeric_limits<uint64_t>::max();
constexpr size_t kMoves = 3;  // flip, add, drop

using Vec = std::vector<double>;

// One inequality a . x + b >= 0 over the target groups' totals.
struct Constraint {
  enum Kind { lower, upper, mass } kind = mass;
  size_t group = 0;  // target index (lower, upper)
  Vec a;
  double b = 0;
  double eval(const Vec& x) const {
    double s = b;
    for (size_t i = 0; i < x.size(); ++i) s += a[i] * x[i];
    return s;
  }
  double dot(const Vec& d) const {
    double s = 0;
    for (size_t i = 0; i < d.size(); ++i) s += a[i] * d[i];
    return s;
  }
};

// Signatures whose records change the totals identically under every allowed action.
struct Class {
  uint64_t cap = 0;
  std::array<bool, kMoves> has{};
  std::array<Vec, kMoves> d;
  std::vector<std::pair<const Signature*, uint64_t>> members;  // signature, its records
};

using Counts = std::vector<std::array<uint64_t, kMoves>>;

struct Problem {
  size_t n = 0;  // target groups
  Vec x0;        // totals before
  std::vector<Constraint> cons;
  std::vector<Class> classes;
  // The inequalities the bound uses: each of cons alone (rows 0 .. cons.size() - 1), then
  // the sums of every subset of two or more of them (a sum of inequalities that hold holds
  // too; with several groups it sees that records raising one group's share do not raise
  // another's). For each row: the best a . d of each class over its moves (>= 0) and the
  // classes in decreasing order of it.
  std::vector<Constraint> rows;
  std::vector<std::vector<double>> best;     // [row][class]
  std::vector<std::vector<uint32_t>> order;  // [row]

  bool feasible(const Vec& x) const {
    for (const auto& c : cons)
      if (c.eval(x) < 0) return false;
    return true;
  }
  double violation(const Vec& x) const {
    double v = 0;
    for (const auto& c : cons) v += std::max(0.0, -c.eval(x));
    return v;
  }

  void prepare_bounds() {
    rows = cons;
    const size_t J = cons.size();
    if (J <= 11) {
      for (uint32_t mask = 1; mask < (1u << J); ++mask) {
        if (std::has_single_bit(mask)) continue;
        Constraint sum;
        sum.kind = Constraint::mass;
        sum.a.assign(n, 0);
        for (size_t j = 0; j < J; ++j)
          if (mask & (1u << j)) {
            for (size_t i = 0; i < n; ++i) sum.a[i] += cons[j].a[i];
            sum.b += cons[j].b;
          }
        rows.push_back(std::move(sum));
      }
    }
    const size_t C = classes.size();
    best.assign(rows.size(), std::vector<double>(C, 0));
    order.assign(rows.size(), {});
    for (size_t r = 0; r < rows.size(); ++r) {
      for (size_t c = 0; c < C; ++c) {
        double b = 0;
        for (size_t m = 0; m < kMoves; ++m)
          if (classes[c].has[m]) b = std::max(b, rows[r].dot(classes[c].d[m]));
        best[r][c] = b;
        if (b > 0) order[r].push_back(static_cast<uint32_t>(c));
      }
      std::stable_sort(order[r].begin(), order[r].end(),
                       [&](uint32_t a, uint32_t b) { return best[r][a] > best[r][b]; });
    }
  }

  // The fewest records of classes [first, end) that make every row hold, each row taken
  // alone: a lower bound on any plan's changes from x (the exchange argument of the header).
  // kNone when some row cannot be made to hold; `failing` then names it. `work` counts the
  // classes looked at.
  uint64_t bound(const Vec& x, size_t first, size_t* failing, uint64_t* work) const {
    uint64_t lb = 0;
    for (size_t r = 0; r < rows.size(); ++r) {
      double deficit = -rows[r].eval(x);
      if (work) ++*work;
      if (deficit <= 0) continue;
      double cum = 0;
      uint64_t need = 0;
      bool met = false;
      for (uint32_t c : order[r]) {
        if (work) ++*work;
        if (c < first) continue;
        double bj = best[r][c];
        double capd = static_cast<double>(classes[c].cap);
        if (cum + capd * bj >= deficit * (1 - 1e-12)) {
          double more = std::ceil((deficit - cum) / bj - 1e-9);
          need += more > 0 ? static_cast<uint64_t>(more) : 0;
          met = true;
          break;
        }
        cum += capd * bj;
        need += classes[c].cap;
      }
      if (!met) {
        if (failing) *failing = r;
        return kNone;
      }
      lb = std::max(lb, need);
    }
    return lb;
  }
};

void axpy(Vec& x, double k, const Vec& d) {
  for (size_t i = 0; i < x.size(); ++i) x[i] += k * d[i];
}

// The number of records q in [1, cap] of direction d that lowers V(x + q d) the most (the
// smallest such q), given that q = 1 lowers it. V is convex and piecewise linear in q.
uint64_t best_count(const Problem& P, const Vec& x, const Vec& d, uint64_t cap) {
  double slope = 0, total = 0;
  std::vector<std::pair<double, double>> breaks;
  for (const auto& c : P.cons) {
    double g = c.eval(x), ad = c.dot(d);
    total += std::abs(ad);
    if (g < 0 || (g == 0 && ad < 0)) slope -= ad;
    if (ad != 0) {
      double q = -g / ad;
      if (q > 0) breaks.emplace_back(q, std::abs(ad));
    }
  }
  std::sort(breaks.begin(), breaks.end());
  double qstar = std::numeric_limits<double>::infinity();
  for (const auto& [q, inc] : breaks) {
    slope += inc;
    if (slope >= -1e-12 * total) {
      qstar = q;
      break;
    }
  }
  const double capd = static_cast<double>(cap);
  if (!(qstar < capd)) return cap;
  uint64_t lo = std::max<uint64_t>(1, static_cast<uint64_t>(std::floor(qstar)));
  uint64_t hi =
      std::min<uint64_t>(cap, std::max<uint64_t>(1, static_cast<uint64_t>(std::ceil(qstar))));
  if (lo >= hi) return lo;
  Vec xl = x, xh = x;
  axpy(xl, static_cast<double>(lo), d);
  axpy(xh, static_cast<double>(hi), d);
  if (P.feasible(xl)) return lo;
  if (P.feasible(xh)) return hi;
  return P.violation(xl) <= P.violation(xh) ? lo : hi;
}

// Step 1 of the header comment. Returns whether the target was reached; `counts` and
// `x` receive the changes and the totals they give.
bool greedy(const Problem& P, Counts& counts, Vec& x) {
  const size_t C = P.classes.size();
  counts.assign(C, {0, 0, 0});
  std::vector<uint64_t> used(C, 0);
  x = P.x0;
  Vec trial;
  for (int step = 0; step < 1'000'000; ++step) {
    if (P.feasible(x)) return true;
    double v = P.violation(x);
    double best_red = 1e-12 * (1 + v);
    size_t best_c = C, best_m = 0;
    for (size_t c = 0; c < C; ++c) {
      if (used[c] >= P.classes[c].cap) continue;
      for (size_t m = 0; m < kMoves; ++m) {
        if (!P.classes[c].has[m]) continue;
        trial = x;
        axpy(trial, 1, P.classes[c].d[m]);
        double red = v - P.violation(trial);
        if (red > best_red) {
          best_red = red;
          best_c = c;
          best_m = m;
        }
      }
    }
    if (best_c == C) return false;
    const Vec& d = P.classes[best_c].d[best_m];
    uint64_t q = best_count(P, x, d, P.classes[best_c].cap - used[best_c]);
    axpy(x, static_cast<double>(q), d);
    used[best_c] += q;
    counts[best_c][best_m] += q;
  }
  return P.feasible(x);
}

// After the greedy has reached the target: takes back changes that are not needed (an early
// step may have moved mass that later steps made up for). Along the direction of taking
// back q changes of one kind, the target's region is an interval containing q = 0, so the
// most that can go is read off the inequalities. Returns how many changes went.
uint64_t take_back(const Problem& P, Counts& counts, Vec& x) {
  uint64_t removed = 0;
  for (int pass = 0, again = 1; again && pass < 1000; ++pass) {
    again = 0;
    for (size_t c = 0; c < P.classes.size(); ++c) {
      for (size_t m = 0; m < kMoves; ++m) {
        uint64_t k = counts[c][m];
        if (k == 0) continue;
        const Vec& d = P.classes[c].d[m];
        double qmax = static_cast<double>(k);
        for (const auto& con : P.cons) {
          double ad = con.dot(d);
          if (ad > 0) qmax = std::min(qmax, std::floor(con.eval(x) / ad));
        }
        uint64_t q = qmax > 0 ? static_cast<uint64_t>(qmax) : 0;
        while (q > 0) {  // guard against rounding at the boundary
          Vec y = x;
          axpy(y, -static_cast<double>(q), d);
          if (P.feasible(y)) {
            x = std::move(y);
            break;
          }
          --q;
        }
        if (q == 0) continue;
        counts[c][m] -= q;
        removed += q;
        again = 1;
      }
    }
  }
  return removed;
}

// Step 3 of the header comment: branch and bound over the classes in order.
class Search {
 public:
  Search(const Problem& P, uint64_t limit, uint64_t best, Counts best_counts)
      : P_(P), limit_(limit), best_(best), best_counts_(std::move(best_counts)) {
    cur_.assign(P.classes.size(), {0, 0, 0});
  }
  Search(const Search&) = delete;
  Search& operator=(const Search&) = delete;

  void run() {
    Vec x = P_.x0;
    dfs(0, x, 0);
  }
  bool aborted() const { return aborted_; }
  uint64_t best() const { return best_; }
  const Counts& best_counts() const { return best_counts_; }

 private:
  void dfs(size_t i, const Vec& x, uint64_t cost) {
    if (aborted_) return;
    if (++work_ > limit_) {
      aborted_ = true;
      return;
    }
    if (P_.feasible(x)) {
      if (cost < best_) {
        best_ = cost;
        best_counts_ = cur_;
      }
      return;
    }
    if (i == P_.classes.size() || cost + 1 >= best_) return;
    uint64_t lb = P_.bound(x, i, nullptr, &work_);
    if (lb == kNone || cost + lb >= best_) return;
    std::string key(sizeof(size_t) + x.size() * sizeof(double), '\0');
    std::memcpy(key.data(), &i, sizeof(size_t));
    std::memcpy(key.data() + sizeof(size_t), x.data(), x.size() * sizeof(double));
    auto [it, fresh] = memo_.try_emplace(std::move(key), cost);
    if (!fresh) {
      if (it->second <= cost) return;
      it->second = cost;
    }
    const Class& cls = P_.classes[i];
    std::array<size_t, kMoves> moves{};
    size_t nm = 0;
    for (size_t m = 0; m < kMoves; ++m)
      if (cls.has[m]) moves[nm++] = m;
    Vec y = x;
    choose(i, moves, nm, 0, cls.cap, y, cost);
    cur_[i] = {0, 0, 0};
  }

  // Chooses the count of moves[k..nm) of class i, `left` records of it still free.
  void choose(size_t i, const std::array<size_t, kMoves>& moves, size_t nm, size_t k, uint64_t left,
              Vec& y, uint64_t cost) {
    if (k == nm) {
      dfs(i + 1, y, cost);
      return;
    }
    const size_t m = moves[k];
    const Vec& d = P_.classes[i].d[m];
    for (uint64_t q = 0; q <= left; ++q) {
      if (aborted_ || (q > 0 && cost + q >= best_)) break;
      Vec z = y;
      axpy(z, static_cast<double>(q), d);
      cur_[i][m] = q;
      choose(i, moves, nm, k + 1, left - q, z, cost + q);
    }
    cur_[i][m] = 0;
  }

  const Problem& P_;
  uint64_t limit_;
  uint64_t work_ = 0;
  bool aborted_ = false;
  uint64_t best_;
  Counts best_counts_;
  Counts cur_;
  std::unordered_map<std::string, uint64_t> memo_;
};

std::string fmt(double v) {
  char buf[32];
  auto r = std::to_chars(buf, buf + sizeof buf, v, std::chars_format::fixed, 3);
  return std::string(buf, r.ptr);
}

std::string share_text(const Vec& x, size_t i, const Plan& plan) {
  double T = 0;
  for (double v : x) T += v;
  const double p = plan.outcome[i].target_share;
  return "the share of '" + plan.target[i].group + "' by " + basis_name(plan.basis) + " is " +
         fmt(T > 0 ? x[i] / T : 0) + " (target " + fmt(p) + " +- " + fmt(plan.tolerance) + ")";
}

std::string allowed_text(const PlanOptions& o) {
  std::string s;
  auto add = [&](const char* a) {
    if (!s.empty()) s += ", ";
    s += a;
  };
  if (o.allow_flip) add("flip");
  if (o.allow_add) add("add");
  if (o.allow_drop) add("drop");
  return s.empty() ? "none" : s;
}

}  // namespace

Result<Plan> make_plan(const Tally& tally, const PlanOptions& options, Infeasibility* why) {
  auto fail = [&](Infeasibility kind, const std::string& reason) -> Error {
    if (why) *why = kind;
    return make_error(ErrorKind::usage, "", reason);
  };
  if (why) *why = Infeasibility::none;

  Plan plan;
  plan.axis = tally.axis;
  plan.groups = tally.groups;
  plan.pack_sha256 = tally.pack_sha256;
  plan.target = options.target;
  plan.basis = options.basis;
  plan.tolerance = options.tolerance;
  plan.allow_flip = options.allow_flip;
  plan.allow_add = options.allow_add;
  plan.allow_drop = options.allow_drop;
  plan.tally_records = tally.records;

  // ---- The target ----
  if (!(options.tolerance >= 0 && options.tolerance < 1))
    return fail(Infeasibility::bad_target, "tolerance must be at least 0 and below 1");
  if (options.target.size() < 2)
    return fail(Infeasibility::bad_target, "the target must name at least two groups");
  std::vector<size_t> gi;  // target index -> group index
  double wsum = 0;
  for (const auto& t : options.target) {
    auto it = std::find(tally.groups.begin(), tally.groups.end(), t.group);
    if (it == tally.groups.end()) {
      std::string names;
      for (const auto& g : tally.groups) names += (names.empty() ? "" : ", ") + g;
      return fail(Infeasibility::bad_target, "'" + t.group + "' is not a group of axis '" +
                                                 tally.axis + "' (groups: " + names + ")");
    }
    size_t g = static_cast<size_t>(it - tally.groups.begin());
    if (std::find(gi.begin(), gi.end(), g) != gi.end())
      return fail(Infeasibility::bad_target, "the target names '" + t.group + "' twice");
    if (!std::isfinite(t.weight) || t.weight < 0)
      return fail(Infeasibility::bad_target,
                  "the weight of '" + t.group + "' must be finite and not negative");
    gi.push_back(g);
    wsum += t.weight;
  }
  if (!(wsum > 0)) return fail(Infeasibility::bad_target, "the target's weights are all 0");

  Problem P;
  P.n = gi.size();
  Vec p(P.n);
  for (size_t i = 0; i < P.n; ++i) p[i] = options.target[i].weight / wsum;
  const double tol = options.tolerance;
  for (size_t i = 0; i < P.n; ++i) {
    Constraint lo, hi;
    lo.kind = Constraint::lower;
    hi.kind = Constraint::upper;
    lo.group = hi.group = i;
    lo.a.assign(P.n, -(p[i] - tol - kSlack));
    hi.a.assign(P.n, p[i] + tol + kSlack);
    lo.a[i] += 1;
    hi.a[i] -= 1;
    P.cons.push_back(std::move(lo));
    P.cons.push_back(std::move(hi));
  }
  Constraint mass;
  mass.kind = Constraint::mass;
  mass.a.assign(P.n, 1);
  mass.b = -1;
  P.cons.push_back(std::move(mass));

  // ---- Per-record values of each signature in the basis ----
  auto values = [&](const Signature& s, const SignatureTotals& t, bool after) {
    Vec v(P.n, 0);
    const double n = static_cast<double>(t.records);
    for (size_t i = 0; i < P.n; ++i) {
      if (options.basis == Basis::mentions) {
        const auto& sums = after ? t.after : t.before;
        v[i] = gi[i] < sums.size() ? static_cast<double>(sums[gi[i]]) / n : 0;
      } else {
        int16_t lead = after ? s.lead_after : s.lead_before;
        v[i] = lead == static_cast<int16_t>(gi[i]) ? 1 : 0;
      }
    }
    return v;
  };
  P.x0.assign(P.n, 0);
  std::map<std::vector<double>, size_t> class_of;
  for (const auto& [sig, tot] : tally.signatures) {
    Vec before = values(sig, tot, false);
    axpy(P.x0, static_cast<double>(tot.records), before);
    Class c;
    if (sig.changeable) {
      Vec after = values(sig, tot, true);
      Vec flip = after;
      axpy(flip, -1, before);
      c.has[0] = options.allow_flip;
      c.d[0] = std::move(flip);
      c.has[1] = options.allow_add;
      c.d[1] = after;
    }
    c.has[2] = options.allow_drop;
    c.d[2] = before;
    for (double& v : c.d[2]) v = -v;
    std::vector<double> key;
    for (size_t m = 0; m < kMoves; ++m) {
      if (c.has[m] && std::all_of(c.d[m].begin(), c.d[m].end(), [](double v) { return v == 0; }))
        c.has[m] = false;  // a move that changes nothing never helps
      if (!c.has[m]) c.d[m].assign(P.n, 0);
      key.push_back(c.has[m] ? 1 : 0);
      key.insert(key.end(), c.d[m].begin(), c.d[m].end());
    }
    if (!c.has[0] && !c.has[1] && !c.has[2]) continue;
    auto [it, fresh] = class_of.try_emplace(key, P.classes.size());
    if (fresh) P.classes.push_back(std::move(c));
    P.classes[it->second].cap += tot.records;
    P.classes[it->second].members.emplace_back(&sig, tot.records);
  }

  // Outcome skeleton (for messages, and filled in at the end).
  for (size_t i = 0; i < P.n; ++i) {
    GroupOutcome o;
    o.group = options.target[i].group;
    o.target_share = p[i];
    plan.outcome.push_back(o);
  }

  // ---- Groups that never occur ----
  for (size_t i = 0; i < P.n; ++i) {
    if (p[i] - tol <= kSlack) continue;
    const size_t g = gi[i];
    bool occurs = g < tally.by_group.size() && tally.by_group[g].mentions > 0;
    for (const auto& [sig, tot] : tally.signatures)
      if (sig.changeable && g < tot.after.size() && tot.after[g] > 0) occurs = true;
    if (!occurs)
      return fail(Infeasibility::group_absent,
                  "target not reachable: group '" + options.target[i].group +
                      "' is never mentioned in this corpus, neither as read nor in any "
                      "counterfactual (has the pack any forms for it on axis '" +
                      tally.axis + "'?)");
  }

  // ---- Lower bound; a row that no change can satisfy proves the target infeasible ----
  const size_t C = P.classes.size();
  P.prepare_bounds();
  size_t failing = 0;
  const uint64_t lb = P.bound(P.x0, 0, &failing, nullptr);
  if (lb == kNone && failing >= P.cons.size())
    return fail(Infeasibility::no_combination,
                "target not reachable: each group's share can be brought within the "
                "tolerance alone, but no combination of allowed changes (" +
                    allowed_text(options) + ") brings all of them within it at once");
  if (lb == kNone) {
    const Constraint& c = P.cons[failing];
    uint64_t helpers = 0;
    for (uint32_t k : P.order[failing]) helpers += P.classes[k].cap;
    std::string what;
    if (c.kind == Constraint::mass) {
      what = "there are no " + std::string(basis_name(options.basis)) +
             " of the target's groups to share";
    } else {
      what = share_text(P.x0, c.group, plan);
    }
    const char* dir = c.kind == Constraint::upper ? "lower" : "raise";
    if (helpers == 0)
      return fail(Infeasibility::no_mover, "target not reachable: " + what +
                                               ", and no allowed change (" + allowed_text(options) +
                                               ") of any record would " + dir +
                                               " it: no record's counterfactual moves " +
                                               basis_name(options.basis) + " that way");
    return fail(Infeasibility::not_enough,
                "target not reachable: " + what + ", and even changing every record that " +
                    "would " + dir + " it (" + std::to_string(helpers) +
                    " of them) falls short (allowed: " + allowed_text(options) + ")");
  }

  // ---- Greedy, then the exact search when the greedy is not proven minimal ----
  Counts counts;
  Vec x;
  bool reached = greedy(P, counts, x);
  uint64_t changed = kNone;
  if (reached) take_back(P, counts, x);
  if (reached) {
    changed = 0;
    for (const auto& c : counts) changed += c[0] + c[1] + c[2];
  }
  bool minimal = reached && changed == lb;
  uint64_t lower = lb;
  if (!minimal) {
    // Search the classes from the most helpful at the start.
    std::vector<size_t> perm(C);
    for (size_t c = 0; c < C; ++c) perm[c] = c;
    const double v0 = P.violation(P.x0);
    std::vector<double> gain(C, 0);
    for (size_t c = 0; c < C; ++c)
      for (size_t m = 0; m < kMoves; ++m)
        if (P.classes[c].has[m]) {
          Vec t = P.x0;
          axpy(t, 1, P.classes[c].d[m]);
          gain[c] = std::max(gain[c], v0 - P.violation(t));
        }
    std::stable_sort(perm.begin(), perm.end(),
                     [&](size_t a, size_t b) { return gain[a] > gain[b]; });
    Problem S;
    S.n = P.n;
    S.x0 = P.x0;
    S.cons = P.cons;
    for (size_t c : perm) S.classes.push_back(P.classes[c]);
    S.prepare_bounds();
    Counts start(C, {0, 0, 0});
    if (reached)
      for (size_t c = 0; c < C; ++c) start[c] = counts[perm[c]];
    Search search(S, options.search_limit, changed, start);
    search.run();
    if (search.best() != kNone) {
      reached = true;
      changed = search.best();
      for (size_t c = 0; c < C; ++c) counts[perm[c]] = search.best_counts()[c];
      x = P.x0;
      for (size_t c = 0; c < C; ++c)
        for (size_t m = 0; m < kMoves; ++m)
          axpy(x, static_cast<double>(counts[c][m]), P.classes[c].d[m]);
    }
    if (!search.aborted()) {
      if (!reached)
        return fail(Infeasibility::no_combination,
                    "target not reachable: each group's share can be brought within the "
                    "tolerance alone, but no combination of allowed changes (" +
                        allowed_text(options) + ") brings all of them within it at once");
      minimal = true;
      lower = changed;
    } else if (!reached) {
      return fail(Infeasibility::search_limit,
                  "no plan found: the greedy pass did not reach the target and the exact "
                  "search stopped at its limit of " +
                      std::to_string(options.search_limit) +
                      " steps (raise the limit or the tolerance)");
    } else {
      minimal = changed == lb;
    }
  }

  // ---- The plan: counts per signature, expected totals and their spread ----
  plan.lower_bound = lower;
  plan.minimal = minimal;
  plan.changed = changed;
  for (size_t c = 0; c < C; ++c) {
    std::array<uint64_t, kMoves> left = counts[c];
    for (const auto& [sig, n] : P.classes[c].members) {
      BinPlan bp;
      bp.records = n;
      uint64_t room = n;
      uint64_t* dst[kMoves] = {&bp.flip, &bp.add, &bp.drop};
      for (size_t m = 0; m < kMoves; ++m) {
        uint64_t k = std::min(room, left[m]);
        *dst[m] = k;
        left[m] -= k;
        room -= k;
      }
      if (bp.flip + bp.add + bp.drop == 0) continue;
      plan.flip += bp.flip;
      plan.add += bp.add;
      plan.drop += bp.drop;
      plan.bins.emplace(*sig, bp);
    }
  }
  Vec var(P.n, 0);
  for (const auto& [sig, bp] : plan.bins) {
    const SignatureTotals& tot = tally.signatures.at(sig);
    Vec before = values(sig, tot, false);
    Vec after = sig.changeable ? values(sig, tot, true) : Vec(P.n, 0);
    const double n = static_cast<double>(bp.records);
    const double pf = static_cast<double>(bp.flip) / n, pa = static_cast<double>(bp.add) / n,
                 pk = 1 - pf - pa - static_cast<double>(bp.drop) / n;
    for (size_t i = 0; i < P.n; ++i) {
      const double vk = before[i], vf = after[i], va = before[i] + after[i];
      const double mean = pk * vk + pf * vf + pa * va;
      const double sq = pk * vk * vk + pf * vf * vf + pa * va * va;
      var[i] += n * std::max(0.0, sq - mean * mean);  // a dropped record adds 0
    }
  }
  double T0 = 0, T1 = 0;
  for (size_t i = 0; i < P.n; ++i) {
    T0 += P.x0[i];
    T1 += x[i];
  }
  for (size_t i = 0; i < P.n; ++i) {
    GroupOutcome& o = plan.outcome[i];
    o.before = P.x0[i];
    o.after = x[i];
    o.share_before = T0 > 0 ? P.x0[i] / T0 : 0;
    o.share_after = T1 > 0 ? x[i] / T1 : 0;
    o.sd = std::sqrt(var[i]);
  }
  plan.reached = P.feasible(x);
  return plan;
}

}  // namespace evenhand::balance
