#include "review/manifest_view.h"

#include <simdjson.h>

#include "audit/manifest.h"

namespace evenhand::review {

namespace {

using simdjson::dom::element;

std::string str(element e, const char* key) {
  std::string_view v;
  if (e[key].get_string().get(v)) return {};
  return std::string(v);
}

uint64_t num(element e, const char* key) {
  uint64_t v = 0;
  if (!e[key].get_uint64().get(v)) return v;
  double d = 0;
  if (!e[key].get_double().get(d) && d >= 0) return static_cast<uint64_t>(d);
  return 0;
}

std::vector<std::pair<std::string, uint64_t>> counts(element obj) {
  std::vector<std::pair<std::string, uint64_t>> out;
  simdjson::dom::object o;
  if (obj.get_object().get(o)) return out;
  for (auto m : o) {
    uint64_t v = 0;
    if (!m.value.get_uint64().get(v)) out.emplace_back(std::string(m.key), v);
  }
  return out;
}

std::vector<std::pair<std::string, double>> reals(element obj) {
  std::vector<std::pair<std::string, double>> out;
  simdjson::dom::object o;
  if (obj.get_object().get(o)) return out;
  for (auto m : o) {
    double v = 0;
    if (!m.value.get_double().get(v)) out.emplace_back(std::string(m.key), v);
  }
  return out;
}

// The "balance" section; an error names the key that is missing or of the wrong type.
Result<BalanceView> balance_view(element b, const std::string& path) {
  auto fail = [&](const char* key) {
    return make_error(ErrorKind::input, path,
                      std::string("'balance.") + key + "' is missing or of the wrong type");
  };
  BalanceView v;
  v.plan = str(b, "plan");
  v.basis = str(b, "basis");
  if (v.basis != "mentions" && v.basis != "records") return fail("basis");
  v.target = reals(b["target"]);
  if (v.target.empty()) return fail("target");
  if (b["tolerance"].get_double().get(v.tolerance)) return fail("tolerance");
  if (b["planned_tolerance"].get_double().get(v.planned_tolerance)) v.planned_tolerance = 0;
  if (b["planned_changed"].get_uint64().get(v.planned_changed)) return fail("planned_changed");
  if (b["lower_bound"].get_uint64().get(v.lower_bound)) return fail("lower_bound");
  if (b["minimal"].get_bool().get(v.minimal)) return fail("minimal");
  v.expected_share = reals(b["expected_share"]);
  v.actions = counts(b["actions"]);
  return v;
}

std::vector<FileRow> files(element arr) {
  std::vector<FileRow> out;
  simdjson::dom::array a;
  if (arr.get_array().get(a)) return out;
  for (element f : a) {
    FileRow r;
    r.role = str(f, "role");
    r.path = str(f, "path");
    r.compression = str(f, "compression");
    r.sha256 = str(f, "sha256");
    r.bytes = num(f, "bytes");
    r.records = num(f, "records");
    out.push_back(std::move(r));
  }
  return out;
}

}  // namespace

uint64_t ManifestView::record_count(const std::string& key) const {
  for (const auto& [k, v] : records)
    if (k == key) return v;
  return 0;
}

Result<ManifestView> read_manifest(const std::string& path) {
  simdjson::dom::parser parser;
  element doc;
  auto fail = [&](const std::string& why) { return make_error(ErrorKind::input, path, why); };
  if (auto err = parser.load(path).get(doc))
    return fail(std::string("cannot read manifest: ") + simdjson::error_message(err));
  if (!doc.is_object() || str(doc, "schema") != audit::kManifestSchema)
    return fail(std::string("not a manifest of schema ") + audit::kManifestSchema);
  ManifestView m;
  m.path = path;
  m.tool_version = str(doc["tool"], "version");
  m.started_at = str(doc, "started_at");
  simdjson::dom::array cl;
  if (!doc["command_line"].get_array().get(cl))
    for (element a : cl) {
      std::string_view s;
      if (!a.get_string().get(s)) m.command_line.emplace_back(s);
    }
  element pack;
  if (!doc["pack"].get(pack) && pack.is_object()) {
    m.pack_name = str(pack, "name");
    m.pack_version = str(pack, "version");
    m.pack_sha256 = str(pack, "sha256");
    m.axis = str(pack, "axis");
  }
  element opts;
  if (doc["options"].get(opts) || !opts.is_object()) return fail("'options' is missing");
  m.mode = str(opts, "mode");
  m.format = str(opts, "format");
  bool para = false;
  if (!opts["paragraphs"].get_bool().get(para)) m.paragraphs = para;
  m.max_record_bytes = num(opts, "max_record_bytes");
  simdjson::dom::array fl;
  if (!opts["fields"].get_array().get(fl))
    for (element a : fl) {
      std::string_view s;
      if (!a.get_string().get(s)) m.fields.emplace_back(s);
    }
  m.inputs = files(doc["inputs"]);
  m.outputs = files(doc["outputs"]);
  element recs;
  if (doc["records"].get(recs) || !recs.is_object()) return fail("'records' is missing");
  m.records = counts(recs);
  m.guarded_by_reason = counts(recs["guarded_by_reason"]);
  m.flagged_by_reason = counts(recs["flagged_by_reason"]);
  m.rejected_by_reason = counts(recs["rejected_by_reason"]);
  simdjson::dom::object groups;
  if (doc["groups"].get_object().get(groups)) return fail("'groups' is missing");
  for (auto axis : groups) {
    simdjson::dom::object gs;
    if (axis.value.get_object().get(gs))
      return fail("'groups." + std::string(axis.key) + "' is not an object");
    for (auto g : gs) {
      GroupRow row;
      row.name = std::string(g.key);
      row.before_mentions = num(g.value["before"], "mentions");
      row.before_records = num(g.value["before"], "records");
      row.after_mentions = num(g.value["after"], "mentions");
      row.after_records = num(g.value["after"], "records");
      simdjson::dom::object planned;
      if (!g.value["planned"].get_object().get(planned))
        for (auto p : planned) {
          double d = 0;
          if (!p.value.get_double().get(d)) {
            row.planned = d;
            row.planned_basis = std::string(p.key);
          }
        }
      m.groups.push_back(std::move(row));
    }
  }
  element rw;
  if (!doc["rewrites"].get(rw) && rw.is_object()) {
    m.edits = num(rw, "edits");
    m.protected_skips = num(rw, "protected_skips");
    m.ambiguous = num(rw, "ambiguous");
    simdjson::dom::array hits;
    if (!rw["entry_hits"].get_array().get(hits))
      for (element h : hits) {
        bool word = false;
        if (h["common_word"].get_bool().get(word)) word = false;
        m.entry_hits.push_back({str(h, "rule"), str(h, "forms"), num(h, "hits"), word});
      }
  }
  element bal;
  if (!doc["balance"].get(bal)) {
    if (!bal.is_object()) return fail("'balance' is not an object");
    auto b = balance_view(bal, path);
    if (!b.ok()) return std::move(b).error();
    m.balance = std::move(*b);
  }
  return m;
}

}  // namespace evenhand::review
