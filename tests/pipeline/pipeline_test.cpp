// The pipeline end to end through the library API, with a small test engine that swaps the
// words "alpha" and "beta" (invented test data; the real engine is tested in tests/rewrite).
#include <catch2/catch.hpp>

#include <filesystem>

#include "pipeline/run.h"
#include "support/temp_dir.h"

using namespace evenhand;
using evenhand::testing::read_file;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

class SwapWorker final : public rewrite::Worker {
 public:
  void rewrite(std::span<const std::string_view> fields, rewrite::RecordResult& out) override {
    out.clear();
    out.before.assign(2, 0);
    out.after.assign(2, 0);
    for (uint32_t f = 0; f < fields.size(); ++f) {
      std::string_view t = fields[f];
      for (size_t i = 0; i < t.size(); ++i) {
        for (int g = 0; g < 2; ++g) {
          std::string_view w = g == 0 ? "alpha" : "beta";
          if (t.substr(i, w.size()) == w) {
            rewrite::Edit e;
            e.field = f;
            e.begin = static_cast<uint32_t>(i);
            e.end = static_cast<uint32_t>(i + w.size());
            e.replacement = g == 0 ? "beta" : "alpha";
            out.edits.push_back(e);
            ++out.before[g];
            ++out.after[1 - g];
            out.entry_hits.push_back(0);
            i += w.size() - 1;
            break;
          }
        }
      }
    }
  }
};

class SwapEngine final : public rewrite::Engine {
 public:
  const pack::CompiledPack* pack() const override { return nullptr; }
  std::unique_ptr<rewrite::Worker> make_worker() const override {
    return std::make_unique<SwapWorker>();
  }
};

std::string make_corpus(int n) {
  std::string s;
  for (int i = 0; i < n; ++i) {
    s += "{\"id\":" + std::to_string(i) + ",\"text\":\"record " + std::to_string(i);
    s += (i % 3 == 0) ? " has alpha and \\u00e9 beta\"" : " plain\"";
    s += ",\"messages\":[{\"content\":\"alpha\"},{\"content\":7}]}\n";
  }
  return s;
}

pipeline::RunOptions base_options(const TempDir& d) {
  pipeline::RunOptions o;
  o.inputs = {d.file("in.jsonl")};
  o.output = d.file("out.jsonl");
  o.edits_path = d.file("edits.jsonl");
  o.threads = 1;
  return o;
}

}  // namespace

TEST_CASE("output bytes are identical for 1 and 4 threads") {
  TempDir d;
  write_file(d.file("in.jsonl"), make_corpus(20000));
  SwapEngine engine;
  std::string outs[2], edits[2];
  for (int k = 0; k < 2; ++k) {
    auto o = base_options(d);
    o.threads = k == 0 ? 1 : 4;
    o.fields = {"/text", "/messages/*/content"};
    auto r = pipeline::run(o, engine);
    REQUIRE(r.ok());
    outs[k] = read_file(o.output);
    edits[k] = read_file(o.edits_path);
  }
  REQUIRE(outs[0].size() > 0);
  REQUIRE(outs[0] == outs[1]);
  REQUIRE(edits[0] == edits[1]);
}

TEST_CASE("augment writes each record with mentions followed by its counterfactual") {
  TempDir d;
  write_file(d.file("in.jsonl"),
             "{\"text\":\"alpha one\"}\r\n{\"text\":\"none here\"}\n\n{\"text\":\"beta\\tx\"}");
  SwapEngine engine;
  auto o = base_options(d);
  auto r = pipeline::run(o, engine);
  REQUIRE(r.ok());
  // Originals byte-identical (CRLF kept); copies spliced; escapes outside edits kept.
  REQUIRE(read_file(o.output) ==
          "{\"text\":\"alpha one\"}\r\n{\"text\":\"beta one\"}\r\n{\"text\":\"none here\"}\n"
          "{\"text\":\"beta\\tx\"}\n{\"text\":\"alpha\\tx\"}\n");
  const auto& st = r->stats;
  REQUIRE(st.records_read == 3);
  REQUIRE(st.records_written == 5);
  REQUIRE(st.records_kept == 3);
  REQUIRE(st.records_added == 2);
  REQUIRE(st.blank_lines == 1);
  REQUIRE(st.before.size() == 2);
  REQUIRE(st.before[0].mentions == 1);
  REQUIRE(st.before[1].mentions == 1);
  // after: originals (1 alpha, 1 beta) plus copies (1 beta, 1 alpha)
  REQUIRE(st.after[0].mentions == 2);
  REQUIRE(st.after[1].mentions == 2);
}

