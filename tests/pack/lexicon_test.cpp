// The compiled lexicon: form tokens agree with ICU's UAX #29 word segmentation, keys are
// folded so that case and curly apostrophes do not matter, multiword entries are found and
// sorted longest first, the pack hash follows its definition, and a pack may have any number
// of groups.
#include <unicode/brkiter.h>
#include <unicode/unistr.h>

#include <catch2/catch.hpp>
#include <cstdio>
#include <fstream>

#include "base/sha256.h"
#include "pack_test_util.h"

using namespace evenhand;
using namespace evenhand::pack;
using namespace evenhand::pack::testing;

namespace {

// The non-space segments of `text` by ICU's word break iterator (root locale).
// source: Unicode Standard Annex #29 "Unicode Text Segmentation", as implemented by ICU
// (libicu72, Debian 12) BreakIterator::createWordInstance.
std::vector<std::string> icu_words(const std::string& text) {
  UErrorCode status = U_ZERO_ERROR;
  std::unique_ptr<icu::BreakIterator> bi(
      icu::BreakIterator::createWordInstance(icu::Locale::getRoot(), status));
  REQUIRE(U_SUCCESS(status));
  icu::UnicodeString u = icu::UnicodeString::fromUTF8(text);
  bi->setText(u);
  std::vector<std::string> out;
  int32_t start = bi->first();
  for (int32_t end = bi->next(); end != icu::BreakIterator::DONE; start = end, end = bi->next()) {
    std::string piece;
    u.tempSubStringBetween(start, end).toUTF8String(piece);
    if (piece != " ") out.push_back(piece);
  }
  return out;
}

const LexEntry* find_entry(const CompiledPack& p, const std::vector<std::string>& words) {
  const auto* list = p.lookup(words.front());
  if (!list) return nullptr;
  for (const auto& e : *list)
    if (e.words == words) return &e;
  return nullptr;
}

std::string run(const std::string& cmd) {
  std::string out;
  FILE* f = popen(cmd.c_str(), "r");
  REQUIRE(f != nullptr);
  char buf[4096];
  size_t n;
  while ((n = fread(buf, 1, sizeof buf, f)) > 0) out.append(buf, n);
  pclose(f);
  return out;
}

}  // namespace

TEST_CASE("form_tokens splits forms as UAX #29 word segmentation does", "[pack][lexicon]") {
  using V = std::vector<std::string>;
  CHECK(form_tokens("mother's") == V{"mother's"});
  CHECK(form_tokens("mother\xE2\x80\x99s") == V{"mother\xE2\x80\x99s"});
  CHECK(form_tokens("step-mother") == V{"step", "-", "mother"});
  CHECK(form_tokens("grandmothers'") == V{"grandmothers", "'"});
  CHECK(form_tokens("best man") == V{"best", "man"});
  CHECK(form_tokens("mother-in-law") == V{"mother", "-", "in", "-", "law"});
  CHECK(form_tokens("'tis") == V{"'", "tis"});
  for (const char* form : {"mother's", "mother\xE2\x80\x99s", "step-mother", "grandmothers'",
                           "ladies' man", "maid of honour", "great-grandmother's", "o'clock",
                           "fianc\xC3\xA9"
                           "e",
                           "'tis", "rock 'n' roll"}) {
    INFO(form);
    CHECK(form_tokens(form) == icu_words(form));
  }
}

TEST_CASE("fold_word folds case and curly apostrophes", "[pack][lexicon]") {
  CHECK(fold_word("Mother\xE2\x80\x99s") == "mother's");
  CHECK(fold_word("MOTHER'S") == "mother's");
  CHECK(fold_word("\xE2\x80\x99") == "'");
  // source: Unicode CaseFolding.txt (full folding): U+00DF -> "ss", U+00C9 -> U+00E9.
  CHECK(fold_word("STRA\xC3\x9F"
                  "E") == "strasse");
  CHECK(fold_word("FIANC\xC3\x89"
                  "E") ==
        "fianc\xC3\xA9"
        "e");
}

