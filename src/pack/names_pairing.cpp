#include "pack/names_pairing.h"

#include <unicode/uchar.h>
#include <unicode/ustring.h>
#include <unicode/utypes.h>

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cstring>
#include <fstream>
#include <sstream>
#include <unordered_map>

namespace evenhand::pack {
namespace {

// Case-folds `utf8` (ICU u_strFoldCase, default options: the folding text::fold_case uses)
// into `out`. Returns false when `utf8` is not valid UTF-8.
bool fold_name(std::string_view utf8, std::string& out) {
  out.clear();
  if (utf8.size() > static_cast<size_t>(INT32_MAX / 4)) return false;
  UErrorCode status = U_ZERO_ERROR;
  int32_t len16 = 0;
  u_strFromUTF8(nullptr, 0, &len16, utf8.data(), static_cast<int32_t>(utf8.size()), &status);
  if (status != U_BUFFER_OVERFLOW_ERROR && U_FAILURE(status)) return false;
  std::u16string s16(static_cast<size_t>(len16), u'\0');
  status = U_ZERO_ERROR;
  u_strFromUTF8(s16.data(), len16, nullptr, utf8.data(), static_cast<int32_t>(utf8.size()),
                &status);
  if (U_FAILURE(status)) return false;
  // Full case folding can lengthen a string (at most threefold per code unit).
  std::u16string folded(s16.size() * 3 + 1, u'\0');
  status = U_ZERO_ERROR;
  int32_t flen = u_strFoldCase(folded.data(), static_cast<int32_t>(folded.size()), s16.data(),
                               len16, U_FOLD_CASE_DEFAULT, &status);
  if (U_FAILURE(status)) return false;
  int32_t len8 = 0;
  status = U_ZERO_ERROR;
  u_strToUTF8(nullptr, 0, &len8, folded.data(), flen, &status);
  if (status != U_BUFFER_OVERFLOW_ERROR && U_FAILURE(status)) return false;
  out.assign(static_cast<size_t>(len8), '\0');
  status = U_ZERO_ERROR;
  u_strToUTF8(out.data(), len8, nullptr, folded.data(), flen, &status);
  return U_SUCCESS(status);
}

Error input_error(const SourceRef& where, const std::string& group, std::string reason) {
  Error e = make_error(ErrorKind::input, where.file, std::move(reason));
  if (where.line != 0) e.line = where.line;
  if (e.file.empty() && !group.empty()) e.reason = "list '" + group + "': " + e.reason;
  return e;
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  return s;
}

// Trims and removes one pair of surrounding double quotes.
std::string_view field(std::string_view s) {
  s = trim(s);
  if (s.size() >= 2 && s.front() == '"' && s.back() == '"') s = trim(s.substr(1, s.size() - 2));
  return s;
}

// True if `name` holds a character that would break a pack line: '|', '#', '~' or a
// control character (tab, line end, ...).
bool has_syntax_char(std::string_view name) {
  for (char c : name) {
    unsigned char u = static_cast<unsigned char>(c);
    if (c == '|' || c == '#' || c == '~' || u < 0x20 || u == 0x7F) return true;
  }
  return false;
}

bool is_ascii_letter(char c) {
  return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z');
}

// Number of code points, for aligning columns (assumes valid UTF-8).
size_t width(std::string_view s) {
  size_t n = 0;
  for (char c : s)
    if ((static_cast<unsigned char>(c) & 0xC0) != 0x80) ++n;
  return n;
}

void pad_to(std::string& out, std::string_view s, size_t w) {
  out += s;
  for (size_t n = width(s); n < w; ++n) out += ' ';
}

}  // namespace

const char* unpaired_reason_name(UnpairedReason r) {
  switch (r) {
    case UnpairedReason::in_several_lists:
      return "in several lists";
    case UnpairedReason::surplus:
      return "surplus";
  }
  return "?";
}

Result<RankPairing> pair_names_by_rank(const std::vector<NameList>& lists) {
  if (lists.size() < 2)
    return make_error(ErrorKind::usage, "", "pairing needs two or more name lists");
  if (lists.size() > UINT16_MAX) return make_error(ErrorKind::usage, "", "too many name lists");

  RankPairing result;
  // Folded name -> the indexes of the lists it occurs in (ascending, no repeats).
  std::unordered_map<std::string, std::vector<uint16_t>> where_folded;
  std::vector<std::vector<std::string>> folded(lists.size());
  std::string f;
  for (size_t g = 0; g < lists.size(); ++g) {
    const NameList& list = lists[g];
    result.groups.push_back(list.group);
    std::unordered_map<std::string, size_t> seen;  // folded -> index in list
    for (size_t i = 0; i < list.names.size(); ++i) {
      const NameCount& nc = list.names[i];
      if (nc.name.empty()) return input_error(nc.where, list.group, "empty name");
      if (!fold_name(nc.name, f))
        return input_error(nc.where, list.group, "name is not valid UTF-8");
      if (has_syntax_char(nc.name))
        return input_error(nc.where, list.group,
                           "name '" + nc.name + "' holds '|', '#', '~' or a control character");
      if (nc.count == 0)
        return input_error(nc.where, list.group, "count of '" + nc.name + "' is not positive");
      auto [it, fresh] = seen.emplace(f, i);
      if (!fresh) {
        const NameCount& first = list.names[it->second];
        std::string at =
            first.where.line ? " (first on line " + std::to_string(first.where.line) + ")" : "";
        return input_error(nc.where, list.group, "duplicate name '" + nc.name + "'" + at);
      }
      where_folded[f].push_back(static_cast<uint16_t>(g));
      folded[g].push_back(f);
    }
  }

  std::vector<std::vector<const NameCount*>> kept(lists.size());
  std::vector<UnpairedName> several;
  for (size_t g = 0; g < lists.size(); ++g) {
    for (size_t i = 0; i < lists[g].names.size(); ++i) {
      const NameCount& nc = lists[g].names[i];
      if (where_folded[folded[g][i]].size() > 1) {
        several.push_back(UnpairedName{nc.name, static_cast<uint16_t>(g), nc.count,
                                       UnpairedReason::in_several_lists, 0, nc.where});
      } else {
        kept[g].push_back(&nc);
      }
    }
    std::sort(kept[g].begin(), kept[g].end(), [](const NameCount* a, const NameCount* b) {
      if (a->count != b->count) return a->count > b->count;
      return a->name < b->name;
    });
  }
  std::sort(several.begin(), several.end(), [](const UnpairedName& a, const UnpairedName& b) {
    if (a.group != b.group) return a.group < b.group;
    return a.name < b.name;
  });

  size_t k = kept[0].size();
  for (const auto& v : kept) k = std::min(k, v.size());
  result.pairs.reserve(k);
  for (size_t i = 0; i < k; ++i) {
    RankedPair p;
    p.rank = i + 1;
    for (const auto& v : kept) {
      p.names.push_back(v[i]->name);
      p.counts.push_back(v[i]->count);
    }
    result.pairs.push_back(std::move(p));
  }
  result.unpaired = std::move(several);
  for (size_t g = 0; g < kept.size(); ++g) {
    for (size_t i = k; i < kept[g].size(); ++i) {
      const NameCount& nc = *kept[g][i];
      result.unpaired.push_back(UnpairedName{nc.name, static_cast<uint16_t>(g), nc.count,
                                             UnpairedReason::surplus, i + 1, nc.where});
    }
  }
  return result;
}

Result<NameList> parse_name_counts(std::string_view text, const std::string& file) {
  NameList list;
  std::unordered_map<std::string, uint32_t> first_line;  // folded name -> line
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  uint32_t line_no = 0;
  bool seen_content = false;
  std::string f;
  auto err = [&](std::string reason) {
    Error e = make_error(ErrorKind::input, file, std::move(reason));
    e.line = line_no;
    return e;
  };
  while (!text.empty()) {
    size_t nl = text.find('\n');
    std::string_view line = text.substr(0, nl);
    text.remove_prefix(nl == std::string_view::npos ? text.size() : nl + 1);
    ++line_no;
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    if (trim(line).empty()) continue;
    const bool first = !seen_content;
    seen_content = true;

    const char sep = line.find('\t') != std::string_view::npos ? '\t' : ',';
    size_t cut = line.find(sep);
    if (cut == std::string_view::npos)
      return err("expected NAME<TAB>COUNT or NAME,COUNT, found no separator");
    std::string_view name = field(line.substr(0, cut));
    std::string_view count_text = field(line.substr(cut + 1));
    if (count_text.find(sep) != std::string_view::npos)
      return err(std::string("expected two fields, found more (separator ") +
                 (sep == '\t' ? "tab" : "comma") + ")");
    if (first && !count_text.empty() && is_ascii_letter(count_text.front())) continue;  // header
    if (name.empty()) return err("empty name");
    if (!fold_name(name, f)) return err("name is not valid UTF-8");
    if (has_syntax_char(name))
      return err("name '" + std::string(name) + "' holds '|', '#', '~' or a control character");
    if (count_text.empty()) return err("missing count for '" + std::string(name) + "'");
    if (count_text.front() == '-' && count_text.size() > 1 &&
        std::all_of(count_text.begin() + 1, count_text.end(),
                    [](char c) { return c >= '0' && c <= '9'; }))
      return err("count " + std::string(count_text) + " of '" + std::string(name) +
                 "' is not positive");
    uint64_t count = 0;
    auto [end, ec] =
        std::from_chars(count_text.data(), count_text.data() + count_text.size(), count);
    if (ec == std::errc::result_out_of_range)
      return err("count '" + std::string(count_text) + "' is too large");
    if (ec != std::errc() || end != count_text.data() + count_text.size())
      return err("count '" + std::string(count_text) + "' is not a decimal integer");
    if (count == 0) return err("count 0 of '" + std::string(name) + "' is not positive");
    auto [it, fresh] = first_line.emplace(f, line_no);
    if (!fresh)
      return err("duplicate name '" + std::string(name) + "' (first on line " +
                 std::to_string(it->second) + ")");
    list.names.push_back(NameCount{std::string(name), count, SourceRef{file, line_no}});
  }
  return list;
}

Result<NameList> read_name_counts_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    return make_error(ErrorKind::input, path, std::string("cannot open: ") + std::strerror(errno));
  std::ostringstream buf;
  buf << in.rdbuf();
  if (in.bad()) return make_error(ErrorKind::input, path, "read failed");
  return parse_name_counts(buf.str(), path);
}

