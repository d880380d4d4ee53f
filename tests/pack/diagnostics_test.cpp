// The pack checker: each kind of problem in a small broken pack is reported with the file and
// line where it was written, every problem is collected (not only the first), and the load
// fails with an Error of kind pack naming the first one.
#include <catch2/catch.hpp>

#include "pack_test_util.h"

using namespace evenhand;
using namespace evenhand::pack;
using namespace evenhand::pack::testing;

TEST_CASE("a well-formed test pack loads with no diagnostics", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "she | he @subj\n"
      "her | him @obj\n"
      "her | his @det\n"
      "hers | his @poss\n"
      "woman | man\n"
      "[names]\n"
      "Emily | Jacob\n"
      "Rose | Ross ~word\n"
      "[protect]\n"
      "Mother Nature\n"
      "[guard medical]\n"
      "pregnancy\n");
  INFO(all(l));
  REQUIRE(l.diags.empty());
  REQUIRE(l.pack);
  CHECK(l.pack->sets().size() == 5);
  CHECK(l.pack->names().size() == 2);
  CHECK(l.pack->names()[1].word_like);
  CHECK(l.pack->protected_phrases() == std::vector<std::string>{"Mother Nature"});
  REQUIRE(l.pack->guards().size() == 1);
  CHECK(l.pack->guards()[0].reason == "medical");
  CHECK(l.pack->guards()[0].where.str() == "words.txt:13");
}

TEST_CASE("unknown header keys are reported at their line", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", std::string(kHeader) + "licence MIT\n"},
                   {"words.txt", "[sets]\nwoman | man\n"}});
  CHECK(has(l, "pack.txt:6", "header-unknown-key"));
  CHECK(l.diags.size() == 1);
}

TEST_CASE("missing header fields are reported for pack.txt as a whole", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", "pack test\nlanguage en\ngroups female male\n"},
                   {"words.txt", "[sets]\nwoman | man\n"}});
  auto missing = with_code(l, "header-missing");
  REQUIRE(missing.size() == 2);
  CHECK(missing[0] == "pack.txt: missing header line 'version X.Y.Z'");
  CHECK(missing[1] == "pack.txt: missing header line 'axis NAME'");
}

TEST_CASE("a missing pack.txt is reported", "[pack][diagnostics]") {
  Loaded l = load({{"words.txt", "[sets]\nwoman | man\n"}});
  CHECK(has(l, "pack.txt", "pack-file-missing"));
  CHECK_FALSE(l.pack);
}

TEST_CASE("fewer than two groups is reported at the groups line", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", "pack t\nversion 1.0.0\nlanguage en\naxis gender\ngroups female\n"},
                   {"words.txt", "[sets]\nwoman\n"}});
  CHECK(has(l, "pack.txt:5", "groups-too-few"));
  // The sets cannot be checked against a broken groups line; that is the only problem named.
  CHECK(l.diags.size() == 1);
}

TEST_CASE("invalid and repeated header values are reported", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt",
                    "pack test\nversion 1.0\nlanguage english_uk\naxis gender\n"
                    "groups female male female\npack again\nmeta source\n"},
                   {"words.txt", "[sets]\nwoman | man\n"}});
  CHECK(has(l, "pack.txt:2", "header-invalid"));    // version not X.Y.Z
  CHECK(has(l, "pack.txt:3", "header-invalid"));    // not a BCP 47 tag
  CHECK(has(l, "pack.txt:5", "header-invalid"));    // group listed twice
  CHECK(has(l, "pack.txt:6", "header-duplicate"));  // pack given twice
  CHECK(has(l, "pack.txt:7", "header-invalid"));    // meta without a value
}

TEST_CASE("unknown sections and bad section arguments are reported", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "woman | man\n"
      "[words]\n"
      "this line is skipped with its section\n"
      "[guard]\n"
      "pregnancy\n"
      "[sets extra]\n"
      "girl | boy\n");
  INFO(all(l));
  CHECK(has(l, "words.txt:3", "section-unknown"));
  CHECK(has(l, "words.txt:5", "section-args"));
  CHECK(has(l, "words.txt:7", "section-args"));
  CHECK(l.diags.size() == 3);
}

