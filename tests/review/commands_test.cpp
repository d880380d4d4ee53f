// The review, report and associations commands end to end on the demo corpus: what they
// print, colour rules (NO_COLOR, --color), clear errors with exit codes, all-or-nothing
// output, and the HTML page rendered by headless Chromium (Debian package chromium).
#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <regex>

#include "review/html_report.h"
#include "support/temp_dir.h"

using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

using Ran = evenhand::testing::Ran;

Ran run(const TempDir& d, const std::string& args, const std::string& env = "") {
  return evenhand::testing::run_evenhand(d, args, "/dev/null", env);
}

// The README's demo run into `d`: out.jsonl, m.json, edits.jsonl.
void demo(const TempDir& d) {
  std::string in = evenhand::testing::source_dir() + "/samples/helpdesk.jsonl";
  auto r = run(d, "run --pack en-gender --in " + in +
                      " --field /text --field '/messages/*/content' --out " + d.file("out.jsonl") +
                      " --manifest " + d.file("m.json") + " --edits " + d.file("edits.jsonl") +
                      " --quiet");
  REQUIRE(r.code == 0);
}

bool exists(const std::string& p) {
  return std::filesystem::exists(p);
}

// The section of `page` with id `id`, or "" when there is none.
std::string section_of(const std::string& page, const std::string& id) {
  size_t at = page.find("<section id=\"" + id + "\"");
  if (at == std::string::npos) return "";
  return page.substr(at, page.find("</section>", at) - at);
}

size_t count(const std::string& s, const std::string& pattern) {
  std::regex re(pattern);
  return size_t(
      std::distance(std::sregex_iterator(s.begin(), s.end(), re), std::sregex_iterator()));
}

// A pattern for the text of a group's after mentions in a balance run's manifest, up to the
// number, which it captures when `capture` (else it ends before the number).
std::string after_mentions(const std::string& group, bool capture) {
  return "\"" + group +
         "\": \\{\\s*\"before\": \\{[^}]*\\},\\s*(?:\"planned\": \\{[^}]*\\},\\s*)?\"after\": "
         "\\{\\s*\"mentions\": " +
         (capture ? "([0-9]+)" : "");
}

// The group colours of the report's charts (review/html_report.cpp), for the legend check.
const std::vector<std::string> kGroupColors = {"#0f766e", "#c2410c", "#6d28d9",
                                               "#a16207", "#be123c", "#1d4ed8"};

// README: exit codes 2 usage, 3 input, 4 output.
constexpr int kUsage = 2, kInput = 3, kOutput = 4;

}  // namespace

TEST_CASE("review: filters, sample, no colour when piped, colour on request") {
  TempDir d;
  demo(d);
  std::string log = d.file("edits.jsonl");
  auto all = run(d, "review " + log + " --manifest " + d.file("m.json"));
  REQUIRE(all.code == 0);
  CHECK(all.out.find("\x1b[") == std::string::npos);  // stdout is a file here
  CHECK(all.out.find("\u00abEmma\u2192Jacob\u00bb") != std::string::npos);
  CHECK(all.out.find("shown 223 of 223 matching records (223 in the log)") != std::string::npos);

  auto guarded = run(d, "review " + log + " --guard medical");
  REQUIRE(guarded.code == 0);
  CHECK(guarded.out.find("shown 4 of 4 matching records") != std::string::npos);
  CHECK(guarded.out.find("guarded (medical: 'prostate', guards.txt:73)") != std::string::npos);

  auto rule = run(d, "review " + log + " --rule words.txt:300 --why lexicon");
  REQUIRE(rule.code == 0);
  CHECK(rule.out.find("\u00abchairwoman\u2192chairman\u00bb") != std::string::npos);
  CHECK(rule.out.find("\u00abEmma\u2192Jacob\u00bb") !=
        std::string::npos);  // line 13, with its other edits

  auto s1 = run(d, "review " + log + " --sample 5 --seed 3");
  auto s2 = run(d, "review " + log + " --sample 5 --seed 3");
  REQUIRE(s1.code == 0);
  CHECK(s1.out == s2.out);
  CHECK(s1.out.find("shown 5 of 223 matching records") != std::string::npos);

  auto always = run(d, "review " + log + " --why name --sample 2 --color always");
  CHECK(always.out.find("\x1b[32;1m") != std::string::npos);
  // NO_COLOR (no-color.org) only matters for --color auto, which needs a terminal.
  auto no_color = run(d, "review " + log + " --sample 2", "NO_COLOR=1");
  CHECK(no_color.out.find("\x1b[") == std::string::npos);
  if (shell("command -v script >/dev/null 2>&1") == 0) {
    // util-linux script(1) gives the command a terminal.
    std::string bin = evenhand::testing::evenhand_binary();
    std::string cmd =
        "script -qec \"" + bin + " review " + log + " --why name --sample 1\" /dev/null";
    shell(cmd + " > " + d.file("tty.txt") + " 2>&1");
    CHECK(read_file(d.file("tty.txt")).find("\x1b[32;1m") != std::string::npos);
    shell("NO_COLOR=1 " + cmd + " > " + d.file("tty2.txt") + " 2>&1");
    CHECK(read_file(d.file("tty2.txt")).find("\x1b[") == std::string::npos);
  }
  auto cols = run(d, "review " + log + " --rule words.txt:300 --layout columns --width 120");
  CHECK(cols.out.find("| Committee news: [Jacob]") != std::string::npos);
}

