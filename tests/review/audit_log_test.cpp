// Reading audit logs back (review/audit_log.h, review/sources.h) and drawing edits
// (review/diff.h): lines join per record, bad lines and logs that do not fit the corpus are
// errors naming file and line, and applying the logged edits to the corpus gives exactly
// the counterfactuals the run wrote.
#include <catch2/catch.hpp>

#include <simdjson.h>

#include "review/audit_log.h"
#include "review/diff.h"
#include "review/sources.h"
#include "support/temp_dir.h"

using namespace evenhand;
using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

const char* kLog =
    R"({"input":"IN","line":1,"action":"added","edits":[{"field":"/text","at":0,"len":3,"from":"She","to":"He","rule":"words.txt:67","why":"lexicon"},{"field":"/text","at":10,"len":3,"from":"her","to":"his","rule":"words.txt:69","why":"context","score":12.5}]})"
    "\n"
    R"({"input":"IN","line":2,"action":"guarded","guard":"medical","phrase":"pregnant","rule":"guards.txt:11"})"
    "\n"
    R"({"input":"IN","line":3,"action":"flagged","flags":[{"unsettled_verb":"she lead"}],"outcome":"counterfactual written"})"
    "\n"
    R"({"input":"IN","line":3,"action":"added","edits":[{"field":"/text","at":0,"len":3,"from":"she","to":"he","rule":"words.txt:67","why":"lexicon"}]})"
    "\n";

const char* kCorpus =
    "{\"text\": \"She fixed her bike.\"}\n"
    "{\"text\": \"She is pregnant.\"}\n"
    "{\"text\": \"she lead the ride\"}\n";

std::string log_for(const std::string& input) {
  std::string s = kLog;
  for (size_t p; (p = s.find("\"IN\"")) != std::string::npos;) s.replace(p, 4, "\"" + input + "\"");
  return s;
}

// Writes the corpus and its log into `d` and reads the log back.
std::vector<review::ReviewRecord> corpus_and_log(const TempDir& d) {
  write_file(d.file("c.jsonl"), kCorpus);
  write_file(d.file("log.jsonl"), log_for("c.jsonl"));
  auto log = review::read_audit_log(d.file("log.jsonl"));
  REQUIRE(log.ok());
  return std::move(*log);
}

}  // namespace

TEST_CASE("audit log lines are joined per record") {
  TempDir d;
  write_file(d.file("log.jsonl"), log_for("c.jsonl"));
  auto log = review::read_audit_log(d.file("log.jsonl"));
  REQUIRE(log.ok());
  REQUIRE(log->size() == 3);
  const auto& r = *log;
  CHECK(r[0].action == "added");
  REQUIRE(r[0].edits.size() == 2);
  CHECK(r[0].edits[1].score == 12.5);
  CHECK(r[1].guard == "medical");
  CHECK(r[1].guard_phrase == "pregnant");
  CHECK(r[2].flags.size() == 1);
  CHECK(r[2].flags[0].code == "unsettled_verb");
  CHECK(r[2].edits.size() == 1);
  CHECK(r[2].log_line == 3);
}

TEST_CASE("a bad audit line is an error naming file and line") {
  TempDir d;
  std::string path = d.file("log.jsonl");
  write_file(path, std::string(kLog) + "{\"input\":\"IN\",\"line\":4,\"action\":\"added\"}\n");
  auto a = review::read_audit_log(path);
  REQUIRE_FALSE(a.ok());
  CHECK(a.error().message() == path + ":5: 'edits' is missing or not an array");
  write_file(path, "{not json\n");
  auto b = review::read_audit_log(path);
  REQUIRE_FALSE(b.ok());
  CHECK(b.error().message().rfind(path + ":1: invalid JSON", 0) == 0);
  write_file(
      path,
      R"({"input":"x","line":1,"action":"added","edits":[{"field":"","at":0,"len":2,"from":"She","to":"He","why":"lexicon"}]})"
      "\n");
  auto c = review::read_audit_log(path);
  REQUIRE_FALSE(c.ok());
  CHECK(c.error().message() == path + ":1: an edit's 'len' is not the byte length of 'from'");
}