TEST_CASE("lines outside a section in other files are reported", "[pack][diagnostics]") {
  Loaded l = load(
      {{"pack.txt", kHeader}, {"words.txt", "# comment\n\nwoman | man\n[sets]\ngirl | boy\n"}});
  CHECK(has(l, "words.txt:3", "outside-section"));
  CHECK(l.diags.size() == 1);
}

TEST_CASE("a set line with the wrong number of columns is reported", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "woman | man\n"
      "girl | boy | child\n"
      "lady\n");
  auto cols = with_code(l, "set-columns");
  REQUIRE(cols.size() == 2);
  CHECK(cols[0].rfind("words.txt:3: a set has 3 columns but the pack has 2 groups", 0) == 0);
  CHECK(cols[1].rfind("words.txt:4: a set has 1 column", 0) == 0);
}

TEST_CASE("unknown, repeated and misplaced tags and markers are reported", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "she | he @subject\n"
      "her | him @obj @det\n"
      "woman | man ~word\n"
      "[names]\n"
      "Emily | Jacob @noun\n"
      "Rose | Ross ~rare\n");
  INFO(all(l));
  CHECK(has(l, "words.txt:2", "tag-unknown"));
  CHECK(has(l, "words.txt:3", "tag-multiple"));
  CHECK(has(l, "words.txt:4", "marker"));
  CHECK(has(l, "words.txt:6", "marker"));
  CHECK(has(l, "words.txt:7", "marker"));
}

TEST_CASE("duplicate sets are reported at the second one", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "woman | man\n"
      "girl | boy\n"
      "Woman | Man\n");  // the same set up to case
  auto dup = with_code(l, "set-duplicate");
  REQUIRE(dup.size() == 1);
  CHECK(dup[0] == "words.txt:4: duplicate set: same forms as the set at words.txt:2");
}

TEST_CASE("a form in two groups is a conflict", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "partner | man\n"
      "woman | partner\n"
      "person | person\n");
  INFO(all(l));
  CHECK(has(l, "words.txt:3", "form-conflict"));
  CHECK(has(l, "words.txt:4", "form-conflict"));
  CHECK(with_code(l, "form-conflict").size() == 2);
}

TEST_CASE("a form with two counterparts needs a different tag in each set", "[pack][diagnostics]") {
  SECTION("no tag at all") {
    Loaded l = load_words("[sets]\nher | him\nher | his\n");
    auto amb = with_code(l, "form-ambiguous");
    REQUIRE(amb.size() == 1);
    CHECK(amb[0] ==
          "words.txt:3: 'her' has two counterparts in group male ('him' at words.txt:2, 'his' "
          "here) and no tag to choose between them; give each set its own @TAG");
  }
  SECTION("the same tag twice") {
    Loaded l = load_words("[sets]\nher | him @obj\nher | his @obj\n");
    REQUIRE(with_code(l, "form-ambiguous").size() == 1);
    CHECK(has(l, "words.txt:3", "form-ambiguous"));
    CHECK(l.diags[0].message.find("the same tag @obj twice") != std::string::npos);
  }
  SECTION("one set tagged, the other not") {
    Loaded l = load_words("[sets]\nhers | his @poss\nher | his\n");
    CHECK(has(l, "words.txt:3", "form-ambiguous"));
  }
  SECTION("a counterpart against no form") {
    Loaded l = load_words("[sets]\nmum | -\nmum | dad\n");
    CHECK(has(l, "words.txt:3", "form-ambiguous"));
  }
  SECTION("different tags are fine") {
    Loaded l = load_words("[sets]\nher | him @obj\nher | his @det\nhers | his @poss\n");
    INFO(all(l));
    CHECK(l.diags.empty());
  }
}