TEST_CASE("review: bad options and logs that do not fit are one clear line") {
  TempDir d;
  demo(d);
  auto usage = run(d, "review " + d.file("edits.jsonl") + " --layout sideways");
  CHECK(usage.code == kUsage);
  CHECK(usage.err == "evenhand: review: --layout must be inline or columns\n");
  write_file(d.file("bad.jsonl"), read_file(d.file("edits.jsonl")) + "{\"line\": 3}\n");
  auto bad = run(d, "review " + d.file("bad.jsonl"));
  CHECK(bad.code == kInput);
  CHECK(bad.err == "evenhand: " + d.file("bad.jsonl") +
                       ":224: audit line lacks 'input', 'line' or 'action'\n");
  // The log of one run against another corpus.
  std::string other = d.file("other.jsonl");
  write_file(other, "{\"text\": \"He rode.\"}\n");
  write_file(d.file("o.edits.jsonl"),
             "{\"input\":\"" + other +
                 "\",\"line\":1,\"action\":\"added\",\"edits\":[{\"field\":\"/text\",\"at\":0,"
                 "\"len\":3,\"from\":\"She\",\"to\":\"He\",\"why\":\"lexicon\"}]}\n");
  auto mismatch = run(d, "review " + d.file("o.edits.jsonl"));
  CHECK(mismatch.code == kInput);
  CHECK(mismatch.err == "evenhand: " + other +
                            ":1: the audit log does not match this corpus: 'She' is not at byte 0 "
                            "of /text\n");
}

TEST_CASE("review and report on a log longer than a batch and than the page's lists") {
  // Invented corpus: 700 records, every fifth one guarded (a pregnancy, a medical guard of
  // en-gender), the others rewritten.
  TempDir d;
  std::string corpus;
  for (int i = 0; i < 700; ++i)
    corpus += i % 5 == 0
                  ? "{\"text\": \"She is pregnant with twins, week " + std::to_string(i) + ".\"}\n"
                  : "{\"text\": \"She fixed her bike on day " + std::to_string(i) + ".\"}\n";
  write_file(d.file("big.jsonl"), corpus);
  REQUIRE(run(d, "run --pack en-gender --in " + d.file("big.jsonl") + " --field /text --out " +
                     d.file("out.jsonl") + " --manifest " + d.file("m.json") + " --edits " +
                     d.file("edits.jsonl") + " --quiet")
              .code == 0);
  auto all = run(d, "review " + d.file("edits.jsonl"));
  REQUIRE(all.code == 0);
  CHECK(all.out.find("shown 700 of 700 matching records (700 in the log)") != std::string::npos);
  // Every record once, in log order, across the batches.
  std::regex head("big\\.jsonl:([0-9]+)  (added|guarded)");
  std::vector<int> lines;
  for (auto it = std::sregex_iterator(all.out.begin(), all.out.end(), head);
       it != std::sregex_iterator(); ++it)
    lines.push_back(std::stoi((*it)[1].str()));
  REQUIRE(lines.size() == 700);
  for (size_t i = 0; i < lines.size(); ++i) CHECK(lines[i] == int(i) + 1);
  auto sample = run(d, "review " + d.file("edits.jsonl") + " --sample 9 --seed 4");
  CHECK(sample.out.find("shown 9 of 700 matching records (700 in the log)") != std::string::npos);

  auto page = run(d, "report --manifest " + d.file("m.json") + " --edits " + d.file("edits.jsonl") +
                         " --out " + d.file("r.html"));
  REQUIRE(page.code == 0);
  std::string html = read_file(d.file("r.html"));
  size_t guards = html.find("id=\"guards\"");
  REQUIRE(guards != std::string::npos);
  std::string section = html.substr(guards, html.find("</section>", guards) - guards);
  std::regex row("<tr><td class=\"ptr\">");
  CHECK(std::distance(std::sregex_iterator(section.begin(), section.end(), row),
                      std::sregex_iterator()) == long(evenhand::review::kReportListed));
  CHECK(section.find("The first 50 of 140.") != std::string::npos);

  // A corpus record that no longer fits, past the first batch: an error naming it.
  corpus.replace(corpus.find("She fixed her bike on day 601."), 3, "Tom");
  write_file(d.file("big.jsonl"), corpus);
  auto late = run(d, "review " + d.file("edits.jsonl"));
  CHECK(late.code == kInput);
  CHECK(late.err.find(d.file("big.jsonl") + ":602: the audit log does not match this corpus") !=
        std::string::npos);
  // report checks every edited record too, not only its sample: same code, same line.
  auto late_page = run(d, "report --manifest " + d.file("m.json") + " --edits " +
                              d.file("edits.jsonl") + " --out " + d.file("r2.html"));
  CHECK(late_page.code == kInput);
  CHECK(late_page.err == late.err);
  CHECK_FALSE(exists(d.file("r2.html")));
}

