#include "pipeline/record_processor.h"

#include <simdjson.h>

#include <algorithm>
#include <cmath>

#include "audit/json_writer.h"
#include "base/hash.h"

namespace evenhand::pipeline {

std::string rejection_code(const Error& e) {
  const std::string& r = e.reason;
  if (r.rfind("invalid UTF-8", 0) == 0) return "invalid_utf8";
  if (r.rfind("record is not a JSON object", 0) == 0) return "not_object";
  if (r.rfind("record of ", 0) == 0) return "record_too_large";
  if (r.rfind("invalid JSON", 0) == 0) return "invalid_json";
  if (r.rfind("duplicate key", 0) == 0) return "duplicate_key";
  if (r.rfind("agreement could not be settled", 0) == 0) return "unsettled_agreement";
  return "invalid_record";
}

struct RecordProcessor::Impl {
  const RunOptions& options;
  const rewrite::Engine& engine;
  size_t n_patterns;
  bool has_id;
  corpus::FieldSelector selector;
  std::unique_ptr<rewrite::Worker> worker;

  // Scratch reused across records.
  std::vector<corpus::FieldMatch> matches;
  std::vector<uint32_t> field_match;  // field index -> match index
  std::vector<uint8_t> pattern_seen;  // per --field pattern: matched in this record
  std::vector<std::string_view> fields;
  rewrite::RecordResult result;
  std::vector<corpus::MatchEdit> match_edits;
  std::string line;  // a counterfactual line (with --provenance)
  std::string tmp;

  Impl(const RunOptions& o, std::vector<corpus::PointerPattern> patterns,
       std::optional<corpus::PointerPattern> id, const rewrite::Engine& e)
      : options(o),
        engine(e),
        n_patterns(patterns.size()),
        has_id(id.has_value()),
        selector(with_id(std::move(patterns), std::move(id))),
        worker(e.make_worker()) {}

  static std::vector<corpus::PointerPattern> with_id(std::vector<corpus::PointerPattern> p,
                                                     std::optional<corpus::PointerPattern> id) {
    if (id) p.push_back(std::move(*id));
    return p;
  }

  // Adds one to the record count of every --field pattern that matched in `matches`.
  void count_patterns(audit::Stats& st) {
    pattern_seen.assign(n_patterns, 0);
    for (const auto& m : matches)
      if (m.pattern < n_patterns) pattern_seen[m.pattern] = 1;
    if (st.pattern_records.size() < n_patterns) st.pattern_records.resize(n_patterns);
    for (size_t p = 0; p < n_patterns; ++p) st.pattern_records[p] += pattern_seen[p];
  }

  void provenance(std::string_view record, const RecordOrigin& origin, bool counterfactual,
                  std::string& out) {
    tmp.clear();
    audit::JsonWriter w(tmp);
    w.begin_object()
        .key("source")
        .value(*origin.path)
        .key("line")
        .value(origin.line)
        .key("copy")
        .value(counterfactual ? "counterfactual" : "original");
    if (counterfactual && !result.flags.empty()) {
      w.key("flags").begin_array();
      for (const auto& f : result.flags) w.begin_object().key(f.code).value(f.detail).end_object();
      w.end_array();
    }
    w.end_object();
    corpus::append_with_member(record, kProvenanceKey, tmp, out);
  }

  void write_line(std::string_view record, std::string_view eol, const RecordOrigin& origin,
                  bool counterfactual, std::string& out) {
    if (options.provenance && options.format == Format::jsonl) {
      provenance(record, origin, counterfactual, out);
    } else {
      out.append(record);
    }
    if (options.framing == corpus::Framing::paragraphs) {
      out += "\n\n";
    } else {
      out.append(eol.empty() ? std::string_view("\n") : eol);
    }
  }

  // Appends the counterfactual of `record`, built from result.edits, to `into`.
  void build_counterfactual(std::string_view record, std::string& into) {
    if (options.format == Format::text) {
      size_t pos = 0;
      for (const auto& e : result.edits) {
        into.append(record.substr(pos, e.begin - pos));
        into.append(e.replacement);
        pos = e.end;
      }
      into.append(record.substr(pos));
      return;
    }
    // Edits are sorted by (field, begin) and fields are in document order.
    match_edits.clear();
    match_edits.reserve(result.edits.size());
    for (const auto& e : result.edits)
      match_edits.push_back({field_match[e.field], {e.begin, e.end, e.replacement}});
    selector.splice_flat(record, matches, match_edits, into);
  }

