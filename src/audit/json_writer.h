// A small streaming JSON writer for the manifest, the audit log and reports: appends
// well-formed JSON (RFC 8259) to a string, handling commas and escaping. Keys are written in
// the order the caller gives, so output is deterministic.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace evenhand::audit {

// Not copyable: it holds a reference to the output string.
class JsonWriter {
 public:
  // `indent` 0 writes compact JSON on one line; > 0 pretty-prints with that many spaces.
  explicit JsonWriter(std::string& out, int indent = 0) : out_(out), indent_(indent) {}
  JsonWriter(const JsonWriter&) = delete;
  JsonWriter& operator=(const JsonWriter&) = delete;

  JsonWriter& begin_object();
  JsonWriter& end_object();
  JsonWriter& begin_array();
  JsonWriter& end_array();
  // Writes a member name; the next call writes its value.
  JsonWriter& key(std::string_view k);

  JsonWriter& value(std::string_view s);  // a string (valid UTF-8)
  JsonWriter& value(const char* s) { return value(std::string_view(s)); }
  JsonWriter& value(const std::string& s) { return value(std::string_view(s)); }
  JsonWriter& value(uint64_t n);
  JsonWriter& value(int64_t n);
  JsonWriter& value(int n) { return value(static_cast<int64_t>(n)); }
  JsonWriter& value(unsigned n) { return value(static_cast<uint64_t>(n)); }
  JsonWriter& value(double d);  // shortest round-trip form; non-finite becomes null
  JsonWriter& value(bool b);
  JsonWriter& null();
  // Writes `json` as a value verbatim (must be valid JSON).
  JsonWriter& raw(std::string_view json);

 private:
  void before_value();
  void newline();
  std::string& out_;
  int indent_;
  std::vector<bool> first_;  // per open container: no member written yet
  bool after_key_ = false;
};

}  // namespace evenhand::audit