TEST_CASE("run refuses a duplicate member name and review and report accept its log") {
  // Invented records. Line 1 names "text" twice; line 3 repeats a member no field reaches.
  TempDir d;
  write_file(d.file("in.jsonl"),
             "{\"text\": \"She rode.\", \"text\": \"Her bike.\"}\n"
             "{\"text\": \"He rode.\"}\n"
             "{\"n\": 1, \"n\": 2, \"text\": \"She ran.\"}\n");
  auto r = run(d, "run --pack en-gender --in " + d.file("in.jsonl") + " --field /text --out " +
                      d.file("out.jsonl") + " --manifest " + d.file("m.json") + " --edits " +
                      d.file("edits.jsonl") + " --rejects " + d.file("rejects.jsonl") +
                      " --on-bad-record skip --quiet");
  REQUIRE(r.code == 0);
  CHECK(
      read_file(d.file("rejects.jsonl"))
          .find(
              "\"line\":1,\"reason\":\"duplicate_key\",\"message\":\"duplicate key \\\"text\\\" in "
              "the top-level object\"") != std::string::npos);
  std::string log = read_file(d.file("edits.jsonl"));
  CHECK(log.find("\"line\":1,") == std::string::npos);
  CHECK(log.find("\"line\":3,") != std::string::npos);
  auto rv = run(d, "review " + d.file("edits.jsonl") + " --manifest " + d.file("m.json"));
  CHECK(rv.code == 0);
  CHECK(rv.out.find("shown 2 of 2 matching records") != std::string::npos);
  auto page = run(d, "report --manifest " + d.file("m.json") + " --edits " + d.file("edits.jsonl") +
                         " --out " + d.file("r.html"));
  CHECK(page.code == 0);
  auto fail = run(d, "run --pack en-gender --in " + d.file("in.jsonl") + " --field /text --out " +
                         d.file("out2.jsonl") + " --quiet");
  CHECK(fail.code == kInput);
  CHECK(fail.err ==
        "evenhand: " + d.file("in.jsonl") + ":1: duplicate key \"text\" in the top-level object\n");
}

TEST_CASE("review and report read the corpus under the run's --max-record-bytes") {
  // Invented: a record of 17 MB (over the 16M default) whose padding no field selects.
  TempDir d;
  std::string big = "{\"pad\": \"" + std::string(17u << 20, 'x') + "\", \"text\": \"She rode.\"}\n";
  write_file(d.file("in.jsonl"), big + "{\"text\": \"She ran.\"}\n");
  auto base = "run --pack en-gender --in " + d.file("in.jsonl") + " --field /text --quiet";
  REQUIRE(run(d, base + " --max-record-bytes 32M --out " + d.file("a.jsonl") + " --manifest " +
                     d.file("a.json") + " --edits " + d.file("a.edits.jsonl"))
              .code == 0);
  auto rv = run(d, "review " + d.file("a.edits.jsonl") + " --manifest " + d.file("a.json"));
  CHECK(rv.code == 0);
  CHECK(rv.out.find("shown 2 of 2 matching records") != std::string::npos);
  CHECK(run(d, "report --manifest " + d.file("a.json") + " --edits " + d.file("a.edits.jsonl") +
                   " --out " + d.file("a.html"))
            .code == 0);
  // Without the manifest the default applies, and the record the log names is too large.
  auto no_m = run(d, "review " + d.file("a.edits.jsonl"));
  CHECK(no_m.code == kInput);
  CHECK(no_m.err.find(d.file("in.jsonl") + ":1: record of ") != std::string::npos);
  // A run under the default limit rejected that record; review passes over it.
  REQUIRE(run(d, base + " --on-bad-record skip --out " + d.file("b.jsonl") + " --edits " +
                     d.file("b.edits.jsonl"))
              .code == 0);
  auto skipped = run(d, "review " + d.file("b.edits.jsonl"));
  CHECK(skipped.code == 0);
  CHECK(skipped.out.find("shown 1 of 1 matching records") != std::string::npos);
}