  // Writes the counterfactual line of `record`: straight into `out`, or through `line` when
  // a provenance member is added to it.
  void write_counterfactual(std::string_view record, std::string_view eol,
                            const RecordOrigin& origin, std::string& out) {
    if (options.provenance && options.format == Format::jsonl) {
      line.clear();
      build_counterfactual(record, line);
      write_line(line, eol, origin, true, out);
      return;
    }
    build_counterfactual(record, out);
    write_line({}, eol, origin, true, out);
  }

  // After a large record, gives back the scratch that grew with it (per field, per edit and
  // per byte), so each worker holds it only while such a record is being processed.
  void trim_after(std::string_view record) {
    if (record.size() < kTrimAbove && fields.size() < kTrimFieldsAbove) return;
    matches = {};
    field_match = {};
    fields = {};
    result = {};
    match_edits = {};
    line = {};
    tmp = {};
    selector.trim();
    worker->trim();
  }
  static constexpr size_t kTrimAbove = 4 << 20;
  static constexpr size_t kTrimFieldsAbove = 1 << 16;

  void audit_line(const RecordOrigin& origin, const char* action, std::string& out) {
    audit::JsonWriter w(out);
    w.begin_object().key("input").value(*origin.path).key("line").value(origin.line);
    w.key("action").value(action);
    w.key("edits").begin_array();
    for (const auto& e : result.edits) {
      w.begin_object();
      w.key("field").value(options.format == Format::text
                               ? std::string_view("")
                               : std::string_view(matches[field_match[e.field]].pointer));
      w.key("at").value(static_cast<uint64_t>(e.begin));
      w.key("len").value(static_cast<uint64_t>(e.end - e.begin));
      w.key("from").value(fields[e.field].substr(e.begin, e.end - e.begin));
      w.key("to").value(e.replacement);
      if (e.rule) w.key("rule").value(e.rule->str());
      w.key("why").value(rewrite::edit_reason_name(e.reason));
      if (!e.note.empty()) w.key("note").value(e.note);
      if (e.reason == rewrite::EditReason::context)
        w.key("score").value(std::round(static_cast<double>(e.score) * 1000) / 1000);
      w.end_object();
    }
    w.end_array().end_object();
    out += '\n';
  }

  void guard_line(const RecordOrigin& origin, std::string& out) {
    audit::JsonWriter w(out);
    w.begin_object().key("input").value(*origin.path).key("line").value(origin.line);
    w.key("action").value("guarded");
    w.key("guard").value(result.guard->reason);
    w.key("phrase").value(result.guard->phrase);
    w.key("rule").value(result.guard->where.str());
    w.end_object();
    out += '\n';
  }

  // Adds a record's mentions, and the record itself to the group it mentions most (a tie
  // or no mention counts toward no group), as the balance tally counts records.
  static void untally(std::vector<audit::GroupTally>& into, const rewrite::GroupCounts& counts) {
    for (size_t g = 0; g < counts.size() && g < into.size(); ++g) into[g].mentions -= counts[g];
    int16_t lead = balance::lead_group(counts);
    if (lead >= 0 && static_cast<size_t>(lead) < into.size())
      --into[static_cast<size_t>(lead)].records;
  }

  void flag_line(const RecordOrigin& origin, std::string& out) {
    audit::JsonWriter w(out);
    w.begin_object().key("input").value(*origin.path).key("line").value(origin.line);
    w.key("action").value("flagged");
    w.key("flags").begin_array();
    for (const auto& f : result.flags) w.begin_object().key(f.code).value(f.detail).end_object();
    w.end_array();
    w.key("outcome").value(options.on_flagged == OnFlagged::original ? "original kept"
                           : options.on_flagged == OnFlagged::reject ? "rejected"
                                                                     : "counterfactual written");
    w.end_object();
    out += '\n';
  }

  static void tally(std::vector<audit::GroupTally>& into, const rewrite::GroupCounts& counts) {
    if (into.size() < counts.size()) into.resize(counts.size());
    for (size_t g = 0; g < counts.size(); ++g) into[g].mentions += counts[g];
    int16_t lead = balance::lead_group(counts);
    if (lead >= 0) ++into[static_cast<size_t>(lead)].records;
  }

  Status process(std::string_view record, std::string_view eol, const RecordOrigin& origin,
                 RecordOutput& out) {
    Status s = process_record(record, eol, origin, out);
    trim_after(record);
    return s;
  }

