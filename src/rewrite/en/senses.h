// English word senses: tells a pack word used in another sense than a person (a network
// "host", laughter "he he", the name "God") and finds the gendered person words the pack has
// no set for, with the lists of the pack's senses.data (rules/tools/build_senses.py, WordNet).
// Immutable once loaded; thread-safe.
#pragma once

#include <array>
#include <cstdint>
#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/flat_map.h"
#include "base/status.h"
#include "pack/pack.h"
#include "rewrite/field_tokens.h"

namespace evenhand::rewrite::en {

inline constexpr const char* kSensesFile = "senses.data";

// The word lists of senses.data (its KIND column).
enum class Sense : uint8_t { unpaired = 0, network, network_sense };

class Senses {
 public:
  // Parses the pack's senses.data; errors name the file and line.
  static Result<std::shared_ptr<const Senses>> from_pack(const pack::CompiledPack& pack);
  bool has(Sense list, std::string_view folded) const;
  // Calls f(word) for every word of `list`.
  template <typename F>
  void for_each(Sense list, F f) const {
    for (const auto& w : lists_[static_cast<size_t>(list)]) f(std::string_view(w));
  }

  // True when the pack word at tokens[k] stands in another sense than a person, so it is
  // neither counted nor rewritten: `keep_god` says whether capitalised "God" is one (a pack
  // setting). `text` is the field the tokens index.
  bool other_sense(std::string_view text, std::span<const FieldToken> tokens, size_t k,
                   bool keep_god) const;

 private:
  bool network_context(std::string_view text, std::span<const FieldToken> tokens, size_t k) const;
  FlatStringMap<uint8_t> words_;  // word -> bit set of Sense
  std::array<std::vector<std::string>, 3> lists_;
};

}  // namespace evenhand::rewrite::en
