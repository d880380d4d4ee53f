// The tokens of one field as the rewrite engine and its language modules read them: byte
// range in the field, folded text, and whether the token is a word. A view: the folded text
// belongs to the worker that prepared the field and lives as long as that field's scratch.
#pragma once

#include <cstdint>
#include <string_view>

namespace evenhand::rewrite {

struct FieldToken {
  uint32_t begin = 0, end = 0;  // bytes in the field
  std::string_view folded;      // pack::fold_word of the token
  bool word = false;            // a word (not punctuation or a number)
};

}  // namespace evenhand::rewrite