TEST_CASE("report: a self-contained page, written all or nothing") {
  TempDir d;
  demo(d);
  std::string html = d.file("report.html");
  auto r = run(d, "report --manifest " + d.file("m.json") + " --edits " + d.file("edits.jsonl") +
                      " --out " + html);
  REQUIRE(r.code == 0);
  CHECK(r.err.empty());
  std::string page = read_file(html);
  for (const char* id :
       {"chart-groups-mentions", "chart-groups-records", "chart-entries", "chart-flagged",
        "chart-guarded", "summary", "sample", "files", "cautions"}) {
    INFO(id);
    CHECK(page.find(std::string("id=\"") + id + "\"") != std::string::npos);
  }
  // Nothing to fetch: no scripts, no external references, a policy that forbids them.
  CHECK(page.find("<script") == std::string::npos);
  CHECK(page.find("src=") == std::string::npos);
  CHECK(page.find("href=") == std::string::npos);
  CHECK(page.find("url(") == std::string::npos);
  CHECK(page.find("@import") == std::string::npos);
  CHECK(page.find("default-src 'none'") != std::string::npos);
  // The manifest's figures and hashes are on the page.
  CHECK(page.find("5 records left as they were") != std::string::npos);
  // The sample: 12 records by default, each edit marked up.
  std::regex rec("<div class=\"rec\">");
  CHECK(std::distance(std::sregex_iterator(page.begin(), page.end(), rec),
                      std::sregex_iterator()) == 12);
  CHECK(page.find("<del title=\"") != std::string::npos);
  CHECK(page.find("<ins title=\"") != std::string::npos);
  // Legend swatches carry the bars' colours, one per group, in each series' style.
  std::regex swatch("<rect class=\"bar swatch (before|after)\"[^>]*fill=\"([^\"]+)\"");
  size_t swatches = 0;
  for (auto it = std::sregex_iterator(page.begin(), page.end(), swatch);
       it != std::sregex_iterator(); ++it, ++swatches) {
    INFO((*it)[0]);
    CHECK(std::find(kGroupColors.begin(), kGroupColors.end(), (*it)[2].str()) !=
          kGroupColors.end());
  }
  CHECK(swatches == 2 * 2 * 3);  // two charts, before and after, three groups
  CHECK(page.find("#555") == std::string::npos);
  // Numbers never break at their thousands separator: a no-break space, and no wrapping.
  std::string files = section_of(page, "files");
  CHECK(files.find("\u202F") != std::string::npos);  // the demo's files exceed 999 bytes
  CHECK(files.find("\u2009") == std::string::npos);
  CHECK(std::regex_search(page, std::regex("td\\.n,th\\.n\\{[^}]*white-space:nowrap")));
  std::smatch sha;
  std::string manifest = read_file(d.file("m.json"));
  REQUIRE(std::regex_search(manifest, sha, std::regex("\"sha256\": \"([0-9a-f]{64})\"")));
  CHECK(page.find(sha[1].str()) != std::string::npos);
  // Same inputs, same bytes.
  REQUIRE(run(d, "report --manifest " + d.file("m.json") + " --edits " + d.file("edits.jsonl") +
                     " --out " + d.file("again.html"))
              .code == 0);
  CHECK(read_file(d.file("again.html")) == page);

  // Failures leave nothing under the final name.
  auto missing_dir =
      run(d, "report --manifest " + d.file("m.json") + " --out " + d.file("no/such/dir/r.html"));
  CHECK(missing_dir.code == kOutput);
  write_file(d.file("broken.jsonl"), read_file(d.file("edits.jsonl")) + "{oops\n");
  auto broken = run(d, "report --manifest " + d.file("m.json") + " --edits " +
                           d.file("broken.jsonl") + " --out " + d.file("broken.html"));
  CHECK(broken.code == kInput);
  CHECK(broken.err.find(d.file("broken.jsonl") + ":224: invalid JSON") != std::string::npos);
  CHECK_FALSE(exists(d.file("broken.html")));
  auto not_manifest =
      run(d, "report --manifest " + d.file("edits.jsonl") + " --out " + d.file("x.html"));
  CHECK(not_manifest.code == kInput);
  CHECK_FALSE(exists(d.file("x.html")));
  auto self = run(d, "report --manifest " + d.file("m.json") + " --out " + d.file("m.json"));
  CHECK(self.code == kUsage);
}