TEST_CASE("substitute replaces about rate of the records, independent of threads and order") {
  TempDir d;
  std::string in;
  for (int i = 0; i < 2000; ++i) in += "{\"text\":\"alpha " + std::to_string(i) + "\"}\n";
  write_file(d.file("in.jsonl"), in);
  SwapEngine engine;
  auto o = base_options(d);
  o.mode = pipeline::Mode::substitute;
  o.rate = 0.25;
  o.seed = 7;
  auto r1 = pipeline::run(o, engine);
  REQUIRE(r1.ok());
  std::string out1 = read_file(o.output);
  REQUIRE(r1->stats.records_written == 2000);
  REQUIRE(r1->stats.records_replaced + r1->stats.records_kept == 2000);
  // Binomial(2000, 0.25): mean 500, sd ~19; 6 sd either side.
  REQUIRE(r1->stats.records_replaced > 385);
  REQUIRE(r1->stats.records_replaced < 615);
  o.threads = 3;
  auto r2 = pipeline::run(o, engine);
  REQUIRE(r2.ok());
  REQUIRE(read_file(o.output) == out1);
  // Decisions hash the record itself, so a record's fate does not depend on its position:
  // reversing the input reverses the output.
  std::vector<std::string> lines;
  for (size_t p = 0, q; (q = in.find('\n', p)) != std::string::npos; p = q + 1)
    lines.push_back(in.substr(p, q - p + 1));
  std::string rev;
  for (auto it = lines.rbegin(); it != lines.rend(); ++it) rev += *it;
  write_file(d.file("in.jsonl"), rev);
  auto r3 = pipeline::run(o, engine);
  REQUIRE(r3.ok());
  std::string out3 = read_file(o.output);
  std::vector<std::string> a, b;
  for (size_t p = 0, q; (q = out1.find('\n', p)) != std::string::npos; p = q + 1)
    a.push_back(out1.substr(p, q - p));
  for (size_t p = 0, q; (q = out3.find('\n', p)) != std::string::npos; p = q + 1)
    b.push_back(out3.substr(p, q - p));
  std::reverse(b.begin(), b.end());
  REQUIRE(a == b);
}

TEST_CASE("records read = originals written + rejected, in every bad-record mode") {
  TempDir d;
  std::string in =
      "{\"text\":\"alpha\"}\n"
      "{\"text\": broken\n"
      "[1,2,3]\n"
      "{\"text\":\"bad \xff utf8\"}\n"
      "{\"text\":\"" +
      std::string(300, 'x') +
      "\"}\n"
      "{\"text\":\"beta\"}\n";
  write_file(d.file("in.jsonl"), in);
  SwapEngine engine;
  for (auto mode : {pipeline::OnBadRecord::skip, pipeline::OnBadRecord::quarantine}) {
    auto o = base_options(d);
    o.on_bad = mode;
    o.max_record_bytes = 200;
    o.quarantine_path = d.file("q.jsonl");
    o.rejects_path = d.file("rejects.jsonl");
    std::vector<std::string> seen;
    o.on_rejection = [&](const Error& e) { seen.push_back(e.message()); };
    auto r = pipeline::run(o, engine);
    REQUIRE(r.ok());
    const auto& st = r->stats;
    REQUIRE(st.records_read == 6);
    REQUIRE(st.records_rejected == 4);
    REQUIRE(st.records_read == st.records_kept + st.records_replaced + st.records_rejected);
    REQUIRE(st.rejected_by_reason.at("invalid_json") == 1);
    REQUIRE(st.rejected_by_reason.at("not_object") == 1);
    REQUIRE(st.rejected_by_reason.at("invalid_utf8") == 1);
    REQUIRE(st.rejected_by_reason.at("record_too_large") == 1);
    REQUIRE(seen.size() == 4);
    REQUIRE(seen[0].find(d.file("in.jsonl") + ":2: ") == 0);
    REQUIRE(seen[3].find(":5: ") != std::string::npos);
    if (mode == pipeline::OnBadRecord::quarantine) {
      // Oversized records are not buffered, so they cannot be copied; the others are.
      REQUIRE(read_file(o.quarantine_path) ==
              "{\"text\": broken\n[1,2,3]\n{\"text\":\"bad \xff utf8\"}\n");
    } else {
      REQUIRE_FALSE(std::filesystem::exists(o.quarantine_path));
    }
    std::string rejects = read_file(o.rejects_path);
    REQUIRE(std::count(rejects.begin(), rejects.end(), '\n') == 4);
  }
}

