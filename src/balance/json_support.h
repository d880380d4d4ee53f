// Internal helpers of the balance unit for its JSON documents: writing and reading a
// Signature, and small typed readers over simdjson's DOM that turn every shape error into an
// Error naming the member. Not part of the public API.
#pragma once

#include <simdjson.h>

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "audit/json_writer.h"
#include "balance/tally.h"
#include "base/status.h"

namespace evenhand::balance::detail {

// Writes the members that open every balance document (schema, axis, groups, pack_sha256)
// into the object that `w` has open.
void write_header_members(audit::JsonWriter& w, std::string_view schema, const std::string& axis,
                          const std::vector<std::string>& groups, const std::string& pack_sha256);

// Writes the members of `s` (changeable, before, after, lead_before, lead_after) into the
// object that `w` has open.
void write_signature_members(audit::JsonWriter& w, const Signature& s);

// Reads the signature members of `obj` for a tally of `groups` groups. Returns an Error (kind
// input, naming `file` and `where`) when one is missing or malformed.
Result<Signature> read_signature(simdjson::dom::object obj, size_t groups, const std::string& file,
                                 const std::string& where);

// Typed member readers: each returns an Error (kind input) naming `file` and `where.key`
// when the member is missing or of the wrong type.
Result<uint64_t> get_u64(simdjson::dom::object obj, std::string_view key, const std::string& file,
                         const std::string& where);
Result<double> get_f64(simdjson::dom::object obj, std::string_view key, const std::string& file,
                       const std::string& where);
Result<bool> get_bool(simdjson::dom::object obj, std::string_view key, const std::string& file,
                      const std::string& where);
Result<std::string> get_str(simdjson::dom::object obj, std::string_view key,
                            const std::string& file, const std::string& where);
Result<simdjson::dom::array> get_arr(simdjson::dom::object obj, std::string_view key,
                                     const std::string& file, const std::string& where);
Result<simdjson::dom::object> get_obj(simdjson::dom::object obj, std::string_view key,
                                      const std::string& file, const std::string& where);
// Reads an array of unsigned integers of exactly `n` entries (any length when n is SIZE_MAX).
Result<std::vector<uint64_t>> get_u64_array(simdjson::dom::object obj, std::string_view key,
                                            size_t n, const std::string& file,
                                            const std::string& where);
// Reads an array of strings.
Result<std::vector<std::string>> get_str_array(simdjson::dom::object obj, std::string_view key,
                                               const std::string& file, const std::string& where);

// Returns an Error of kind input about `file` with reason "`where`: `what`".
Error bad_doc(const std::string& file, const std::string& where, const std::string& what);

// Parses `json` into `parser`'s document and returns its root object, or an Error (kind input).
Result<simdjson::dom::object> parse_root(simdjson::dom::parser& parser, std::string_view json,
                                         const std::string& file, std::string_view schema);

}  // namespace evenhand::balance::detail

// Inside a function returning Result<...> or Status: assigns the value of `expr` (a Result)
// to `dst`, or returns its error. Shared by the tally and plan readers.
#define EVENHAND_READ(dst, expr)                                        \
  do {                                                                  \
    auto evenhand_read_ = (expr);                                       \
    if (!evenhand_read_.ok()) return std::move(evenhand_read_).error(); \
    dst = std::move(evenhand_read_).value();                            \
  } while (0)
