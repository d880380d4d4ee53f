#include "rewrite/en/possessive.h"

#include <algorithm>
#include <charconv>
#include <limits>
#include <optional>
#include <random>
#include <utility>

#include "rewrite/en/possessive_words.h"

namespace evenhand::rewrite {

namespace {

using Set = PossessiveWords::Set;

constexpr std::string_view kMagic = "evenhand-possessive-model 1";
constexpr std::string_view kClasses = "determiner object standalone";
constexpr int kClassCount = 3;
// Longest word (in bytes) that goes into a feature; longer ones are cut at a character start.
constexpr size_t kMaxWordBytes = 40;

enum class Target : uint8_t { her, his, other };

Target target_of(std::string_view w) {
  if (w.size() == 3) {
    auto lower = [](char c) { return (c >= 'A' && c <= 'Z') ? char(c - 'A' + 'a') : c; };
    char a = lower(w[0]), b = lower(w[1]), c = lower(w[2]);
    if (a == 'h' && b == 'e' && c == 'r') return Target::her;
    if (a == 'h' && b == 'i' && c == 's') return Target::his;
  }
  return Target::other;
}

// Bit set of the classes that compete for a target.
unsigned allowed_classes(Target t) {
  switch (t) {
    case Target::her:
      return (1u << Decision::determiner) | (1u << Decision::object);
    case Target::his:
      return (1u << Decision::determiner) | (1u << Decision::standalone);
    case Target::other:
      break;
  }
  return 7u;
}

std::string_view target_name(Target t) {
  switch (t) {
    case Target::her:
      return "her";
    case Target::his:
      return "his";
    case Target::other:
      break;
  }
  return "other";
}

// ---- Token normalisation ------------------------------------------------------------------

// A token as the features see it: either a symbol (punctuation class, number, boundary) or a
// word, folded into a fixed buffer (ASCII lower case, typographic apostrophe -> ').
struct Tok {
  bool is_word = false;
  bool ends_sentence = false;
  std::string_view symbol;  // when !is_word
  char buf[kMaxWordBytes];
  size_t len = 0;
  std::string_view text() const { return is_word ? std::string_view(buf, len) : symbol; }
};

bool is_ascii_alnum(unsigned char c) {
  return (c >= '0' && c <= '9') || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
}

// Classifies a punctuation-only token (no ASCII letter or digit, and no non-ASCII letter);
// returns "" when the token is not punctuation.
std::string_view punct_class(std::string_view w, bool& terminator) {
  terminator = false;
  bool all_stops = true;
  std::string_view first_class;
  size_t i = 0;
  while (i < w.size()) {
    unsigned char c = static_cast<unsigned char>(w[i]);
    std::string_view cls;
    size_t step = 1;
    bool stop = false;
    if (c < 0x80) {
      if (is_ascii_alnum(c)) return {};
      switch (c) {
        case '.':
        case '!':
        case '?':
          cls = ".";
          stop = true;
          break;
        case '"':
        case '`':
        case '\'':
          cls = "\"";
          break;
        case ',':
          cls = ",";
          break;
        case ';':
        case ':':
          cls = ";";
          break;
        case '-':
          cls = "--";
          break;
        case '(':
        case '[':
        case '{':
          cls = "(";
          break;
        case ')':
        case ']':
        case '}':
          cls = ")";
          break;
        default:
          cls = "<p>";
          break;
      }
    } else if (c == 0xE2 && i + 2 < w.size() && static_cast<unsigned char>(w[i + 1]) == 0x80) {
      unsigned char d = static_cast<unsigned char>(w[i + 2]);
      step = 3;
      if (d == 0x98 || d == 0x99 || d == 0x9C || d == 0x9D) {
        cls = "\"";  // ‘ ’ “ ”
      } else if (d == 0x93 || d == 0x94) {
        cls = "--";  // – —
      } else if (d == 0xA6) {
        cls = ".";  // …
        stop = true;
      } else {
        return {};
      }
    } else {
      return {};  // other non-ASCII: treat the token as a word
    }
    if (first_class.empty()) first_class = cls;
    all_stops = all_stops && stop;
    i += step;
  }
  if (first_class.empty()) return {};
  if (all_stops) {
    terminator = true;
    return ".";
  }
  return first_class == "." ? std::string_view("<p>") : first_class;
}

void normalise(std::string_view w, Tok& out) {
  out.is_word = false;
  out.ends_sentence = false;
  out.len = 0;
  if (w.empty()) {
    out.symbol = "<b>";
    out.ends_sentence = true;
    return;
  }
  if (w[0] >= '0' && w[0] <= '9') {
    out.symbol = "<num>";
    return;
  }
  bool term = false;
  std::string_view p = punct_class(w, term);
  if (!p.empty()) {
    out.symbol = p;
    out.ends_sentence = term;
    return;
  }
  out.is_word = true;
  size_t i = 0;
  while (i < w.size()) {
    unsigned char c = static_cast<unsigned char>(w[i]);
    size_t clen = 1;
    if (c >= 0xF0) {
      clen = 4;
    } else if (c >= 0xE0) {
      clen = 3;
    } else if (c >= 0xC0) {
      clen = 2;
    }
    if (clen == 3 && i + 2 < w.size() && c == 0xE2 &&
        static_cast<unsigned char>(w[i + 1]) == 0x80 &&
        static_cast<unsigned char>(w[i + 2]) == 0x99) {
      if (out.len + 1 > kMaxWordBytes) break;
      out.buf[out.len++] = '\'';
      i += 3;
      continue;
    }
    if (clen > w.size() - i) clen = w.size() - i;
    if (out.len + clen > kMaxWordBytes) break;
    for (size_t k = 0; k < clen; ++k) {
      char ch = w[i + k];
      if (ch >= 'A' && ch <= 'Z') ch = char(ch - 'A' + 'a');
      out.buf[out.len++] = ch;
    }
    i += clen;
  }
}

// The last `n` characters (code points) of a folded word.
std::string_view suffix(std::string_view w, size_t n) {
  size_t pos = w.size();
  while (pos > 0 && n > 0) {
    --pos;
    while (pos > 0 && (static_cast<unsigned char>(w[pos]) & 0xC0) == 0x80) --pos;
    --n;
  }
  return w.substr(pos);
}

bool ends_with(std::string_view w, std::string_view s) {
  return w.size() >= s.size() && w.substr(w.size() - s.size()) == s;
}

std::string_view shape(const Tok& t) {
  if (!t.is_word) return t.symbol;
  std::string_view w = t.text();
  if (w.find('-') != std::string_view::npos) return "hyph";
  if (ends_with(w, "'s") || ends_with(w, "s'")) return "gen";
  if (ends_with(w, "ly")) return "ly";
  if (ends_with(w, "ing")) return "ing";
  if (ends_with(w, "ed")) return "ed";
  if (ends_with(w, "s")) return "s";
  return "x";
}

// The closed-class category of a token (word-classes.data), or its punctuation kind.
std::string_view category(const PossessiveWords& lex, const Tok& t) {
  return t.is_word ? lex.category(t.text()) : t.symbol;
}

bool in_list(std::string_view w, std::initializer_list<std::string_view> list) {
  return std::find(list.begin(), list.end(), w) != list.end();
}

// Rules for "her" that come before the weights. Each looks at the next word, its class in the
// model's lexicon (its most frequent Brown tag; "?" when unknown) and the class of the word
// after it ("after"; a punctuation kind or "</s>" when that is not a word). The counts are from
// the odd-numbered Brown files (lexicon from all of them), "her" tagged PPO / PP$, and for the
// other object and possessive pronouns (him me them us / my your our their his), object / PP$;
// in 4-fold cross-validation inside those files the four rules together take "her" from 1540 to
// 1550 right of 1645 and change no "his".

// Word classes that can stand inside a noun phrase after a determiner (and "?": unknown words
// are mostly nouns), plus numbers.
bool nominal_class(std::string_view c) {
  return in_list(c,
                 {"nn",  "nns", "np", "nps", "nr",  "nn$", "nns$", "np$", "jj",  "jjr", "jjs",
                  "jjt", "od",  "cd", "ap",  "vbn", "vbd", "vbg",  "hvg", "beg", "?",   "<num>"});
}

// Whether `next` (after "her" or "his") is an adverb or particle not followed by a nominal.
bool adverb_alone(const PossessiveWords& lex, std::string_view next, std::string_view next_class,
                  std::string_view after_class) {
  bool adverb =
      in_list(next_class, {"rb", "ql", "rbr", "rbt", "rn", "rp"}) ||
      (next_class == "?" && next.size() > 4 && ends_with(next, "ly") && after_class != ",");
  return adverb && !lex.has(Set::adverb_noun, next) && !nominal_class(after_class);
}

// Whether "her" between the folded words `prev` and `next` is the object by rule.
bool object_rule(const PossessiveWords& lex, std::string_view prev, std::string_view next,
                 std::string_view next_class, std::string_view after_class) {
  // 1. An adverb or particle not followed by a nominal: "disliked her intensely", "picked her
  //    up", "watched her somewhat enviously" (not "her unusually searching tours"). Unknown
  //    words in -ly count as adverbs unless a comma follows ("her portly , well-bred way").
  //    "back" (word-classes.data: adverb-noun) is left to the model: it is a noun as often
  //    ("rubbed her back briefly").
  //    Odd files: her 53 object / 1 PP$ (a tag error: "seen her somewhere before");
  //    other pronouns 211 / 3.
  if (adverb_alone(lex, next, next_class, after_class)) return true;
  // 2. A closed-class word that never follows a determiner: an article, pronoun, subordinator,
  //    "to", a wh-word or existential "there" ("gave her the key", "told her that", "tell her
  //    anything"). "every" (after-possessive) is left out ("her every wish"). Odd files:
  //    her 110 / 1 (a tag error: "defend her to the gang"); other pronouns 629 / 3.
  if (!lex.has(Set::after_possessive, next) &&
      in_list(next_class, {"at", "pn", "ppo", "pps", "ppss", "ppl", "ppls", "pp$", "cs", "to",
                           "wdt", "wrb", "wps", "wpo", "ex"})) {
    return true;
  }
  // 3. Day words used as adverbs (day-adverb): "dinner with her tomorrow night". Odd files:
  //    her 1 / 0; other pronouns 4 / 0.
  if (lex.has(Set::day_adverb, next)) return true;
  // 4. A verbal "-ing" form followed by its own complement: "the idea of her going out", "of her
  //    having been", "turned to her standing there". Brown tags "her" there as the object
  //    (odd files: her 7 PPO / 2 PP$), while "his", "their" and "our" before such a gerund are
  //    PP$ (16 object / 27 PP$), so the rule is for "her" alone.
  if (ends_with(next, "ing") && in_list(next_class, {"vbg", "hvg", "beg"}) &&
      in_list(after_class,
              {"in",  "rp",  "rb",   "rbr", "rn",  "ql",  "at",  "dt",  "abn", "ap", "cd",
               "ppo", "pps", "ppss", "ppl", "pp$", "ben", "hvn", "vbn", "to",  "ex"})) {
    return true;
  }
  // 5. A verb of the object-participle-verb set (word-classes.data: the forms of have, get,
  //    make, see, hear, find, keep, leave, want, watch and feel), then a past participle
  //    (class vbn or vbd, or an unknown word in "-ed") not followed by a nominal: "got her
  //    acquitted", "had her arrested" (not "had her broken arm"). Odd files: her 5 object /
  //    0 PP$; other pronouns 12 / 0. The cross-validation already had all five right, so this
  //    changes no figure there; it is for unseen verbs and participles (the even-file
  //    analysis in possessive.h found such misses).
  if (lex.has(Set::object_participle_verb, prev) &&
      (in_list(next_class, {"vbn", "vbd"}) || (next_class == "?" && ends_with(next, "ed"))) &&
      !nominal_class(after_class)) {
    return true;
  }
  return false;
}

// ---- Features -------------------------------------------------------------------------------

// Builds one feature string at a time in a fixed buffer.
class FeatureBuf {
 public:
  FeatureBuf& start(std::string_view prefix) {
    len_ = 0;
    return add(prefix);
  }
  FeatureBuf& add(std::string_view s) {
    size_t n = std::min(s.size(), sizeof(data_) - len_);
    std::copy_n(s.data(), n, data_ + len_);
    len_ += n;
    return *this;
  }
  std::string_view view() const { return {data_, len_}; }