TEST_CASE("edits are checked against the corpus they name") {
  TempDir d;
  auto records = corpus_and_log(d);
  std::vector<review::ReviewRecord*> all;
  for (auto& r : records) all.push_back(&r);
  review::CorpusLayout layout;
  layout.root = d.path().string();
  REQUIRE(review::attach_sources(all, layout).ok());
  REQUIRE(records[0].fields.size() == 1);
  CHECK(records[0].fields[0].text == "She fixed her bike.");
  CHECK(review::apply_edits(records[0].fields[0].text, records[0].edits, "/text") ==
        "He fixed his bike.");
  CHECK(records[1].raw == "{\"text\": \"She is pregnant.\"}");

  // Another corpus under the same name: the first edit's 'from' is not there.
  write_file(d.file("c.jsonl"), "{\"text\": \"He fixed his bike.\"}\n");
  auto again = review::read_audit_log(d.file("log.jsonl"));
  std::vector<review::ReviewRecord*> first{&(*again)[0]};
  auto s = review::attach_sources(first, layout);
  REQUIRE_FALSE(s.ok());
  CHECK(s.error().message() == d.file("c.jsonl") +
                                   ":1: the audit log does not match this corpus: 'She' is not "
                                   "at byte 0 of /text");
  std::vector<review::ReviewRecord*> third{&(*again)[2]};
  auto t = review::attach_sources(third, layout);
  REQUIRE_FALSE(t.ok());
  CHECK(t.error().message() ==
        d.file("c.jsonl") + ":3: no record at this line although the audit log names it");
}

TEST_CASE("the streaming reader hands over one joined record at a time and stops on an error") {
  TempDir d;
  write_file(d.file("log.jsonl"), log_for("c.jsonl"));
  std::vector<std::pair<uint64_t, size_t>> seen;  // line, edits
  auto s = review::for_each_review_record(d.file("log.jsonl"), [&](review::ReviewRecord& r) {
    seen.emplace_back(r.line, r.edits.size());
    return ok_status();
  });
  REQUIRE(s.ok());
  CHECK(seen == std::vector<std::pair<uint64_t, size_t>>{{1, 2}, {2, 0}, {3, 1}});
  // An error of the callback comes back as it is, and nothing more is read.
  size_t calls = 0;
  auto stop = review::for_each_review_record(d.file("log.jsonl"), [&](review::ReviewRecord&) {
    ++calls;
    return Status(make_error(ErrorKind::output, "elsewhere", "cannot write"));
  });
  REQUIRE_FALSE(stop.ok());
  CHECK(stop.error().message() == "elsewhere: cannot write");
  CHECK(calls == 1);
  // A bad line: the records before it were handed over, the one it belongs to was not.
  write_file(d.file("bad.jsonl"), log_for("c.jsonl") + "{\"input\":\"c.jsonl\",\"line\":3}\n");
  seen.clear();
  auto bad = review::for_each_review_record(d.file("bad.jsonl"), [&](review::ReviewRecord& r) {
    seen.emplace_back(r.line, r.edits.size());
    return ok_status();
  });
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.error().message() ==
        d.file("bad.jsonl") + ":5: audit line lacks 'input', 'line' or 'action'");
  CHECK(seen.size() == 2);
}

