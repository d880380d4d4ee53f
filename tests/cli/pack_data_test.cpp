// A pack's data files through the command line: `check` runs every loader `run` runs, so a
// corrupt possessive.model, word-classes.data, verbs.data or noun-phrase data file is refused
// by both with the same one-line message naming the folder as given, the file and the line;
// and a target of targets.data that the pack rewrites is refused by check, run and
// associations.
#include <catch2/catch.hpp>

#include <filesystem>
#include <functional>

#include "support/temp_dir.h"

using evenhand::testing::Ran;
using evenhand::testing::read_file;
using evenhand::testing::run_evenhand;
using evenhand::testing::source_dir;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

constexpr int kInput = 3, kPack = 5;

// A copy of the shipped pack rules/NAME in d/pack; returns its path.
std::string copy_pack(const TempDir& d, const std::string& name) {
  std::filesystem::copy(source_dir() + "/rules/" + name, d.file("pack"));
  return d.file("pack");
}

// The 1-based line of byte `pos` of `text`.
size_t line_at(const std::string& text, size_t pos) {
  return 1 + std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(pos), '\n');
}

// The start of the first line of `text` that begins with `prefix`.
size_t line_starting(const std::string& text, const std::string& prefix) {
  if (text.compare(0, prefix.size(), prefix) == 0) return 0;
  size_t p = text.find("\n" + prefix);
  REQUIRE(p != std::string::npos);
  return p + 1;
}

// The line of `text` that starts at `pos`, without its newline.
std::string line_from(const std::string& text, size_t pos) {
  return text.substr(pos, text.find('\n', pos) - pos);
}

// One corruption of one data file: it edits the file's text and returns the line the loader
// must name (0: the file as a whole); `says` is part of the reason.
struct Corruption {
  const char* what;
  const char* file;
  std::function<size_t(std::string&)> edit;
  const char* says;
};

// The whole line `check` printed for DIR/FILE:LINE (or "DIR/FILE: " for line 0).
std::string check_line(const Ran& r, const std::string& where) {
  size_t p = r.out.find(where);
  if (p == std::string::npos || (p > 0 && r.out[p - 1] != '\n')) return "";
  return line_from(r.out, p);
}

// Applies `c` to a fresh copy of `pack` and checks that `check` and `run` both refuse the
// pack, printing the same message that names the folder path, the file and the line.
void refused_alike(const std::string& pack, const Corruption& c) {
  INFO(c.what);
  TempDir d;
  std::string dir = copy_pack(d, pack);
  std::string path = dir + "/" + c.file;
  size_t line = 0;
  if (c.edit) {
    std::string text = read_file(path);
    line = c.edit(text);
    write_file(path, text);
  } else {
    std::filesystem::remove(path);
  }
  std::string where = path + (line ? ":" + std::to_string(line) : std::string()) + ": ";
  auto check = run_evenhand(d, "check " + dir);
  INFO(check.out + check.err);
  CHECK(check.code == kPack);
  std::string message = check_line(check, where);
  REQUIRE_FALSE(message.empty());
  CHECK(message.find(c.says) != std::string::npos);

  write_file(d.file("in.jsonl"), "{\"text\":\"She said her sister knows.\"}\n");
  auto run = run_evenhand(d, "run --quiet --pack " + dir + " --in " + d.file("in.jsonl") +
                                 " --out " + d.file("out.jsonl"));
  INFO(run.err);
  CHECK(run.code == kPack);
  CHECK(run.err.find("evenhand: " + message + "\n") != std::string::npos);
  CHECK_FALSE(std::filesystem::exists(d.file("out.jsonl")));
}

// Replaces the first line starting with `prefix` by `by`; returns its line number.
size_t replace_line(std::string& text, const std::string& prefix, const std::string& by) {
  size_t p = line_starting(text, prefix);
  text.replace(p, line_from(text, p).size(), by);
  return line_at(text, p);
}

// The first feature line of a possessive model (the line after "features N").
size_t first_feature(const std::string& text) {
  return text.find('\n', line_starting(text, "features ")) + 1;
}

}  // namespace

