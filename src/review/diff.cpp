#include "review/diff.h"

#include <algorithm>

#include <cstdio>

namespace evenhand::review {

namespace {

std::vector<const LoggedEdit*> edits_of(const std::vector<LoggedEdit>& edits,
                                        const std::string& field) {
  std::vector<const LoggedEdit*> out;
  for (const auto& e : edits)
    if (e.field == field) out.push_back(&e);
  std::stable_sort(out.begin(), out.end(),
                   [](const LoggedEdit* a, const LoggedEdit* b) { return a->at < b->at; });
  return out;
}

bool is_space(char c) {
  return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v';
}

bool ends_clause(char c) {
  return c == '.' || c == ';' || c == ':' || c == '!' || c == '?';
}

bool continuation(std::string_view t, size_t i) {
  return i < t.size() && (static_cast<unsigned char>(t[i]) & 0xC0) == 0x80;
}

// Where a window around an edit at `at` starts: the start of the edit's word, then up to
// `words` words more, not past a clause mark or a line break, within `cap` bytes.
size_t window_start(std::string_view t, size_t at, size_t words, size_t cap) {
  size_t i = at;
  while (i > 0 && !is_space(t[i - 1])) --i;
  for (size_t n = 0; n < words && i > 0; ++n) {
    size_t j = i;
    while (j > 0 && is_space(t[j - 1]) && t[j - 1] != '\n') --j;
    if (j == 0 || t[j - 1] == '\n' || ends_clause(t[j - 1])) break;
    while (j > 0 && !is_space(t[j - 1])) --j;
    i = j;
  }
  if (at - i > cap) {
    i = at - cap;
    while (i < at && continuation(t, i)) ++i;
  }
  return i;
}

// Where a window around an edit ending at `end` ends: the end of the edit's word, then up
// to `words` words more, up to and with a clause mark, not past a line break, within `cap`.
size_t window_end(std::string_view t, size_t end, size_t words, size_t cap) {
  size_t i = end;
  while (i < t.size() && !is_space(t[i])) ++i;
  for (size_t n = 0; n < words && i < t.size() && !(i > end && ends_clause(t[i - 1])); ++n) {
    size_t j = i;
    while (j < t.size() && is_space(t[j]) && t[j] != '\n') ++j;
    if (j == t.size() || t[j] == '\n') break;
    while (j < t.size() && !is_space(t[j])) ++j;
    i = j;
  }
  if (i - end > cap) {
    i = end + cap;
    while (i > end && continuation(t, i)) --i;
  }
  return i;
}

size_t word_count(std::string_view s) {
  size_t n = 0;
  for (size_t i = 0; i < s.size(); ++i)
    if (!is_space(s[i]) && (i == 0 || is_space(s[i - 1]))) ++n;
  return n;
}

// A gap between two windows is shown rather than cut when it is no larger than a window's
// side (a new window costs a line) or no longer than its statement.
bool not_worth_a_cut(std::string_view gap, size_t words) {
  if (word_count(gap) <= words && gap.size() <= words * kWindowBytesPerWord) return true;
  return gap.size() <= cut_statement(gap).size();
}

// The pieces of `all` (diff_pieces of `text`) inside [b, e); kept text is trimmed to it.
std::vector<Piece> slice(const std::vector<Piece>& all, std::string_view text, size_t b, size_t e) {
  std::vector<Piece> out;
  for (const Piece& p : all) {
    if (p.kind != Piece::same) {
      if (p.edit->at >= b && p.edit->at + p.edit->len <= e) out.push_back(p);
      continue;
    }
    size_t s = static_cast<size_t>(p.text.data() - text.data());
    size_t lo = std::max(s, b), hi = std::min(s + p.text.size(), e);
    if (lo < hi) out.push_back({Piece::same, text.substr(lo, hi - lo), nullptr});
  }
  return out;
}

const char* kRed = "\x1b[31;9m";  // red, crossed out
const char* kGreen = "\x1b[32;1m";
const char* kBold = "\x1b[1m";
const char* kDim = "\x1b[2m";
const char* kReset = "\x1b[0m";

// One terminal cell: a code point (as UTF-8) and the style it is drawn in.
struct Cell {
  std::string_view ch;
  int style = 0;  // 0 plain, 1 removed, 2 added, 3 marker, 4 cut statement
};

// Cuts `s` into cells of `style` (a code point each; tab and CR drawn as a space).
void add_cells(std::string_view s, int style, std::vector<Cell>& out) {
  size_t i = 0;
  while (i < s.size()) {
    size_t n = 1;
    unsigned char c = static_cast<unsigned char>(s[i]);
    if (c >= 0xF0)
      n = 4;
    else if (c >= 0xE0)
      n = 3;
    else if (c >= 0xC0)
      n = 2;
    n = std::min(n, s.size() - i);
    std::string_view ch = s.substr(i, n);
    if (ch == "\t" || ch == "\r") ch = " ";
    out.push_back({ch, style});
    i += n;
  }
}

// Cuts pieces into cells; without colour, brackets mark the edits.
void to_cells(const std::vector<Piece>& pieces, bool color, bool columns, bool left,
              std::vector<Cell>& out) {
  auto add_text = [&](std::string_view s, int style) { add_cells(s, style, out); };
  for (size_t i = 0; i < pieces.size(); ++i) {
    const Piece& p = pieces[i];
    if (p.kind == Piece::same) {
      add_text(p.text, 0);
      continue;
    }
    if (columns && (p.kind == Piece::removed) != left) continue;
    int style = p.kind == Piece::removed ? 1 : 2;
    if (color) {
      add_text(p.text, style);
    } else if (columns) {
      add_text("[", 3);
      add_text(p.text, style);
      add_text("]", 3);
    } else {
      // Inline: one mark per edit, the old text before the arrow and the new after it:
      // «old→new» (a pure insertion «→new», a pure removal «old→»).
      add_text("\u00ab", 3);
      if (p.kind == Piece::removed) add_text(p.text, 1);
      add_text("\u2192", 3);
      if (p.kind == Piece::added) {
        add_text(p.text, 2);
      } else if (i + 1 < pieces.size() && pieces[i + 1].kind == Piece::added) {
        add_text(pieces[++i].text, 2);
      }
      add_text("\u00bb", 3);
    }
  }
}

// Greedy wrapping at spaces (or hard, inside a word longer than a line); "\n" breaks.
std::vector<std::vector<Cell>> wrap(const std::vector<Cell>& cells, size_t width) {
  std::vector<std::vector<Cell>> lines(1);
  width = std::max<size_t>(width, 8);
  for (size_t i = 0; i < cells.size(); ++i) {
    if (cells[i].ch == "\n") {
      lines.emplace_back();
      continue;
    }
    auto& cur = lines.back();
    if (cur.size() < width) {
      cur.push_back(cells[i]);
      continue;
    }
    // Line full: break after its last space when there is one.
    size_t cut = cur.size();
    for (size_t k = cur.size(); k > 0; --k) {
      if (cur[k - 1].ch == " ") {
        cut = k;
        break;
      }
    }
    std::vector<Cell> carry(cur.begin() + static_cast<long>(cut), cur.end());
    cur.resize(cut);
    if (cells[i].ch == " " && carry.empty()) {
      lines.emplace_back();
      continue;
    }
    carry.push_back(cells[i]);
    lines.push_back(std::move(carry));
  }
  return lines;
}

void draw(const std::vector<Cell>& line, bool color, size_t pad_to, std::string& out) {
  int cur = 0;
  for (const auto& c : line) {
    if (color && c.style != cur) {
      out += kReset;
      if (c.style == 1) out += kRed;
      if (c.style == 2) out += kGreen;
      if (c.style == 4) out += kDim;
      cur = c.style;
    }
    out.append(c.ch);
  }
  if (color && cur) out += kReset;
  for (size_t n = line.size(); n < pad_to; ++n) out += ' ';
}

}  // namespace

std::vector<Piece> diff_pieces(std::string_view text, const std::vector<LoggedEdit>& edits,
                               const std::string& field) {
  std::vector<Piece> out;
  size_t pos = 0;
  for (const LoggedEdit* e : edits_of(edits, field)) {
    if (e->at < pos || e->at + e->len > text.size()) continue;  // overlapping or out of range
    if (e->at > pos) out.push_back({Piece::same, text.substr(pos, e->at - pos), nullptr});
    out.push_back({Piece::removed, text.substr(e->at, e->len), e});
    out.push_back({Piece::added, e->to, e});
    pos = e->at + e->len;
  }
  if (pos < text.size()) out.push_back({Piece::same, text.substr(pos), nullptr});
  return out;
}

std::string apply_edits(std::string_view text, const std::vector<LoggedEdit>& edits,
                        const std::string& field) {
  std::string out;
  for (const auto& p : diff_pieces(text, edits, field))
    if (p.kind != Piece::removed) out.append(p.text);
  return out;
}

std::vector<EditWindow> edit_windows(std::string_view text, const std::vector<LoggedEdit>& edits,
                                     const std::string& field, size_t words) {
  std::vector<Piece> all = diff_pieces(text, edits, field);
  size_t cap = kWindowBytesPerWord * std::max<size_t>(words, 1);
  std::vector<EditWindow> out;
  for (const Piece& p : all) {
    if (p.kind != Piece::removed) continue;
    const LoggedEdit* e = p.edit;
    size_t b = window_start(text, e->at, words, cap);
    size_t en = window_end(text, e->at + e->len, words, cap);
    if (!out.empty()) {
      EditWindow& last = out.back();
      if (b <= last.end || not_worth_a_cut(text.substr(last.end, b - last.end), words)) {
        last.begin = std::min(last.begin, b);
        last.end = std::max(last.end, en);
        last.edits.push_back(e);
        continue;
      }
    }
    out.push_back({b, en, 0, 0, {}, {e}});
  }
  if (out.empty()) return out;
  // A cut at either end of the field no longer than its statement is shown instead.
  std::string_view head = text.substr(0, out.front().begin);
  if (head.size() <= cut_statement(head).size()) out.front().begin = 0;
  std::string_view tail = text.substr(out.back().end);
  if (tail.size() <= cut_statement(tail).size()) out.back().end = text.size();
  size_t prev = 0;
  for (auto& w : out) {
    w.cut_before = w.begin - prev;
    prev = w.end;
    w.pieces = slice(all, text, w.begin, w.end);
  }
  out.back().cut_after = text.size() - out.back().end;
  return out;
}

EditWindow whole_window(std::string_view text, const std::vector<LoggedEdit>& edits,
                        const std::string& field) {
  EditWindow w;
  w.end = text.size();
  w.pieces = diff_pieces(text, edits, field);
  for (const Piece& p : w.pieces)
    if (p.kind == Piece::removed) w.edits.push_back(p.edit);
  return w;
}

std::string cut_statement(std::string_view left_out) {
  size_t words = word_count(left_out);
  return "\u27e8" + std::to_string(words) + (words == 1 ? " word, " : " words, ") +
         std::to_string(left_out.size()) + (left_out.size() == 1 ? " byte" : " bytes") +
         " not shown\u27e9";
}

namespace {

void header(const ReviewRecord& r, const TerminalStyle& style, std::string& out) {
  if (style.color) out += kBold;
  out += r.input + ":" + std::to_string(r.line);
  if (style.color) out += kReset;
  if (!r.action.empty()) out += "  " + r.action + ", " + std::to_string(r.edits.size()) + " edits";
  if (!r.guard.empty())
    out += "  guarded (" + r.guard + ": '" + r.guard_phrase + "', " + r.guard_rule + ")";
  for (const auto& f : r.flags) out += "  flagged " + f.code + ": " + f.detail;
  if (!r.flag_outcome.empty()) out += " (" + r.flag_outcome + ")";
  out += '\n';
}

// A record without edits is shown as read, up to kRawShown bytes (cut at a character).
void raw_record(const std::string& raw, size_t width, std::string& out) {
  const size_t kRawShown = 2000;
  size_t cut = std::min(raw.size(), kRawShown);
  while (cut < raw.size() && (static_cast<unsigned char>(raw[cut]) & 0xC0) == 0x80) --cut;
  std::vector<Cell> cells;
  to_cells({{Piece::same, std::string_view(raw).substr(0, cut), nullptr}}, false, false, true,
           cells);
  for (const auto& line : wrap(cells, width - 2)) {
    out += "  ";
    draw(line, false, 0, out);
    out += '\n';
  }
  if (cut < raw.size()) out += "  ... (" + std::to_string(raw.size() - cut) + " more bytes)\n";
}

// The line above a window: the field's pointer and, for a window, its edits' offsets.
void window_label(const std::string& pointer, const EditWindow* w, const TerminalStyle& style,
                  std::string& out) {
  std::string label = pointer;
  if (w)
    for (const LoggedEdit* e : w->edits)
      label += (label.empty() ? "@" : " @") + std::to_string(e->at);
  if (label.empty()) return;
  if (style.color) out += kDim;
  out += "  " + label;
  if (style.color) out += kReset;
  out += '\n';
}

// One side of a window as cells: the statement of the cut before, the pieces, the cut after
// (the statements are kept in `notes`, which the cells point into).
std::vector<Cell> window_cells(std::string_view text, const EditWindow& w,
                               const TerminalStyle& style, bool left, std::string notes[2]) {
  std::vector<Cell> cells;
  if (w.cut_before) {
    notes[0] = cut_statement(text.substr(w.begin - w.cut_before, w.cut_before));
    add_cells(notes[0], 4, cells);
    add_cells(" ", 0, cells);
  }
  to_cells(w.pieces, style.color, style.columns, left, cells);
  if (w.cut_after) {
    notes[1] = cut_statement(text.substr(w.end, w.cut_after));
    add_cells(" ", 0, cells);
    add_cells(notes[1], 4, cells);
  }
  return cells;
}

void draw_window(std::string_view text, const EditWindow& w, const TerminalStyle& style,
                 std::string& out) {
  size_t width = std::max<size_t>(style.width, 20);
  std::string notes[2];
  auto trim = [&] {
    while (!out.empty() && out.back() == ' ') out.pop_back();
    out += '\n';
  };
  if (!style.columns) {
    for (const auto& line : wrap(window_cells(text, w, style, true, notes), width - 4)) {
      out += "    ";
      draw(line, style.color, 0, out);
      trim();
    }
    return;
  }
  size_t col = (width - 7) / 2;
  std::string right_notes[2];  // the cells point into the notes: one pair per side
  auto l = wrap(window_cells(text, w, style, true, notes), col);
  auto rr = wrap(window_cells(text, w, style, false, right_notes), col);
  for (size_t i = 0; i < std::max(l.size(), rr.size()); ++i) {
    out += "    ";
    draw(i < l.size() ? l[i] : std::vector<Cell>{}, style.color, col, out);
    out += " | ";
    if (i < rr.size()) draw(rr[i], style.color, 0, out);
    trim();
  }
}

void rule_lines(const ReviewRecord& r, std::string& out) {
  for (const auto& e : r.edits) {
    out += "      ";
    if (!e.field.empty() && r.fields.size() > 1) out += e.field + " ";
    out += "@" + std::to_string(e.at) + " '" + e.from + "' -> '" + e.to + "'  " + e.why;
    if (!e.rule.empty()) out += " " + e.rule;
    if (e.score) {
      char buf[32];
      std::snprintf(buf, sizeof buf, " score %.3g", *e.score);
      out += buf;
    }
    if (!e.note.empty()) out += " (" + e.note + ")";
    out += '\n';
  }
}

}  // namespace

std::string render_terminal(const ReviewRecord& r, const TerminalStyle& style) {
  std::string out;
  header(r, style, out);
  if (r.fields.empty() && !r.raw.empty()) raw_record(r.raw, std::max<size_t>(style.width, 20), out);
  for (const auto& f : r.fields) {
    std::vector<EditWindow> windows;
    if (!style.whole) windows = edit_windows(f.text, r.edits, f.pointer, style.context_words);
    if (windows.empty()) {
      window_label(f.pointer, nullptr, style, out);
      draw_window(f.text, whole_window(f.text, r.edits, f.pointer), style, out);
    }
    for (const auto& w : windows) {
      window_label(f.pointer, &w, style, out);
      draw_window(f.text, w, style, out);
    }
  }
  if (style.show_rules) rule_lines(r, out);
  return out;
}

}  // namespace evenhand::review