TEST_CASE("sources attached in batches: forward reading, going back, closing, errors") {
  TempDir d;
  auto rs = corpus_and_log(d);
  review::CorpusLayout layout;
  layout.root = d.path().string();
  review::SourceAttacher attacher(layout);
  std::vector<review::ReviewRecord*> b1{&rs[0]}, b2{&rs[2]}, b3{&rs[1]}, b4{&rs[2], &rs[0]};
  REQUIRE(attacher.attach(b1).ok());
  CHECK(rs[0].fields.at(0).text == "She fixed her bike.");
  REQUIRE(attacher.attach(b2).ok());  // forward
  CHECK(rs[2].fields.at(0).text == "she lead the ride");
  REQUIRE(attacher.attach(b3).ok());  // behind the read position: the input is read again
  CHECK(rs[1].raw == "{\"text\": \"She is pregnant.\"}");
  rs[0].fields.clear();
  REQUIRE(attacher.attach(b4).ok());  // out of order within a batch
  CHECK(rs[0].fields.at(0).text == "She fixed her bike.");
  // The corpus changes under the same name; the open input was closed by a batch that did not
  // name it, so the new bytes are read.
  std::vector<review::ReviewRecord> other(1);
  other[0].input = "o.jsonl";
  other[0].line = 1;
  write_file(d.file("o.jsonl"), "{}\n");
  std::vector<review::ReviewRecord*> b5{&other[0]};
  REQUIRE(attacher.attach(b5).ok());
  write_file(d.file("c.jsonl"), "{\"text\": \"He fixed his bike.\"}\n");
  auto s = attacher.attach(b1);
  REQUIRE_FALSE(s.ok());
  CHECK(s.error().message() == d.file("c.jsonl") +
                                   ":1: the audit log does not match this corpus: 'She' is not "
                                   "at byte 0 of /text");
  auto t = attacher.attach(b2);
  REQUIRE_FALSE(t.ok());
  CHECK(t.error().message() ==
        d.file("c.jsonl") + ":3: no record at this line although the audit log names it");
}

TEST_CASE("an audit line far longer than any record limit is read") {
  // A short edit logs about a hundred bytes, so a record's line can be many times the
  // record; here one line of 70 MiB (white space between members is valid JSON).
  TempDir d;
  write_file(d.file("c.jsonl"), kCorpus);
  std::string line = log_for("c.jsonl");
  line = line.substr(0, line.find('\n'));
  line.insert(1, std::string(70u << 20, ' '));
  write_file(d.file("log.jsonl"), line + "\n");
  auto log = review::read_audit_log(d.file("log.jsonl"));
  REQUIRE(log.ok());
  REQUIRE(log->size() == 1);
  CHECK((*log)[0].edits.size() == 2);
}

TEST_CASE("a logged field whose name appears twice in its object is refused as run does") {
  TempDir d;
  write_file(d.file("c.jsonl"), "{\"text\": \"She fixed her bike.\", \"text\": \"x\"}\n");
  write_file(d.file("log.jsonl"), log_for("c.jsonl").substr(0, log_for("c.jsonl").find('\n') + 1));
  auto log = review::read_audit_log(d.file("log.jsonl"));
  REQUIRE(log.ok());
  std::vector<review::ReviewRecord*> all{&(*log)[0]};
  review::CorpusLayout layout;
  layout.root = d.path().string();
  Status s = review::attach_sources(all, layout);
  REQUIRE_FALSE(s.ok());
  CHECK(s.error().line == 1u);
  CHECK(s.error().reason == "duplicate key \"text\" in the top-level object");
}

