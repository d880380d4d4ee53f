// Private to the pack layer: the bytes of every rules/<pack>/*.txt file, embedded at build
// time by embed_rules.cmake into a generated builtin_packs.cpp. Sorted by pack, then file.
#pragma once

#include <cstddef>

namespace evenhand::pack::detail {

struct EmbeddedFile {
  const char* pack;  // folder name under rules/, e.g. "en-gender"
  const char* name;  // file name, e.g. "words.txt"
  const unsigned char* data;
  size_t size;
};

extern const EmbeddedFile kEmbeddedFiles[];
extern const size_t kEmbeddedFileCount;

}  // namespace evenhand::pack::detail
