// Windows around edits (review/diff.h): field start and end, nearby edits merged, far ones
// split with the cut stated, clause and line ends, UTF-8 boundaries, and the whole option.
#include <catch2/catch.hpp>

#include <string>

#include "review/diff.h"

namespace review = evenhand::review;
using review::LoggedEdit;

namespace {

LoggedEdit edit(const std::string& text, const std::string& from, const std::string& to,
                size_t nth = 0) {
  size_t at = text.find(from);
  for (size_t i = 0; i < nth; ++i) at = text.find(from, at + 1);
  REQUIRE(at != std::string::npos);
  return {"/text", at, from.size(), from, to, "words.txt:1", "lexicon", "", {}};
}

std::string shown(const std::string& text, const review::EditWindow& w) {
  return text.substr(w.begin, w.end - w.begin);
}

// Invented, mechanical: numbered words, no clause marks.
std::string words(int from, int to) {
  std::string s;
  for (int i = from; i <= to; ++i) s += (s.empty() ? "w" : " w") + std::to_string(i);
  return s;
}

}  // namespace

TEST_CASE("window: at the start and the end of a field, the far side cut and stated") {
  std::string text = "she " + words(1, 40) + " her";
  std::vector<LoggedEdit> edits{edit(text, "she", "he"), edit(text, "her", "his")};
  auto ws = review::edit_windows(text, edits, "/text", 3);
  REQUIRE(ws.size() == 2);
  CHECK(shown(text, ws[0]) == "she w1 w2 w3");
  CHECK(ws[0].cut_before == 0);
  CHECK(ws[0].cut_after == 0);
  CHECK(shown(text, ws[1]) == "w38 w39 w40 her");
  CHECK(ws[1].end == text.size());
  CHECK(ws[1].cut_after == 0);
  CHECK(ws[1].cut_before == text.find(" w38") + 1 - ws[0].end);
  CHECK(review::cut_statement(text.substr(ws[0].end, ws[1].cut_before)) ==
        "\u27e834 words, " + std::to_string(ws[1].cut_before) + " bytes not shown\u27e9");
  // The pieces of a window are its text with the edit marked.
  REQUIRE(ws[0].pieces.size() == 3);
  CHECK(ws[0].pieces[0].kind == review::Piece::removed);
  CHECK(ws[0].pieces[1].text == "he");
  CHECK(ws[0].pieces[2].text == " w1 w2 w3");
}

TEST_CASE("window: close edits share one window, a gap shorter than its statement is shown") {
  std::string text = words(1, 20) + " she w21 w22 w23 w24 w25 her " + words(30, 60);
  std::vector<LoggedEdit> edits{edit(text, "she", "he"), edit(text, "her", "his")};
  auto ws = review::edit_windows(text, edits, "/text", 2);
  REQUIRE(ws.size() == 1);
  CHECK(shown(text, ws[0]) == "w19 w20 she w21 w22 w23 w24 w25 her w30 w31");
  CHECK(ws[0].edits.size() == 2);
  // Six words apart, one each side: the gap (w22 w23 w24) is shorter than its statement.
  auto one = review::edit_windows(text, edits, "/text", 1);
  REQUIRE(one.size() == 1);
  CHECK(shown(text, one[0]) == "w20 she w21 w22 w23 w24 w25 her w30");
  // Words at a field's end within a statement's length are shown, not cut.
  std::string short_tail = "she w1 w2 w3 w4 w5";
  auto t = review::edit_windows(short_tail, {edit(short_tail, "she", "he")}, "/text", 2);
  REQUIRE(t.size() == 1);
  CHECK(t[0].end == short_tail.size());
}

TEST_CASE("window: a clause mark or a line break ends the context first") {
  std::string text = words(1, 20) + ". w21 she w22; " + words(30, 50);
  auto ws = review::edit_windows(text, {edit(text, "she", "he")}, "/text", 8);
  REQUIRE(ws.size() == 1);
  CHECK(shown(text, ws[0]) == "w21 she w22;");
  std::string lines = words(1, 30) + "\nw31 w32 she w33 w34\n" + words(35, 60);
  ws = review::edit_windows(lines, {edit(lines, "she", "he")}, "/text", 8);
  REQUIRE(ws.size() == 1);
  CHECK(shown(lines, ws[0]) == "w31 w32 she w33 w34");
}