  Status process_record(std::string_view record, std::string_view eol, const RecordOrigin& origin,
                        RecordOutput& out) {
    audit::Stats& st = *out.stats;
    fields.clear();
    field_match.clear();
    std::string_view identity = record;
    if (options.format == Format::jsonl) {
      corpus::SelectStats ss;
      Status s = selector.select(record, matches, ss);
      if (!s.ok()) {
        Error e = std::move(s).error();
        e.file = *origin.path;
        e.line = origin.line;
        return e;
      }
      st.fields_missing += ss.missing;
      st.fields_not_string += ss.not_string;
      count_patterns(st);
      for (uint32_t i = 0; i < matches.size(); ++i) {
        const auto& m = matches[i];
        if (has_id && m.pattern == n_patterns) {
          identity = record.substr(m.raw_begin, m.raw_end - m.raw_begin);
          continue;
        }
        if (!m.is_string) continue;
        fields.push_back(m.text);
        field_match.push_back(i);
      }
    } else {
      if (!simdjson::validate_utf8(record.data(), record.size())) {
        Error e = make_error(ErrorKind::input, *origin.path, "invalid UTF-8 in text record");
        e.line = origin.line;
        return e;
      }
      fields.push_back(record);
    }
    st.fields_selected += fields.size();
    ++st.records_read;

    if (options.mode == Mode::passthrough) {
      result.clear();
    } else {
      worker->rewrite(fields, result);
    }
    tally(st.before, result.before);
    bool mentions = result.has_mentions();
    if (mentions) ++st.records_with_mentions;
    if (result.guard) {
      ++st.records_guarded;
      ++st.guarded_by_reason[result.guard->reason];
      if (out.edits) {
        guard_line(origin, *out.edits);
        ++st.audit_lines;
      }
    }
    st.protected_skips += result.protected_spans;
    st.ambiguous += result.ambiguous;

    bool can_rewrite = mentions && !result.guard && !result.edits.empty();
    if (can_rewrite && !result.flags.empty() && options.mode != Mode::tally) {
      ++st.records_flagged;
      for (const auto& f : result.flags) ++st.flagged_by_reason[f.code];
      if (out.edits) {
        flag_line(origin, *out.edits);
        ++st.audit_lines;
      }
      if (options.on_flagged == OnFlagged::reject) {
        // Undo what this record added to the counts: it is rejected instead.
        st.records_read -= 1;
        st.fields_selected -= fields.size();
        Error e = make_error(ErrorKind::input, *origin.path,
                             "agreement could not be settled: " + result.flags.front().detail);
        e.line = origin.line;
        untally(st.before, result.before);
        if (mentions) --st.records_with_mentions;
        return e;
      }
      if (options.on_flagged == OnFlagged::original) can_rewrite = false;
    }
    if (options.mode == Mode::tally) {
      if (out.tally) out.tally->add(result);
      return ok_status();
    }
    bool replace = false, add = false, drop = false;
    if (can_rewrite) {
      if (options.mode == Mode::augment) {
        add = true;
      } else if (options.mode == Mode::substitute) {
        replace = hash_unit(stable_hash(options.seed, identity)) < options.rate;
      } else if (options.mode == Mode::balance && options.plan) {
        switch (options.plan->decide(result, stable_hash(options.seed, identity))) {
          case balance::Action::keep:
            break;
          case balance::Action::flip:
            replace = true;
            break;
          case balance::Action::add:
            add = true;
            break;
          case balance::Action::drop:
            drop = true;
            break;
        }
      }
    }
    if (drop) {
      ++st.records_dropped;
      return ok_status();
    }
    if (!replace) {
      write_line(record, eol, origin, false, *out.out);
      ++st.records_kept;
      ++st.records_written;
      tally(st.after, result.before);
    }
    if (replace || add) {
      write_counterfactual(record, eol, origin, *out.out);
      ++st.records_written;
      if (replace) {
        ++st.records_replaced;
      } else {
        ++st.records_added;
      }
      tally(st.after, result.after);
      st.edits += result.edits.size();
      for (uint32_t hit : result.entry_hits) ++st.entry_hits[hit];
      if (out.edits) {
        audit_line(origin, replace ? "replaced" : "added", *out.edits);
        ++st.audit_lines;
      }
    }
    return ok_status();
  }
};

RecordProcessor::RecordProcessor(const RunOptions& options,
                                 std::vector<corpus::PointerPattern> patterns,
                                 std::optional<corpus::PointerPattern> id_pattern,
                                 const rewrite::Engine& engine)
    : impl_(std::make_unique<Impl>(options, std::move(patterns), std::move(id_pattern), engine)) {}

RecordProcessor::~RecordProcessor() = default;

Status RecordProcessor::process(std::string_view record, std::string_view eol,
                                const RecordOrigin& origin, RecordOutput& out) {
  return impl_->process(record, eol, origin, out);
}

}  // namespace evenhand::pipeline
