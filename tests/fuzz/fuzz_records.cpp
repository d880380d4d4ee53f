// Fuzz target: record framing (corpus/records.h), field selection and splicing
// (corpus/json_fields.h). Input: byte 0 picks framing, read size and pointer patterns, byte 1
// the record size limit, the rest is the stream. Checked: every record's bytes and offsets
// are the stream's; records + oversized + blank lines = lines; splicing no edits gives the
// record byte for byte; spliced edits read back as the edited strings with every byte
// outside them kept; and the spliced output frames into as many records as were kept.
#include <string>
#include <vector>

#include "corpus/json_fields.h"
#include "corpus/records.h"
#include "fuzz_support.h"

using namespace evenhand;
using namespace evenhand::corpus;
using evenhand::fuzz::Mix;

namespace {

// Small reads: a fresh 1 MiB buffer per run would cost more than the run itself.
constexpr size_t kReadSize = 4096;

std::vector<PointerPattern> patterns_for(unsigned pick) {
  static const std::vector<std::vector<std::string>> kSets = {
      {"/text", "/messages/*/content"}, {"/*"}, {"/*/*", "/a/*/*"}, {"", "/text"}};
  std::vector<PointerPattern> out;
  for (const auto& t : kSets[pick % kSets.size()]) out.push_back(PointerPattern::parse(t).value());
  return out;
}

// The paragraph starting at `offset`, as paragraph framing must read it: its lines up to a
// blank one, without their CR, joined by '\n'.
std::string expected_paragraph(std::string_view s, size_t offset, size_t& lines_taken) {
  std::string out;
  lines_taken = 0;
  size_t pos = offset;
  while (pos < s.size()) {
    size_t nl = s.find('\n', pos);
    size_t end = nl == std::string_view::npos ? s.size() : nl;
    std::string_view line = s.substr(pos, end - pos);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    if (is_blank(line)) break;
    if (lines_taken++) out += '\n';
    out.append(line);
    pos = end + 1;
  }
  return out;
}

struct EditPlan {
  std::vector<std::string> replacements;  // owns the replacement bytes
  std::vector<FieldEdits> edits;
};

// Chooses edits at character boundaries of the matched strings.
void plan_edits(const std::vector<FieldMatch>& ms, Mix& mix, EditPlan& plan) {
  static const char* kRepl[] = {"",         "he",           "\"",
                                "\\",       "\n",           "\x01",
                                "\xC3\xA9", "\xE2\x80\x99", "\xF0\x9F\x98\x80",
                                "}",        "\\u0041",      "a\"b\\c\td"};
  plan.edits.clear();
  plan.replacements.clear();
  plan.replacements.reserve(64);
  for (uint32_t i = 0; i < ms.size(); ++i) {
    if (!ms[i].is_string || mix.below(3) == 0) continue;
    std::string_view t = ms[i].text;
    std::vector<uint32_t> cuts;
    for (uint32_t k = 0; k <= t.size(); ++k)
      if (fuzz::at_char_boundary(t, k) && mix.below(4) == 0) cuts.push_back(k);
    FieldEdits fe{i, {}};
    for (size_t k = 0; k + 1 < cuts.size() && plan.replacements.size() < 60; k += 2) {
      plan.replacements.push_back(kRepl[mix.below(sizeof kRepl / sizeof *kRepl)]);
      fe.edits.push_back({cuts[k], cuts[k + 1], plan.replacements.back()});
    }
    if (!fe.edits.empty()) plan.edits.push_back(std::move(fe));
  }
}

std::string apply_edits(std::string_view text, const std::vector<StringEdit>& edits) {
  std::string out;
  size_t pos = 0;
  for (const auto& e : edits) {
    out.append(text.substr(pos, e.begin - pos));
    out.append(e.replacement);
    pos = e.end;
  }
  out.append(text.substr(pos));
  return out;
}

// Splices `record` with no edits, then with planned ones, and checks what comes out.
void check_splice(std::string_view record, FieldSelector& sel, FieldSelector& again,
                  std::vector<FieldMatch>& ms, Mix& mix, std::string& out) {
  std::string same;
  sel.splice(record, ms, {}, same);
  FUZZ_CHECK(same == record, "splicing no edits changed the record");
  std::vector<std::string> texts;  // decoded strings of the input
  for (const auto& m : ms) texts.emplace_back(m.text);
  EditPlan plan;
  plan_edits(ms, mix, plan);
  std::string spliced;
  sel.splice(record, ms, plan.edits, spliced);
  std::vector<FieldMatch> ms2;
  SelectStats st2;
  Status s = again.select(spliced, ms2, st2);
  FUZZ_CHECK(s.ok(), "the spliced record does not parse: " + (s.ok() ? "" : s.error().reason));
  FUZZ_CHECK(ms2.size() == ms.size(), "the spliced record matches a different number of values");
  size_t in_pos = 0, out_pos = 0, next_edit = 0;
  for (uint32_t i = 0; i < ms.size(); ++i) {
    FUZZ_CHECK(ms2[i].pointer == ms[i].pointer, "pointer changed: " + ms[i].pointer);
    bool edited = next_edit < plan.edits.size() && plan.edits[next_edit].match == i;
    if (!edited) {
      if (ms[i].is_string) FUZZ_CHECK(ms2[i].text == texts[i], "unedited string changed");
      continue;
    }
    const auto& fe = plan.edits[next_edit++];
    FUZZ_CHECK(ms2[i].text == apply_edits(texts[i], fe.edits),
               "edited string at " + ms[i].pointer + " is not the edits applied");
    std::string_view gap_in = record.substr(in_pos, ms[i].raw_begin - in_pos);
    std::string_view gap_out =
        std::string_view(spliced).substr(out_pos, ms2[i].raw_begin - out_pos);
    FUZZ_CHECK(gap_in == gap_out, "bytes outside the edited strings changed");
    in_pos = ms[i].raw_end;
    out_pos = ms2[i].raw_end;
  }
  FUZZ_CHECK(record.substr(in_pos) == std::string_view(spliced).substr(out_pos),
             "bytes after the last edited string changed");
  out += spliced;
  out += '\n';
}

size_t count_records(std::string_view stream) {
  fuzz::MemorySource src(stream, 1 << 20);
  RecordReader reader(src, Framing::lines, SIZE_MAX, kReadSize);
  RawRecord r;
  size_t n = 0;
  for (;;) {
    auto k = reader.next(r);
    FUZZ_CHECK(k.ok(), "reading the spliced output failed");
    if (*k == RecordReader::Kind::end) return n;
    ++n;
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  if (size < 2) return 0;
  const unsigned flags = data[0];
  const Framing framing = (flags & 1) ? Framing::paragraphs : Framing::lines;
  const size_t chunk = 1 + ((flags >> 1) & 31);
  const size_t max = data[1] < 128 ? 1 + data[1] : SIZE_MAX;
  std::string_view stream(reinterpret_cast<const char*>(data) + 2, size - 2);
  const size_t bom = stream.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0;

  fuzz::MemorySource src(stream, chunk);
  RecordReader reader(src, framing, max, kReadSize);
  FieldSelector sel(patterns_for(flags >> 6)), again(patterns_for(flags >> 6));
  std::vector<FieldMatch> ms;
  Mix mix{size * 0x9E37u + flags};
  std::string out;
  uint64_t records = 0, oversized = 0, kept = 0, rejected = 0, last_line = 0, last_end = bom;
  RawRecord r;
  for (;;) {
    auto k = reader.next(r);
    FUZZ_CHECK(k.ok(), "framing an in-memory stream failed");
    if (*k == RecordReader::Kind::end) break;
    FUZZ_CHECK(r.line > last_line && r.offset >= last_end, "records out of order");
    last_line = r.line;
    if (*k == RecordReader::Kind::oversized) {
      ++oversized;
      FUZZ_CHECK(r.size > max && r.bytes.empty(), "an oversized record within the limit");
      last_end = r.offset + r.size;  // then past the line's terminator, if any
      if (stream.substr(last_end, 2) == "\r\n") {
        last_end += 2;
      } else if (stream.substr(last_end, 1) == "\n") {
        last_end += 1;
      }
      continue;
    }
    ++records;
    FUZZ_CHECK(r.size == r.bytes.size() && r.size <= max, "record size disagrees");
    if (framing == Framing::lines) {
      FUZZ_CHECK(stream.substr(r.offset, r.size) == r.bytes, "record bytes are not the stream's");
      FUZZ_CHECK(stream.substr(r.offset + r.size, r.eol.size()) == r.eol,
                 "eol is not the stream's");
      FUZZ_CHECK(is_blank(stream.substr(last_end, r.offset - last_end)),
                 "skipped a non-blank line");
      last_end = r.offset + r.size + r.eol.size();
    } else {
      size_t taken = 0;
      FUZZ_CHECK(expected_paragraph(stream, r.offset, taken) == r.bytes, "paragraph bytes differ");
      last_end = r.offset + r.size;
    }
    // JSON records are framed by lines only (the pipeline refuses --paragraphs with jsonl):
    // a paragraph may hold a pretty-printed object whose splice spans several lines.
    if (framing != Framing::lines) continue;
    SelectStats st;
    if (sel.select(r.bytes, ms, st).ok()) {
      ++kept;
      check_splice(r.bytes, sel, again, ms, mix, out);
    } else {
      ++rejected;
    }
  }
  FUZZ_CHECK(reader.data_bytes() == stream.size(), "not every byte was read");
  if (framing == Framing::lines) {
    FUZZ_CHECK(records + oversized + reader.blank_lines() == reader.lines(),
               "records + oversized + blank lines != lines");
    FUZZ_CHECK(is_blank(stream.substr(std::min<uint64_t>(last_end, stream.size()))),
               "bytes after the last record were not read as a record");
  }
  if (framing != Framing::lines) return 0;
  FUZZ_CHECK(records == kept + rejected, "records in != kept + rejected");
  FUZZ_CHECK(count_records(out) == kept, "the spliced output frames into a different count");
  return 0;
}