TEST_CASE("lookup finds curly and straight apostrophes, any case, in the same entry",
          "[pack][lexicon]") {
  Loaded l = load_words("[sets]\nmother's | father's\ngrandmothers' | grandfathers'\n");
  INFO(all(l));
  REQUIRE(l.pack);
  const auto* straight = l.pack->lookup(fold_word("mother's"));
  const auto* curly = l.pack->lookup(fold_word("Mother\xE2\x80\x99s"));
  REQUIRE(straight != nullptr);
  CHECK(straight == curly);
  REQUIRE(straight->size() == 1);
  CHECK((*straight)[0].group == 0);
  CHECK(l.pack->sets()[(*straight)[0].set].forms[1] == "father's");
  // A plural possessive is two tokens, and the entry stores both.
  const LexEntry* e = find_entry(*l.pack, {"grandmothers", "'"});
  REQUIRE(e != nullptr);
  CHECK(l.pack->sets()[e->set].forms[1] == "grandfathers'");
  // Written with a curly apostrophe in the pack, found with a straight one.
  Loaded c = load_words("[sets]\nwoman\xE2\x80\x99s | man\xE2\x80\x99s\n");
  REQUIRE(c.pack);
  CHECK(c.pack->lookup("woman's") != nullptr);
}

TEST_CASE("multiword entries are found under their first word, longest first", "[pack][lexicon]") {
  Loaded l = load_words(
      "[sets]\n"
      "mother | father @noun\n"
      "mother-in-law | father-in-law\n"
      "mother-to-be | father-to-be\n"
      "queen | king\n"
      "queen consort | king consort\n"
      "[names]\n"
      "Mary Ann | John Paul\n");
  INFO(all(l));
  REQUIRE(l.pack);
  const auto* list = l.pack->lookup("mother");
  REQUIRE(list != nullptr);
  REQUIRE(list->size() == 3);
  CHECK((*list)[0].words == std::vector<std::string>{"mother", "-", "in", "-", "law"});
  CHECK((*list)[1].words == std::vector<std::string>{"mother", "-", "to", "-", "be"});
  CHECK((*list)[2].words == std::vector<std::string>{"mother"});
  CHECK((*list)[2].tag == Tag::noun);
  const auto* queen = l.pack->lookup("queen");
  REQUIRE(queen != nullptr);
  REQUIRE(queen->size() == 2);
  CHECK((*queen)[0].words == std::vector<std::string>{"queen", "consort"});
  const LexEntry* name = find_entry(*l.pack, {"john", "paul"});
  REQUIRE(name != nullptr);
  CHECK(name->is_name);
  CHECK(name->group == 1);
  CHECK(l.pack->names()[name->set].names[0] == "Mary Ann");
  CHECK(l.pack->max_entry_words() == 5);
  CHECK(l.pack->lookup("in") == nullptr);      // only first words are keys
  CHECK(l.pack->lookup("Mother") == nullptr);  // keys are folded; callers fold first
}

TEST_CASE("the pack hash is SHA-256 over name, NUL, bytes, NUL of each file in name order",
          "[pack][lexicon]") {
  std::map<std::string, std::string> files = {{"pack.txt", kHeader},
                                              {"words.txt", "[sets]\nwoman | man\n"},
                                              {"a.txt", "[protect]\nMother Nature\n"},
                                              {"README", "a data file\n"}};
  Loaded a = load(files);
  Loaded b = load(files);
  REQUIRE(a.pack);
  REQUIRE(b.pack);
  CHECK(a.pack->sha256() == b.pack->sha256());
  CHECK(a.pack->sha256().size() == 64);

  // The same digest from coreutils over the documented byte stream.
  // source: sha256sum (GNU coreutils, Debian 12), FIPS 180-4.
  std::string stream;
  for (const char* name : {"README", "a.txt", "pack.txt", "words.txt"}) {
    stream += name;
    stream += '\0';
    stream += files[name];
    stream += '\0';
  }
  std::string tmp =
      (std::filesystem::temp_directory_path() / "evenhand_pack_sha_test.bin").string();
  {
    std::ofstream out(tmp, std::ios::binary);
    out << stream;
  }
  std::string sum = run("sha256sum '" + tmp + "'");
  std::filesystem::remove(tmp);
  CHECK(sum.substr(0, 64) == a.pack->sha256());

  // Any change to a file's bytes or name changes the digest, data files included.
  auto changed = files;
  changed["words.txt"] = "[sets]\nwoman | man\n\n";
  Loaded c = load(changed);
  REQUIRE(c.pack);
  CHECK(c.pack->sha256() != a.pack->sha256());
  auto renamed = files;
  renamed.erase("a.txt");
  renamed["b.txt"] = files["a.txt"];
  Loaded d = load(renamed);
  REQUIRE(d.pack);
  CHECK(d.pack->sha256() != a.pack->sha256());
  auto extra = files;
  extra["README"] = "changed";
  Loaded e = load(extra);
  REQUIRE(e.pack);
  CHECK(e.pack->sha256() != a.pack->sha256());
  // Data files are kept as they are; .txt files too.
  REQUIRE(a.pack->file("README") != nullptr);
  CHECK(*a.pack->file("README") == "a data file\n");
  REQUIRE(a.pack->file("words.txt") != nullptr);
  CHECK(*a.pack->file("words.txt") == files["words.txt"]);
  CHECK(a.pack->file("missing.txt") == nullptr);
  CHECK(a.pack->file_names() ==
        std::vector<std::string>{"README", "a.txt", "pack.txt", "words.txt"});
}

