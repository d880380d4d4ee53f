// English word senses (see senses.h).
#include "rewrite/en/senses.h"

#include <algorithm>

#include "pack/data_records.h"

namespace evenhand::rewrite::en {

namespace {

constexpr const char* kFormatLine = "format evenhand-senses 1";
// Tokens either side of a network-sense word that are read for a network context.
constexpr size_t kNetworkWindow = 6;

bool is_word_byte(char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9');
}

// "mail.example.com", "10.0.0.1": a token with a dot between letters or digits.
bool host_like(std::string_view tok) {
  for (size_t i = 1; i + 1 < tok.size(); ++i)
    if (tok[i] == '.' && is_word_byte(tok[i - 1]) && is_word_byte(tok[i + 1])) return true;
  return false;
}

// Start of the line that holds byte `at`.
size_t line_start(std::string_view text, size_t at) {
  size_t nl = text.rfind('\n', at == 0 ? 0 : at - 1);
  return at == 0 || nl == text.npos ? 0 : nl + 1;
}

// End of a mail or news header field name at `from` ("NNTP-Posting-Host:", RFC 5322 2.2:
// printable ASCII but the colon, no space), or npos when the line does not open with one.
size_t field_name_end(std::string_view text, size_t from) {
  size_t i = from;
  while (i < text.size() && (is_word_byte(text[i]) || text[i] == '-')) ++i;
  return i > from && i < text.size() && text[i] == ':' ? i : text.npos;
}

}  // namespace

Result<std::shared_ptr<const Senses>> Senses::from_pack(const pack::CompiledPack& pack) {
  const std::string* text = pack.file(kSensesFile);
  if (text == nullptr) return make_error(ErrorKind::pack, pack.file_path(kSensesFile), "missing");
  auto s = std::make_shared<Senses>();
  std::vector<std::pair<std::string, uint8_t>> words;
  auto error = pack::read_data_records(
      *text, pack.file_path(kSensesFile), kFormatLine, [&](std::string_view line) -> std::string {
        size_t sp = line.find(' ');
        std::string_view kind = line.substr(0, sp), word;
        if (sp != line.npos) word = line.substr(sp + 1);
        Sense k;
        if (kind == "unpaired") {
          k = Sense::unpaired;
        } else if (kind == "network") {
          k = Sense::network;
        } else if (kind == "network-sense") {
          k = Sense::network_sense;
        } else {
          return "unknown kind '" + std::string(kind) + "'";
        }
        if (word.empty() || word.find(' ') != word.npos) return "expected 'kind word'";
        words.emplace_back(std::string(word), uint8_t(1u << static_cast<unsigned>(k)));
        s->lists_[static_cast<size_t>(k)].emplace_back(word);
        return "";
      });
  if (error) return *error;
  std::sort(words.begin(), words.end());
  for (size_t i = 0; i < words.size();) {
    uint8_t bits = 0;
    size_t j = i;
    for (; j < words.size() && words[j].first == words[i].first; ++j) bits |= words[j].second;
    s->words_.emplace(words[i].first, bits);
    i = j;
  }
  return std::shared_ptr<const Senses>(std::move(s));
}

bool Senses::has(Sense list, std::string_view folded) const {
  const uint8_t* bits = words_.find(folded);
  return bits && ((*bits >> static_cast<unsigned>(list)) & 1);
}

bool Senses::network_context(std::string_view text, std::span<const FieldToken> tokens,
                             size_t k) const {
  size_t ls = line_start(text, tokens[k].begin);
  size_t name_end = field_name_end(text, ls);
  if (name_end != text.npos && tokens[k].end <= name_end) return true;  // "NNTP-Posting-Host:"
  size_t lo = k > kNetworkWindow ? k - kNetworkWindow : 0;
  size_t hi = std::min(tokens.size(), k + kNetworkWindow + 1);
  for (size_t j = lo; j < hi; ++j) {
    if (j == k || tokens[j].end <= ls) continue;
    std::string_view between = j < k ? text.substr(tokens[j].end, tokens[k].begin - tokens[j].end)
                                     : text.substr(tokens[k].end, tokens[j].begin - tokens[k].end);
    if (between.find('\n') != between.npos) continue;  // the same line only
    if (host_like(text.substr(tokens[j].begin, tokens[j].end - tokens[j].begin))) return true;
    if (tokens[j].word && has(Sense::network, tokens[j].folded)) return true;
  }
  return false;
}

bool Senses::other_sense(std::string_view text, std::span<const FieldToken> tokens, size_t k,
                         bool keep_god) const {
  std::string_view f = tokens[k].folded;
  // "God", "God's": the name of the one god of a religion, written with a capital, unless an
  // article makes it one god of many ("a God").
  if (keep_god && (f == "god" || f.starts_with("god'")) && text[tokens[k].begin] == 'G') {
    bool article = k > 0 && (tokens[k - 1].folded == "a" || tokens[k - 1].folded == "an");
    if (!article) return true;
  }
  if (has(Sense::network_sense, f) && network_context(text, tokens, k)) return true;
  // "a host of reasons": a multitude (WordNet 3.0 host, noun sense 3).
  if (f == "host" && k > 0 && k + 1 < tokens.size() && tokens[k - 1].folded == "a" &&
      tokens[k + 1].folded == "of")
    return true;
  return false;
}

}  // namespace evenhand::rewrite::en
