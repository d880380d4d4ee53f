// Rule packs: the data that says which words belong to which group of an axis (for example
// gender: female, male, later neutral) and how they map onto each other. A pack is read from
// text files (rules/README.md documents the syntax), checked, and compiled once into an
// immutable CompiledPack that every worker thread shares read-only.
#pragma once

#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "base/status.h"

namespace evenhand::pack {

// Where an entry was written, for the audit log and for check messages ("words.txt:12").
// Line 0 means the file as a whole (for example a header field that is missing).
struct SourceRef {
  std::string file;  // file name inside the pack, e.g. "words.txt"
  uint32_t line = 0;
  // "words.txt:12", or just "pack.txt" when line is 0.
  std::string str() const { return line ? file + ":" + std::to_string(line) : file; }
};

// One problem found while reading or checking a pack.
struct Diagnostic {
  SourceRef where;
  std::string message;  // e.g. "'her' has two counterparts in group male ('him', 'his') and no tag"
  std::string code;  // stable kind of problem, e.g. "form-ambiguous" (rules/README.md lists them)
};

// A diagnostic of the pack loaded from `label` as an Error of kind pack that names the file by
// pack_file_path and the line: its message() is "LABEL/words.txt:12: message".
Error diagnostic_error(std::string_view label, const Diagnostic& d);

// Slot or part-of-speech tags that choose between several counterparts of one form.
// The engine knows how to decide each of these from context.
enum class Tag : uint8_t { none = 0, subj, obj, det, poss, noun, adj, verb };
const char* tag_name(Tag t);
std::optional<Tag> parse_tag(std::string_view s);

// One equivalence set: the same word in each group (a form may be absent: "-").
struct WordSet {
  std::vector<std::string> forms;  // index = group; "" where the group has no form
  Tag tag = Tag::none;
  SourceRef where;
};

// A first-name pair across groups (index = group, "" = none). `word_like` marks names that
// are also common lower-case words ("Rose", "Bill"): swapped only in name-like positions.
struct NamePair {
  std::vector<std::string> names;
  bool word_like = false;
  SourceRef where;
};

// A phrase that blocks the axis for the whole record it appears in, with its reason class
// (e.g. "medical", "legal").
struct Guard {
  std::string phrase;  // as written; matched case-insensitively on whole words
  std::string reason;
  SourceRef where;
};

// An entry of the compiled lexicon: one form (a sequence of case-folded words) of one set.
struct LexEntry {
  std::vector<std::string> words;  // folded words; multiword forms have several
  uint32_t set = 0;                // index into sets() (or names() when is_name)
  uint16_t group = 0;              // the group this form belongs to
  Tag tag = Tag::none;
  bool is_name = false;
};

// How messages name file `file` of the pack loaded from `label` (a folder path as given, or a
// built-in pack's name): "LABEL/FILE" ("/tmp/mypack/possessive.model",
// "en-gender/verbs.data"), with no second '/' when the label ends in one.
std::string pack_file_path(std::string_view label, std::string_view file);

class CompiledPack {
 public:
  CompiledPack(const CompiledPack&) = delete;
  CompiledPack& operator=(const CompiledPack&) = delete;

  const std::string& name() const { return name_; }
  // Where the pack was loaded from, as the user named it: the folder path as given, or the
  // built-in pack's name ("en-gender"). Messages about its files start with it.
  const std::string& label() const { return label_; }
  // The name messages give the pack's file `file`: pack_file_path(label(), file).
  std::string file_path(std::string_view file) const { return pack_file_path(label_, file); }
  const std::string& version() const { return version_; }
  const std::string& language() const { return language_; }
  const std::string& axis() const { return axis_; }
  const std::vector<std::string>& groups() const { return groups_; }
  // Index of a group by name, or nullopt.
  std::optional<uint16_t> group_index(std::string_view name) const;
  // Hex SHA-256 over all the pack's files in sorted name order: for each, its name, a NUL
  // byte, its bytes, a NUL byte.
  const std::string& sha256() const { return sha256_; }

