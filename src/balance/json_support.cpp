#include "balance/json_support.h"

#include <cstdint>

namespace evenhand::balance::detail {

Error bad_doc(const std::string& file, const std::string& where, const std::string& what) {
  return make_error(ErrorKind::input, file, where.empty() ? what : where + ": " + what);
}

namespace {

std::string member(const std::string& where, std::string_view key) {
  std::string s = where;
  if (!s.empty()) s += '.';
  s += key;
  return s;
}

Result<simdjson::dom::element> get_member(simdjson::dom::object obj, std::string_view key,
                                          const std::string& file, const std::string& where) {
  simdjson::dom::element e;
  if (obj.at_key(key).get(e) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "missing");
  return e;
}

}  // namespace

Result<uint64_t> get_u64(simdjson::dom::object obj, std::string_view key, const std::string& file,
                         const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  uint64_t v = 0;
  if (e->get_uint64().get(v) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "not an unsigned integer");
  return v;
}

Result<double> get_f64(simdjson::dom::object obj, std::string_view key, const std::string& file,
                       const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  double v = 0;
  if (e->get_double().get(v) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "not a number");
  return v;
}

Result<bool> get_bool(simdjson::dom::object obj, std::string_view key, const std::string& file,
                      const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  bool v = false;
  if (e->get_bool().get(v) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "not true or false");
  return v;
}

Result<std::string> get_str(simdjson::dom::object obj, std::string_view key,
                            const std::string& file, const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  std::string_view v;
  if (e->get_string().get(v) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "not a string");
  return std::string(v);
}

Result<simdjson::dom::array> get_arr(simdjson::dom::object obj, std::string_view key,
                                     const std::string& file, const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  simdjson::dom::array v;
  if (e->get_array().get(v) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "not an array");
  return v;
}

Result<simdjson::dom::object> get_obj(simdjson::dom::object obj, std::string_view key,
                                      const std::string& file, const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  simdjson::dom::object v;
  if (e->get_object().get(v) != simdjson::SUCCESS)
    return bad_doc(file, member(where, key), "not an object");
  return v;
}

Result<std::vector<uint64_t>> get_u64_array(simdjson::dom::object obj, std::string_view key,
                                            size_t n, const std::string& file,
                                            const std::string& where) {
  auto arr = get_arr(obj, key, file, where);
  if (!arr.ok()) return std::move(arr).error();
  std::vector<uint64_t> out;
  for (simdjson::dom::element e : *arr) {
    uint64_t v = 0;
    if (e.get_uint64().get(v) != simdjson::SUCCESS)
      return bad_doc(file, member(where, key), "holds something other than unsigned integers");
    out.push_back(v);
  }
  if (n != SIZE_MAX && out.size() != n)
    return bad_doc(file, member(where, key),
                   "has " + std::to_string(out.size()) + " entries, not " + std::to_string(n));
  return out;
}

Result<std::vector<std::string>> get_str_array(simdjson::dom::object obj, std::string_view key,
                                               const std::string& file, const std::string& where) {
  auto arr = get_arr(obj, key, file, where);
  if (!arr.ok()) return std::move(arr).error();
  std::vector<std::string> out;
  for (simdjson::dom::element e : *arr) {
    std::string_view v;
    if (e.get_string().get(v) != simdjson::SUCCESS)
      return bad_doc(file, member(where, key), "holds something other than strings");
    out.emplace_back(v);
  }
  return out;
}

Result<simdjson::dom::object> parse_root(simdjson::dom::parser& parser, std::string_view json,
                                         const std::string& file, std::string_view schema) {
  simdjson::dom::element root;
  auto err = parser.parse(json.data(), json.size()).get(root);
  if (err != simdjson::SUCCESS)
    return bad_doc(file, "", std::string("not valid JSON (") + simdjson::error_message(err) + ")");
  simdjson::dom::object obj;
  if (root.get_object().get(obj) != simdjson::SUCCESS)
    return bad_doc(file, "", "the document is not a JSON object");
  auto s = get_str(obj, "schema", file, "");
  if (!s.ok()) return std::move(s).error();
  if (*s != schema)
    return bad_doc(file, "schema", "is '" + *s + "', expected '" + std::string(schema) + "'");
  return obj;
}

void write_header_members(audit::JsonWriter& w, std::string_view schema, const std::string& axis,
                          const std::vector<std::string>& groups, const std::string& pack_sha256) {
  w.key("schema").value(schema);
  w.key("axis").value(axis);
  w.key("groups").begin_array();
  for (const auto& g : groups) w.value(g);
  w.end_array();
  w.key("pack_sha256").value(pack_sha256);
}

void write_signature_members(audit::JsonWriter& w, const Signature& s) {
  w.key("changeable").value(s.changeable);
  w.key("before").begin_array();
  for (uint8_t b : s.before) w.value(bin_low(b));
  w.end_array();
  w.key("after").begin_array();
  for (uint8_t b : s.after) w.value(bin_low(b));
  w.end_array();
  w.key("lead_before").value(static_cast<int64_t>(s.lead_before));
  w.key("lead_after").value(static_cast<int64_t>(s.lead_after));
}

namespace {

Result<std::vector<uint8_t>> read_bins(simdjson::dom::object obj, std::string_view key, size_t n,
                                       const std::string& file, const std::string& where) {
  auto lows = get_u64_array(obj, key, n, file, where);
  if (!lows.ok()) return std::move(lows).error();
  std::vector<uint8_t> bins;
  for (uint64_t low : *lows) {
    int b = bin_of_low(low);
    if (b < 0)
      return bad_doc(file, member(where, key),
                     std::to_string(low) + " is not the lowest count of a count bin");
    bins.push_back(static_cast<uint8_t>(b));
  }
  return bins;
}

Result<int16_t> read_lead(simdjson::dom::object obj, std::string_view key, size_t groups,
                          const std::string& file, const std::string& where) {
  auto e = get_member(obj, key, file, where);
  if (!e.ok()) return std::move(e).error();
  int64_t v = 0;
  if (e->get_int64().get(v) != simdjson::SUCCESS || v < kLeadNone ||
      v >= static_cast<int64_t>(groups))
    return bad_doc(file, member(where, key), "must be a group index, -1 (tie) or -2 (no mention)");
  return static_cast<int16_t>(v);
}

}  // namespace

Result<Signature> read_signature(simdjson::dom::object obj, size_t groups, const std::string& file,
                                 const std::string& where) {
  Signature s;
  auto changeable = get_bool(obj, "changeable", file, where);
  if (!changeable.ok()) return std::move(changeable).error();
  s.changeable = *changeable;
  auto before = read_bins(obj, "before", groups, file, where);
  if (!before.ok()) return std::move(before).error();
  s.before = std::move(before).value();
  auto after = read_bins(obj, "after", s.changeable ? groups : 0, file, where);
  if (!after.ok()) return std::move(after).error();
  s.after = std::move(after).value();
  auto lb = read_lead(obj, "lead_before", groups, file, where);
  if (!lb.ok()) return std::move(lb).error();
  s.lead_before = *lb;
  auto la = read_lead(obj, "lead_after", groups, file, where);
  if (!la.ok()) return std::move(la).error();
  s.lead_after = *la;
  if (!s.changeable && s.lead_after != kLeadNone)
    return bad_doc(file, member(where, "lead_after"), "must be -2 for a record not changeable");
  return s;
}

}  // namespace evenhand::balance::detail
