// Reading the records of a pack data file that opens with a format line: one definition of
// the line loop every such file shares (comments, blank lines, CR LF, the format line first),
// so that each loader states only what its records mean. Errors name the file and line.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "base/status.h"

namespace evenhand::pack {

// Calls `take(line)` for every record of `text` after the format line `format` (a record is a
// line that is neither empty nor a `#` comment; a trailing CR is dropped). `take` returns an
// empty string to go on, or a reason: then the Error (kind pack) names `file` and the line.
// A first record other than `format`, or no record at all, is an error too.
template <typename Take>
std::optional<Error> read_data_records(std::string_view text, const std::string& file,
                                       std::string_view format, Take take) {
  uint64_t line_no = 0;
  bool have_format = false;
  auto fail = [&](std::string reason) {
    Error e = make_error(ErrorKind::pack, file, std::move(reason));
    if (line_no) e.line = line_no;  // 0: the file as a whole
    return e;
  };
  for (size_t pos = 0; pos < text.size();) {
    size_t end = text.find('\n', pos);
    std::string_view line = text.substr(pos, end == text.npos ? text.npos : end - pos);
    pos = end == text.npos ? text.size() : end + 1;
    ++line_no;
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    if (line.empty() || line[0] == '#') continue;
    if (!have_format && line != format) {
      return fail("the first record must be '" + std::string(format) + "', found '" +
                  std::string(line) + "'");
    }
    if (!have_format) {
      have_format = true;
      continue;
    }
    if (std::string reason = take(line); !reason.empty()) return fail(std::move(reason));
  }
  if (!have_format) {
    line_no = 0;
    return fail("no '" + std::string(format) + "' record");
  }
  return std::nullopt;
}

}  // namespace evenhand::pack