TEST_CASE("terminal drawing: brackets without colour, ANSI with it, two columns") {
  review::ReviewRecord r;
  r.input = "c.jsonl";
  r.line = 1;
  r.action = "added";
  r.edits.push_back({"/text", 0, 3, "She", "He", "words.txt:67", "lexicon", "", {}});
  r.edits.push_back({"/text", 10, 3, "her", "his", "words.txt:69", "context", "", 3.5});
  r.fields.push_back({"/text", "She fixed her bike."});
  review::TerminalStyle plain;
  plain.width = 60;
  std::string a = review::render_terminal(r, plain);
  CHECK(a.find("\u00abShe\u2192He\u00bb fixed \u00abher\u2192his\u00bb bike.") !=
        std::string::npos);
  CHECK(a.find("\x1b[") == std::string::npos);
  CHECK(a.find("'her' -> 'his'  context words.txt:69 score 3.5") != std::string::npos);
  review::TerminalStyle color = plain;
  color.color = true;
  std::string b = review::render_terminal(r, color);
  CHECK(b.find("\x1b[31;9mShe\x1b[0m\x1b[32;1mHe\x1b[0m") != std::string::npos);
  review::TerminalStyle cols = plain;
  cols.columns = true;
  std::string c = review::render_terminal(r, cols);
  CHECK(c.find("[She] fixed [her] bike.") != std::string::npos);
  CHECK(c.find(" | [He] fixed [his] bike.") != std::string::npos);
  // Wrapping: every drawn line fits the width.
  r.fields[0].text = "She fixed her bike" + std::string(200, '.');
  review::TerminalStyle narrow = plain;
  narrow.width = 40;
  std::string w = review::render_terminal(r, narrow);
  size_t start = 0;
  for (size_t nl; (nl = w.find('\n', start)) != std::string::npos; start = nl + 1) {
    bool rule_line = w.compare(start, 6, "      ") == 0;  // the edit list is not wrapped
    if (!rule_line) CHECK(nl - start <= 40);
  }
  CHECK(w.find(std::string(36, '.')) != std::string::npos);
  // A record without edits (guarded) is shown as read, long ones cut.
  review::ReviewRecord g;
  g.input = "c.jsonl";
  g.line = 2;
  g.guard = "medical";
  g.raw = "{\"text\": \"" + std::string(3000, 'x') + "\"}";
  std::string gt = review::render_terminal(g, plain);
  CHECK(gt.find("guarded (medical") != std::string::npos);
  CHECK(gt.find("... (1012 more bytes)") != std::string::npos);  // 3012 bytes, 2000 shown
}

TEST_CASE("applying the demo run's logged edits gives exactly its counterfactuals") {
  // README "The audit log": applying the edits to the input gives exactly the output.
  TempDir d;
  std::string src = evenhand::testing::source_dir();
  std::string in = src + "/samples/helpdesk.jsonl";
  REQUIRE(shell(evenhand::testing::evenhand_binary() + " run --pack en-gender --in " + in +
                " --field /text --field '/messages/*/content' --out " + d.file("out.jsonl") +
                " --edits " + d.file("edits.jsonl") + " --quiet") == 0);
  auto log = review::read_audit_log(d.file("edits.jsonl"));
  REQUIRE(log.ok());
  std::vector<review::ReviewRecord*> all;
  for (auto& r : *log) all.push_back(&r);
  REQUIRE(review::attach_sources(all, {}).ok());
  // Output lines: every original, followed by its counterfactual when one was added.
  std::vector<std::string> out;
  std::string text = read_file(d.file("out.jsonl"));
  for (size_t s = 0, nl; (nl = text.find('\n', s)) != std::string::npos; s = nl + 1)
    out.push_back(text.substr(s, nl - s));
  simdjson::dom::parser parser;
  size_t checked = 0, added = 0;
  size_t pos = 0;  // index into `out`
  std::vector<std::string> input_lines;
  std::string itext = read_file(in);
  for (size_t s = 0, nl; (nl = itext.find('\n', s)) != std::string::npos; s = nl + 1)
    input_lines.push_back(itext.substr(s, nl - s));
  size_t next = 0;
  for (size_t line = 1; line <= input_lines.size(); ++line) {
    ++pos;  // the original
    while (next < log->size() && (*log)[next].line < line) ++next;
    if (next < log->size() && (*log)[next].line == line && (*log)[next].action == "added") {
      const auto& r = (*log)[next];
      REQUIRE(pos < out.size());
      simdjson::dom::element doc;
      REQUIRE_FALSE(parser.parse(out[pos]).get(doc));
      for (const auto& f : r.fields) {
        std::string_view want;
        REQUIRE_FALSE(doc.at_pointer(f.pointer).get_string().get(want));
        CHECK(review::apply_edits(f.text, r.edits, f.pointer) == want);
        ++checked;
      }
      ++added;
      ++pos;
    }
  }
  CHECK(pos == out.size());
  CHECK(added == 218);  // the README's worked example: 218 counterfactuals added
  CHECK(checked >= added);
}