TEST_CASE("check and run refuse a corrupt possessive.model alike, naming folder and line") {
  const std::vector<Corruption> cases = {
      {"bad header", "possessive.model",
       [](std::string& t) { return replace_line(t, "evenhand-possessive-model", "model 7"); },
       "not a possessive model"},
      {"huge count", "possessive.model",
       [](std::string& t) { return replace_line(t, "words ", "words 999999999999"); },
       "words 999999999999 is more than the lines left in the file"},
      {"truncated line", "possessive.model",
       [](std::string& t) {
         size_t p = t.find('\n', line_starting(t, "words ")) + 1;  // the first word line
         t.erase(t.find('\t', p), t.find('\n', p) - t.find('\t', p));
         return line_at(t, p);
       },
       "a word line is"},
      {"bad number", "possessive.model",
       [](std::string& t) {
         size_t p = first_feature(t);
         t.insert(t.find('\t', p) + 1, "x");
         return line_at(t, p);
       },
       "is not an integer"},
      {"wrong column count", "possessive.model",
       [](std::string& t) {
         size_t p = first_feature(t);
         t.erase(t.rfind('\t', t.find('\n', p)), t.find('\n', p) - t.rfind('\t', t.find('\n', p)));
         return line_at(t, p);
       },
       "a feature line is"},
      {"unknown header key", "possessive.model",
       [](std::string& t) { return replace_line(t, "scale ", "colour 3"); },
       "unknown header line 'colour'"},
      {"duplicate word", "possessive.model",
       [](std::string& t) {
         size_t first = t.find('\n', line_starting(t, "words ")) + 1;
         size_t second = t.find('\n', first) + 1;
         std::string again = line_from(t, first);
         t.replace(second, line_from(t, second).size(), again);
         return line_at(t, second);
       },
       "is listed twice"},
      {"truncated file", "possessive.model",
       [](std::string& t) {
         t.resize(t.rfind("end\n"));  // the file ends after its last feature line
         return line_at(t, t.size() - 1);
       },
       "expected 'end' after the features"},
      {"count beyond the file", "possessive.model",
       [](std::string& t) {
         size_t p = line_starting(t, "features ");
         t.resize(first_feature(t) + 100);  // cut inside the features, and the line cut too
         return line_at(t, p);
       },
       "lines left in the file"},
  };
  for (const auto& c : cases) refused_alike("en-gender", c);
}

TEST_CASE("check and run refuse a corrupt word-classes.data alike, naming folder and line") {
  const std::vector<Corruption> cases = {
      {"unknown kind", "word-classes.data",
       [](std::string& t) { return replace_line(t, "determiner the", "article the"); },
       "unknown kind 'article'"},
      {"two words on a line", "word-classes.data",
       [](std::string& t) { return replace_line(t, "determiner the", "determiner the a"); },
       "a record is: KIND WORD"},
      {"upper case", "word-classes.data",
       [](std::string& t) { return replace_line(t, "determiner the", "determiner The"); },
       "is not a lower-case word"},
      {"two closed classes", "word-classes.data",
       [](std::string& t) {
         t += "preposition the\n";
         return line_at(t, t.size() - 1);
       },
       "already has a closed class"},
      {"no format line", "word-classes.data",
       [](std::string& t) {
         return replace_line(t, "format evenhand-word-classes", "determiner the");
       },
       "the first record must be"},
      // The model is read with its word lists: without them the pack does not load.
      {"missing file", "word-classes.data", nullptr, "missing (the pack has possessive.model"},
  };
  for (const auto& c : cases) refused_alike("en-gender", c);
}

TEST_CASE("check and run refuse a corrupt verbs.data alike, naming folder and line") {
  const std::vector<Corruption> cases = {
      {"unknown tag", "verbs.data",
       [](std::string& t) { return replace_line(t, "v ", "x aah aahs aahed aahing"); },
       "unknown record type 'x'"},
      {"wrong column count", "verbs.data",
       [](std::string& t) { return replace_line(t, "v ", "v aah aahs aahed"); }, "has 5 fields"},
      {"duplicate lemma", "verbs.data",
       [](std::string& t) {
         std::string first = line_from(t, line_starting(t, "v "));
         t += first + "\n";
         return line_at(t, t.size() - 1);
       },
       "listed twice"},
      {"bad form", "verbs.data",
       [](std::string& t) { return replace_line(t, "v ", "v Aah aahs aahed aahing"); },
       "bad lemma 'Aah'"},
      {"adjective of no verb", "verbs.data",
       [](std::string& t) {
         t += "a blorped\n";
         return line_at(t, t.size() - 1);
       },
       "not a past form"},
      {"wrong format line", "verbs.data",
       [](std::string& t) { return replace_line(t, "format ", "format evenhand-verbs 9"); },
       "the first record must be"},
      {"empty file", "verbs.data",
       [](std::string& t) {
         t.clear();
         return size_t{0};
       },
       "no 'format evenhand-verbs 1' record"},
  };
  for (const auto& c : cases) refused_alike("en-gender", c);
}