TEST_CASE("a pack with three groups loads and maps between all of them", "[pack][lexicon]") {
  Loaded l = load({{"pack.txt",
                    "pack three\nversion 0.1.0\nlanguage en-GB\naxis gender\n"
                    "groups female male neutral\n"},
                   {"words.txt",
                    "[sets]\n"
                    "she | he | they @subj\n"
                    "her | him | them @obj\n"
                    "chairwoman | chairman | chairperson\n"
                    "actress | actor | -\n"
                    "- | - | folk\n"
                    "spokeswoman | spokesman | spokesperson\n"
                    "[names]\n"
                    "Emily | Jacob | Alex\n"}});
  INFO(all(l));
  REQUIRE(l.pack);
  CHECK(l.pack->groups() == std::vector<std::string>{"female", "male", "neutral"});
  CHECK(l.pack->group_index("neutral") == std::optional<uint16_t>(2));
  CHECK_FALSE(l.pack->group_index("other").has_value());
  CHECK(l.pack->language() == "en-GB");
  const LexEntry* e = find_entry(*l.pack, {"chairperson"});
  REQUIRE(e != nullptr);
  CHECK(e->group == 2);
  CHECK(l.pack->sets()[e->set].forms ==
        std::vector<std::string>{"chairwoman", "chairman", "chairperson"});
  const LexEntry* they = find_entry(*l.pack, {"they"});
  REQUIRE(they != nullptr);
  CHECK(they->tag == Tag::subj);
  const LexEntry* alex = find_entry(*l.pack, {"alex"});
  REQUIRE(alex != nullptr);
  CHECK(alex->is_name);
  CHECK(alex->group == 2);

  // The checks work across three groups too.
  Loaded bad = load({{"pack.txt",
                      "pack three\nversion 0.1.0\nlanguage en\naxis gender\n"
                      "groups female male neutral\n"},
                     {"words.txt", "[sets]\nactress | actor | actor\nwoman | man\n"}});
  CHECK(has(bad, "words.txt:2", "form-conflict"));
  CHECK(has(bad, "words.txt:3", "set-columns"));
}

