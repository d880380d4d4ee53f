// PackBuilder: reads the text files of one rule pack, checks them and compiles them into a
// CompiledPack. Every problem becomes a Diagnostic with its file and line; a pack with any
// diagnostic is not compiled. Used by load_pack_*; one builder per load, not thread-safe.
#pragma once

#include <map>
#include <memory>
#include <string>
#include <vector>

#include "pack/pack.h"

namespace evenhand::pack {

class PackBuilder {
 public:
  // `label` names the pack in errors (a directory path or a built-in pack name).
  explicit PackBuilder(std::string label);
  PackBuilder(const PackBuilder&) = delete;
  PackBuilder& operator=(const PackBuilder&) = delete;

  // Reads, checks and compiles `files` (file name -> bytes; names ending in ".txt" are
  // parsed, the others kept as data files). Returns the compiled pack, or, when `diagnostics`
  // received any, the first of them as diagnostic_error(label, first).
  Result<std::shared_ptr<const CompiledPack>> build(const std::map<std::string, std::string>& files,
                                                    std::vector<Diagnostic>& diagnostics);

 private:
  enum class Section { header, none, sets, names, protect, guard, unknown };
  struct HeaderValue {
    std::string value;
    SourceRef where;
  };
  struct Phrase {
    std::string text;
    SourceRef where;
  };

  void diag(const SourceRef& where, std::string code, std::string message);
  void parse_file(const std::string& name, const std::string& bytes, bool is_header_file);
  void parse_header_line(const SourceRef& where, std::string_view line);
  void parse_section_line(const SourceRef& where, std::string_view line);
  void parse_set_line(const SourceRef& where, std::string_view line);
  void parse_name_line(const SourceRef& where, std::string_view line);
  size_t read_forms(const SourceRef& where, const std::vector<std::string>& columns,
                    const char* what, std::vector<std::string>& forms,
                    std::vector<std::vector<std::string>>& tokens, bool& ok);
  void parse_phrase_line(const SourceRef& where, std::string_view line);
  // Splits "a | b | c  @tag ~mark" into trimmed columns and the marker tokens after them;
  // false (with a diagnostic) when the columns are not one per group.
  bool split_columns(const SourceRef& where, std::string_view line, const char* what,
                     std::vector<std::string>& columns, std::vector<std::string>& markers);
  void finish_header();
  void check_sets();
  void check_names();
  void check_reversible();
  void check_phrases();
  void check_groups_used();
  std::shared_ptr<CompiledPack> compile() const;  // sha256 is left to build()

  std::string label_;
  std::vector<std::string> file_order_;
  std::vector<Diagnostic> diags_;

  // Header.
  std::map<std::string, HeaderValue> header_;
  std::vector<std::pair<std::string, std::string>> meta_;
  std::vector<std::string> groups_;
  size_t columns_ = 0;  // groups_.size() when the groups line is usable, else 0 (unchecked)

  // Parser state.
  Section section_ = Section::none;
  std::string guard_reason_;

  // Parsed content.
  std::vector<WordSet> sets_;
  std::vector<std::vector<std::vector<std::string>>> set_tokens_;  // [set][group] folded
  std::vector<NamePair> names_;
  std::vector<std::vector<std::vector<std::string>>> name_tokens_;
  std::vector<Guard> guards_;
  std::vector<Phrase> protect_;
};

}  // namespace evenhand::pack
