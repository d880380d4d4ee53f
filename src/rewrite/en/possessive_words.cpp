// Reading word-classes.data (see possessive_words.h).
#include "rewrite/en/possessive_words.h"

#include <algorithm>
#include <array>
#include <optional>

#include "pack/data_records.h"

namespace evenhand::rewrite {

namespace {

constexpr std::string_view kFormatLine = "format evenhand-word-classes 1";
constexpr auto kNoSet = PossessiveWords::Set::count;

// A kind of the file: a closed-class category (its feature label) or a set of the rules.
struct Kind {
  std::string_view name;
  std::string_view category;  // "" for a set
  PossessiveWords::Set set = kNoSet;
};
using Set = PossessiveWords::Set;
constexpr std::array<Kind, 19> kKinds = {{
    {"determiner", "det"},
    {"preposition", "prep"},
    {"conjunction", "conj"},
    {"subordinator", "sub"},
    {"subject-pronoun", "subj"},
    {"object-pronoun", "obj"},
    {"possessive", "poss"},
    {"standalone-possessive", "stand"},
    {"auxiliary", "aux"},
    {"negation", "neg"},
    {"object-verb", "vobj"},
    {"infinitive-to", "to"},
    {"her", "her"},
    {"finite-verb", "", Set::finite_verb},
    {"object-participle-verb", "", Set::object_participle_verb},
    {"day-adverb", "", Set::day_adverb},
    {"adjective-preposition", "", Set::adjective_preposition},
    {"adverb-noun", "", Set::adverb_noun},
    {"after-possessive", "", Set::after_possessive},
}};

bool lower_word(std::string_view w) {
  return !w.empty() && std::all_of(w.begin(), w.end(),
                                   [](char c) { return (c >= 'a' && c <= 'z') || c == '\''; });
}

}  // namespace

std::string PossessiveWords::add(std::string_view line, uint32_t& seen_kinds) {
  size_t space = line.find(' ');
  if (space == std::string_view::npos || line.find(' ', space + 1) != std::string_view::npos)
    return "a record is: KIND WORD (one space between)";
  std::string_view kind = line.substr(0, space), word = line.substr(space + 1);
  auto k =
      std::find_if(kKinds.begin(), kKinds.end(), [&](const Kind& x) { return x.name == kind; });
  if (k == kKinds.end()) return "unknown kind '" + std::string(kind) + "'";
  if (!lower_word(word)) return "'" + std::string(word) + "' is not a lower-case word (a-z and ')";
  seen_kinds |= 1u << (k - kKinds.begin());
  words_.emplace(word, Entry{});
  Entry& e = *words_.find_for_update(word);
  if (!k->category.empty()) {
    if (e.category == k->category)
      return "'" + std::string(word) + "' is listed twice as " + std::string(kind);
    if (e.category != "w")
      return "'" + std::string(word) + "' already has a closed class (" + std::string(e.category) +
             "); a word has one";
    e.category = k->category;
    return {};
  }
  uint32_t bit = 1u << static_cast<unsigned>(k->set);
  if (e.sets & bit) return "'" + std::string(word) + "' is listed twice as " + std::string(kind);
  e.sets |= bit;
  return {};
}

Result<std::shared_ptr<const PossessiveWords>> PossessiveWords::parse(std::string_view text,
                                                                      const std::string& file) {
  auto out = std::make_shared<PossessiveWords>();
  uint32_t seen = 0;  // 1 << index in kKinds
  auto error = pack::read_data_records(text, file, kFormatLine,
                                       [&](std::string_view line) { return out->add(line, seen); });
  if (error) return *error;
  for (size_t k = 0; k < kKinds.size(); ++k) {
    if (!(seen >> k & 1u))
      return make_error(ErrorKind::pack, file, "no '" + std::string(kKinds[k].name) + "' word");
  }
  return std::shared_ptr<const PossessiveWords>(std::move(out));
}

}  // namespace evenhand::rewrite