TEST_CASE("window: on real text, edits on two lines merge and the attribution is cut") {
  // source: Debian package fortunes, file "debian" (tests/external/real-text, fortunes-debian-0022)
  std::string text =
      "Just to expand on what Ross said, it is undoubtedly too much to expect\nof any "
      "distribution that it automatically detect whether or not the\nperson installing it can "
      "read simple English directions, and if he\ncan't, proceed without his input.  That way "
      "lies madness.\n\t\t-- Shawn McMahon on debian-curiosa@l.d.o";
  LoggedEdit he = edit(text, " he\n", " she\n");
  he = {"/text", he.at + 1, 2, "he", "she", "words.txt:1", "lexicon", "", {}};
  std::vector<LoggedEdit> edits{he, edit(text, "his", "her")};
  auto ws = review::edit_windows(text, edits, "/text", review::kWindowWords);
  REQUIRE(ws.size() == 1);
  CHECK(shown(text, ws[0]) ==
        "it can read simple English directions, and if he\ncan't, proceed without his input.");
  std::string tail = text.substr(ws[0].end);
  CHECK(review::cut_statement(tail) ==
        "\u27e89 words, " + std::to_string(tail.size()) + " bytes not shown\u27e9");
  CHECK(ws[0].cut_before == text.find("it can read"));
}

TEST_CASE("window: text without spaces is cut at a code point, never inside one") {
  // Invented: 100 two-byte letters (é), then a word, then 100 three-byte letters (€).
  std::string e2, e3;
  for (int i = 0; i < 100; ++i) e2 += "\u00e9", e3 += "\u20ac";
  std::string text = e2 + "she" + e3;
  auto ws = review::edit_windows(text, {edit(text, "she", "he")}, "/text", 2);
  REQUIRE(ws.size() == 1);
  size_t cap = 2 * review::kWindowBytesPerWord;  // 32 bytes each side
  auto lead = [&](size_t i) {
    return i == text.size() || (static_cast<unsigned char>(text[i]) & 0xC0) != 0x80;
  };
  CHECK(lead(ws[0].begin));
  CHECK(lead(ws[0].end));
  CHECK(ws[0].begin == 200 - cap);        // 32 bytes: 16 whole é
  CHECK(ws[0].end == 203 + cap / 3 * 3);  // 32 bytes reach 10 whole € (30 bytes)
  CHECK(ws[0].cut_before == 200 - cap);
  CHECK(ws[0].cut_after == text.size() - ws[0].end);
  CHECK(review::cut_statement(text.substr(0, ws[0].begin)) ==
        "\u27e81 word, 168 bytes not shown\u27e9");
}

TEST_CASE("window: two edits far apart in text without spaces keep two windows") {
  // Invented: one word of 300 three-byte letters around two edits.
  std::string e3;
  for (int i = 0; i < 100; ++i) e3 += "\u20ac";
  std::string text = e3 + "she" + e3 + "her" + e3;
  auto ws =
      review::edit_windows(text, {edit(text, "she", "he"), edit(text, "her", "his")}, "/text", 2);
  REQUIRE(ws.size() == 2);
  CHECK(ws[1].cut_before > 0);
  CHECK(review::cut_statement(text.substr(ws[0].end, ws[1].cut_before)).find("\u27e81 word, ") ==
        0);
}

TEST_CASE("window: the terminal shows the pointer, the offsets and the cuts, and whole shows all") {
  review::ReviewRecord r;
  r.input = "c.jsonl";
  r.line = 1;
  r.action = "added";
  std::string text = "she " + words(1, 40) + " her";
  r.edits = {edit(text, "she", "he"), edit(text, "her", "his")};
  r.fields.push_back({"/text", text});
  review::TerminalStyle style;
  style.context_words = 2;
  style.width = 200;
  std::string out = review::render_terminal(r, style);
  CHECK(out.find("  /text @0\n    \u00abshe\u2192he\u00bb w1 w2\n") != std::string::npos);
  // The gap is stated once, where the next window starts.
  std::string at = std::to_string(r.edits[1].at);
  CHECK(out.find("  /text @" + at + "\n    \u27e836 words, 138 bytes not shown\u27e9 w39") !=
        std::string::npos);
  CHECK(out.find("w39 w40 \u00abher\u2192his\u00bb\n") != std::string::npos);
  CHECK(out.find("w20") == std::string::npos);
  style.columns = true;
  std::string cols = review::render_terminal(r, style);
  CHECK(cols.find("[she] w1 w2") != std::string::npos);
  CHECK(cols.find("| [he] w1 w2\n") != std::string::npos);
  CHECK(cols.find("\u27e836 words, 138 bytes not shown\u27e9 w39 w40 [her]") != std::string::npos);
  CHECK(cols.find("| \u27e836 words, 138 bytes not shown\u27e9 w39 w40 [his]") !=
        std::string::npos);
  style.columns = false;
  style.color = true;
  CHECK(review::render_terminal(r, style).find("\x1b[2m\u27e8") != std::string::npos);
  style.color = false;
  style.whole = true;
  std::string whole = review::render_terminal(r, style);
  CHECK(whole.find("  /text\n") != std::string::npos);
  CHECK(whole.find("w20") != std::string::npos);
  CHECK(whole.find("\u27e8") == std::string::npos);
}
