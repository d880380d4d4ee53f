// Reading, checking and compiling a rule pack (syntax: rules/README.md).
#include "pack/builder.h"

#include <algorithm>
#include <set>
#include <unordered_map>
#include <utility>

#include "base/sha256.h"
#include "pack/forms.h"

namespace evenhand::pack {

namespace {

constexpr std::string_view kHeaderFile = "pack.txt";

bool is_space(char c) {
  return c == ' ' || c == '\t' || c == '\r' || c == '\v' || c == '\f';
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

std::vector<std::string> split_ws(std::string_view s) {
  std::vector<std::string> out;
  size_t i = 0;
  while (i < s.size()) {
    while (i < s.size() && is_space(s[i])) ++i;
    size_t start = i;
    while (i < s.size() && !is_space(s[i])) ++i;
    if (i > start) out.emplace_back(s.substr(start, i - start));
  }
  return out;
}

std::string collapse_ws(std::string_view s) {
  std::string out;
  for (const auto& w : split_ws(s)) {
    if (!out.empty()) out += ' ';
    out += w;
  }
  return out;
}

// Names of packs, axes, groups, meta keys and guard reasons.
bool is_identifier(std::string_view s) {
  if (s.empty()) return false;
  for (char c : s) {
    bool ok = (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') ||
              c == '_' || c == '-' || c == '.';
    if (!ok) return false;
  }
  return true;
}

bool is_version(std::string_view s) {
  int parts = 0;
  size_t i = 0;
  while (true) {
    size_t start = i;
    while (i < s.size() && s[i] >= '0' && s[i] <= '9') ++i;
    if (i == start) return false;
    ++parts;
    if (i == s.size()) break;
    if (s[i] != '.') return false;
    ++i;
  }
  return parts == 3;
}

// A BCP 47 tag in its common shape: a 2-3 letter (or 4-8 letter) language subtag, then
// subtags of 1-8 letters or digits separated by hyphens ("en", "en-GB", "pt-BR", "zh-Hant").
bool is_language_tag(std::string_view s) {
  size_t i = 0;
  bool first = true;
  while (true) {
    size_t start = i;
    while (i < s.size() && s[i] != '-') ++i;
    std::string_view sub = s.substr(start, i - start);
    if (sub.empty() || sub.size() > 8) return false;
    for (char c : sub) {
      bool alpha = (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
      bool digit = c >= '0' && c <= '9';
      if (!(alpha || (digit && !first))) return false;
    }
    if (first && sub.size() < 2) return false;
    first = false;
    if (i == s.size()) break;
    ++i;
  }
  return true;
}

std::string key_of(const std::vector<std::string>& tokens) {
  std::string k;
  for (size_t i = 0; i < tokens.size(); ++i) {
    if (i) k += '\x1f';
    k += tokens[i];
  }
  return k;
}

std::string key_of(const std::vector<std::string>& tokens, size_t begin, size_t end) {
  std::string k;
  for (size_t i = begin; i < end; ++i) {
    if (i > begin) k += '\x1f';
    k += tokens[i];
  }
  return k;
}

std::string quoted(std::string_view s) {
  return "'" + std::string(s) + "'";
}

size_t word_count(const std::vector<std::string>& tokens) {
  size_t n = 0;
  for (const auto& t : tokens)
    if (detail::is_word_token(t)) ++n;
  return n;
}

std::string known_tags() {
  std::string out;
  for (int t = 1; t <= static_cast<int>(Tag::verb); ++t) {
    if (!out.empty()) out += ' ';
    out += '@';
    out += tag_name(static_cast<Tag>(t));
  }
  return out;
}

struct Occurrence {
  uint32_t item;  // set or name pair index
  uint16_t group;
};

}  // namespace

PackBuilder::PackBuilder(std::string label) : label_(std::move(label)) {}

void PackBuilder::diag(const SourceRef& where, std::string code, std::string message) {
  diags_.push_back(Diagnostic{where, std::move(message), std::move(code)});
}

Result<std::shared_ptr<const CompiledPack>> PackBuilder::build(
    const std::map<std::string, std::string>& files, std::vector<Diagnostic>& diagnostics) {
  // pack.txt first (it holds the header the other files need), then the rest in name order.
  std::vector<const std::pair<const std::string, std::string>*> order;
  const std::pair<const std::string, std::string>* header = nullptr;
  for (const auto& kv : files) {
    if (kv.first.size() < 4 || kv.first.compare(kv.first.size() - 4, 4, ".txt") != 0) continue;
    if (kv.first == kHeaderFile)
      header = &kv;
    else
      order.push_back(&kv);
  }
  if (header) {
    order.insert(order.begin(), header);
  } else {
    diag(SourceRef{std::string(kHeaderFile), 0}, "pack-file-missing",
         "the pack has no pack.txt (it holds the header: pack, version, language, axis, groups)");
  }
  for (const auto* kv : order) {
    file_order_.push_back(kv->first);
    parse_file(kv->first, kv->second, kv->first == kHeaderFile);
    if (kv->first == kHeaderFile) finish_header();
  }

  check_sets();
  check_names();
  check_reversible();
  check_phrases();
  check_groups_used();

  // Report in reading order: file by file, line by line (whole-file problems first).
  std::map<std::string, size_t> rank;
  rank[std::string(kHeaderFile)] = 0;
  for (size_t i = 0; i < file_order_.size(); ++i) rank[file_order_[i]] = i;
  std::stable_sort(diags_.begin(), diags_.end(), [&](const Diagnostic& a, const Diagnostic& b) {
    size_t ra = rank[a.where.file], rb = rank[b.where.file];
    if (ra != rb) return ra < rb;
    return a.where.line < b.where.line;
  });
  diagnostics.insert(diagnostics.end(), diags_.begin(), diags_.end());
  if (!diags_.empty()) {
    return diagnostic_error(label_, diags_.front());
  }

  std::shared_ptr<CompiledPack> pack = compile();
  // SHA-256 over all the files in sorted name order: name, NUL, bytes, NUL for each.
  Sha256 sha;
  for (const auto& kv : files) {
    pack->files_.emplace(kv.first, kv.second);
    sha.update(kv.first);
    sha.update("\0", 1);
    sha.update(kv.second);
    sha.update("\0", 1);
  }
  pack->sha256_ = sha.finish_hex();
  return std::shared_ptr<const CompiledPack>(std::move(pack));
}

// ---------------------------------------------------------------------------------------------
// Parsing

void PackBuilder::parse_file(const std::string& name, const std::string& bytes,
                             bool is_header_file) {
  section_ = is_header_file ? Section::header : Section::none;
  std::string_view all(bytes);
  if (all.substr(0, 3) == "\xEF\xBB\xBF") all.remove_prefix(3);  // a UTF-8 byte order mark
  size_t pos = 0;
  uint32_t line_no = 0;
  while (pos < all.size()) {
    size_t nl = all.find('\n', pos);
    std::string_view raw = all.substr(pos, nl == std::string_view::npos ? nl : nl - pos);
    pos = nl == std::string_view::npos ? all.size() : nl + 1;
    SourceRef where{name, ++line_no};
    if (auto bad = detail::find_invalid_utf8(raw)) {
      diag(where, "encoding", "invalid UTF-8 at byte " + std::to_string(*bad + 1) + " of the line");
      continue;
    }
    size_t hash = raw.find('#');
    std::string_view line = trim(hash == std::string_view::npos ? raw : raw.substr(0, hash));
    if (line.empty()) continue;
    if (line.front() == '[') {
      parse_section_line(where, line);
      continue;
    }
    switch (section_) {
      case Section::header:
        parse_header_line(where, line);
        break;
      case Section::none:
        diag(where, "outside-section",
             "line outside any section (start one with [sets], [names], [protect] or "
             "[guard REASON]; header lines belong in pack.txt)");
        break;
      case Section::sets:
        parse_set_line(where, line);
        break;
      case Section::names:
        parse_name_line(where, line);
        break;
      case Section::protect:
      case Section::guard:
        parse_phrase_line(where, line);
        break;
      case Section::unknown:
        break;  // already reported at the section line
    }
  }
}

void PackBuilder::parse_section_line(const SourceRef& where, std::string_view line) {
  section_ = Section::unknown;
  if (line.back() != ']') {
    diag(where, "section-invalid", "a section line must end with ']'");
    return;
  }
  std::vector<std::string> parts = split_ws(line.substr(1, line.size() - 2));
  if (parts.empty()) {
    diag(where, "section-unknown", "empty section name '[]'");
    return;
  }
  const std::string& name = parts[0];
  size_t args = parts.size() - 1;
  if (name == "sets" || name == "names" || name == "protect") {
    if (args) diag(where, "section-args", "section [" + name + "] takes no argument");
    section_ = name == "sets" ? Section::sets : name == "names" ? Section::names : Section::protect;
  } else if (name == "guard") {
    if (args != 1 || !is_identifier(parts[1])) {
      diag(where, "section-args",
           "section [guard REASON] needs one reason name (letters, digits, '_', '-'), e.g. "
           "[guard medical]");
      return;
    }
    guard_reason_ = parts[1];
    section_ = Section::guard;
  } else {
    diag(where, "section-unknown",
         "unknown section [" + name + "] (known: [sets], [names], [protect], [guard REASON])");
  }
}

void PackBuilder::parse_header_line(const SourceRef& where, std::string_view line) {
  std::vector<std::string> words = split_ws(line);
  const std::string& key = words[0];
  std::string value = collapse_ws(line.substr(key.size()));
  static const char* const kKeys[] = {"pack", "version", "language", "axis", "groups", "meta"};
  if (std::find(std::begin(kKeys), std::end(kKeys), key) == std::end(kKeys)) {
    diag(where, "header-unknown-key",
         "unknown header key '" + key + "' (known: pack, version, language, axis, groups, meta)");
    return;
  }
  if (key == "meta") {
    if (words.size() < 3 || !is_identifier(words[1])) {
      diag(where, "header-invalid", "'meta' needs a key and a value: meta KEY VALUE...");
      return;
    }
    meta_.emplace_back(words[1], collapse_ws(value.substr(words[1].size())));
    return;
  }
  if (auto it = header_.find(key); it != header_.end()) {
    diag(where, "header-duplicate",
         "header key '" + key + "' given twice (first at " + it->second.where.str() + ")");
    return;
  }
  if (value.empty()) {
    diag(where, "header-invalid", "header key '" + key + "' needs a value");
    return;
  }
  if (key == "groups") {
    std::vector<std::string> groups(words.begin() + 1, words.end());
    bool ok = true;
    for (size_t i = 0; i < groups.size(); ++i) {
      if (!is_identifier(groups[i])) {
        diag(where, "header-invalid",
             "group name '" + groups[i] + "' may use only letters, digits, '_', '-' and '.'");
        ok = false;
      }
      for (size_t j = 0; j < i; ++j) {
        if (groups[j] == groups[i]) {
          diag(where, "header-invalid", "group '" + groups[i] + "' is listed twice");
          ok = false;
        }
      }
    }
    if (groups.size() < 2) {
      diag(where, "groups-too-few",
           "a pack needs at least two groups; 'groups' lists " + std::to_string(groups.size()));
      ok = false;
    }
    if (groups.size() > 0xFFFF) ok = false;
    groups_ = groups;
    if (ok) columns_ = groups.size();
  } else if (key == "version" && !is_version(value)) {
    diag(where, "header-invalid", "version '" + value + "' is not of the form X.Y.Z (digits)");
  } else if (key == "language" && !is_language_tag(value)) {
    diag(where, "header-invalid",
         "language '" + value + "' is not a BCP 47 tag such as en or en-GB");
  } else if ((key == "pack" || key == "axis") && !is_identifier(value)) {
    diag(where, "header-invalid",
         key + " name '" + value + "' may use only letters, digits, '_', '-' and '.'");
  }
  header_[key] = HeaderValue{value, where};
}

void PackBuilder::finish_header() {
  static const char* const kRequired[][2] = {{"pack", "pack NAME"},
                                             {"version", "version X.Y.Z"},
                                             {"language", "language TAG"},
                                             {"axis", "axis NAME"},
                                             {"groups", "groups NAME NAME [NAME...]"}};
  for (const auto& r : kRequired) {
    if (!header_.count(r[0]))
      diag(SourceRef{std::string(kHeaderFile), 0}, "header-missing",
           std::string("missing header line '") + r[1] + "'");
  }
}

bool PackBuilder::split_columns(const SourceRef& where, std::string_view line, const char* what,
                                std::vector<std::string>& columns,
                                std::vector<std::string>& markers) {
  size_t cut = line.find_first_of("@~");
  std::string_view body = cut == std::string_view::npos ? line : line.substr(0, cut);
  markers = cut == std::string_view::npos ? std::vector<std::string>{} : split_ws(line.substr(cut));
  columns.clear();
  size_t start = 0;
  while (true) {
    size_t bar = body.find('|', start);
    columns.push_back(
        collapse_ws(body.substr(start, bar == std::string_view::npos ? bar : bar - start)));
    if (bar == std::string_view::npos) break;
    start = bar + 1;
  }
  if (columns_ == 0) return false;  // the groups line is broken; already reported
  if (columns.size() != columns_) {
    std::string groups;
    for (const auto& g : groups_) groups += (groups.empty() ? "" : ", ") + g;
    diag(where, std::string(what) + "-columns",
         std::string(what == std::string("set") ? "a set" : "a name pair") + " has " +
             std::to_string(columns.size()) + (columns.size() == 1 ? " column" : " columns") +
             " but the pack has " + std::to_string(columns_) + " groups (" + groups +
             "); separate one entry per group with '|' and write '-' for none");
    return false;
  }
  return true;
}

// One column per group: checks each form (or name: `what`), writes "" for '-', and the
// folded tokens of each present form. Returns how many groups have a form; clears `ok` on a
// problem, which it reports.
size_t PackBuilder::read_forms(const SourceRef& where, const std::vector<std::string>& columns,
                               const char* what, std::vector<std::string>& forms,
                               std::vector<std::vector<std::string>>& tokens, bool& ok) {
  tokens.assign(columns.size(), {});
  size_t present = 0;
  for (size_t g = 0; g < columns.size(); ++g) {
    const std::string& c = columns[g];
    if (c.empty()) {
      diag(where, "form-empty",
           std::string("empty ") + what + " in column " + std::to_string(g + 1) + " (" +
               groups_[g] + "); write '-' when a group has no " + what);
      ok = false;
      forms.emplace_back();
      continue;
    }
    if (c == "-") {
      forms.emplace_back();
      continue;
    }
    if (auto problem = detail::form_problem(c)) {
      diag(where, "form-invalid",
           std::string(what) + " '" + c + "' (" + groups_[g] + "): " + *problem);
      ok = false;
    }
    forms.push_back(c);
    tokens[g] = detail::folded_tokens(c);
    ++present;
  }
  return present;
}

void PackBuilder::parse_set_line(const SourceRef& where, std::string_view line) {
  std::vector<std::string> columns, markers;
  if (!split_columns(where, line, "set", columns, markers)) return;
  bool ok = true;
  Tag tag = Tag::none;
  for (const auto& m : markers) {
    if (m[0] == '@') {
      auto t = parse_tag(std::string_view(m).substr(1));
      if (!t) {
        diag(where, "tag-unknown", "unknown tag '" + m + "' (known: " + known_tags() + ")");
        ok = false;
      } else if (tag != Tag::none) {
        diag(where, "tag-multiple",
             "a set takes at most one tag; this one has '@" + std::string(tag_name(tag)) +
                 "' and '" + m + "'");
        ok = false;
      } else {
        tag = *t;
      }
    } else if (m[0] == '~') {
      diag(where, "marker", "'" + m + "' is a marker for [names]; sets take '@TAG'");
      ok = false;
    } else {
      diag(where, "marker", "unexpected '" + m + "' after the forms ('|' belongs before tags)");
      ok = false;
    }
  }
  WordSet set;
  set.tag = tag;
  set.where = where;
  std::vector<std::vector<std::string>> tokens;
  size_t present = read_forms(where, columns, "form", set.forms, tokens, ok);
  if (ok && present == 0) {
    diag(where, "set-empty", "a set needs a form in at least one group (all are '-')");
    ok = false;
  }
  if (!ok) return;
  sets_.push_back(std::move(set));
  set_tokens_.push_back(std::move(tokens));
}

void PackBuilder::parse_name_line(const SourceRef& where, std::string_view line) {
  std::vector<std::string> columns, markers;
  if (!split_columns(where, line, "name", columns, markers)) return;
  bool ok = true;
  NamePair pair;
  pair.where = where;
  for (const auto& m : markers) {
    if (m == "~word") {
      pair.word_like = true;
    } else if (m[0] == '@') {
      diag(where, "marker", "name pairs take no tags ('" + m + "'); only '~word'");
      ok = false;
    } else {
      diag(where, "marker", "unknown marker '" + m + "' (name pairs know only '~word')");
      ok = false;
    }
  }
  std::vector<std::vector<std::string>> tokens;
  size_t present = read_forms(where, columns, "name", pair.names, tokens, ok);
  if (ok && present < 2) {
    diag(where, "name-too-few",
         "a name pair needs names in at least two groups (a name without a counterpart maps "
         "nothing)");
    ok = false;
  }
  if (!ok) return;
  names_.push_back(std::move(pair));
  name_tokens_.push_back(std::move(tokens));
}

void PackBuilder::parse_phrase_line(const SourceRef& where, std::string_view line) {
  std::string phrase = collapse_ws(line);
  bool has_letter = false;
  for (unsigned char c : phrase) {
    if (c >= 0x80 || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9'))
      has_letter = true;
  }
  if (!has_letter) {
    diag(where, "phrase-invalid", "phrase '" + phrase + "' has no letter or digit");
    return;
  }
  if (section_ == Section::protect) {
    protect_.push_back(Phrase{phrase, where});
  } else {
    guards_.push_back(Guard{phrase, guard_reason_, where});
  }
}

// ---------------------------------------------------------------------------------------------
// Checks

void PackBuilder::check_sets() {
  std::unordered_map<std::string, std::vector<Occurrence>> occ;
  std::set<std::pair<uint32_t, uint32_t>> reported;  // (earlier set, later set)
  for (uint32_t s = 0; s < sets_.size(); ++s) {
    const WordSet& set = sets_[s];
    for (uint16_t g = 0; g < set.forms.size(); ++g) {
      if (set.forms[g].empty()) continue;
      std::string key = key_of(set_tokens_[s][g]);
      auto& list = occ[key];
      for (const Occurrence& o : list) {
        if (!reported.insert({o.item, s}).second) continue;
        const WordSet& other = sets_[o.item];
        if (o.item == s) {
          diag(set.where, "form-conflict",
               "form " + quoted(set.forms[g]) + " stands in two groups of this set (" +
                   groups_[o.group] + " and " + groups_[g] +
                   "); a form must belong to exactly one group");
          continue;
        }
        if (o.group != g) {
          diag(set.where, "form-conflict",
               "form " + quoted(set.forms[g]) + " is in group " + groups_[g] +
                   " here but in group " + groups_[o.group] + " at " + other.where.str() +
                   "; a form must belong to exactly one group");
          continue;
        }
        // Same form, same group, two sets: identical sets, or a choice that needs tags.
        std::optional<uint16_t> differs;
        for (uint16_t h = 0; h < set.forms.size(); ++h) {
          if (set_tokens_[s][h] != set_tokens_[o.item][h]) {
            differs = h;
            break;
          }
        }
        if (!differs) {
          diag(set.where, "set-duplicate",
               "duplicate set: same forms as the set at " + other.where.str());
          continue;
        }
        // Different tags on both sets: the engine chooses by the slot it decides.
        if (set.tag != other.tag && set.tag != Tag::none && other.tag != Tag::none) continue;
        uint16_t h = *differs;
        auto shown = [](const std::string& f) { return f.empty() ? std::string("-") : quoted(f); };
        std::string what = quoted(set.forms[g]) + " has two counterparts in group " + groups_[h] +
                           " (" + shown(other.forms[h]) + " at " + other.where.str() + ", " +
                           shown(set.forms[h]) + " here)";
        if (set.tag == Tag::none && other.tag == Tag::none) {
          diag(set.where, "form-ambiguous",
               what + " and no tag to choose between them; give each set its own @TAG");
        } else if (set.tag == other.tag) {
          diag(set.where, "form-ambiguous",
               what + " and the same tag @" + tag_name(set.tag) +
                   " twice; give each set its own @TAG");
        } else {
          diag(set.where, "form-ambiguous",
               what + "; every set of a form with several counterparts needs its own tag, and " +
                   (set.tag == Tag::none ? std::string("this set")
                                         : "the set at " + other.where.str()) +
                   " has none");
        }
      }
      list.push_back(Occurrence{s, g});
    }
  }
}

void PackBuilder::check_names() {
  std::unordered_map<std::string, std::vector<Occurrence>> set_occ;
  for (uint32_t s = 0; s < sets_.size(); ++s)
    for (uint16_t g = 0; g < sets_[s].forms.size(); ++g)
      if (!sets_[s].forms[g].empty()) set_occ[key_of(set_tokens_[s][g])].push_back({s, g});

  std::unordered_map<std::string, std::vector<Occurrence>> occ;
  std::set<std::pair<uint32_t, uint32_t>> reported;
  for (uint32_t n = 0; n < names_.size(); ++n) {
    const NamePair& pair = names_[n];
    for (uint16_t g = 0; g < pair.names.size(); ++g) {
      if (pair.names[g].empty()) continue;
      std::string key = key_of(name_tokens_[n][g]);
      if (auto it = set_occ.find(key); it != set_occ.end()) {
        const WordSet& set = sets_[it->second.front().item];
        diag(pair.where, "name-collision",
             "name " + quoted(pair.names[g]) + " collides with the form " +
                 quoted(set.forms[it->second.front().group]) + " of the set at " + set.where.str() +
                 "; a word is either a set form or a name");
      }
      auto& list = occ[key];
      for (const Occurrence& o : list) {
        if (!reported.insert({o.item, n}).second) continue;
        const NamePair& other = names_[o.item];
        if (o.item == n) {
          diag(pair.where, "name-bijection",
               "not a bijection: " + quoted(pair.names[g]) + " is a name of both group " +
                   groups_[o.group] + " and group " + groups_[g] + " in this pair");
          continue;
        }
        if (name_tokens_[n] == name_tokens_[o.item]) {
          diag(pair.where, "name-duplicate",
               "duplicate name pair: same names as the pair at " + other.where.str());
          continue;
        }
        if (o.group != g) {
          diag(pair.where, "name-bijection",
               "not a bijection: " + quoted(pair.names[g]) + " is a name of group " + groups_[g] +
                   " here but of group " + groups_[o.group] + " at " + other.where.str());
        } else {
          diag(pair.where, "name-bijection",
               "not a bijection: " + quoted(pair.names[g]) + " is already paired at " +
                   other.where.str() + "; each name may have one counterpart per group");
        }
      }
      list.push_back(Occurrence{n, g});
    }
  }
}

// With symmetric set lines and no ambiguous form, every single form maps back to itself. What
// can still break a round trip is composition: the engine rewrites the words of a phrase one
// by one, and the result may be a multiword form of another set. Example: with "woman | man"
// and "maid of honour | best man", the text "best woman" becomes "best man", which maps back
// to "maid of honour". For every form of two or more words, this check rebuilds the phrase
// that word-by-word rewriting from each other group would turn into it, and reports the form
// when no such phrase is the form's own counterpart.
void PackBuilder::check_reversible() {
  std::unordered_map<std::string, std::vector<Occurrence>> occ;
  for (uint32_t s = 0; s < sets_.size(); ++s)
    for (uint16_t g = 0; g < sets_[s].forms.size(); ++g)
      if (!sets_[s].forms[g].empty()) occ[key_of(set_tokens_[s][g])].push_back({s, g});

  constexpr size_t kMaxCandidates = 16;
  for (uint32_t s = 0; s < sets_.size(); ++s) {
    const WordSet& set = sets_[s];
    for (uint16_t h = 0; h < set.forms.size(); ++h) {
      const std::vector<std::string>& form = set_tokens_[s][h];
      if (word_count(form) < 2) continue;
      for (uint16_t g = 0; g < set.forms.size(); ++g) {
        if (g == h) continue;
        std::vector<std::vector<std::string>> candidates(1);
        bool substituted = false;
        size_t i = 0;
        while (i < form.size()) {
          // Longest part of the form, short of the whole, that is a form of group h.
          size_t best_len = 0;
          std::vector<uint32_t> best_sets;
          for (size_t len = form.size() - i; len >= 1 && best_len == 0; --len) {
            if (i == 0 && len == form.size()) continue;
            auto it = occ.find(key_of(form, i, i + len));
            if (it == occ.end()) continue;
            for (const Occurrence& o : it->second) {
              if (o.group == h && o.item != s && !sets_[o.item].forms[g].empty())
                best_sets.push_back(o.item);
            }
            if (!best_sets.empty()) best_len = len;
          }
          if (best_len == 0) {
            for (auto& c : candidates) c.push_back(form[i]);
            ++i;
            continue;
          }
          std::vector<std::vector<std::string>> next;
          for (const auto& c : candidates) {
            for (uint32_t t : best_sets) {
              if (next.size() >= kMaxCandidates) break;
              std::vector<std::string> extended = c;
              const auto& part = set_tokens_[t][g];
              extended.insert(extended.end(), part.begin(), part.end());
              if (std::find(next.begin(), next.end(), extended) == next.end())
                next.push_back(std::move(extended));
            }
          }
          candidates = std::move(next);
          substituted = true;
          i += best_len;
        }
        if (!substituted) continue;
        const std::vector<std::string>& own = set_tokens_[s][g];
        if (std::find(candidates.begin(), candidates.end(), own) != candidates.end()) continue;
        // A phrase that is itself a form of group g maps by its own set, not word by word.
        const std::vector<std::string>* source = nullptr;
        for (const auto& c : candidates) {
          auto it = occ.find(key_of(c));
          bool is_form = false;
          if (it != occ.end())
            for (const Occurrence& o : it->second) is_form |= o.group == g;
          if (!is_form) {
            source = &c;
            break;
          }
        }
        if (!source) continue;
        std::string from = quoted(detail::join_tokens(*source)) + " (" + groups_[g] + ")";
        std::string via = quoted(set.forms[h]) + " (" + groups_[h] + ")";
        if (set.forms[g].empty()) {
          diag(set.where, "not-reversible",
               "not reversible: " + from + " becomes " + via + " word by word, but " +
                   quoted(set.forms[h]) + " has no form in group " + groups_[g] +
                   " to map back to; give it one or drop this set");
        } else {
          diag(set.where, "not-reversible",
               "not reversible: " + from + " becomes " + via + " word by word, but " +
                   quoted(set.forms[h]) + " maps back to " + quoted(set.forms[g]) +
                   "; add a set for " + quoted(detail::join_tokens(*source)) + " or drop this one");
        }
      }
    }
  }
}

void PackBuilder::check_phrases() {
  std::unordered_map<std::string, const Phrase*> seen;
  for (const Phrase& p : protect_) {
    auto [it, fresh] = seen.emplace(detail::phrase_key(p.text), &p);
    if (!fresh)
      diag(p.where, "phrase-duplicate",
           "duplicate protected phrase (first at " + it->second->where.str() + ")");
  }
  std::unordered_map<std::string, const Guard*> guards;
  for (const Guard& g : guards_) {
    auto [it, fresh] = guards.emplace(detail::phrase_key(g.phrase), &g);
    if (!fresh)
      diag(g.where, "phrase-duplicate",
           "duplicate guard phrase (first at " + it->second->where.str() + ", reason " +
               it->second->reason + ")");
  }
}

void PackBuilder::check_groups_used() {
  if (columns_ == 0) return;
  std::vector<size_t> count(columns_, 0);
  for (const auto& set : sets_)
    for (size_t g = 0; g < set.forms.size(); ++g) count[g] += !set.forms[g].empty();
  for (const auto& pair : names_)
    for (size_t g = 0; g < pair.names.size(); ++g) count[g] += !pair.names[g].empty();
  for (size_t g = 0; g < columns_; ++g) {
    if (count[g] == 0)
      diag(header_["groups"].where, "group-empty",
           "group '" + groups_[g] + "' has no form in any set or name pair");
  }
}

// ---------------------------------------------------------------------------------------------
// Compiling

std::shared_ptr<CompiledPack> PackBuilder::compile() const {
  std::shared_ptr<CompiledPack> pack(new CompiledPack());
  pack->label_ = label_;
  pack->name_ = header_.at("pack").value;
  pack->version_ = header_.at("version").value;
  pack->language_ = header_.at("language").value;
  pack->axis_ = header_.at("axis").value;
  pack->groups_ = groups_;
  pack->sets_ = sets_;
  pack->names_ = names_;
  pack->guards_ = guards_;
  for (const auto& p : protect_) pack->protected_.push_back(p.text);
  pack->meta_ = meta_;
  auto add = [&](const std::vector<std::string>& words, uint32_t item, uint16_t group, Tag tag,
                 bool is_name) {
    pack->max_words_ = std::max(pack->max_words_, words.size());
    pack->index_[words.front()].push_back(LexEntry{words, item, group, tag, is_name});
  };
  for (uint32_t s = 0; s < sets_.size(); ++s)
    for (uint16_t g = 0; g < sets_[s].forms.size(); ++g)
      if (!sets_[s].forms[g].empty()) add(set_tokens_[s][g], s, g, sets_[s].tag, false);
  for (uint32_t n = 0; n < names_.size(); ++n)
    for (uint16_t g = 0; g < names_[n].names.size(); ++g)
      if (!names_[n].names[g].empty()) add(name_tokens_[n][g], n, g, Tag::none, true);
  for (auto& [key, entries] : pack->index_) {
    std::stable_sort(entries.begin(), entries.end(), [](const LexEntry& a, const LexEntry& b) {
      return a.words.size() > b.words.size();
    });
  }
  return pack;
}

}  // namespace evenhand::pack
