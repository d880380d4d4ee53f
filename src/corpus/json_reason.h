// Plain reasons for a JSON record the parser refused, where simdjson's own message misleads:
// a complete value followed by more text ("document ended early" for {"a":1} x), and NaN or
// Infinity, which are no JSON numbers (RFC 8259 section 6). Called on the error path only.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace evenhand::corpus {

// A reason ("invalid JSON: ...") naming the first NaN/Infinity written as a value, or else
// text after a complete, valid first value, with its byte offset in `record` (0-based);
// nullopt when neither explains the failure.
std::optional<std::string> explain_invalid_json(std::string_view record);

}  // namespace evenhand::corpus
