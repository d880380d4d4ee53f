// Fuzz target: the whole-record rewrite (pipeline/record_processor.h over the engine of
// rewrite/engine.h with the built-in en-gender and es-gender packs, loaded once). Input:
// byte 0 picks pack, direction, format, framing, mode and what happens to flagged records;
// the rest is a corpus, framed as the pipeline frames it. Checked: records framed = records
// read + rejected, and a rejected record writes nothing; lines written = kept + added +
// replaced; a record without edits leaves byte for byte; the edits of the audit line, applied
// to the input's fields, give the counterfactual's fields, and their "from" is the input's.
#include <simdjson.h>

#include <map>
#include <memory>
#include <string>
#include <vector>

#include "corpus/json_fields.h"
#include "corpus/records.h"
#include "engine_checks.h"
#include "fuzz_support.h"
#include "pack/pack.h"
#include "pipeline/record_processor.h"
#include "rewrite/engine.h"

using namespace evenhand;
using namespace evenhand::pipeline;

namespace {

// Small reads: a fresh 1 MiB buffer per run would cost more than the run itself.
constexpr size_t kReadSize = 4096;

struct Engines {
  std::vector<std::unique_ptr<rewrite::Engine>> all;  // en swap, en toward neutral, es, es toward
  Engines() {
    for (const char* name : {"en-gender", "es-gender"}) {
      std::vector<pack::Diagnostic> diags;
      auto p = pack::load_pack(name, diags);
      FUZZ_CHECK(p.ok(), std::string("built-in pack does not load: ") + name);
      std::shared_ptr<const pack::CompiledPack> shared = std::move(p).value();
      for (bool toward : {false, true}) {
        rewrite::EngineOptions o;
        if (toward) o.toward = static_cast<uint16_t>(shared->groups().size() - 1);
        o.themselves = toward;
        auto e = rewrite::make_engine(shared, o);
        FUZZ_CHECK(e.ok(), "the engine does not build");
        all.push_back(std::move(e).value());
      }
    }
  }
};

std::vector<corpus::PointerPattern> patterns() {
  std::vector<corpus::PointerPattern> out;
  for (const char* t : {"/text", "/messages/*/content"})
    out.push_back(corpus::PointerPattern::parse(t).value());
  return out;
}

struct LoggedEdit {
  std::string field, from, to;
  uint64_t at = 0, len = 0;
};

// The edits of the audit line of action "added" or "replaced" in `log`; false if none.
bool logged_edits(const std::string& log, std::vector<LoggedEdit>& out) {
  static simdjson::dom::parser parser;
  out.clear();
  bool found = false;
  for (size_t pos = 0; pos < log.size();) {
    size_t nl = log.find('\n', pos);
    FUZZ_CHECK(nl != std::string::npos, "an audit line without its newline");
    simdjson::dom::element doc;
    std::string line = log.substr(pos, nl - pos);
    FUZZ_CHECK(parser.parse(line).get(doc) == simdjson::SUCCESS, "an audit line is not JSON");
    pos = nl + 1;
    std::string_view action;
    FUZZ_CHECK(doc["action"].get_string().get(action) == simdjson::SUCCESS, "no action");
    if (action != "added" && action != "replaced") continue;
    found = true;
    simdjson::dom::array edits;
    FUZZ_CHECK(doc["edits"].get_array().get(edits) == simdjson::SUCCESS, "no edits array");
    for (simdjson::dom::element e : edits) {
      LoggedEdit le;
      std::string_view s;
      bool ok = e["field"].get_string().get(s) == simdjson::SUCCESS;
      le.field = s;
      ok = ok && e["from"].get_string().get(s) == simdjson::SUCCESS;
      le.from = s;
      ok = ok && e["to"].get_string().get(s) == simdjson::SUCCESS;
      le.to = s;
      ok = ok && e["at"].get_uint64().get(le.at) == simdjson::SUCCESS &&
           e["len"].get_uint64().get(le.len) == simdjson::SUCCESS;
      FUZZ_CHECK(ok, "an edit of the audit line lacks a member");
      out.push_back(std::move(le));
    }
  }
  return found;
}

// `text` with the logged edits of `field` applied, checking each "from" against `text`.
std::string apply_edits(std::string_view text, const std::vector<LoggedEdit>& edits,
                        const std::string& field) {
  std::string out;
  uint64_t pos = 0;
  for (const LoggedEdit& e : edits) {
    if (e.field != field) continue;
    FUZZ_CHECK(e.at >= pos && e.at + e.len <= text.size(), "logged edits overlap or overrun");
    FUZZ_CHECK(text.substr(e.at, e.len) == e.from, "a logged 'from' is not the input's bytes");
    out.append(text.substr(pos, e.at - pos));
    out.append(e.to);
    pos = e.at + e.len;
  }
  out.append(text.substr(pos));
  return out;
}

// Checks the counterfactual against the input record and the logged edits.
void check_counterfactual(std::string_view record, std::string_view cf, bool jsonl,
                          const std::vector<LoggedEdit>& edits) {
  if (!jsonl) {
    FUZZ_CHECK(apply_edits(record, edits, "") == cf,
               "text record: the edits do not give the output");
    return;
  }
  static corpus::FieldSelector in_sel(patterns()), out_sel(patterns());
  std::vector<corpus::FieldMatch> in, out;
  corpus::SelectStats st;
  FUZZ_CHECK(in_sel.select(record, in, st).ok(), "an accepted record does not parse");
  FUZZ_CHECK(out_sel.select(cf, out, st).ok(), "the counterfactual does not parse");
  FUZZ_CHECK(in.size() == out.size(), "the counterfactual matches other values");
  std::map<std::string, int> strings_at;  // a pointer twice (duplicate keys) is ambiguous
  for (const auto& m : in)
    if (m.is_string) ++strings_at[m.pointer];
  for (size_t i = 0; i < in.size(); ++i) {
    FUZZ_CHECK(in[i].pointer == out[i].pointer, "the counterfactual's values moved");
    if (!in[i].is_string || strings_at[in[i].pointer] > 1) continue;
    FUZZ_CHECK(apply_edits(in[i].text, edits, in[i].pointer) == out[i].text,
               "the edits applied to " + in[i].pointer + " do not give the output");
  }
}

// Runs the engine itself on the record's fields and checks the promises of its result.
void check_engine(std::string_view record, bool jsonl, size_t engine_index,
                  const rewrite::Engine& engine) {
  static std::vector<std::unique_ptr<rewrite::Worker>> workers(4);
  if (!workers[engine_index]) workers[engine_index] = engine.make_worker();
  static corpus::FieldSelector sel(patterns());
  std::vector<corpus::FieldMatch> ms;
  std::vector<std::string_view> fields;
  corpus::SelectStats st;
  if (jsonl) {
    FUZZ_CHECK(sel.select(record, ms, st).ok(), "an accepted record does not parse");
    for (const auto& m : ms)
      if (m.is_string) fields.push_back(m.text);
  } else {
    fields.push_back(record);
  }
  rewrite::RecordResult result;
  workers[engine_index]->rewrite(fields, result);
  fuzz::check_result(fields, result, engine.pack()->groups().size());
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  static Engines* engines = new Engines();
  if (size < 1) return 0;
  const unsigned flags = data[0] & 63;
  // One processor per choice of options, made once (a worker per run would dominate).
  struct Setup {
    RunOptions opt;
    std::unique_ptr<RecordProcessor> proc;
  };
  static std::vector<std::unique_ptr<Setup>> setups(64);
  if (!setups[flags]) {
    auto su = std::make_unique<Setup>();
    RunOptions& o = su->opt;
    o.format = (flags & 4) ? Format::text : Format::jsonl;
    o.framing = (flags & 12) == 12 ? corpus::Framing::paragraphs : corpus::Framing::lines;
    o.mode = (flags & 16) ? Mode::substitute : Mode::augment;
    o.rate = 1.0;
    o.on_flagged = (flags & 32) ? OnFlagged::original : OnFlagged::counterfactual;
    su->proc = std::make_unique<RecordProcessor>(
        o, o.format == Format::jsonl ? patterns() : std::vector<corpus::PointerPattern>{},
        std::nullopt, *engines->all[flags & 3]);
    setups[flags] = std::move(su);
  }
  const RunOptions& opt = setups[flags]->opt;
  RecordProcessor& proc = *setups[flags]->proc;
  const bool jsonl = opt.format == Format::jsonl;
  const rewrite::Engine& engine = *engines->all[flags & 3];
  std::string_view stream(reinterpret_cast<const char*>(data) + 1, size - 1);
  fuzz::MemorySource src(stream, 1 << 20);
  corpus::RecordReader reader(src, opt.framing, 1 << 20, kReadSize);
  const std::string path = "fuzz-input";
  audit::Stats stats;
  std::string out, log, all_out;
  RecordOutput ro{&out, &log, &stats, nullptr};
  uint64_t framed = 0, rejected = 0;
  std::vector<LoggedEdit> edits;
  corpus::RawRecord r;
  for (;;) {
    auto k = reader.next(r);
    FUZZ_CHECK(k.ok(), "framing failed");
    if (*k == corpus::RecordReader::Kind::end) break;
    if (*k != corpus::RecordReader::Kind::record) continue;
    ++framed;
    out.clear();
    log.clear();
    Status s = proc.process(r.bytes, r.eol, RecordOrigin{&path, r.line, r.offset}, ro);
    if (!s.ok()) {
      ++rejected;
      FUZZ_CHECK(out.empty(), "a rejected record wrote output");
      continue;
    }
    const std::string eol = opt.framing == corpus::Framing::paragraphs ? "\n\n"
                            : r.eol.empty()                            ? "\n"
                                                                       : std::string(r.eol);
    const std::string original = std::string(r.bytes) + eol;
    check_engine(r.bytes, jsonl, flags & 3, engine);
    all_out += out;
    if (!logged_edits(log, edits)) {
      FUZZ_CHECK(out == original, "a record without edits did not leave byte for byte");
      continue;
    }
    FUZZ_CHECK(!edits.empty(), "a counterfactual without edits");
    std::string_view cf = out;
    if (opt.mode == Mode::augment) {
      FUZZ_CHECK(cf.substr(0, original.size()) == original, "augment changed the original");
      cf.remove_prefix(original.size());
    }
    FUZZ_CHECK(cf.size() >= eol.size() && cf.substr(cf.size() - eol.size()) == eol,
               "the counterfactual lacks its terminator");
    cf.remove_suffix(eol.size());
    check_counterfactual(r.bytes, cf, jsonl, edits);
  }
  FUZZ_CHECK(framed == stats.records_read + rejected, "records framed != read + rejected");
  FUZZ_CHECK(
      stats.records_written == stats.records_kept + stats.records_added + stats.records_replaced,
      "records written != kept + added + replaced");
  fuzz::MemorySource again(all_out, 1 << 20);
  corpus::RecordReader reread(again, opt.framing, SIZE_MAX, kReadSize);
  uint64_t lines = 0;
  for (auto k = reread.next(r); k.ok() && *k != corpus::RecordReader::Kind::end; k = reread.next(r))
    ++lines;
  FUZZ_CHECK(lines == stats.records_written, "the output frames into a different record count");
  return 0;
}