TEST_CASE("with three groups a neutral form maps back to one set of its tag", "[pack][lexicon]") {
  const std::string header =
      "pack three\nversion 0.1.0\nlanguage en\naxis gender\ngroups female male neutral\n";
  auto three = [&](const std::string& words) {
    return load({{"pack.txt", header}, {"words.txt", words}});
  };
  // The shape of the shipped pack: "her" and "his" in two tagged sets each, every neutral
  // form in one set only, '-' where there is none.
  Loaded ok = three(
      "[sets]\n"
      "she | he | they @subj\n"
      "her | him | them @obj\n"
      "her | his | their @det\n"
      "hers | his | theirs @poss\n"
      "daughter | son | child\n"
      "girl | boy | kid @noun\n"
      "niece | nephew | -\n"
      "- | fireman | firefighter\n"
      "daughter-in-law | son-in-law | child-in-law\n");
  INFO(all(ok));
  REQUIRE(ok.pack);
  const LexEntry* their = find_entry(*ok.pack, {"their"});
  REQUIRE(their != nullptr);
  CHECK(their->group == 2);
  CHECK(their->tag == Tag::det);
  CHECK(ok.pack->sets()[their->set].forms[0] == "her");
  const LexEntry* niece = find_entry(*ok.pack, {"niece"});
  REQUIRE(niece != nullptr);
  CHECK(ok.pack->sets()[niece->set].forms[2].empty());
  const LexEntry* fireman = find_entry(*ok.pack, {"fireman"});
  REQUIRE(fireman != nullptr);
  CHECK(ok.pack->sets()[fireman->set].forms[0].empty());

  // "child" in two untagged sets: two female counterparts, no tag to choose.
  Loaded twice = three("[sets]\ndaughter | son | child\ngirl | boy | child\n");
  CHECK(has(twice, "words.txt:3", "form-ambiguous"));
  // The same neutral form under two different tags is a choice the engine can make.
  Loaded tagged = three("[sets]\nher | him | them @obj\nhers | his | them @poss\n");
  INFO(all(tagged));
  CHECK(tagged.pack != nullptr);
  // A neutral form that is the male form of another set: one form in two groups.
  Loaded actor = three("[sets]\nactress | actor | -\nstarlet | - | actor\n");
  CHECK(has(actor, "words.txt:3", "form-conflict"));
  // "child-in-law" would become "daughter-in-law" word by word, and that has no neutral form
  // to map back to.
  Loaded in_law = three("[sets]\ndaughter | son | child\ndaughter-in-law | son-in-law | -\n");
  CHECK(has(in_law, "words.txt:3", "not-reversible"));
  // Multiword neutral forms whose words are no forms are fine ("police officer").
  Loaded officer = three("[sets]\npolicewoman | policeman | police officer\n");
  INFO(all(officer));
  REQUIRE(officer.pack);
  CHECK(find_entry(*officer.pack, {"police", "officer"}) != nullptr);
}

TEST_CASE("load_pack_dir reads the .txt files of a folder", "[pack][lexicon]") {
  namespace fs = std::filesystem;
  fs::path dir = fs::temp_directory_path() / "evenhand_pack_dir_test";
  fs::remove_all(dir);
  fs::create_directories(dir);
  std::ofstream(dir / "pack.txt") << kHeader;
  std::ofstream(dir / "words.txt") << "[sets]\nwoman | man\n";
  std::ofstream(dir / "notes.md") << "not read";
  std::ofstream(dir / "broken.txt~") << "not read either";
  std::ofstream(dir / ".hidden.txt") << "nor this";
  std::vector<Diagnostic> diags;
  auto r = load_pack_dir(dir.string(), diags);
  REQUIRE(r.ok());
  CHECK(diags.empty());
  CHECK(r.value()->sets().size() == 1);
  // Hidden files and editor backups are skipped; other files are data files of the pack.
  CHECK(r.value()->file_names() == std::vector<std::string>{"notes.md", "pack.txt", "words.txt"});
  auto via_files = load_pack_files(
      "x",
      {{"pack.txt", kHeader}, {"words.txt", "[sets]\nwoman | man\n"}, {"notes.md", "not read"}},
      diags);
  REQUIRE(via_files.ok());
  CHECK(via_files.value()->sha256() == r.value()->sha256());

  std::ofstream(dir / "more.txt") << "[sets]\nwoman | man\n";
  diags.clear();
  auto dup = load_pack_dir(dir.string(), diags);
  REQUIRE_FALSE(dup.ok());
  CHECK(dup.error().kind == ErrorKind::pack);
  // more.txt is read before words.txt, so the duplicate is the one in words.txt; the file is
  // named under the folder as given.
  CHECK(dup.error().file == (dir / "words.txt").string());
  CHECK(dup.error().line == 2u);
  CHECK(dup.error().reason.rfind("duplicate set", 0) == 0);
  fs::remove_all(dir);

  auto missing = load_pack_dir((dir / "nope").string(), diags);
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.error().kind == ErrorKind::pack);
  auto unknown = load_pack((dir / "nope").string(), diags);
  REQUIRE_FALSE(unknown.ok());
  CHECK(unknown.error().kind == ErrorKind::usage);
}

TEST_CASE("tag names round-trip", "[pack][lexicon]") {
  for (Tag t : {Tag::subj, Tag::obj, Tag::det, Tag::poss, Tag::noun, Tag::adj, Tag::verb})
    CHECK(parse_tag(tag_name(t)) == std::optional<Tag>(t));
  CHECK_FALSE(parse_tag("subject").has_value());
  CHECK_FALSE(parse_tag("").has_value());
}