TEST_CASE("a bad record under fail leaves no output behind") {
  TempDir d;
  std::string in;
  for (int i = 0; i < 5000; ++i) in += "{\"text\":\"alpha\"}\n";
  in += "{oops}\n";
  write_file(d.file("in.jsonl"), in);
  SwapEngine engine;
  auto o = base_options(d);
  o.threads = 2;
  auto r = pipeline::run(o, engine);
  REQUIRE_FALSE(r.ok());
  REQUIRE(r.error().kind == ErrorKind::input);
  REQUIRE(r.error().message().find(d.file("in.jsonl") + ":5001: invalid JSON") == 0);
  REQUIRE_FALSE(std::filesystem::exists(o.output));
  REQUIRE_FALSE(std::filesystem::exists(o.edits_path));
  size_t leftovers = 0;
  for (const auto& e : std::filesystem::directory_iterator(d.path()))
    leftovers += e.path() != d.file("in.jsonl");
  REQUIRE(leftovers == 0);
}

TEST_CASE("the audit log applied to the input gives the output") {
  TempDir d;
  write_file(d.file("in.jsonl"), make_corpus(50));
  SwapEngine engine;
  auto o = base_options(d);
  o.mode = pipeline::Mode::substitute;
  o.rate = 1.0;
  o.format = pipeline::Format::text;  // fields are whole lines, edits apply to raw bytes
  auto r = pipeline::run(o, engine);
  REQUIRE(r.ok());
  std::string in = read_file(d.file("in.jsonl"));
  std::string edits = read_file(o.edits_path);
  // Every changed line has an audit line naming its line number and edits; replay them.
  std::vector<std::string> lines;
  for (size_t p = 0, q; (q = in.find('\n', p)) != std::string::npos; p = q + 1)
    lines.push_back(in.substr(p, q - p));
  size_t n_audit = 0;
  for (size_t p = 0, q; (q = edits.find('\n', p)) != std::string::npos; p = q + 1) {
    std::string a = edits.substr(p, q - p);
    auto num = [&](const std::string& key, size_t from) {
      size_t k = a.find("\"" + key + "\":", from);
      REQUIRE(k != std::string::npos);
      return std::make_pair(std::stoul(a.substr(k + key.size() + 3)), k);
    };
    auto [line, lpos] = num("line", 0);
    std::string& text = lines[line - 1];
    // Apply edits back to front so offsets stay valid.
    std::vector<std::tuple<size_t, size_t, std::string>> es;
    for (size_t k = a.find("\"at\":"); k != std::string::npos; k = a.find("\"at\":", k + 1)) {
      auto [at, apos] = num("at", k);
      auto [len, lpos2] = num("len", apos);
      size_t to = a.find("\"to\":\"", lpos2) + 6;
      es.emplace_back(at, len, a.substr(to, a.find('"', to) - to));
    }
    for (auto it = es.rbegin(); it != es.rend(); ++it)
      text.replace(std::get<0>(*it), std::get<1>(*it), std::get<2>(*it));
    ++n_audit;
  }
  REQUIRE(n_audit == 50);
  std::string replayed;
  for (const auto& l : lines) replayed += l + "\n";
  REQUIRE(replayed == read_file(o.output));
}

