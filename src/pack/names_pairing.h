// First-name pairing by frequency rank: from one list of (name, count) per group, pairs the
// names of equal rank across groups (after the names intervention of Hall Maudslay et al.
// 2019), reports every name left out and why, and writes the pairs as a pack [names] section.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"
#include "pack/pack.h"

namespace evenhand::pack {

// One name of a user's list with its count (e.g. births or corpus mentions).
struct NameCount {
  std::string name;  // as written in the input (trimmed)
  uint64_t count = 0;
  SourceRef where;  // input file and line; empty file when built in memory
};

// The names of one group (e.g. "female"), in input order.
struct NameList {
  std::string group;
  std::vector<NameCount> names;
};

// One pair produced by rank: names[g] and counts[g] for each group g (in list order).
struct RankedPair {
  std::vector<std::string> names;
  std::vector<uint64_t> counts;
  uint64_t rank = 0;       // 1-based rank shared by every name of the pair
  bool word_like = false;  // never set by pair_names_by_rank; callers may mark pairs
};

enum class UnpairedReason {
  in_several_lists,  // the name (case-folded) occurs in more than one group's list
  surplus,           // ranked below the length of the shortest list
};
// Returns the reason as words for messages: "in several lists" or "surplus".
const char* unpaired_reason_name(UnpairedReason r);

// A name that got no partner.
struct UnpairedName {
  std::string name;
  uint16_t group = 0;  // index of the list it came from
  uint64_t count = 0;
  UnpairedReason reason = UnpairedReason::surplus;
  uint64_t rank = 0;  // surplus: its 1-based rank within its own list; else 0
  SourceRef where;
};

// What pair_names_by_rank returns: the pairs and every name left without a partner.
struct RankPairing {
  std::vector<std::string> groups;     // the group names, in list order
  std::vector<RankedPair> pairs;       // by rank, best first
  std::vector<UnpairedName> unpaired;  // in-several-lists first (by group, then name), then
                                       // surplus (by group, then rank)
};

// Pairs names of equal frequency rank across the lists. Names whose case-folded form occurs
// in more than one list are removed from all of them first. Each list is then sorted by count
// descending, ties by name (byte order of the UTF-8 text, i.e. code-point order), and the
// i-th names of all lists form pair i. Lists of unequal length leave their names ranked
// below the shortest list's length unpaired (reason surplus). Returns an Error (kind usage)
// for fewer than two lists, and (kind input) for an empty or invalid UTF-8 name, a name that
// holds '|', '#', '~' or a control character (it could not be written as a pack line), a zero
// count, or a name that occurs twice (case-folded) in one list, naming its file and line if
// known.
Result<RankPairing> pair_names_by_rank(const std::vector<NameList>& lists);

// Parses a user's name-count file: one `NAME<TAB>COUNT` or `NAME,COUNT` per line (a line that
// holds a tab is split at the tab, else at the comma). Fields are trimmed of spaces; a field
// wrapped in double quotes is unwrapped. Blank lines are skipped, CRLF line ends and a leading
// UTF-8 byte-order mark are accepted, and the first non-blank line is taken as a CSV header
// when its count field starts with a letter (e.g. "name,count"). Returns the list (group
// empty), or an Error (kind input) with `file` and the 1-based line for the first malformed
// line (not two fields, an empty name, a name that is not valid UTF-8 or holds '|', '#', '~'
// or a control character, a count that is not a decimal integer or does not fit 64 bits), a count
// that is not positive, or a name listed twice (case-folded; the message names the first line).
Result<NameList> parse_name_counts(std::string_view text, const std::string& file);

// Reads `path` and parses it as above. Returns an Error (kind input) if it cannot be read.
Result<NameList> read_name_counts_file(const std::string& path);

// Text of a pack [names] section for `pairing`: a comment header naming the groups and the
// method, "[names]", then one line per pair in rank order ("Emily | Jacob", followed by
// "~word" when word_like, and a comment with rank and counts), then comment lines listing the
// unpaired names with their reasons. Deterministic: the same pairing gives the same bytes.
std::string write_names_section(const RankPairing& pairing);

}  // namespace evenhand::pack
