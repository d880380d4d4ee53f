// `evenhand merge-manifests`: adds up the manifests of runs over the shards of one corpus
// into the manifest of the whole. Counts are summed, file lists concatenated, entry hits
// merged by rule; identity fields (schema, tool, pack, options, plan) must agree, and a run
// given twice (same start time, inputs and outputs) is refused rather than counted twice.
#include <simdjson.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <map>
#include <memory>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

#include "audit/json_writer.h"
#include "audit/manifest.h"
#include "cli/cli.h"
#include "cli/common.h"

namespace evenhand::cli {

namespace {

struct JMember;

// A JSON value with members kept in document order.
struct JVal {
  enum Kind { null, boolean, integer, real, string, array, object } kind = null;
  bool b = false;
  int64_t i = 0;
  double d = 0;
  std::string s;
  std::vector<JVal> items;
  // A vector of a type still incomplete here (allowed since C++17); a std::pair of JVal
  // would need JVal complete, which clang with libstdc++ refuses.
  std::vector<JMember> members;

  JVal* find(const std::string& k);
  const JVal* find(const std::string& k) const { return const_cast<JVal*>(this)->find(k); }
};

// One member of an object: its key and value.
struct JMember {
  JMember(std::string k, JVal v) : first(std::move(k)), second(std::move(v)) {}
  std::string first;
  JVal second;
};

JVal* JVal::find(const std::string& k) {
  for (auto& m : members)
    if (m.first == k) return &m.second;
  return nullptr;
}

JVal from_dom(simdjson::dom::element e) {
  JVal v;
  switch (e.type()) {
    case simdjson::dom::element_type::ARRAY:
      v.kind = JVal::array;
      for (auto x : e.get_array()) v.items.push_back(from_dom(x));
      break;
    case simdjson::dom::element_type::OBJECT:
      v.kind = JVal::object;
      for (auto f : e.get_object()) v.members.emplace_back(std::string(f.key), from_dom(f.value));
      break;
    case simdjson::dom::element_type::INT64:
      v.kind = JVal::integer;
      v.i = int64_t(e);
      break;
    case simdjson::dom::element_type::UINT64:
      v.kind = JVal::integer;
      v.i = static_cast<int64_t>(uint64_t(e));
      break;
    case simdjson::dom::element_type::DOUBLE:
      v.kind = JVal::real;
      v.d = double(e);
      break;
    case simdjson::dom::element_type::STRING:
      v.kind = JVal::string;
      v.s = std::string(std::string_view(e));
      break;
    case simdjson::dom::element_type::BOOL:
      v.kind = JVal::boolean;
      v.b = bool(e);
      break;
    case simdjson::dom::element_type::NULL_VALUE:
      break;
  }
  return v;
}

void write(audit::JsonWriter& w, const JVal& v) {
  switch (v.kind) {
    case JVal::null:
      w.null();
      break;
    case JVal::boolean:
      w.value(v.b);
      break;
    case JVal::integer:
      w.value(v.i);
      break;
    case JVal::real:
      w.value(v.d);
      break;
    case JVal::string:
      w.value(v.s);
      break;
    case JVal::array:
      w.begin_array();
      for (const auto& x : v.items) write(w, x);
      w.end_array();
      break;
    case JVal::object:
      w.begin_object();
      for (const auto& [k, x] : v.members) {
        w.key(k);
        write(w, x);
      }
      w.end_object();
      break;
  }
}

bool same(const JVal& a, const JVal& b) {
  std::string x, y;
  audit::JsonWriter wa(x), wb(y);
  write(wa, a);
  write(wb, b);
  return x == y;
}

// Adds `from` into `into`: integers and the numbers of count objects are summed, objects
// merged member by member. Returns false when the shapes differ.
bool add_counts(JVal& into, const JVal& from) {
  if (into.kind == JVal::integer && from.kind == JVal::integer) {
    into.i += from.i;
    return true;
  }
  if (into.kind == JVal::real && from.kind == JVal::real) {
    into.d += from.d;
    return true;
  }
  if (into.kind == JVal::object && from.kind == JVal::object) {
    for (const auto& [k, v] : from.members) {
      if (JVal* mine = into.find(k)) {
        if (!add_counts(*mine, v)) return false;
      } else {
        into.members.emplace_back(k, v);
      }
    }
    return true;
  }
  return same(into, from);
}

Status merge_into(JVal& total, const JVal& m, const std::string& path) {
  auto err = [&](const std::string& why) { return make_error(ErrorKind::input, path, why); };
  for (const char* k : {"schema", "pack", "options"}) {
    JVal* a = total.find(k);
    const JVal* b = nullptr;
    for (const auto& mm : m.members)
      if (mm.first == k) b = &mm.second;
    if (!a || !b || !same(*a, *b))
      return err(std::string("'") + k +
                 "' differs from the first manifest's; shards must be "
                 "runs of the same pack and options");
  }
  for (const auto& [k, v] : m.members) {
    JVal* t = total.find(k);
    if (!t) {
      total.members.emplace_back(k, v);
      continue;
    }
    if (k == "inputs" || k == "outputs" || k == "rejections") {
      for (const auto& x : v.items) t->items.push_back(x);
      if (k == "rejections" && t->items.size() > 100) t->items.resize(100);
    } else if (k == "command_line") {
      // kept from the first manifest; every shard's command line goes into "shards"
    } else if (k == "records" || k == "fields") {
      if (!add_counts(*t, v)) return err("'" + k + "' has another shape");
    } else if (k == "groups") {
      // Sum before/after; the planned totals belong to the shared plan and stay as they are.
      for (const auto& [axis, groups] : v.members) {
        JVal* ta = t->find(axis);
        if (!ta) return err("axis '" + axis + "' is not in the first manifest");
        for (const auto& [g, counts] : groups.members) {
          JVal* tg = ta->find(g);
          if (!tg) return err("group '" + g + "' is not in the first manifest");
          for (const auto& [which, c] : counts.members) {
            if (which == "planned") continue;
            JVal* tc = tg->find(which);
            if (!tc || !add_counts(*tc, c)) return err("group counts have another shape");
          }
        }
      }
    } else if (k == "rewrites") {
      for (const auto& [rk, rv] : v.members) {
        JVal* tr = t->find(rk);
        if (!tr) {
          t->members.emplace_back(rk, rv);
        } else if (rk == "entry_hits") {
          for (const auto& hit : rv.items) {
            const JVal* rule = nullptr;
            const JVal* hits = nullptr;
            for (const auto& hm : hit.members) {
              if (hm.first == "rule") rule = &hm.second;
              if (hm.first == "hits") hits = &hm.second;
            }
            bool found = false;
            for (auto& mine : tr->items) {
              JVal* r = mine.find("rule");
              if (r && rule && r->s == rule->s) {
                if (JVal* h = mine.find("hits"); h && hits) h->i += hits->i;
                found = true;
                break;
              }
            }
            if (!found) tr->items.push_back(hit);
          }
          std::stable_sort(tr->items.begin(), tr->items.end(), [](const JVal& x, const JVal& y) {
            const JVal* rx = x.find("rule");
            const JVal* ry = y.find("rule");
            return rx && ry && audit::rule_less(rx->s, ry->s);
          });
        } else if (!add_counts(*tr, rv)) {
          return err("'rewrites." + rk + "' has another shape");
        }
      }
    } else if (k == "balance") {
      JVal copy = v;
      JVal* a = t->find("actions");
      JVal* b = copy.find("actions");
      if (a && b && !add_counts(*a, *b)) return err("'balance.actions' has another shape");
      if (b) *b = *a;
      if (!same(*t, copy)) return err("'balance' differs: shards must apply one plan");
    } else if (k == "timing") {
      for (const auto& [tk, tv] : v.members) {
        JVal* tt = t->find(tk);
        if (!tt) continue;
        if (tk == "seconds") tt->d += tv.kind == JVal::real ? tv.d : static_cast<double>(tv.i);
        if (tk == "threads" && tv.i > tt->i) tt->i = tv.i;
      }
    }
  }
  return ok_status();
}

// What tells one run from another: its start time and the paths and hashes of the files it
// read and wrote. Two manifests with the same identity are one run given twice.
std::string run_identity(const JVal& m) {
  JVal id;
  id.kind = JVal::object;
  for (const char* k : {"started_at", "inputs", "outputs"})
    if (const JVal* v = m.find(k)) id.members.emplace_back(k, *v);
  std::string text;
  audit::JsonWriter w(text);
  write(w, id);
  return text;
}

}  // namespace

int merge_manifests_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  std::vector<std::string> inputs;
  std::string out;
  opts.add_options()("help,h", "show this help")(
      "manifest", po::value(&inputs)->value_name("PATH")->composing(),
      "a shard's manifest; repeatable, or positional")(
      "out", po::value(&out)->value_name("PATH"), "write the merged manifest here ('-' is stdout)");
  po::positional_options_description pos;
  pos.add("manifest", -1);
  po::variables_map vm;
  int rc = parse_args("merge-manifests", "SHARD.json [SHARD.json ...] --out WHOLE.json", opts, args,
                      vm, &pos);
  if (rc >= 0) return rc;
  if (inputs.empty() || out.empty()) {
    print_error("merge-manifests: give the shard manifests and --out");
    return kUsage;
  }
  std::vector<io::NamedPath> ins;
  for (const auto& in : inputs) ins.push_back({in, "--manifest"});
  rc = check_outputs("merge-manifests", ins, {{out, "--out"}});
  if (rc >= 0) return rc;
  simdjson::dom::parser parser;
  JVal total;
  JVal shards;
  shards.kind = JVal::array;
  std::vector<std::string> identities;  // per argument read so far
  for (size_t n = 0; n < inputs.size(); ++n) {
    simdjson::dom::element doc;
    auto error = parser.load(inputs[n]).get(doc);
    if (error) {
      return report(
          make_error(ErrorKind::input, inputs[n],
                     std::string("cannot read manifest: ") + simdjson::error_message(error)));
    }
    JVal m = from_dom(doc);
    const JVal* schema = m.find("schema");
    if (m.kind != JVal::object || !schema || schema->s != audit::kManifestSchema) {
      return report(make_error(ErrorKind::input, inputs[n],
                               std::string("not a manifest of schema ") + audit::kManifestSchema));
    }
    identities.push_back(run_identity(m));
    for (size_t k = 0; k + 1 < identities.size(); ++k) {
      if (identities[k] == identities.back()) {
        print_error("merge-manifests: " + inputs[n] + " is the same run as " + inputs[k] +
                    " (same start time, inputs and outputs); each run counts once");
        return kUsage;
      }
    }
    if (const JVal* cl = m.find("command_line")) shards.items.push_back(*cl);
    if (n == 0) {
      total = std::move(m);
    } else {
      Status s = merge_into(total, m, inputs[n]);
      if (!s.ok()) return report(s.error());
    }
  }
  // Rates follow from the summed counts.
  if (JVal* timing = total.find("timing")) {
    JVal* secs = timing->find("seconds");
    JVal* rps = timing->find("records_per_second");
    JVal* mbs = timing->find("mb_per_second");
    double seconds = secs ? (secs->kind == JVal::real ? secs->d : secs->i) : 0;
    double records = 0, bytes = 0;
    if (JVal* recs = total.find("records"))
      if (JVal* read = recs->find("read")) records = static_cast<double>(read->i);
    if (JVal* ins = total.find("inputs"))
      for (auto& f : ins->items)
        if (JVal* db = f.find("data_bytes")) bytes += static_cast<double>(db->i);
    if (rps) *rps = JVal{JVal::real, false, 0, seconds > 0 ? records / seconds : 0, {}, {}, {}};
    if (mbs) *mbs = JVal{JVal::real, false, 0, seconds > 0 ? bytes / 1e6 / seconds : 0, {}, {}, {}};
  }
  total.members.emplace_back("shards", std::move(shards));
  std::string text;
  audit::JsonWriter w(text, 2);
  write(w, total);
  text += '\n';
  Status s = write_file_atomic(out, text);
  if (!s.ok()) return report(s.error());
  return kOk;
}

}  // namespace evenhand::cli