 private:
  char data_[3 * kMaxWordBytes + 32];
  size_t len_ = 0;
};

// Calls emit(std::string_view) once per feature of words[i] (i < words.size()).
template <typename WordClass, typename Possessed, typename Emit>
void extract_features(const PossessiveWords& lex, std::span<const std::string_view> words, size_t i,
                      Target target, const WordClass& word_class, const Possessed& possessed,
                      Emit&& emit) {
  static const std::string_view kStart = "<s>";
  static const std::string_view kEnd = "</s>";
  // Window: [0]=i-2, [1]=i-1, [2]=i+1, [3]=i+2.
  Tok win[4];
  // Left: stop at the start or at a sentence boundary (which itself counts as the start).
  bool stopped = false;
  for (int k = 1; k <= 2; ++k) {
    Tok& t = win[2 - k];
    if (stopped || i < static_cast<size_t>(k)) {
      t.is_word = false;
      t.symbol = kStart;
      stopped = true;
      continue;
    }
    normalise(words[i - k], t);
    if (t.ends_sentence) {
      t.is_word = false;
      t.symbol = kStart;
      stopped = true;
    }
  }
  // Right: a sentence-ending token is seen, everything after it is the end.
  stopped = false;
  for (int k = 1; k <= 2; ++k) {
    Tok& t = win[1 + k];
    if (stopped || i + k >= words.size()) {
      t.is_word = false;
      t.symbol = kEnd;
      stopped = true;
      continue;
    }
    normalise(words[i + k], t);
    if (t.ends_sentence) {
      stopped = true;
      if (!t.is_word && t.symbol == "<b>") t.symbol = kEnd;
    }
  }
  const Tok& p2 = win[0];
  const Tok& p1 = win[1];
  const Tok& n1 = win[2];
  const Tok& n2 = win[3];

  FeatureBuf f;
  emit(f.start("T:").add(target_name(target)).view());
  emit(f.start("p1:").add(p1.text()).view());
  emit(f.start("p2:").add(p2.text()).view());
  emit(f.start("n1:").add(n1.text()).view());
  emit(f.start("n2:").add(n2.text()).view());
  emit(f.start("pn:").add(p1.text()).add("|").add(n1.text()).view());
  emit(f.start("nn:").add(n1.text()).add("|").add(n2.text()).view());
  emit(f.start("pp:").add(p2.text()).add("|").add(p1.text()).view());
  if (n1.is_word) {
    emit(f.start("s2n:").add(suffix(n1.text(), 2)).view());
    emit(f.start("s3n:").add(suffix(n1.text(), 3)).view());
  }
  if (p1.is_word) {
    emit(f.start("s2p:").add(suffix(p1.text(), 2)).view());
    emit(f.start("s3p:").add(suffix(p1.text(), 3)).view());
  }
  std::string_view cp2 = category(lex, p2), cp1 = category(lex, p1), cn1 = category(lex, n1),
                   cn2 = category(lex, n2);
  emit(f.start("hn:").add(shape(n1)).view());
  emit(f.start("hp:").add(shape(p1)).view());
  emit(f.start("cp:").add(cp1).view());
  emit(f.start("cn:").add(cn1).view());
  emit(f.start("cn2:").add(cn2).view());
  emit(f.start("cpn:").add(cp1).add("|").add(cn1).view());
  emit(f.start("cnn:").add(cn1).add("|").add(cn2).view());
  emit(f.start("cpp:").add(cp2).add("|").add(cp1).view());
  emit(f.start("cpnn:").add(cp1).add("|").add(cn1).add("|").add(cn2).view());
  emit(f.start("p1cn:").add(p1.text()).add("|").add(cn1).view());
  emit(f.start("cpn1:").add(cp1).add("|").add(n1.text()).view());
  auto wclass = [&](const Tok& t, size_t pos) {
    return t.is_word ? word_class(pos, t.text()) : t.symbol;
  };
  std::string_view wp1 = wclass(p1, i - 1), wn1 = wclass(n1, i + 1), wn2 = wclass(n2, i + 2);
  emit(f.start("wn:").add(wn1).view());
  emit(f.start("wn2:").add(wn2).view());
  emit(f.start("wp:").add(wp1).view());
  emit(f.start("wnn:").add(wn1).add("|").add(wn2).view());
  emit(f.start("wpn:").add(wp1).add("|").add(wn1).view());
  emit(f.start("cpwn:").add(cp1).add("|").add(wn1).view());
  // What follows the next word, joined with the next word's form: an "-ly" or "-ing" word
  // before a nominal modifies it ("her deeply lined face"), before anything else it does not
  // ("watched her intently ."). Also the two classes ahead with the one behind.
  std::string_view hn1 = shape(n1);
  emit(f.start("hnwn2:").add(hn1).add("|").add(wn2).view());
  emit(f.start("hncn2:").add(hn1).add("|").add(cn2).view());
  emit(f.start("s2nwn2:")
           .add(n1.is_word ? suffix(n1.text(), 2) : n1.text())
           .add("|")
           .add(wn2)
           .view());
  emit(f.start("cpwnn:").add(cp1).add("|").add(wn1).add("|").add(wn2).view());
  emit(f.start("wpwnn:").add(wp1).add("|").add(wn1).add("|").add(wn2).view());
  // How often the next word (and the one after it) follows a possessive determiner in the
  // corpus: "shook her head" (head: often) against "brought her shawls" (shawls: seldom).
  std::string_view b1 = n1.is_word ? possessed(i + 1, n1.text()) : std::string_view("?");
  std::string_view b2 = n2.is_word ? possessed(i + 2, n2.text()) : std::string_view("?");
  emit(f.start("pb:").add(b1).view());
  emit(f.start("pbp:").add(cp1).add("|").add(b1).view());
  emit(f.start("pbp1:").add(p1.text()).add("|").add(b1).view());
  emit(f.start("pbwn:").add(wn1).add("|").add(b1).view());
  emit(f.start("pb2:").add(wn1).add("|").add(b1).add("|").add(b2).view());
}

// Chooses the best allowed class; ties go to the lower class index.
Decision choose(const std::array<int64_t, 3>& scores, unsigned allowed, int64_t scale) {
  int best = -1, second = -1;
  for (int k = 0; k < kClassCount; ++k) {
    if (!(allowed & (1u << k))) continue;
    if (best < 0 || scores[k] > scores[best]) {
      second = best;
      best = k;
    } else if (second < 0 || scores[k] > scores[second]) {
      second = k;
    }
  }
  Decision d;
  d.kind = static_cast<Decision::Kind>(best);
  if (second >= 0) {
    d.score = static_cast<float>(static_cast<double>(scores[best] - scores[second]) /
                                 static_cast<double>(scale));
  }
  return d;
}

// ---- Parsing helpers ------------------------------------------------------------------------

Error model_error(std::string_view label, uint64_t line, std::string reason) {
  Error e = make_error(ErrorKind::pack, std::string(label.empty() ? "possessive model" : label),
                       std::move(reason));
  e.line = line;
  return e;
}

bool parse_int(std::string_view s, int64_t& out) {
  if (s.empty()) return false;
  auto [ptr, ec] = std::from_chars(s.data(), s.data() + s.size(), out);
  return ec == std::errc() && ptr == s.data() + s.size();
}

}  // namespace

std::string_view PossessiveModel::word_class_of(std::string_view folded) const {
  const std::string* cls = word_classes_.find(folded);
  return cls == nullptr ? std::string_view("?") : std::string_view(*cls);
}

const char* decision_kind_name(Decision::Kind kind) {
  switch (kind) {
    case Decision::determiner:
      return "determiner";
    case Decision::object:
      return "object";
    case Decision::standalone:
      return "standalone";
  }
  return "determiner";
}

Result<std::shared_ptr<const PossessiveModel>> PossessiveModel::from_pack(
    const pack::CompiledPack& pack) {
  const std::string* model_text = pack.file(kPossessiveModelFile);
  const std::string* words_text = pack.file(kWordClassesFile);
  if (model_text == nullptr || words_text == nullptr) {
    const char* missing = model_text == nullptr ? kPossessiveModelFile : kWordClassesFile;
    const char* other = model_text == nullptr ? kWordClassesFile : kPossessiveModelFile;
    return make_error(ErrorKind::pack, pack.file_path(missing),
                      std::string("missing (the pack has ") + other + ", which needs it)");
  }
  auto words = PossessiveWords::parse(*words_text, pack.file_path(kWordClassesFile));
  if (!words.ok()) return std::move(words).error();
  return parse(*model_text, std::move(*words), pack.file_path(kPossessiveModelFile));
}

Result<std::shared_ptr<const PossessiveModel>> PossessiveModel::parse(
    std::string_view text, std::shared_ptr<const PossessiveWords> words, std::string_view label) {
  if (words == nullptr) {
    return make_error(ErrorKind::pack, std::string(label.empty() ? "possessive model" : label),
                      "no word classes (word-classes.data) to read it with");
  }
  std::shared_ptr<PossessiveModel> model(new PossessiveModel());
  model->words_ = std::move(words);
  size_t pos = 0;
  uint64_t line_no = 0;
  auto next_line = [&](std::string_view& line) {
    if (pos >= text.size()) return false;
    size_t end = text.find('\n', pos);
    if (end == std::string_view::npos) end = text.size();
    line = text.substr(pos, end - pos);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    pos = end + 1;
    ++line_no;
    return true;
  };

  // A count in the header promises that many lines after it; it can be no more than the lines
  // left in the file, so a corrupt count is an error here, never a huge allocation.
  const uint64_t total_lines =
      std::count(text.begin(), text.end(), '\n') + (!text.empty() && text.back() != '\n');
  auto count_error = [&](std::string_view what, int64_t n) -> std::optional<Error> {
    if (static_cast<uint64_t>(n) <= total_lines - line_no) return std::nullopt;
    return model_error(label, line_no,
                       std::string(what) + " " + std::to_string(n) +
                           " is more than the lines left in the file (" +
                           std::to_string(total_lines - line_no) + ")");
  };

  std::string_view line;
  if (!next_line(line) || line != kMagic) {
    return model_error(
        label, 1, "not a possessive model (the first line must be '" + std::string(kMagic) + "')");
  }
  bool have_scale = false, have_classes = false, have_words = false, have_possessed = false;
  int64_t feature_total = -1;
  while (feature_total < 0) {
    if (!next_line(line)) return model_error(label, line_no, "header ends before 'features N'");
    if (line.empty() || line[0] == '#') continue;
    size_t sp = line.find(' ');
    std::string_view key = line.substr(0, sp);
    std::string_view value =
        sp == std::string_view::npos ? std::string_view() : line.substr(sp + 1);
    if (key == "scale") {
      if (!parse_int(value, model->scale_) || model->scale_ <= 0) {
        return model_error(label, line_no, "scale must be a positive integer");
      }
      have_scale = true;
    } else if (key == "classes") {
      if (value != kClasses) {
        return model_error(label, line_no, "classes must be '" + std::string(kClasses) + "'");
      }
      have_classes = true;
    } else if (key == "words" || key == "possessed") {
      // "words": word -> class; "possessed": word -> how often it follows a possessive.
      bool is_words = key == "words";
      bool& have = is_words ? have_words : have_possessed;
      auto& map = is_words ? model->word_classes_ : model->possessed_;
      std::string section(key);
      int64_t n = 0;
      if (!parse_int(value, n) || n < 0) {
        return model_error(label, line_no, section + " must be a non-negative integer");
      }
      if (have) return model_error(label, line_no, "a second '" + section + "' section");
      if (auto e = count_error(section, n)) return *e;
      have = true;
      map.reserve(static_cast<size_t>(n));
      for (int64_t k = 0; k < n; ++k) {
        if (!next_line(line)) {
          return model_error(label, line_no,
                             "file ends after " + std::to_string(k) + " of " + std::to_string(n) +
                                 (is_words ? " words" : " possessed words"));
        }
        size_t tab = line.find('\t');
        if (tab == 0 || tab == std::string_view::npos || tab + 1 == line.size() ||
            line.find_first_of(" \t", tab + 1) != std::string_view::npos) {
          return model_error(label, line_no,
                             is_words ? "a word line is: word, a tab, its class"
                                      : "a possessed line is: word, a tab, its share label");
        }
        if (!map.emplace(line.substr(0, tab), std::string(line.substr(tab + 1)))) {
          return model_error(label, line_no,
                             "word '" + std::string(line.substr(0, tab)) + "' is listed twice");
        }
      }
    } else if (key == "features") {
      int64_t n = 0;
      if (!parse_int(value, n) || n < 0) {
        return model_error(label, line_no, "features must be a non-negative integer");
      }
      if (!have_scale || !have_classes || !have_words) {
        return model_error(label, line_no,
                           "'scale', 'classes' and 'words' must come before 'features'");
      }
      if (auto e = count_error("features", n)) return *e;
      feature_total = n;
    } else {
      return model_error(label, line_no, "unknown header line '" + std::string(key) + "'");
    }
  }
  model->weights_.reserve(static_cast<size_t>(feature_total));
  for (int64_t k = 0; k < feature_total; ++k) {
    if (!next_line(line)) {
      return model_error(label, line_no,
                         "file ends after " + std::to_string(k) + " of " +
                             std::to_string(feature_total) + " features");
    }
    if (line == "end") {
      return model_error(label, line_no,
                         "'end' after " + std::to_string(k) + " of " +
                             std::to_string(feature_total) + " features");
    }
    std::string_view fields[5];
    size_t nfields = 0, start = 0;
    while (nfields < 5) {
      size_t tab = line.find('\t', start);
      fields[nfields++] = line.substr(start, tab == std::string_view::npos ? tab : tab - start);
      if (tab == std::string_view::npos) break;
      start = tab + 1;
    }
    if (nfields != 4 || fields[0].empty()) {
      return model_error(label, line_no,
                         "a feature line is: feature, then 3 weights, separated by tabs");
    }
    std::array<int64_t, 3> w{};
    for (int c = 0; c < kClassCount; ++c) {
      if (!parse_int(fields[1 + c], w[c])) {
        return model_error(label, line_no,
                           "weight '" + std::string(fields[1 + c]) + "' is not an integer");
      }
    }
    if (!model->weights_.emplace(fields[0], w)) {
      return model_error(label, line_no,
                         "feature '" + std::string(fields[0]) + "' is listed twice");
    }
  }
  if (!next_line(line) || line != "end") {
    return model_error(label, line_no, "expected 'end' after the features");
  }
  while (next_line(line)) {
    if (!line.empty()) return model_error(label, line_no, "text after 'end'");
  }
  return std::shared_ptr<const PossessiveModel>(std::move(model));
}

Decision PossessiveModel::decide(std::span<const std::string_view> words, size_t i) const {
  if (i >= words.size()) return Decision{};
  Target target = target_of(words[i]);
  if (target != Target::other) {
    // A determiner needs a nominal after it: before , ; : . ! ?, the end of the sentence or a
    // finite verb the word is the object ("saw her .") or the standalone possessive ("it was
    // his .", "a rage of his would").
    Tok next;
    bool clause_ends = i + 1 >= words.size();
    if (!clause_ends) {
      normalise(words[i + 1], next);
      clause_ends = next.is_word ? words_->has(Set::finite_verb, next.text())
                                 : (next.ends_sentence || next.symbol == "," || next.symbol == ";");
    }
    if (clause_ends) {
      return Decision{target == Target::her ? Decision::object : Decision::standalone, kRuleScore};
    }
    if (next.is_word) {
      // The rules below look at the next word's class and at the class of the one after it
      // (a punctuation kind, or "</s>" at the end).
      std::string_view next_class = word_class_of(next.text());
      std::string_view after_class = "</s>";
      if (i + 2 < words.size()) {
        Tok after;
        normalise(words[i + 2], after);
        after_class = after.is_word ? word_class_of(after.text()) : after.symbol;
      }
      if (target == Target::her) {
        Tok prev;  // "" at the start of the input
        if (i > 0) normalise(words[i - 1], prev);
        if (object_rule(*words_, prev.text(), next.text(), next_class, after_class)) {
          return Decision{Decision::object, kRuleScore};
        }
      }
      // "his" right before a preposition is standalone: "a friend of his in town", "brought
      // his along". Odd Brown files, all possessives before a word whose class is "in"
      // (excluding "her"): 6 PP$$ / 1 PP$, a tag error ("her mouth on his/PP$ in the green").
      // No change in the cross-validation; "her" there (PPO 90 / PP$ 1 in the odd files) is
      // left to the weights. Left out: "inside", "outside" and "near" before a nominal, which
      // are adjectives there ("his inside pocket", "his near neighbour"); common practice of
      // English grammar.
      // "his" before a personal pronoun (Brown tags pps, ppss, ppo: "his it remains", "and his
      // they took"), a conjunction and a standalone possessive (cc, pp$$: "his or mine", "his
      // and yours") or an adverb with no nominal after it ("is his alone .", not "his only
      // son") stands alone: a
      // determiner needs a nominal, and these cannot open one (common practice of English
      // grammar; issue 13's Brown adjudication).
      if (target == Target::his &&
          (next_class == "pps" || next_class == "ppss" || next_class == "ppo" ||
           (next_class == "cc" && after_class == "pp$$") ||
           adverb_alone(*words_, next.text(), next_class, after_class))) {
        return Decision{Decision::standalone, kRuleScore};
      }
      if (target == Target::his && next_class == "in" &&
          !(words_->has(Set::adjective_preposition, next.text()) && nominal_class(after_class))) {
        return Decision{Decision::standalone, kRuleScore};
      }
    }
  }
  std::array<int64_t, 3> scores{};
  auto word_class = [this](size_t, std::string_view w) { return word_class_of(w); };
  auto possessed = [this](size_t, std::string_view w) {
    const std::string* share = possessed_.find(w);
    return share == nullptr ? std::string_view("?") : std::string_view(*share);
  };
  extract_features(*words_, words, i, target, word_class, possessed, [&](std::string_view f) {
    const std::array<int64_t, 3>* w = weights_.find(f);
    if (w == nullptr) return;
    for (int k = 0; k < kClassCount; ++k) scores[k] += (*w)[k];
  });
  return choose(scores, allowed_classes(target), scale_);
}

std::string train_possessive_model(std::span<const PossessiveExample> examples,
                                   const PossessiveWords& words,
                                   const PossessiveTrainOptions& options) {
  // Word classes that can be written (no white space in either part) and can be looked up
  // (the word is a word to the features, already in folded form).
  auto writable = [](const std::string& s) {
    return !s.empty() && s.find_first_of(" \t\r\n") == std::string::npos;
  };
  std::unordered_map<std::string_view, std::string_view> classes;
  for (const auto& [word, cls] : options.word_classes) {
    if (!writable(word) || !writable(cls)) continue;
    Tok t;
    normalise(word, t);
    if (t.is_word && t.text() == word) classes.emplace(word, cls);
  }
  std::unordered_map<std::string_view, std::string_view> shares;
  for (const auto& [word, share] : options.possessed) {
    if (!writable(word) || !writable(share)) continue;
    Tok t;
    normalise(word, t);
    if (t.is_word && t.text() == word) shares.emplace(word, share);
  }
  const PossessiveExample* current = nullptr;
  auto possessed = [&](size_t pos, std::string_view w) {
    if (!current->possessed.empty()) {
      if (pos < current->possessed.size() && !current->possessed[pos].empty()) {
        return std::string_view(current->possessed[pos]);
      }
      return std::string_view("?");
    }
    auto it = shares.find(w);
    return it == shares.end() ? std::string_view("?") : it->second;
  };
  auto word_class = [&](size_t pos, std::string_view w) {
    if (!current->classes.empty()) {
      if (pos < current->classes.size() && !current->classes[pos].empty()) {
        return std::string_view(current->classes[pos]);
      }
      return std::string_view("?");
    }
    auto it = classes.find(w);
    return it == classes.end() ? std::string_view("?") : it->second;
  };

  // Intern the features of every example once.
  std::unordered_map<std::string, uint32_t> ids;
  std::vector<std::string> names;
  std::vector<uint32_t> seen;  // examples per feature
  std::vector<std::vector<uint32_t>> feats(examples.size());
  std::vector<unsigned> allowed(examples.size());
  std::vector<std::string_view> view;
  for (size_t e = 0; e < examples.size(); ++e) {
    const PossessiveExample& ex = examples[e];
    if (ex.index >= ex.words.size()) continue;
    view.assign(ex.words.begin(), ex.words.end());
    current = &ex;
    Target target = target_of(view[ex.index]);
    allowed[e] = allowed_classes(target) | (1u << ex.gold);
    extract_features(words, view, ex.index, target, word_class, possessed, [&](std::string_view f) {
      auto [it, fresh] = ids.emplace(std::string(f), static_cast<uint32_t>(names.size()));
      if (fresh) {
        names.emplace_back(f);
        seen.push_back(0);
      }
      std::vector<uint32_t>& list = feats[e];
      if (std::find(list.begin(), list.end(), it->second) == list.end()) {
        list.push_back(it->second);
        ++seen[it->second];
      }
    });
  }
  if (options.min_feature_count > 1) {
    for (auto& list : feats) {
      std::erase_if(list, [&](uint32_t id) {
        return seen[id] < static_cast<uint32_t>(options.min_feature_count);
      });
    }
  }

  // Averaged perceptron, integer form: w = current weights, u = sum of c * update. With an
  // ensemble, each member starts from zero with its own seed and the members' integer averages
  // are added up (the scale grows with them, so the mean is what counts).
  std::vector<size_t> start_order;
  for (size_t e = 0; e < examples.size(); ++e) {
    if (!feats[e].empty()) start_order.push_back(e);
  }
  std::vector<std::array<int64_t, 3>> avg(names.size(), {0, 0, 0});
  int64_t scale = 0;
  for (int member = 0; member < std::max(1, options.ensemble); ++member) {
    std::vector<std::array<int64_t, 3>> w(names.size(), {0, 0, 0}), u(names.size(), {0, 0, 0});
    int64_t c = 1;
    std::vector<size_t> order = start_order;
    // The standard fixes mt19937_64's output sequence.
    std::mt19937_64 rng(options.seed + static_cast<uint64_t>(member));
    for (int epoch = 0; epoch < options.epochs; ++epoch) {
      for (size_t k = order.size(); k > 1; --k) {
        size_t j = static_cast<size_t>(rng() % k);
        std::swap(order[k - 1], order[j]);
      }
      for (size_t e : order) {
        std::array<int64_t, 3> scores{};
        for (uint32_t f : feats[e]) {
          for (int k = 0; k < kClassCount; ++k) scores[k] += w[f][k];
        }
        int pred = choose(scores, allowed[e], 1).kind;
        int gold = examples[e].gold;
        if (pred != gold) {
          for (uint32_t f : feats[e]) {
            w[f][gold] += 1;
            u[f][gold] += c;
            w[f][pred] -= 1;
            u[f][pred] -= c;
          }
        }
        ++c;
      }
    }
    for (uint32_t f = 0; f < names.size(); ++f) {
      for (int k = 0; k < kClassCount; ++k) avg[f][k] += c * w[f][k] - u[f][k];
    }
    scale += c;
  }

  std::vector<uint32_t> kept;
  for (uint32_t f = 0; f < names.size(); ++f) {
    bool nonzero = avg[f][0] != 0 || avg[f][1] != 0 || avg[f][2] != 0;
    // Tabs and line breaks cannot occur in a feature line.
    if (nonzero && names[f].find_first_of("\t\r\n") == std::string::npos) kept.push_back(f);
  }
  std::sort(kept.begin(), kept.end(), [&](uint32_t a, uint32_t b) { return names[a] < names[b]; });

  std::string out;
  out += kMagic;
  out += '\n';
  size_t pos = 0;
  while (pos < options.comment.size()) {
    size_t end = options.comment.find('\n', pos);
    if (end == std::string::npos) end = options.comment.size();
    out += "# ";
    out.append(options.comment, pos, end - pos);
    out += '\n';
    pos = end + 1;
  }
  out += "scale " + std::to_string(scale) + "\n";
  out += "classes ";
  out += kClasses;
  out += '\n';
  size_t written = 0;
  for (const auto& [word, cls] : options.word_classes) written += classes.count(word);
  out += "words " + std::to_string(written) + "\n";
  for (const auto& [word, cls] : options.word_classes) {
    if (!classes.count(word)) continue;
    out += word;
    out += '\t';
    out += cls;
    out += '\n';
  }
  written = 0;
  for (const auto& [word, share] : options.possessed) written += shares.count(word);
  out += "possessed " + std::to_string(written) + "\n";
  for (const auto& [word, share] : options.possessed) {
    if (!shares.count(word)) continue;
    out += word;
    out += '\t';
    out += share;
    out += '\n';
  }
  out += "features " + std::to_string(kept.size()) + "\n";
  for (uint32_t f : kept) {
    out += names[f];
    for (int k = 0; k < kClassCount; ++k) {
      out += '\t';
      out += std::to_string(avg[f][k]);
    }
    out += '\n';
  }
  out += "end\n";
  return out;
}

}  // namespace evenhand::rewrite
