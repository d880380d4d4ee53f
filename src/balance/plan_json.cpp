// JSON form of plans ("evenhand.plan/1"): writing and parsing back.
#include <simdjson.h>

#include "audit/json_writer.h"
#include "balance/json_support.h"
#include "balance/plan.h"

namespace evenhand::balance {

std::string plan_to_json(const Plan& p, int indent) {
  std::string out;
  audit::JsonWriter w(out, indent);
  w.begin_object();
  detail::write_header_members(w, kPlanSchema, p.axis, p.groups, p.pack_sha256);
  w.key("target").begin_array();
  for (const auto& t : p.target) {
    w.begin_object();
    w.key("group").value(t.group);
    w.key("weight").value(t.weight);
    w.end_object();
  }
  w.end_array();
  w.key("basis").value(basis_name(p.basis));
  w.key("tolerance").value(p.tolerance);
  w.key("allowed").begin_object();
  w.key("flip").value(p.allow_flip);
  w.key("add").value(p.allow_add);
  w.key("drop").value(p.allow_drop);
  w.end_object();
  w.key("tally_records").value(p.tally_records);
  w.key("changed").value(p.changed);
  w.key("flip").value(p.flip);
  w.key("add").value(p.add);
  w.key("drop").value(p.drop);
  w.key("lower_bound").value(p.lower_bound);
  w.key("minimal").value(p.minimal);
  w.key("reached").value(p.reached);
  w.key("outcome").begin_array();
  for (const auto& o : p.outcome) {
    w.begin_object();
    w.key("group").value(o.group);
    w.key("target_share").value(o.target_share);
    w.key("before").value(o.before);
    w.key("after").value(o.after);
    w.key("share_before").value(o.share_before);
    w.key("share_after").value(o.share_after);
    w.key("sd").value(o.sd);
    w.end_object();
  }
  w.end_array();
  w.key("decision")
      .value(
          "a record of a signature with n records of which the plan flips f, adds a and drops d: "
          "u = hash_unit(stable_hash(seed, identity)); flip if u < f/n, else add if u < (f+a)/n, "
          "else drop if u < (f+a+d)/n, else keep");
  w.key("bins").begin_array();
  for (const auto& [sig, b] : p.bins) {
    w.begin_object();
    detail::write_signature_members(w, sig);
    w.key("records").value(b.records);
    w.key("flip").value(b.flip);
    w.key("add").value(b.add);
    w.key("drop").value(b.drop);
    w.end_object();
  }
  w.end_array();
  w.end_object();
  out += '\n';
  return out;
}

Result<Plan> plan_from_json(std::string_view json, const std::string& file) {
  using detail::bad_doc;
  simdjson::dom::parser parser;
  auto root = detail::parse_root(parser, json, file, kPlanSchema);
  if (!root.ok()) return std::move(root).error();
  simdjson::dom::object obj = *root;
  Plan p;
  EVENHAND_READ(p.axis, detail::get_str(obj, "axis", file, ""));
  EVENHAND_READ(p.groups, detail::get_str_array(obj, "groups", file, ""));
  EVENHAND_READ(p.pack_sha256, detail::get_str(obj, "pack_sha256", file, ""));
  const size_t n = p.groups.size();

  simdjson::dom::array target;
  EVENHAND_READ(target, detail::get_arr(obj, "target", file, ""));
  for (simdjson::dom::element e : target) {
    std::string where = "target[" + std::to_string(p.target.size()) + "]";
    simdjson::dom::object to;
    if (e.get_object().get(to) != simdjson::SUCCESS) return bad_doc(file, where, "not an object");
    TargetWeight t;
    EVENHAND_READ(t.group, detail::get_str(to, "group", file, where));
    EVENHAND_READ(t.weight, detail::get_f64(to, "weight", file, where));
    if (std::find(p.groups.begin(), p.groups.end(), t.group) == p.groups.end())
      return bad_doc(file, where + ".group", "'" + t.group + "' is not one of the groups");
    p.target.push_back(std::move(t));
  }
  std::string basis;
  EVENHAND_READ(basis, detail::get_str(obj, "basis", file, ""));
  auto b = parse_basis(basis);
  if (!b) return bad_doc(file, "basis", "must be 'mentions' or 'records'");
  p.basis = *b;
  EVENHAND_READ(p.tolerance, detail::get_f64(obj, "tolerance", file, ""));
  simdjson::dom::object allowed;
  EVENHAND_READ(allowed, detail::get_obj(obj, "allowed", file, ""));
  EVENHAND_READ(p.allow_flip, detail::get_bool(allowed, "flip", file, "allowed"));
  EVENHAND_READ(p.allow_add, detail::get_bool(allowed, "add", file, "allowed"));
  EVENHAND_READ(p.allow_drop, detail::get_bool(allowed, "drop", file, "allowed"));
  EVENHAND_READ(p.tally_records, detail::get_u64(obj, "tally_records", file, ""));
  EVENHAND_READ(p.changed, detail::get_u64(obj, "changed", file, ""));
  EVENHAND_READ(p.flip, detail::get_u64(obj, "flip", file, ""));
  EVENHAND_READ(p.add, detail::get_u64(obj, "add", file, ""));
  EVENHAND_READ(p.drop, detail::get_u64(obj, "drop", file, ""));
  EVENHAND_READ(p.lower_bound, detail::get_u64(obj, "lower_bound", file, ""));
  EVENHAND_READ(p.minimal, detail::get_bool(obj, "minimal", file, ""));
  EVENHAND_READ(p.reached, detail::get_bool(obj, "reached", file, ""));

  simdjson::dom::array outcome;
  EVENHAND_READ(outcome, detail::get_arr(obj, "outcome", file, ""));
  for (simdjson::dom::element e : outcome) {
    std::string where = "outcome[" + std::to_string(p.outcome.size()) + "]";
    simdjson::dom::object oo;
    if (e.get_object().get(oo) != simdjson::SUCCESS) return bad_doc(file, where, "not an object");
    GroupOutcome o;
    EVENHAND_READ(o.group, detail::get_str(oo, "group", file, where));
    EVENHAND_READ(o.target_share, detail::get_f64(oo, "target_share", file, where));
    EVENHAND_READ(o.before, detail::get_f64(oo, "before", file, where));
    EVENHAND_READ(o.after, detail::get_f64(oo, "after", file, where));
    EVENHAND_READ(o.share_before, detail::get_f64(oo, "share_before", file, where));
    EVENHAND_READ(o.share_after, detail::get_f64(oo, "share_after", file, where));
    EVENHAND_READ(o.sd, detail::get_f64(oo, "sd", file, where));
    if (p.outcome.size() >= p.target.size() || o.group != p.target[p.outcome.size()].group)
      return bad_doc(file, where, "does not match the target's groups");
    p.outcome.push_back(std::move(o));
  }
  if (p.outcome.size() != p.target.size())
    return bad_doc(file, "outcome", "does not match the target's groups");

  simdjson::dom::array bins;
  EVENHAND_READ(bins, detail::get_arr(obj, "bins", file, ""));
  size_t index = 0;
  uint64_t flips = 0, adds = 0, drops = 0;
  for (simdjson::dom::element e : bins) {
    std::string where = "bins[" + std::to_string(index++) + "]";
    simdjson::dom::object bo;
    if (e.get_object().get(bo) != simdjson::SUCCESS) return bad_doc(file, where, "not an object");
    Signature sig;
    EVENHAND_READ(sig, detail::read_signature(bo, n, file, where));
    BinPlan bp;
    EVENHAND_READ(bp.records, detail::get_u64(bo, "records", file, where));
    EVENHAND_READ(bp.flip, detail::get_u64(bo, "flip", file, where));
    EVENHAND_READ(bp.add, detail::get_u64(bo, "add", file, where));
    EVENHAND_READ(bp.drop, detail::get_u64(bo, "drop", file, where));
    if (bp.flip > bp.records || bp.add > bp.records - bp.flip ||
        bp.drop > bp.records - bp.flip - bp.add)
      return bad_doc(file, where, "changes more records than the signature has");
    if (!sig.changeable && (bp.flip || bp.add))
      return bad_doc(file, where, "flips or adds records that are not changeable");
    if ((bp.flip && !p.allow_flip) || (bp.add && !p.allow_add) || (bp.drop && !p.allow_drop))
      return bad_doc(file, where, "uses an action the plan does not allow");
    flips += bp.flip;
    adds += bp.add;
    drops += bp.drop;
    if (!p.bins.emplace(std::move(sig), bp).second)
      return bad_doc(file, where, "repeats an earlier signature");
  }
  if (flips != p.flip || adds != p.add || drops != p.drop)
    return bad_doc(file, "bins", "do not add up to the plan's flip, add and drop counts");
  if (p.changed != p.flip + p.add + p.drop)
    return bad_doc(file, "changed", "is not flip + add + drop");
  if (p.lower_bound > p.changed) return bad_doc(file, "lower_bound", "exceeds changed");
  return p;
}

}  // namespace evenhand::balance