TEST_CASE("report: a balance run shows the planned counts on its basis's chart") {
  TempDir d;
  std::string in = evenhand::testing::source_dir() + "/samples/helpdesk.jsonl";
  REQUIRE(run(d, "run --pack en-gender --in " + in +
                     " --field /text --field '/messages/*/content' --mode balance --target "
                     "female=1,male=1 --out " +
                     d.file("b.jsonl") + " --manifest " + d.file("m.json") + " --quiet")
              .code == 0);
  REQUIRE(run(d, "report --manifest " + d.file("m.json") + " --out " + d.file("r.html")).code == 0);
  std::string page = read_file(d.file("r.html"));
  size_t mentions = page.find("id=\"chart-groups-mentions\"");
  size_t records = page.find("id=\"chart-groups-records\"");
  REQUIRE(mentions < records);
  std::string m_chart = page.substr(mentions, records - mentions);
  std::string r_chart = page.substr(records, page.find("</svg>", records) - records);
  CHECK(m_chart.find("class=\"bar planned\" data-series=\"planned\"") != std::string::npos);
  CHECK(r_chart.find("planned") == std::string::npos);  // --basis mentions: no planned records
  CHECK(page.find("No audit log was given") != std::string::npos);

  // The balance header comes first, before the summary: target, tolerance, shares, the plan.
  std::string bal = section_of(page, "balance");
  REQUIRE_FALSE(bal.empty());
  CHECK(page.find("id=\"balance\"") < page.find("id=\"summary\""));
  CHECK(bal.find("basis mentions, tolerance \u00b12.0 points") != std::string::npos);
  CHECK(bal.find("id=\"chart-balance\"") != std::string::npos);
  for (const char* g : {"female", "male"})
    for (const char* series : {"before", "target", "after"}) {
      INFO(g << " " << series);
      CHECK(bal.find(std::string("data-series=\"") + series + "\" data-group=\"" + g + "\"") !=
            std::string::npos);
    }
  CHECK(bal.find("data-group=\"neutral\"") == std::string::npos);  // not a target group
  // Achieved shares, from the manifest's after counts (the run really reached the target).
  std::string manifest = read_file(d.file("m.json"));
  std::smatch f, ml, minimal, changed, bound;
  REQUIRE(std::regex_search(manifest, f, std::regex(after_mentions("female", true))));
  REQUIRE(std::regex_search(manifest, ml, std::regex(after_mentions("male", true))));
  double share = std::stod(f[1]) / (std::stod(f[1]) + std::stod(ml[1]));
  REQUIRE(std::abs(share - 0.5) <= 0.02);
  char want[64];
  std::snprintf(want, sizeof want, "<td class=\"n\">%.1f%%</td>", 100 * share);
  CHECK(bal.find(want) != std::string::npos);
  CHECK(bal.find("Target reached:") != std::string::npos);
  REQUIRE(std::regex_search(manifest, minimal, std::regex("\"minimal\": ?(true|false)")));
  REQUIRE(std::regex_search(manifest, changed, std::regex("\"planned_changed\": ?([0-9]+)")));
  REQUIRE(std::regex_search(manifest, bound, std::regex("\"lower_bound\": ?([0-9]+)")));
  CHECK(bal.find("The plan changes " + changed[1].str() +
                 " records; no plan can reach the "
                 "target with fewer than " +
                 bound[1].str() + ".") != std::string::npos);
  CHECK(bal.find(minimal[1] == "true" ? "Proved minimal." : "Not proved minimal") !=
        std::string::npos);
  CHECK(section_of(page, "look-first").find("data-kind=\"balance\"") == std::string::npos);

  // The same manifest with the female share moved out of the window: missed, and listed first.
  std::string off = std::regex_replace(
      manifest, std::regex("(" + after_mentions("female", false) + ")[0-9]+"), "$011");
  REQUIRE(off != manifest);
  write_file(d.file("off.json"), off);
  REQUIRE(run(d, "report --manifest " + d.file("off.json") + " --out " + d.file("off.html")).code ==
          0);
  std::string off_page = read_file(d.file("off.html"));
  CHECK(section_of(off_page, "balance").find("Target missed:") != std::string::npos);
  CHECK(section_of(off_page, "look-first").find("<li data-kind=\"balance\"><b>female</b>") !=
        std::string::npos);

  // A balance section without its keys is refused with the key named.
  write_file(d.file("bad.json"),
             std::regex_replace(manifest, std::regex("\"minimal\": ?(true|false)"),
                                "\"minimal\": \"yes\""));
  auto bad = run(d, "report --manifest " + d.file("bad.json") + " --out " + d.file("bad.html"));
  CHECK(bad.code == kInput);
  CHECK(bad.err == "evenhand: " + d.file("bad.json") +
                       ": 'balance.minimal' is missing or of the wrong type\n");
  CHECK_FALSE(exists(d.file("bad.html")));
}