  const std::vector<WordSet>& sets() const { return sets_; }
  const std::vector<NamePair>& names() const { return names_; }
  const std::vector<Guard>& guards() const { return guards_; }
  // Protected phrases (never rewritten), as written.
  const std::vector<std::string>& protected_phrases() const { return protected_; }
  // Free-form key/value facts from the header (licence, sources), in file order.
  const std::vector<std::pair<std::string, std::string>>& meta() const { return meta_; }

  // All lexicon entries whose first folded word is `folded_word` (longest first), or null.
  const std::vector<LexEntry>* lookup(std::string_view folded_word) const;

  // Every first folded word the lexicon has entries for, in no particular order.
  std::vector<std::string_view> keys() const;

  // The most words any entry has (for multiword matching windows).
  size_t max_entry_words() const { return max_words_; }

  // The bytes of the pack's file `name`: any file of the pack folder, the *.txt files that
  // were parsed as well as data files such as "possessive.model". Null when there is none.
  const std::string* file(std::string_view name) const;
  // Names of all the pack's files, sorted (the order the hash covers them in).
  std::vector<std::string> file_names() const;

 private:
  friend class PackBuilder;
  CompiledPack() = default;
  std::string label_, name_, version_, language_, axis_, sha256_;
  std::vector<std::string> groups_;
  std::vector<WordSet> sets_;
  std::vector<NamePair> names_;
  std::vector<Guard> guards_;
  std::vector<std::string> protected_;
  std::vector<std::pair<std::string, std::string>> meta_;
  // Transparent hash, so lookup() finds a string_view without building a string.
  struct KeyHash {
    using is_transparent = void;
    size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
  };
  std::unordered_map<std::string, std::vector<LexEntry>, KeyHash, std::equal_to<>> index_;
  size_t max_words_ = 1;
  std::map<std::string, std::string, std::less<>> files_;
};

// Folds one token (a word, or a hyphen or apostrophe token) the way the lexicon's keys are
// folded: Unicode full case folding, then U+2019 RIGHT SINGLE QUOTATION MARK replaced by "'",
// so that curly and straight apostrophes find the same entry. Returns the folded token.
std::string fold_word(std::string_view token);

// Splits a form as written in a pack ("step-mother", "best man", "grandmothers'") into the
// tokens a UAX #29 word segmenter produces for it, leaving out spaces: hyphens are tokens of
// their own; an apostrophe between two letters stays inside its word ("mother's"), any other
// apostrophe is a token of its own ("grandmothers", "'"). Returns the tokens unfolded.
std::vector<std::string> form_tokens(std::string_view form);

// Reads and checks a pack. `diagnostics` receives every problem found (not only the first);
// the result is an Error (kind pack, naming the first problem) when there is any.
// Loads a pack from a directory on disk: every regular file directly inside it, except names
// starting with '.' or ending in '~' (hidden and editor backup files).
Result<std::shared_ptr<const CompiledPack>> load_pack_dir(const std::string& dir,
                                                          std::vector<Diagnostic>& diagnostics);
// Loads a pack from in-memory files (name -> bytes), e.g. the packs built into the binary.
// Files whose name ends in ".txt" are parsed; the others are data files, kept as they are
// (CompiledPack::file) and covered by the hash.
Result<std::shared_ptr<const CompiledPack>> load_pack_files(
    const std::string& label, const std::map<std::string, std::string>& files,
    std::vector<Diagnostic>& diagnostics);

// Names of the packs built into the binary (rules/*/ at build time), sorted.
std::vector<std::string> builtin_pack_names();
// The files of a built-in pack, or nullopt.
std::optional<std::map<std::string, std::string>> builtin_pack_files(std::string_view name);

// Resolves a --pack argument: a built-in name, or else a directory path. An argument that is
// neither is an Error of kind usage; a broken pack is an Error of kind pack.
Result<std::shared_ptr<const CompiledPack>> load_pack(const std::string& name_or_dir,
                                                      std::vector<Diagnostic>& diagnostics);

}  // namespace evenhand::pack
