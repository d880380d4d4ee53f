#include "balance/tally.h"

#include <simdjson.h>

#include <algorithm>
#include <bit>

#include "audit/json_writer.h"
#include "balance/json_support.h"

namespace evenhand::balance {

namespace {

constexpr uint8_t kLastBin = 37;

uint32_t count_at(std::span<const uint32_t> counts, size_t g) {
  return g < counts.size() ? counts[g] : 0;
}

}  // namespace

uint8_t count_bin(uint32_t c) {
  if (c <= kExactCountMax) return static_cast<uint8_t>(c);
  int floor_log2 = std::bit_width(c - 1) - 1;  // >= 3 because c - 1 >= 8
  return static_cast<uint8_t>(9 + floor_log2 - 3);
}

uint64_t bin_low(uint8_t b) {
  if (b <= kExactCountMax) return b;
  return (uint64_t{1} << (b - 6)) + 1;
}

uint64_t bin_high(uint8_t b) {
  if (b <= kExactCountMax) return b;
  if (b >= kLastBin) return UINT32_MAX;
  return uint64_t{1} << (b - 5);
}

int bin_of_low(uint64_t low) {
  if (low <= kExactCountMax) return static_cast<int>(low);
  uint64_t p = low - 1;
  if (!std::has_single_bit(p)) return -1;
  int b = 9 + (std::bit_width(p) - 1) - 3;
  return b <= kLastBin ? b : -1;
}

int16_t lead_group(std::span<const uint32_t> counts) {
  uint32_t best = 0;
  int16_t lead = kLeadNone;
  for (size_t g = 0; g < counts.size(); ++g) {
    if (counts[g] == 0) continue;
    if (counts[g] > best) {
      best = counts[g];
      lead = static_cast<int16_t>(g);
    } else if (counts[g] == best) {
      lead = kLeadTie;
    }
  }
  return lead;
}

Signature make_signature(std::span<const uint32_t> before, std::span<const uint32_t> after,
                         bool changeable, size_t groups) {
  Signature s;
  std::vector<uint32_t> b(groups), a(groups);
  for (size_t g = 0; g < groups; ++g) {
    b[g] = count_at(before, g);
    a[g] = count_at(after, g);
  }
  s.lead_before = lead_group(b);
  s.changeable = changeable && s.lead_before != kLeadNone;
  s.before.resize(groups);
  for (size_t g = 0; g < groups; ++g) s.before[g] = count_bin(b[g]);
  if (s.changeable) {
    s.after.resize(groups);
    for (size_t g = 0; g < groups; ++g) s.after[g] = count_bin(a[g]);
    s.lead_after = lead_group(a);
  }
  return s;
}

bool is_changeable(const rewrite::RecordResult& r) {
  return r.has_mentions() && r.guard == nullptr && !r.edits.empty();
}

Signature signature_of(const rewrite::RecordResult& r, size_t groups) {
  return make_signature(r.before, r.after, is_changeable(r), groups);
}

Tally Tally::make(std::string axis, std::vector<std::string> groups, std::string pack_sha256) {
  Tally t;
  t.axis = std::move(axis);
  t.groups = std::move(groups);
  t.pack_sha256 = std::move(pack_sha256);
  t.by_group.resize(t.groups.size());
  return t;
}

void Tally::add(std::span<const uint32_t> before, std::span<const uint32_t> after, bool changeable,
                bool guarded) {
  const size_t n = groups.size();
  if (by_group.size() < n) by_group.resize(n);
  Signature sig = make_signature(before, after, changeable, n);
  ++records;
  if (sig.changeable) ++records_changeable;
  if (guarded) ++records_guarded;
  if (sig.lead_before == kLeadNone) ++records_without_mentions;
  if (sig.lead_before == kLeadTie) ++records_tied;
  if (sig.lead_before >= 0) ++by_group[static_cast<size_t>(sig.lead_before)].records;
  for (size_t g = 0; g < n; ++g) by_group[g].mentions += count_at(before, g);

  bool with_after = sig.changeable;
  SignatureTotals& tot = signatures[std::move(sig)];
  if (tot.records == 0) {
    tot.before.assign(n, 0);
    if (with_after) tot.after.assign(n, 0);
  }
  ++tot.records;
  for (size_t g = 0; g < n; ++g) {
    tot.before[g] += count_at(before, g);
    if (with_after) tot.after[g] += count_at(after, g);
  }
}

void Tally::add(const rewrite::RecordResult& r) {
  add(r.before, r.after, is_changeable(r), r.guard != nullptr);
}

Status Tally::merge(const Tally& other) {
  if (groups.empty() && records == 0 && axis.empty()) {
    axis = other.axis;
    groups = other.groups;
    pack_sha256 = other.pack_sha256;
    by_group.assign(groups.size(), GroupTotals{});
  }
  if (other.axis != axis || other.groups != groups || other.pack_sha256 != pack_sha256)
    return make_error(ErrorKind::usage, "",
                      "cannot merge tallies of different packs (axis '" + axis + "' vs '" +
                          other.axis + "', or other groups or pack hash)");
  records += other.records;
  records_changeable += other.records_changeable;
  records_guarded += other.records_guarded;
  records_without_mentions += other.records_without_mentions;
  records_tied += other.records_tied;
  if (by_group.size() < groups.size()) by_group.resize(groups.size());
  for (size_t g = 0; g < groups.size() && g < other.by_group.size(); ++g) {
    by_group[g].mentions += other.by_group[g].mentions;
    by_group[g].records += other.by_group[g].records;
  }
  for (const auto& [sig, src] : other.signatures) {
    SignatureTotals& dst = signatures[sig];
    if (dst.records == 0) {
      dst.before.assign(src.before.size(), 0);
      dst.after.assign(src.after.size(), 0);
    }
    dst.records += src.records;
    for (size_t g = 0; g < src.before.size() && g < dst.before.size(); ++g)
      dst.before[g] += src.before[g];
    for (size_t g = 0; g < src.after.size() && g < dst.after.size(); ++g)
      dst.after[g] += src.after[g];
  }
  return ok_status();
}

// ---- JSON ----------------------------------------------------------------------------------

std::string tally_to_json(const Tally& t, int indent) {
  std::string out;
  audit::JsonWriter w(out, indent);
  w.begin_object();
  detail::write_header_members(w, kTallySchema, t.axis, t.groups, t.pack_sha256);
  w.key("count_bins")
      .value(
          "counts 0-8 exact, then 9-16, 17-32, 33-64, ...; a bin is written as its lowest count");
  w.key("records").value(t.records);
  w.key("records_changeable").value(t.records_changeable);
  w.key("records_guarded").value(t.records_guarded);
  w.key("records_without_mentions").value(t.records_without_mentions);
  w.key("records_tied").value(t.records_tied);
  w.key("by_group").begin_array();
  for (size_t g = 0; g < t.groups.size(); ++g) {
    GroupTotals gt = g < t.by_group.size() ? t.by_group[g] : GroupTotals{};
    w.begin_object();
    w.key("group").value(t.groups[g]);
    w.key("mentions").value(gt.mentions);
    w.key("records").value(gt.records);
    w.end_object();
  }
  w.end_array();
  w.key("signatures").begin_array();
  for (const auto& [sig, tot] : t.signatures) {
    w.begin_object();
    detail::write_signature_members(w, sig);
    w.key("records").value(tot.records);
    w.key("sum_before").begin_array();
    for (uint64_t v : tot.before) w.value(v);
    w.end_array();
    w.key("sum_after").begin_array();
    for (uint64_t v : tot.after) w.value(v);
    w.end_array();
    w.end_object();
  }
  w.end_array();
  w.end_object();
  out += '\n';
  return out;
}

namespace {

// Whether `lead` can be the lead of counts that fall into `bins`.
bool lead_fits(const std::vector<uint8_t>& bins, int16_t lead) {
  uint8_t top = 0;
  size_t at_top = 0;
  for (uint8_t b : bins) top = std::max(top, b);
  for (uint8_t b : bins) at_top += (b == top && top > 0);
  if (lead == kLeadNone) return top == 0;
  if (top == 0) return false;
  bool exact = top <= kExactCountMax;
  if (lead == kLeadTie) return at_top >= 2;
  if (static_cast<size_t>(lead) >= bins.size() || bins[static_cast<size_t>(lead)] != top)
    return false;
  return exact ? at_top == 1 : true;
}

bool sum_fits(uint64_t sum, uint64_t n, uint8_t bin) {
  unsigned __int128 lo = static_cast<unsigned __int128>(n) * bin_low(bin);
  unsigned __int128 hi = static_cast<unsigned __int128>(n) * bin_high(bin);
  return sum >= lo && sum <= hi;
}

}  // namespace

Result<Tally> tally_from_json(std::string_view json, const std::string& file) {
  using detail::bad_doc;
  simdjson::dom::parser parser;
  auto root = detail::parse_root(parser, json, file, kTallySchema);
  if (!root.ok()) return std::move(root).error();
  simdjson::dom::object obj = *root;
  Tally t;
  EVENHAND_READ(t.axis, detail::get_str(obj, "axis", file, ""));
  EVENHAND_READ(t.groups, detail::get_str_array(obj, "groups", file, ""));
  EVENHAND_READ(t.pack_sha256, detail::get_str(obj, "pack_sha256", file, ""));
  EVENHAND_READ(t.records, detail::get_u64(obj, "records", file, ""));
  EVENHAND_READ(t.records_changeable, detail::get_u64(obj, "records_changeable", file, ""));
  EVENHAND_READ(t.records_guarded, detail::get_u64(obj, "records_guarded", file, ""));
  EVENHAND_READ(t.records_without_mentions,
                detail::get_u64(obj, "records_without_mentions", file, ""));
  EVENHAND_READ(t.records_tied, detail::get_u64(obj, "records_tied", file, ""));
  const size_t n = t.groups.size();
  for (size_t i = 0; i < n; ++i)
    for (size_t j = i + 1; j < n; ++j)
      if (t.groups[i] == t.groups[j])
        return bad_doc(file, "groups", "names '" + t.groups[i] + "' twice");

  simdjson::dom::array by_group;
  EVENHAND_READ(by_group, detail::get_arr(obj, "by_group", file, ""));
  for (simdjson::dom::element e : by_group) {
    std::string where = "by_group[" + std::to_string(t.by_group.size()) + "]";
    simdjson::dom::object go;
    if (e.get_object().get(go) != simdjson::SUCCESS) return bad_doc(file, where, "not an object");
    std::string name;
    EVENHAND_READ(name, detail::get_str(go, "group", file, where));
    if (t.by_group.size() >= n || name != t.groups[t.by_group.size()])
      return bad_doc(file, where, "does not match the groups list");
    GroupTotals gt;
    EVENHAND_READ(gt.mentions, detail::get_u64(go, "mentions", file, where));
    EVENHAND_READ(gt.records, detail::get_u64(go, "records", file, where));
    t.by_group.push_back(gt);
  }
  if (t.by_group.size() != n) return bad_doc(file, "by_group", "does not match the groups list");

  simdjson::dom::array sigs;
  EVENHAND_READ(sigs, detail::get_arr(obj, "signatures", file, ""));
  size_t index = 0;
  for (simdjson::dom::element e : sigs) {
    std::string where = "signatures[" + std::to_string(index++) + "]";
    simdjson::dom::object so;
    if (e.get_object().get(so) != simdjson::SUCCESS) return bad_doc(file, where, "not an object");
    Signature sig;
    EVENHAND_READ(sig, detail::read_signature(so, n, file, where));
    SignatureTotals tot;
    EVENHAND_READ(tot.records, detail::get_u64(so, "records", file, where));
    EVENHAND_READ(tot.before, detail::get_u64_array(so, "sum_before", n, file, where));
    EVENHAND_READ(tot.after,
                  detail::get_u64_array(so, "sum_after", sig.changeable ? n : 0, file, where));
    if (tot.records == 0) return bad_doc(file, where + ".records", "must be at least 1");
    if (!lead_fits(sig.before, sig.lead_before))
      return bad_doc(file, where + ".lead_before", "does not fit the counts");
    if (sig.changeable && !lead_fits(sig.after, sig.lead_after))
      return bad_doc(file, where + ".lead_after", "does not fit the counts");
    for (size_t g = 0; g < n; ++g) {
      if (!sum_fits(tot.before[g], tot.records, sig.before[g]))
        return bad_doc(file, where + ".sum_before", "lies outside the counts' bin");
      if (sig.changeable && !sum_fits(tot.after[g], tot.records, sig.after[g]))
        return bad_doc(file, where + ".sum_after", "lies outside the counts' bin");
    }
    if (!t.signatures.emplace(std::move(sig), std::move(tot)).second)
      return bad_doc(file, where, "repeats an earlier signature");
  }

  // The counters are sums over the signatures; check that they add up.
  uint64_t recs = 0, changeable = 0, none = 0, tied = 0;
  std::vector<GroupTotals> sums(n);
  for (const auto& [sig, tot] : t.signatures) {
    recs += tot.records;
    if (sig.changeable) changeable += tot.records;
    if (sig.lead_before == kLeadNone) none += tot.records;
    if (sig.lead_before == kLeadTie) tied += tot.records;
    if (sig.lead_before >= 0) sums[static_cast<size_t>(sig.lead_before)].records += tot.records;
    for (size_t g = 0; g < n; ++g) sums[g].mentions += tot.before[g];
  }
  if (recs != t.records) return bad_doc(file, "records", "differs from the signatures' sum");
  if (changeable != t.records_changeable)
    return bad_doc(file, "records_changeable", "differs from the signatures' sum");
  if (none != t.records_without_mentions)
    return bad_doc(file, "records_without_mentions", "differs from the signatures' sum");
  if (tied != t.records_tied)
    return bad_doc(file, "records_tied", "differs from the signatures' sum");
  if (t.records_guarded > t.records - t.records_changeable)
    return bad_doc(file, "records_guarded", "exceeds the records that are not changeable");
  if (sums != t.by_group) return bad_doc(file, "by_group", "differs from the signatures' sums");
  return t;
}

}  // namespace evenhand::balance