TEST_CASE("a multiword form that word-by-word rewriting reaches is not reversible",
          "[pack][diagnostics]") {
  SECTION("A -> B but B -> C") {
    // 'best woman' becomes 'best man' word by word, and 'best man' maps to 'maid of honour'.
    Loaded l = load_words(
        "[sets]\n"
        "woman | man\n"
        "maid of honour | best man\n");
    auto nr = with_code(l, "not-reversible");
    REQUIRE(nr.size() == 1);
    CHECK(nr[0].rfind("words.txt:3: not reversible: 'best woman' (female) becomes 'best man' "
                      "(male) word by word, but 'best man' maps back to 'maid of honour'",
                      0) == 0);
  }
  SECTION("B has no counterpart to go back to") {
    Loaded l = load_words("[sets]\nwoman | man\n\n- | man-about-town\n");
    CHECK(has(l, "words.txt:4", "not-reversible"));
  }
  SECTION("a compositional form is reversible") {
    Loaded l = load_words("[sets]\nmother | father\nmother-in-law | father-in-law\n");
    INFO(all(l));
    CHECK(l.diags.empty());
  }
  SECTION("a phrase that is itself a form maps by its own set") {
    Loaded l =
        load_words("[sets]\nwoman | man\nbest woman | groomsman\nmaid of honour | best man\n");
    INFO(all(l));
    CHECK(l.diags.empty());
  }
}

TEST_CASE("a group without any form is reported at the groups line", "[pack][diagnostics]") {
  Loaded l = load_words("[sets]\nwoman | -\ngirl | -\n");
  auto empty = with_code(l, "group-empty");
  REQUIRE(empty.size() == 1);
  CHECK(empty[0] == "pack.txt:5: group 'male' has no form in any set or name pair");
}

TEST_CASE("empty forms, invalid forms and sets without forms are reported", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\n"
      "woman |\n"
      " | man\n"
      "- | -\n"
      "wo-man | -man\n"
      "girl | b0y\n"
      "lady | gentle  man\n");  // inner white space is collapsed, so this one is fine
  INFO(all(l));
  CHECK(has(l, "words.txt:2", "form-empty"));
  CHECK(has(l, "words.txt:3", "form-empty"));
  CHECK(has(l, "words.txt:4", "set-empty"));
  CHECK(has(l, "words.txt:5", "form-invalid"));  // "-man" begins with a hyphen
  CHECK(has(l, "words.txt:6", "form-invalid"));  // a digit
  CHECK(l.diags.size() == 5);
}

TEST_CASE("forms must be in NFC and files in UTF-8", "[pack][diagnostics]") {
  // "fiance\u0301e" (e + combining acute) is the NFD spelling of "fiancée".
  Loaded l = load_words(
      "[sets]\nfiance\xCC\x81"
      "e | fianc\xC3\xA9\nwoman | m\xFF"
      "an\n");
  INFO(all(l));
  CHECK(has(l, "words.txt:2", "form-invalid"));
  CHECK(has(l, "words.txt:3", "encoding"));
}

TEST_CASE("names that collide with set forms are reported", "[pack][diagnostics]") {
  Loaded l = load_words("[sets]\ngal | guy\n[names]\nGail | Guy ~word\n");
  auto col = with_code(l, "name-collision");
  REQUIRE(col.size() == 1);
  CHECK(col[0] ==
        "words.txt:4: name 'Guy' collides with the form 'guy' of the set at words.txt:2; a word "
        "is either a set form or a name");
}

TEST_CASE("duplicate name pairs are reported", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", kHeader},
                   {"names.txt", "[names]\nEmily | Jacob\nMia | Noah\nemily | JACOB\n"}});
  auto dup = with_code(l, "name-duplicate");
  REQUIRE(dup.size() == 1);
  CHECK(dup[0] == "names.txt:4: duplicate name pair: same names as the pair at names.txt:2");
}

TEST_CASE("a name mapping that is not a bijection is reported", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", kHeader},
                   {"names.txt",
                    "[names]\n"
                    "Emily | Jacob\n"
                    "Emily | Noah\n"     // Emily would map to two names
                    "Jordan | Jordan\n"  // a name in both groups
                    "Ava | Mia\n"
                    "Mia | Liam\n"   // Mia female here, male above
                    "Zoe | -\n"}});  // no counterpart
  INFO(all(l));
  CHECK(has(l, "names.txt:3", "name-bijection"));
  CHECK(has(l, "names.txt:4", "name-bijection"));
  CHECK(has(l, "names.txt:6", "name-bijection"));
  CHECK(has(l, "names.txt:7", "name-too-few"));
  CHECK(l.diags.size() == 4);
}

