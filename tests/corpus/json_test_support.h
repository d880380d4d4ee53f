// Outside references for the corpus tests: simdjson's DOM parser and, as subprocesses,
// Python's json module (Debian package python3.11) and jq (Debian package jq). Each helper
// reports failure instead of pretending success, so a missing tool fails the test.
#pragma once

#include <simdjson.h>
#include <unistd.h>

#include <cstdint>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <optional>
#include <sstream>
#include <string>
#include <string_view>
#include <vector>

namespace evenhand::corpus::testing {

// The decoded string simdjson (DOM API) finds at `pointer` in `json`; nullopt when the JSON
// does not parse, the pointer names nothing, or the value is not a string.
inline std::optional<std::string> simdjson_string_at(std::string_view json,
                                                     std::string_view pointer) {
  simdjson::dom::parser parser;
  simdjson::padded_string padded(json);
  simdjson::dom::element doc;
  if (parser.parse(padded).get(doc)) return std::nullopt;
  std::string_view s;
  if (doc.at_pointer(pointer).get_string().get(s)) return std::nullopt;
  return std::string(s);
}

// simdjson's minified text of the value at `pointer`; nullopt as above.
inline std::optional<std::string> simdjson_minified_at(std::string_view json,
                                                       std::string_view pointer) {
  simdjson::dom::parser parser;
  simdjson::padded_string padded(json);
  simdjson::dom::element doc;
  if (parser.parse(padded).get(doc)) return std::nullopt;
  simdjson::dom::element v;
  if (doc.at_pointer(pointer).get(v)) return std::nullopt;
  return simdjson::minify(v);
}

// Every string of a JSON array of strings, decoded by simdjson's DOM API.
inline std::optional<std::vector<std::string>> decode_with_simdjson(std::string_view json_array) {
  simdjson::dom::parser parser;
  simdjson::padded_string padded(json_array);
  simdjson::dom::array arr;
  if (parser.parse(padded).get(arr)) return std::nullopt;
  std::vector<std::string> out;
  for (simdjson::dom::element e : arr) {
    std::string_view s;
    if (e.get_string().get(s)) return std::nullopt;
    out.emplace_back(s);
  }
  return out;
}

namespace detail {

inline std::filesystem::path scratch_dir() {
  static int counter = 0;
  std::filesystem::path dir =
      std::filesystem::temp_directory_path() /
      ("evenhand-corpus-test-" + std::to_string(::getpid()) + "-" + std::to_string(counter++));
  std::filesystem::create_directories(dir);
  return dir;
}

inline void write_file(const std::filesystem::path& p, std::string_view bytes) {
  std::ofstream f(p, std::ios::binary);
  f.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
}

inline std::string read_file(const std::filesystem::path& p) {
  std::ifstream f(p, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(f), std::istreambuf_iterator<char>());
}

// Parses "<byte length>\n<bytes>" records.
inline std::optional<std::vector<std::string>> parse_length_prefixed(const std::string& s) {
  std::vector<std::string> out;
  size_t pos = 0;
  while (pos < s.size()) {
    size_t nl = s.find('\n', pos);
    if (nl == std::string::npos) return std::nullopt;
    size_t len = std::stoul(s.substr(pos, nl - pos));
    if (nl + 1 + len > s.size()) return std::nullopt;
    out.push_back(s.substr(nl + 1, len));
    pos = nl + 1 + len;
  }
  return out;
}

// Runs `command` with "in.json" holding `json_array` and the output going to "out"; the
// command must print each string as "<byte length>\n<UTF-8 bytes>".
inline std::optional<std::vector<std::string>> run_decoder(const std::string& command,
                                                           std::string_view json_array,
                                                           std::string_view script = {}) {
  std::filesystem::path dir = scratch_dir();
  write_file(dir / "in.json", json_array);
  if (!script.empty()) write_file(dir / "decode.py", script);
  std::string cmd = "cd '" + dir.string() + "' && " + command + " > out 2> err";
  int rc = std::system(cmd.c_str());
  std::optional<std::vector<std::string>> result;
  if (rc == 0) result = parse_length_prefixed(read_file(dir / "out"));
  std::filesystem::remove_all(dir);
  return result;
}

}  // namespace detail

// Every string of a JSON array of strings, decoded by Python's json module (json.loads).
inline std::optional<std::vector<std::string>> decode_with_python(std::string_view json_array) {
  static constexpr std::string_view kScript =
      "import json, sys\n"
      "values = json.loads(open('in.json', 'rb').read().decode('utf-8'))\n"
      "out = sys.stdout.buffer\n"
      "for v in values:\n"
      "    b = v.encode('utf-8')\n"
      "    out.write(str(len(b)).encode('ascii') + b'\\n' + b)\n";
  return detail::run_decoder("/usr/bin/python3 decode.py", json_array, kScript);
}

// Every string of a JSON array of strings, decoded by jq.
inline std::optional<std::vector<std::string>> decode_with_jq(std::string_view json_array) {
  return detail::run_decoder(
      "/usr/bin/jq -j '.[] | (utf8bytelength | tostring) + \"\\n\" + .' in.json", json_array);
}

}  // namespace evenhand::corpus::testing