TEST_CASE("provenance adds one namespaced member to every written record") {
  TempDir d;
  write_file(d.file("in.jsonl"), "{\"text\":\"alpha\"}\n{}\n");
  SwapEngine engine;
  auto o = base_options(d);
  o.provenance = true;
  auto r = pipeline::run(o, engine);
  REQUIRE(r.ok());
  std::string src = d.file("in.jsonl");
  REQUIRE(read_file(o.output) == "{\"text\":\"alpha\",\"_evenhand\":{\"source\":\"" + src +
                                     "\",\"line\":1,\"copy\":\"original\"}}\n"
                                     "{\"text\":\"beta\",\"_evenhand\":{\"source\":\"" +
                                     src +
                                     "\",\"line\":1,\"copy\":\"counterfactual\"}}\n"
                                     "{\"_evenhand\":{\"source\":\"" +
                                     src + "\",\"line\":2,\"copy\":\"original\"}}\n");
}

TEST_CASE("an output that names an input is refused before anything is written") {
  TempDir d;
  write_file(d.file("in.jsonl"), "{\"text\":\"alpha\"}\n");
  SwapEngine engine;
  auto o = base_options(d);
  o.output = d.path().string() + "/./in.jsonl";
  auto r = pipeline::run(o, engine);
  REQUIRE_FALSE(r.ok());
  REQUIRE(r.error().kind == ErrorKind::usage);
  REQUIRE(read_file(d.file("in.jsonl")) == "{\"text\":\"alpha\"}\n");
}

TEST_CASE("several inputs are read in order and each is described") {
  TempDir d;
  write_file(d.file("a.jsonl"), "{\"text\":\"one\"}\n");
  write_file(d.file("b.jsonl"), "{\"text\":\"two\"}\n{\"text\":\"three\"}\n");
  SwapEngine engine;
  pipeline::RunOptions o;
  o.inputs = {d.file("a.jsonl"), d.file("b.jsonl")};
  o.output = d.file("out.jsonl.zst");
  auto r = pipeline::run(o, engine);
  REQUIRE(r.ok());
  REQUIRE(r->inputs.size() == 2);
  REQUIRE(r->inputs[0].records == 1);
  REQUIRE(r->inputs[1].records == 2);
  REQUIRE(r->inputs[1].data_bytes == 32);  // 15 + 17 bytes, terminators included
  REQUIRE(r->outputs.at(0).compression == "zstd");
  REQUIRE(evenhand::testing::shell("zstd -dc " + o.output + " > " + d.file("plain")) == 0);
  REQUIRE(read_file(d.file("plain")) ==
          "{\"text\":\"one\"}\n{\"text\":\"two\"}\n{\"text\":\"three\"}\n");
}

TEST_CASE("batches in flight hold at most the byte cap of input, whatever the thread count") {
  // Records of about 100 KB: a 256 KiB batch holds three, and 2 x threads + 2 batches of
  // them would be more than the byte cap for a --max-record-bytes of 128 KiB.
  TempDir d;
  std::string corpus;
  for (int i = 0; i < 40; ++i) {
    corpus += "{\"id\":" + std::to_string(i) + ",\"text\":\"";
    for (int k = 0; k < 10000; ++k) corpus += k % 7 == 0 ? "alpha " : "gamma ";
    corpus += "\"}\n";
  }
  write_file(d.file("in.jsonl"), corpus);
  SwapEngine engine;
  std::string outs[2];
  for (int k = 0; k < 2; ++k) {
    auto o = base_options(d);
    o.threads = k == 0 ? 1 : 3;
    o.fields = {"/text"};
    o.max_record_bytes = 128 << 10;
    auto r = pipeline::run(o, engine);
    REQUIRE(r.ok());
    REQUIRE(r->stats.records_read == 40);
    REQUIRE(r->batch_byte_cap == pipeline::in_flight_byte_cap(o.threads, o.max_record_bytes));
    REQUIRE(r->batch_byte_cap == o.threads * ((128u << 10) + (512u << 10)));
    REQUIRE(r->peak_batch_bytes > 0);
    REQUIRE(r->peak_batch_bytes <= r->batch_byte_cap);
    outs[k] = read_file(o.output);
  }
  REQUIRE(outs[0] == outs[1]);
}