TEST_CASE("report: look here first lists busy entries, word-like names, guards and flags") {
  // Invented records: "Rose" (a pair the pack marks ~word, a common word) and "Emma" (not
  // marked) named as persons, "she" in every record, a pregnancy that a medical guard blocks.
  TempDir d;
  std::string corpus;
  for (int i = 0; i < 30; ++i)
    corpus += std::string("{\"text\": \"") + (i % 2 ? "Rose" : "Emma") +
              " said she would lead ride " + std::to_string(i) + ".\"}\n";
  corpus += "{\"text\": \"She is pregnant with twins.\"}\n";
  write_file(d.file("in.jsonl"), corpus);
  REQUIRE(run(d, "run --pack en-gender --in " + d.file("in.jsonl") + " --field /text --out " +
                     d.file("out.jsonl") + " --manifest " + d.file("m.json") + " --quiet")
              .code == 0);
  // The manifest marks the hits of ~word pairs (rules/en-gender/names.txt).
  std::string manifest = read_file(d.file("m.json"));
  CHECK(std::regex_search(manifest, std::regex("\"forms\": \"Rose\\|Kyle\\|-\",\\s*\"hits\": "
                                               "15,\\s*\"common_word\": true")));
  CHECK(std::regex_search(manifest,
                          std::regex("\"forms\": \"Emma\\|Jacob\\|-\",\\s*\"hits\": 15\\s*\\}")));
  REQUIRE(run(d, "report --manifest " + d.file("m.json") + " --out " + d.file("r.html")).code == 0);
  std::string page = read_file(d.file("r.html"));
  std::string look = section_of(page, "look-first");
  REQUIRE_FALSE(look.empty());
  CHECK(page.find("id=\"look-first\"") < page.find("id=\"summary\""));
  CHECK(section_of(page, "balance").empty());  // not a balance run
  CHECK(page.find("chart-balance") == std::string::npos);
  // she|he: 30 edits of 60 (at least 20 and 10%); each name pair 15 (under 20).
  CHECK(look.find("<li data-kind=\"entry\"><b>she|he|they @subj</b>") != std::string::npos);
  CHECK(count(look, "data-kind=\"entry\"") == 1);
  CHECK(look.find("\u201cjohn\u201d): <b>Rose|Kyle|-</b> 15. Check") != std::string::npos);
  CHECK(count(look, "data-kind=\"word-name\"") == 1);
  CHECK(look.find("Emma") == std::string::npos);  // not a common word
  CHECK(look.find("<li data-kind=\"guarded\"><b>Guarded records: 1</b> (medical 1)") !=
        std::string::npos);
  CHECK(look.find("data-kind=\"flagged\"") == std::string::npos);  // nothing flagged
}

TEST_CASE("report: the cautions are the README's, word for word") {
  std::string readme = read_file(evenhand::testing::source_dir() + "/README.md");
  size_t start = readme.find("## Cautions\n");
  REQUIRE(start != std::string::npos);
  size_t end = readme.find("\n## ", start + 1);
  std::string section = readme.substr(start, end - start);
  std::vector<std::string> bullets;
  std::regex ws("\\s+");
  for (size_t p = section.find("\n- "); p != std::string::npos;) {
    size_t q = section.find("\n- ", p + 1);
    std::string b = section.substr(p + 3, (q == std::string::npos ? section.size() : q) - p - 3);
    b = std::regex_replace(b, ws, " ");
    while (!b.empty() && b.back() == ' ') b.pop_back();
    bullets.push_back(b);
    p = q;
  }
  CHECK(bullets == evenhand::review::report_cautions());
}

