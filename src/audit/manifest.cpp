#include "audit/manifest.h"

#include <algorithm>
#include <cstdlib>

#include "audit/json_writer.h"
#include "evenhand/version.h"

namespace evenhand::audit {

namespace {

void write_file(JsonWriter& w, const FileInfo& f, bool output) {
  w.begin_object();
  if (output) w.key("role").value(f.role);
  w.key("path").value(f.path);
  w.key("compression").value(f.compression);
  w.key("bytes").value(f.bytes);
  if (!output) w.key("data_bytes").value(f.data_bytes);
  w.key("sha256").value(f.sha256);
  w.key("records").value(f.records);
  w.end_object();
}

void write_counts(JsonWriter& w, const std::map<std::string, uint64_t>& m) {
  w.begin_object();
  for (const auto& [k, v] : m) w.key(k).value(v);
  w.end_object();
}

void write_tally(JsonWriter& w, const GroupTally& t) {
  w.begin_object().key("mentions").value(t.mentions).key("records").value(t.records).end_object();
}

}  // namespace

bool rule_less(std::string_view a, std::string_view b) {
  auto split = [](std::string_view r) {
    size_t colon = r.rfind(':');
    if (colon == std::string_view::npos) return std::make_pair(r, 0ul);
    return std::make_pair(r.substr(0, colon),
                          std::strtoul(std::string(r.substr(colon + 1)).c_str(), nullptr, 10));
  };
  return split(a) < split(b);
}

std::pair<std::string, std::string> describe_entry(const pack::CompiledPack& pack, uint32_t index) {
  auto join = [](const std::vector<std::string>& forms) {
    std::string s;
    for (size_t i = 0; i < forms.size(); ++i) {
      if (i) s += '|';
      s += forms[i].empty() ? "-" : forms[i];
    }
    return s;
  };
  if (index < pack.sets().size()) {
    const auto& set = pack.sets()[index];
    std::string forms = join(set.forms);
    if (set.tag != pack::Tag::none) forms += std::string(" @") + pack::tag_name(set.tag);
    return {set.where.str(), forms};
  }
  size_t n = index - pack.sets().size();
  if (n < pack.names().size()) {
    return {pack.names()[n].where.str(), join(pack.names()[n].names)};
  }
  return {"?", "?"};
}

std::string render_manifest(const ManifestData& d) {
  static const Stats kEmpty;
  const Stats& st = d.stats ? *d.stats : kEmpty;
  std::string out;
  JsonWriter w(out, 2);
  w.begin_object();
  w.key("schema").value(kManifestSchema);
  w.key("tool")
      .begin_object()
      .key("name")
      .value("evenhand")
      .key("version")
      .value(kVersion)
      .end_object();
  w.key("command_line").begin_array();
  for (const auto& a : d.command_line) w.value(a);
  w.end_array();
  w.key("started_at").value(d.started_at);

  w.key("pack");
  if (d.pack) {
    w.begin_object();
    w.key("name").value(d.pack->name());
    w.key("version").value(d.pack->version());
    w.key("sha256").value(d.pack->sha256());
    w.key("language").value(d.pack->language());
    w.key("axis").value(d.pack->axis());
    w.key("groups").begin_array();
    for (const auto& g : d.pack->groups()) w.value(g);
    w.end_array();
    w.end_object();
  } else {
    w.null();
  }

  w.key("options").begin_object();
  for (const auto& [k, v] : d.options) w.key(k).raw(v);
  w.end_object();

  w.key("inputs").begin_array();
  for (const auto& f : d.inputs) write_file(w, f, false);
  w.end_array();
  w.key("outputs").begin_array();
  for (const auto& f : d.outputs) write_file(w, f, true);
  w.end_array();

  w.key("records").begin_object();
  w.key("read").value(st.records_read);
  w.key("written").value(st.records_written);
  w.key("kept").value(st.records_kept);
  w.key("replaced").value(st.records_replaced);
  w.key("added").value(st.records_added);
  w.key("dropped").value(st.records_dropped);
  w.key("rejected").value(st.records_rejected);
  w.key("rejected_by_reason");
  write_counts(w, st.rejected_by_reason);
  w.key("quarantined").value(st.quarantined);
  w.key("blank_lines").value(st.blank_lines);
  w.key("with_mentions").value(st.records_with_mentions);
  w.key("guarded").value(st.records_guarded);
  w.key("guarded_by_reason");
  write_counts(w, st.guarded_by_reason);
  w.key("flagged").value(st.records_flagged);
  w.key("flagged_by_reason");
  write_counts(w, st.flagged_by_reason);
  w.end_object();

  w.key("fields").begin_object();
  w.key("selected").value(st.fields_selected);
  w.key("missing").value(st.fields_missing);
  w.key("not_string").value(st.fields_not_string);
  w.end_object();

  w.key("groups").begin_object();
  if (d.pack) {
    w.key(d.pack->axis()).begin_object();
    const auto& groups = d.pack->groups();
    for (size_t g = 0; g < groups.size(); ++g) {
      w.key(groups[g]).begin_object();
      w.key("before");
      write_tally(w, g < st.before.size() ? st.before[g] : GroupTally{});
      if (!d.planned_basis.empty() && g < d.planned.size() && d.planned[g] == d.planned[g]) {
        w.key("planned").begin_object().key(d.planned_basis).value(d.planned[g]).end_object();
      }
      w.key("after");
      write_tally(w, g < st.after.size() ? st.after[g] : GroupTally{});
      w.end_object();
    }
    w.end_object();
  }
  w.end_object();

  w.key("rewrites").begin_object();
  w.key("edits").value(st.edits);
  w.key("protected_skips").value(st.protected_skips);
  w.key("ambiguous").value(st.ambiguous);
  w.key("entry_hits").begin_array();
  if (d.pack) {
    struct Hit {
      std::string rule, forms;
      uint64_t hits;
      bool common_word;
    };
    std::vector<Hit> list;
    const size_t sets = d.pack->sets().size();
    for (const auto& [index, hits] : st.entry_hits) {
      auto [rule, forms] = describe_entry(*d.pack, index);
      // A name pair marked ~word in the pack: one of its names is also a common word.
      bool word = index >= sets && index - sets < d.pack->names().size() &&
                  d.pack->names()[index - sets].word_like;
      list.push_back({rule, forms, hits, word});
    }
    std::sort(list.begin(), list.end(),
              [](const Hit& a, const Hit& b) { return rule_less(a.rule, b.rule); });
    for (const auto& h : list) {
      w.begin_object().key("rule").value(h.rule).key("forms").value(h.forms);
      w.key("hits").value(h.hits);
      if (h.common_word) w.key("common_word").value(true);
      w.end_object();
    }
  }
  w.end_array();
  w.end_object();

  if (!d.balance_json.empty()) w.key("balance").raw(d.balance_json);

  w.key("rejections").begin_array();
  for (const auto& e : d.first_rejections) {
    w.begin_object().key("input").value(e.file);
    if (e.line) w.key("line").value(*e.line);
    if (e.offset) w.key("offset").value(*e.offset);
    w.key("reason").value(e.reason).end_object();
  }
  w.end_array();

  uint64_t in_bytes = 0;
  for (const auto& f : d.inputs) in_bytes += f.data_bytes;
  w.key("timing").begin_object();
  w.key("seconds").value(d.seconds);
  w.key("threads").value(d.threads);
  w.key("records_per_second").value(d.seconds > 0 ? st.records_read / d.seconds : 0.0);
  w.key("mb_per_second").value(d.seconds > 0 ? in_bytes / 1e6 / d.seconds : 0.0);
  w.end_object();
  w.end_object();
  out += '\n';
  return out;
}

}  // namespace evenhand::audit