TEST_CASE("name lines with the wrong number of columns are reported", "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", kHeader}, {"names.txt", "[names]\nEmily | Jacob | Sam\n"}});
  CHECK(has(l, "names.txt:2", "name-columns"));
}

TEST_CASE("duplicate protected and guard phrases are reported", "[pack][diagnostics]") {
  Loaded l = load_words(
      "[sets]\nwoman | man\n"
      "[protect]\nMother Nature\nmother   nature\n---\n"
      "[guard medical]\npregnancy\n[guard other]\nPregnancy\n");
  INFO(all(l));
  CHECK(has(l, "words.txt:5", "phrase-duplicate"));
  CHECK(has(l, "words.txt:6", "phrase-invalid"));
  CHECK(has(l, "words.txt:10", "phrase-duplicate"));
  CHECK(l.diags.size() == 3);
}

TEST_CASE("every problem is collected, in reading order, and the first names the Error",
          "[pack][diagnostics]") {
  Loaded l = load({{"pack.txt", std::string(kHeader) + "colour blue\n"},
                   {"b.txt", "[sets]\ngirl | boy | child\n"},
                   {"a.txt", "[sets]\nwoman | man @bogus\nwoman | man\n"},
                   {"notes.md", "a data file: kept, not parsed | @x\n"}});
  INFO(all(l));
  REQUIRE(l.diags.size() == 3);
  // pack.txt is read first, then the other files in sorted name order.
  CHECK(format_diagnostic(l.diags[0]).rfind("pack.txt:6: unknown header key 'colour'", 0) == 0);
  CHECK(l.diags[1].where.str() == "a.txt:2");
  CHECK(l.diags[1].code == "tag-unknown");
  CHECK(l.diags[2].where.str() == "b.txt:2");
  CHECK(l.diags[2].code == "set-columns");
  CHECK_FALSE(l.pack);
  // The Error is the first problem, its file named under the pack's label.
  CHECK(l.error_file == "testpack/pack.txt");
  CHECK(l.error_reason == l.diags[0].message);
  CHECK(l.error == "testpack/" + format_diagnostic(l.diags[0]));
}

TEST_CASE("a pack's files are named under the label it was loaded from", "[pack][diagnostics]") {
  CHECK(pack_file_path("/tmp/mypack", "verbs.data") == "/tmp/mypack/verbs.data");
  CHECK(pack_file_path("/tmp/mypack/", "verbs.data") == "/tmp/mypack/verbs.data");
  CHECK(pack_file_path("en-gender", "possessive.model") == "en-gender/possessive.model");
  Loaded l = load({{"pack.txt", std::string(kHeader) + "[sets]\nwoman | man\n"}});
  INFO(all(l));
  REQUIRE(l.pack);
  CHECK(l.pack->label() == "testpack");
  CHECK(l.pack->file_path("targets.data") == "testpack/targets.data");
  Diagnostic whole{{"pack.txt", 0}, "a reason", "x"};
  CHECK(diagnostic_error("/p", whole).message() == "/p/pack.txt: a reason");
}

TEST_CASE("load_pack_files reports its Error with kind pack", "[pack][diagnostics]") {
  std::vector<Diagnostic> diags;
  auto r = load_pack_files("x", {{"pack.txt", "pack x\n"}}, diags);
  REQUIRE_FALSE(r.ok());
  CHECK(r.error().kind == ErrorKind::pack);
  CHECK(r.error().file == "x/pack.txt");
  CHECK_FALSE(r.error().line.has_value());
  CHECK(diags.size() == 4);  // version, language, axis and groups are missing
}

TEST_CASE("format_diagnostics writes one line per problem", "[pack][diagnostics]") {
  std::vector<Diagnostic> d = {{{"words.txt", 3}, "first", "x"}, {{"pack.txt", 0}, "second", "y"}};
  CHECK(format_diagnostics(d) == "words.txt:3: first\npack.txt: second\n");
  CHECK(format_diagnostics({}).empty());
}