TEST_CASE("check and run refuse broken Spanish noun-phrase data alike, naming folder and line") {
  auto append = [](const char* line) {
    return [line](std::string& t) {
      t += std::string(line) + "\n";
      return line_at(t, t.size() - 1);
    };
  };
  const std::vector<Corruption> cases = {
      {"unknown kind", "noun-phrase.data", append("sometimes la el"), "unknown entry kind"},
      {"set not in the pack", "noun-phrase.data", append("det nadie nadies"), "no set"},
      {"wrong column count", "adjectives.data", append("pair bueno buena buenos"), "pair takes"},
      {"unknown tag", "common-gender.data", append("plural artista artistas"),
       "expected KIND SINGULAR PLURAL"},
      {"bad stressed-a line", "stressed-a.data", append("noun agua"), "expected noun SG PL"},
      {"missing file", "adjectives.data", nullptr, "missing"},
  };
  for (const auto& c : cases) refused_alike("es-gender", c);
}

TEST_CASE("check reports the first problem of every data file, not only the first file's") {
  TempDir d;
  std::string dir = copy_pack(d, "en-gender");
  std::string model = read_file(dir + "/possessive.model");
  size_t m = replace_line(model, "words ", "words 999999999999");
  write_file(dir + "/possessive.model", model);
  std::string verbs = read_file(dir + "/verbs.data");
  size_t v = replace_line(verbs, "v ", "x aah aahs aahed aahing");
  write_file(dir + "/verbs.data", verbs);
  auto r = run_evenhand(d, "check " + dir);
  INFO(r.out + r.err);
  CHECK(r.code == kPack);
  CHECK(r.out.find(dir + "/possessive.model:" + std::to_string(m) + ": ") != std::string::npos);
  CHECK(r.out.find(dir + "/verbs.data:" + std::to_string(v) + ": ") != std::string::npos);
  CHECK(r.err == "evenhand: " + dir + ": 2 problems\n");
}

TEST_CASE("a target that the pack rewrites fails check, run and associations") {
  TempDir d;
  std::string dir = copy_pack(d, "en-gender");
  std::string targets = read_file(dir + "/targets.data");
  targets += "midwife midwives mother's\n";
  size_t line = line_at(targets, targets.size() - 1);
  write_file(dir + "/targets.data", targets);
  std::string where = dir + "/targets.data:" + std::to_string(line) + ": ";
  // "mother's" is "mother" with a clitic: the counter takes it for a group word.
  std::string says = "target word 'mother's' is a form the pack rewrites (" + dir + "/words.txt:";

  auto check = run_evenhand(d, "check " + dir);
  INFO(check.out + check.err);
  CHECK(check.code == kPack);
  std::string message = check_line(check, where);
  REQUIRE_FALSE(message.empty());
  CHECK(message.rfind(where + says, 0) == 0);

  write_file(d.file("in.jsonl"), "{\"text\":\"The midwife said her mother's friend came.\"}\n");
  for (std::string cmd :
       {"associations --pack " + dir + " --in " + d.file("in.jsonl") + " --out " + d.file("a.json"),
        "run --quiet --pack " + dir + " --in " + d.file("in.jsonl") + " --out " +
            d.file("out.jsonl")}) {
    INFO(cmd);
    auto r = run_evenhand(d, cmd);
    INFO(r.err);
    CHECK(r.code == kPack);
    CHECK(r.err.find("evenhand: " + message + "\n") != std::string::npos);
  }
  CHECK_FALSE(std::filesystem::exists(d.file("a.json")));
  CHECK_FALSE(std::filesystem::exists(d.file("out.jsonl")));

  // A list given with --targets is held to the same rule, for the pack it is measured with.
  write_file(d.file("list.txt"), "nurse\n# names are rewritten too\nEmma\n");
  auto own = run_evenhand(d, "associations --pack en-gender --in " + d.file("in.jsonl") +
                                 " --targets " + d.file("list.txt") + " --out " + d.file("a.json"));
  CHECK(own.code == kInput);
  CHECK(
      own.err.rfind("evenhand: " + d.file("list.txt") +
                        ":3: target word 'emma' is a name the pack rewrites (en-gender/names.txt:",
                    0) == 0);
  CHECK_FALSE(std::filesystem::exists(d.file("a.json")));
}
