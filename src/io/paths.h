// Path identity for the command line's files: whether an output would replace an input or
// another output. One check serves every command; it compares files, not spellings, so
// "./in.jsonl", an absolute path, a hard link or a symbolic link to an input are all caught.
#pragma once

#include <string>
#include <vector>

#include "base/status.h"

namespace evenhand::io {

// A path as given on the command line, with the option that gave it ("--in", "--out").
struct NamedPath {
  std::string path;
  std::string option;
};

// Whether `a` and `b` name one file: the same device and inode when both exist (links
// followed), else the same resolved path (symbolic links followed, including a dangling
// link's target and links among the parent directories). "-" (stdin or stdout) and the
// empty path name no file; character devices (/dev/null) are never the same file.
bool same_file(const std::string& a, const std::string& b);

// Errors (kind usage, naming both options and the output path) when an output would replace
// an input or another output: the same file as by same_file(), or, for an input that is a
// directory (a rule pack), an existing file under it. Returns ok when all are distinct.
Status check_outputs_distinct(const std::vector<NamedPath>& inputs,
                              const std::vector<NamedPath>& outputs);

}  // namespace evenhand::io