TEST_CASE("report: headless Chromium loads the page and finds the charts") {
  // chromium is a dependency of the tests (.ci/deps installs it): missing, the check fails.
  REQUIRE(shell("command -v chromium >/dev/null 2>&1") == 0);
  TempDir d;
  demo(d);
  std::string in = evenhand::testing::source_dir() + "/samples/helpdesk.jsonl";
  REQUIRE(run(d, "associations --pack en-gender --in " + in + " --after " + d.file("out.jsonl") +
                     " --field /text --field '/messages/*/content' --out " + d.file("a.json"))
              .code == 0);
  std::string html = d.file("report.html");
  REQUIRE(run(d, "report --manifest " + d.file("m.json") + " --edits " + d.file("edits.jsonl") +
                     " --associations " + d.file("a.json") + " --out " + html)
              .code == 0);
  std::string chrome =
      "chromium --headless --no-sandbox --disable-gpu --user-data-dir=" + d.file("profile") +
      " --enable-logging=stderr --v=0 ";
  int rc = shell("timeout 120 " + chrome + "--dump-dom file://" + html + " > " +
                 d.file("dom.html") + " 2> " + d.file("chrome.log"));
  REQUIRE(rc == 0);
  std::string dom = read_file(d.file("dom.html"));
  std::string log = read_file(d.file("chrome.log"));
  INFO(log);
  // Console messages (script errors, refused loads under the page's policy) are logged as
  // CONSOLE lines; a clean page has none.
  CHECK(log.find("CONSOLE") == std::string::npos);
  CHECK(log.find("Refused to") == std::string::npos);
  for (const char* id : {"chart-groups-mentions", "chart-groups-records", "chart-entries",
                         "chart-flagged", "chart-guarded", "chart-associations"}) {
    INFO(id);
    std::regex svg(std::string("<svg id=\"") + id + "\"[^>]*>");
    CHECK(std::regex_search(dom, svg));
  }
  // The bars are there as parsed elements: the demo run's three groups, before and after.
  std::regex bar("<rect class=\"bar (before|after)\" data-series=");
  CHECK(std::distance(std::sregex_iterator(dom.begin(), dom.end(), bar), std::sregex_iterator()) >=
        12);
  // The demo run is no balance run; its look-here-first list names the guarded records.
  CHECK(dom.find("id=\"balance\"") == std::string::npos);
  CHECK(dom.find("id=\"chart-balance\"") == std::string::npos);
  // (std::regex recurses per character: long spans are cut out with find.)
  CHECK(section_of(dom, "look-first").find("<li data-kind=\"guarded\"><b>Guarded records: 5</b>") !=
        std::string::npos);
  // The association table says which columns are before and which after: no label twice.
  size_t table = dom.find("<table id=\"table-associations\">");
  REQUIRE(table != std::string::npos);
  std::string head = dom.substr(table, dom.find("<tr><td>", table) - table);
  std::vector<std::string> labels;
  std::regex th("<th[^>]*>([^<]*)</th>");
  for (auto it = std::sregex_iterator(head.begin(), head.end(), th); it != std::sregex_iterator();
       ++it)
    if (!(*it)[1].str().empty()) labels.push_back((*it)[1]);
  CHECK(labels.size() == 12);  // 2 column groups, target, occurs, 2 x (with f, with m, z, p)
  std::vector<std::string> sorted = labels;
  std::sort(sorted.begin(), sorted.end());
  CHECK(std::adjacent_find(sorted.begin(), sorted.end()) == sorted.end());

  // Numbers keep to one line: the page with a probe script (and without the policy that
  // forbids it) reports, for each number cell of the files table, on how many lines its text
  // lies in a narrow window (Range.getClientRects gives one box per line of text).
  std::string probe = std::regex_replace(read_file(html),
                                         std::regex("<meta http-equiv=\"Content-Security-Policy\""
                                                    "[^>]*>"),
                                         "");
  probe.replace(probe.rfind("</body>"), 7,
                "<script>const n=[];for(const td of document.querySelectorAll('#files td.n')){"
                "const r=document.createRange();r.selectNodeContents(td);const tops=new Set();"
                "for(const b of r.getClientRects())tops.add(Math.round(b.top));n.push(tops.size)}"
                "const p=document.createElement('pre');p.id='probe';p.textContent=n.join(' ');"
                "document.body.appendChild(p);</script></body>");
  write_file(d.file("probe.html"), probe);
  REQUIRE(shell("timeout 120 " + chrome + "--window-size=480,900 --dump-dom file://" +
                d.file("probe.html") + " > " + d.file("probe-dom.html") + " 2>/dev/null") == 0);
  std::smatch lines;
  std::string probed = read_file(d.file("probe-dom.html"));
  REQUIRE(std::regex_search(probed, lines, std::regex("<pre id=\"probe\">([0-9 ]+)</pre>")));
  INFO("lines per number cell: " << lines[1]);
  CHECK(std::regex_match(lines[1].str(), std::regex("1( 1)*")));
  CHECK(lines[1].str().size() >= 9);  // the demo's files: at least 5 cells with a number

  // A balance run: the balance header and its chart, parsed, before the summary.
  REQUIRE(run(d, "run --pack en-gender --in " + in +
                     " --field /text --field '/messages/*/content' --mode balance --target "
                     "female=1,male=1 --out " +
                     d.file("b.jsonl") + " --manifest " + d.file("bm.json") + " --quiet")
              .code == 0);
  REQUIRE(run(d, "report --manifest " + d.file("bm.json") + " --out " + d.file("b.html")).code ==
          0);
  REQUIRE(shell("timeout 120 " + chrome + "--dump-dom file://" + d.file("b.html") + " > " +
                d.file("b-dom.html") + " 2>/dev/null") == 0);
  std::string bdom = read_file(d.file("b-dom.html"));
  CHECK(bdom.find("<section id=\"balance\">") < bdom.find("<section id=\"summary\">"));
  CHECK(std::regex_search(section_of(bdom, "balance"),
                          std::regex("<svg id=\"chart-balance\"[^>]*>")));
  CHECK(count(bdom,
              "<rect class=\"bar (before|planned|after)\" data-series=\"(before|target|"
              "after)\" data-group=") == 6);

  // A screenshot for people to look at, kept in the build tree.
  std::filesystem::create_directories(EVENHAND_TEST_ARTEFACTS);
  std::string png = std::string(EVENHAND_TEST_ARTEFACTS) + "/report.png";
  std::filesystem::remove(png);
  rc = shell("timeout 120 " + chrome + "--window-size=1100,2400 --screenshot=" + png + " file://" +
             html + " > /dev/null 2>&1");
  CHECK(rc == 0);
  std::string shot = read_file(png);
  REQUIRE(shot.size() > 1000);
  CHECK(shot.substr(1, 3) == "PNG");  // PNG signature (ISO/IEC 15948)
}

