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

const char* kRed = "\x1b[31;9m";  // red, crossed out
const char* kGreen = "\x1b[32;1m";
const char* kBold = "\x1b[1m";
const char* kDim = "\x1b[2m";
const char* kReset = "\x1b[0m";

// One terminal cell: a code point (as UTF-8) and the style it is drawn in.
struct Cell {
  std::string_view ch;
  int style = 0;  // 0 plain, 1 removed, 2 added, 3 marker
};

// Cuts pieces into cells; without colour, brackets mark the edits.
void to_cells(const std::vector<Piece>& pieces, bool color, bool columns, bool left,
              std::vector<Cell>& out) {
  auto add_text = [&](std::string_view s, int style) {
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
  };
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

std::string render_terminal(const ReviewRecord& r, const TerminalStyle& style) {
  std::string out;
  if (style.color) out += kBold;
  out += r.input + ":" + std::to_string(r.line);
  if (style.color) out += kReset;
  if (!r.action.empty()) out += "  " + r.action + ", " + std::to_string(r.edits.size()) + " edits";
  if (!r.guard.empty())
    out += "  guarded (" + r.guard + ": '" + r.guard_phrase + "', " + r.guard_rule + ")";
  for (const auto& f : r.flags) out += "  flagged " + f.code + ": " + f.detail;
  if (!r.flag_outcome.empty()) out += " (" + r.flag_outcome + ")";
  out += '\n';
  size_t width = std::max<size_t>(style.width, 20);
  if (r.fields.empty() && !r.raw.empty()) {
    // A record without edits is shown as read, up to kRawShown bytes (cut at a character).
    const size_t kRawShown = 2000;
    size_t cut = std::min(r.raw.size(), kRawShown);
    while (cut < r.raw.size() && (static_cast<unsigned char>(r.raw[cut]) & 0xC0) == 0x80) --cut;
    std::vector<Cell> cells;
    to_cells({{Piece::same, std::string_view(r.raw).substr(0, cut), nullptr}}, false, false, true,
             cells);
    for (const auto& line : wrap(cells, width - 2)) {
      out += "  ";
      draw(line, false, 0, out);
      out += '\n';
    }
    if (cut < r.raw.size())
      out += "  ... (" + std::to_string(r.raw.size() - cut) + " more bytes)\n";
  }
  for (const auto& f : r.fields) {
    if (!f.pointer.empty()) {
      if (style.color) out += kDim;
      out += "  " + f.pointer;
      if (style.color) out += kReset;
      out += '\n';
    }
    auto pieces = diff_pieces(f.text, r.edits, f.pointer);
    if (!style.columns) {
      std::vector<Cell> cells;
      to_cells(pieces, style.color, false, true, cells);
      for (const auto& line : wrap(cells, width - 4)) {
        out += "    ";
        draw(line, style.color, 0, out);
        while (!out.empty() && out.back() == ' ') out.pop_back();
        out += '\n';
      }
    } else {
      size_t col = (width - 7) / 2;
      std::vector<Cell> left, right;
      to_cells(pieces, style.color, true, true, left);
      to_cells(pieces, style.color, true, false, right);
      auto l = wrap(left, col), rr = wrap(right, col);
      for (size_t i = 0; i < std::max(l.size(), rr.size()); ++i) {
        out += "    ";
        draw(i < l.size() ? l[i] : std::vector<Cell>{}, style.color, col, out);
        out += " | ";
        if (i < rr.size()) draw(rr[i], style.color, 0, out);
        while (!out.empty() && out.back() == ' ') out.pop_back();
        out += '\n';
      }
    }
  }
  if (style.show_rules) {
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
  return out;
}

}  // namespace evenhand::review
