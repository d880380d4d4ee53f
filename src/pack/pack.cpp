// CompiledPack queries, the pack loaders (directory, in-memory files, built-in) and tags.
#include "pack/pack.h"

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "pack/builder.h"
#include "pack/builtin_data.h"

namespace evenhand::pack {

namespace {

constexpr const char* kTagNames[] = {"", "subj", "obj", "det", "poss", "noun", "adj", "verb"};

}  // namespace

const char* tag_name(Tag t) {
  auto i = static_cast<size_t>(t);
  return i < std::size(kTagNames) ? kTagNames[i] : "";
}

std::optional<Tag> parse_tag(std::string_view s) {
  for (size_t i = 1; i < std::size(kTagNames); ++i)
    if (s == kTagNames[i]) return static_cast<Tag>(i);
  return std::nullopt;
}

std::string pack_file_path(std::string_view label, std::string_view file) {
  std::string path(label);
  if (!path.empty() && path.back() != '/') path += '/';
  return path.append(file);
}

Error diagnostic_error(std::string_view label, const Diagnostic& d) {
  Error e = make_error(ErrorKind::pack, pack_file_path(label, d.where.file), d.message);
  if (d.where.line) e.line = d.where.line;
  return e;
}

std::optional<uint16_t> CompiledPack::group_index(std::string_view name) const {
  for (size_t i = 0; i < groups_.size(); ++i)
    if (groups_[i] == name) return static_cast<uint16_t>(i);
  return std::nullopt;
}

const std::vector<LexEntry>* CompiledPack::lookup(std::string_view folded_word) const {
  auto it = index_.find(folded_word);
  return it == index_.end() ? nullptr : &it->second;
}

std::vector<std::string_view> CompiledPack::keys() const {
  std::vector<std::string_view> out;
  out.reserve(index_.size());
  for (const auto& kv : index_) out.push_back(kv.first);
  return out;
}

const std::string* CompiledPack::file(std::string_view name) const {
  auto it = files_.find(name);
  return it == files_.end() ? nullptr : &it->second;
}

std::vector<std::string> CompiledPack::file_names() const {
  std::vector<std::string> names;
  for (const auto& kv : files_) names.push_back(kv.first);
  return names;
}

Result<std::shared_ptr<const CompiledPack>> load_pack_files(
    const std::string& label, const std::map<std::string, std::string>& files,
    std::vector<Diagnostic>& diagnostics) {
  PackBuilder builder(label);
  return builder.build(files, diagnostics);
}

Result<std::shared_ptr<const CompiledPack>> load_pack_dir(const std::string& dir,
                                                          std::vector<Diagnostic>& diagnostics) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::is_directory(dir, ec))
    return make_error(ErrorKind::pack, dir, "not a directory (a rule pack is a folder)");
  std::map<std::string, std::string> files;
  fs::directory_iterator it(dir, ec);
  if (ec) return make_error(ErrorKind::pack, dir, "cannot list the folder: " + ec.message());
  for (const fs::directory_entry& entry : it) {
    std::string name = entry.path().filename().string();
    if (name.empty() || name[0] == '.' || name.back() == '~') continue;
    if (!entry.is_regular_file(ec)) continue;
    std::ifstream in(entry.path(), std::ios::binary);
    std::ostringstream bytes;
    bytes << in.rdbuf();
    if (!in.good() && !in.eof())
      return make_error(ErrorKind::pack, dir, "cannot read " + name + ": " + std::strerror(errno));
    files.emplace(std::move(name), bytes.str());
  }
  return load_pack_files(dir, files, diagnostics);
}

std::vector<std::string> builtin_pack_names() {
  std::vector<std::string> names;
  for (size_t i = 0; i < detail::kEmbeddedFileCount; ++i) {
    const char* pack = detail::kEmbeddedFiles[i].pack;
    if (names.empty() || names.back() != pack) names.emplace_back(pack);
  }
  return names;  // the table is sorted by pack, so this is sorted and unique
}

std::optional<std::map<std::string, std::string>> builtin_pack_files(std::string_view name) {
  std::map<std::string, std::string> files;
  for (size_t i = 0; i < detail::kEmbeddedFileCount; ++i) {
    const detail::EmbeddedFile& f = detail::kEmbeddedFiles[i];
    if (name != f.pack) continue;
    files.emplace(f.name, std::string(reinterpret_cast<const char*>(f.data), f.size));
  }
  if (files.empty()) return std::nullopt;
  return files;
}

Result<std::shared_ptr<const CompiledPack>> load_pack(const std::string& name_or_dir,
                                                      std::vector<Diagnostic>& diagnostics) {
  if (auto files = builtin_pack_files(name_or_dir)) {
    return load_pack_files(name_or_dir, *files, diagnostics);
  }
  std::error_code ec;
  if (std::filesystem::is_directory(name_or_dir, ec))
    return load_pack_dir(name_or_dir, diagnostics);
  std::string known;
  for (const auto& n : builtin_pack_names()) known += (known.empty() ? "" : ", ") + n;
  return make_error(ErrorKind::usage, name_or_dir,
                    "no such pack: neither a built-in pack (" + (known.empty() ? "none" : known) +
                        ") nor a directory");
}

}  // namespace evenhand::pack