TEST_CASE(
    "review: an unknown --why is a usage error, and standard input is read back from a copy") {
  TempDir d;
  demo(d);
  auto bogus = run(d, "review " + d.file("edits.jsonl") + " --why bogus");
  CHECK(bogus.code == kUsage);
  CHECK(bogus.err.find("--why must be lexicon, name, context or agreement, not 'bogus'") !=
        std::string::npos);
  // A run from standard input logs its records as <stdin> (invented record, mechanics).
  write_file(d.file("in.jsonl"), "{\"text\":\"She thanked her brother.\"}\n");
  auto piped = evenhand::testing::run_evenhand(
      d, "run --pack en-gender --in - --out " + d.file("o.jsonl") + " --edits " + d.file("e.jsonl"),
      d.file("in.jsonl"));
  REQUIRE(piped.code == 0);
  CHECK(read_file(d.file("e.jsonl")).find("\"input\":\"<stdin>\"") != std::string::npos);
  auto no_copy = run(d, "review " + d.file("e.jsonl"));
  CHECK(no_copy.code == kUsage);
  CHECK(no_copy.err.find("--stdin-corpus") != std::string::npos);
  auto copy = run(d, "review " + d.file("e.jsonl") + " --stdin-corpus " + d.file("in.jsonl"));
  CHECK(copy.code == 0);
  CHECK(copy.out.find("\u00abShe\u2192He\u00bb thanked \u00abher\u2192his\u00bb") !=
        std::string::npos);
}

TEST_CASE("review: windows by default, --whole for whole fields, --context checked") {
  TempDir d;
  demo(d);
  std::string log = d.file("edits.jsonl");
  auto windows = run(d, "review " + log + " --width 200");
  auto whole = run(d, "review " + log + " --whole --width 200");
  REQUIRE(windows.code == 0);
  REQUIRE(whole.code == 0);
  // Whole fields state no cut; windows state theirs.
  CHECK(whole.out.find("\u27e8") == std::string::npos);
  CHECK(windows.out.find(" bytes not shown\u27e9") != std::string::npos);
  // A window's line names the field and the logged offsets of its edits.
  CHECK(windows.out.find("  /text @16 @46 @74 @122\n") != std::string::npos);
  CHECK(whole.out.find("  /text\n") != std::string::npos);
  // One word each side cuts the chair's notice (line 13) in two windows, the gap stated.
  auto narrow = run(d, "review " + log + " --rule words.txt:300 --context 1 --width 200");
  REQUIRE(narrow.code == 0);
  CHECK(narrow.out.find("  /text @16 @46 @74\n") != std::string::npos);
  CHECK(narrow.out.find("  /text @122\n    \u27e88 words, 34 bytes not shown\u27e9 thank "
                        "\u00abher\u2192him\u00bb warmly.\n") != std::string::npos);
  CHECK(narrow.out.find("will stay on as a ride leader, and we thank") == std::string::npos);
  auto narrow_whole = run(d, "review " + log + " --rule words.txt:300 --whole --width 200");
  CHECK(narrow_whole.out.find("will stay on as a ride leader, and we thank") != std::string::npos);
  for (const char* bad : {"--context x", "--context 201", "--context -1", "--context ''"}) {
    INFO(bad);
    auto r = run(d, "review " + log + " " + bad);
    CHECK(r.code == kUsage);
    CHECK(r.err.find("evenhand: review: --context must be a whole number from 0 to 200") == 0);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
  }
  auto both = run(d, "review " + log + " --whole --context 3");
  CHECK(both.code == kUsage);
  CHECK(both.err ==
        "evenhand: review: --context sets the windows that --whole replaces; give one "
        "of them\n");
  // The report's sample shows the same windows and statements.
  REQUIRE(run(d, "report --manifest " + d.file("m.json") + " --edits " + log +
                     " --sample 300 --out " + d.file("r.html"))
              .code == 0);
  std::string page = read_file(d.file("r.html"));
  CHECK(page.find("<div class=\"ptr\">/text @16 @46 @74 @122</div>") != std::string::npos);
  CHECK(page.find(" bytes not shown\u27e9</span>") != std::string::npos);
}