std::string write_names_section(const RankPairing& pairing) {
  const size_t ng = pairing.groups.size();
  std::string out;
  out += "# First-name pairs by frequency rank, groups:";
  for (const auto& g : pairing.groups) out += " " + (g.empty() ? std::string("?") : g);
  out += ".\n";
  out += "# Each list is sorted by count, highest first, ties by name; the names of equal rank\n";
  out += "# form a pair. Names in more than one list and the surplus of longer lists are left\n";
  out += "# unpaired (listed at the end).\n";
  out += "# Pairs: " + std::to_string(pairing.pairs.size()) +
         ", unpaired names: " + std::to_string(pairing.unpaired.size()) + ".\n\n";
  out += "[names]\n";
  std::vector<size_t> w(ng, 0);
  bool any_word = false;
  for (const auto& p : pairing.pairs) {
    for (size_t g = 0; g < ng && g < p.names.size(); ++g) w[g] = std::max(w[g], width(p.names[g]));
    any_word = any_word || p.word_like;
  }
  for (const auto& p : pairing.pairs) {
    std::string line;
    for (size_t g = 0; g < ng && g < p.names.size(); ++g) {
      if (g) line += " | ";
      pad_to(line, p.names[g], w[g]);
    }
    if (any_word) line += p.word_like ? " ~word" : "      ";
    line += "  # rank " + std::to_string(p.rank) + ":";
    for (uint64_t c : p.counts) line += " " + std::to_string(c);
    out += line + "\n";
  }
  if (!pairing.unpaired.empty()) {
    out += "\n# Unpaired (group name count: reason):\n";
    for (const auto& u : pairing.unpaired) {
      const std::string& g = u.group < ng ? pairing.groups[u.group] : std::string("?");
      out += "#   " + g + " " + u.name + " " + std::to_string(u.count) + ": " +
             unpaired_reason_name(u.reason);
      if (u.reason == UnpairedReason::surplus) out += ", rank " + std::to_string(u.rank);
      if (!u.where.file.empty()) out += " (" + u.where.str() + ")";
      out += "\n";
    }
  }
  return out;
}

}  // namespace evenhand::pack
