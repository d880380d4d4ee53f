// Edits shown against their text: a field is cut into kept, removed and added pieces, shown
// whole or as windows of a few words around its edits (what a window leaves out is stated),
// and a record is drawn for a terminal inline or as two columns (original, counterfactual),
// wrapped to a width. Without colour, edits stay visible in a pager or a file: inline
// "«her→his»", columns "[her]" and "[his]". Windows never cut inside a UTF-8 code point.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "review/audit_log.h"

namespace evenhand::review {

struct Piece {
  enum Kind { same, removed, added } kind = same;
  std::string_view text;             // points into the field text or the edit
  const LoggedEdit* edit = nullptr;  // for removed and added pieces
};

// The pieces of `text` under the edits of `field` (those of `edits` whose field matches, in
// offset order): same, then removed + added for every edit. Edits must not overlap.
std::vector<Piece> diff_pieces(std::string_view text, const std::vector<LoggedEdit>& edits,
                               const std::string& field);

// The counterfactual text: `text` with the edits of `field` applied.
std::string apply_edits(std::string_view text, const std::vector<LoggedEdit>& edits,
                        const std::string& field);

// A stretch of one field around one or more of its edits, as review and report show it.
struct EditWindow {
  size_t begin = 0, end = 0;  // the bytes of the field shown: [begin, end)
  size_t cut_before = 0;      // bytes left out right before `begin` (since the previous window)
  size_t cut_after = 0;       // the last window: bytes left out after `end`; else 0
  std::vector<Piece> pieces;  // the pieces of diff_pieces() inside [begin, end)
  std::vector<const LoggedEdit*> edits;  // the edits inside, in offset order
};

// Words of context each side of an edit when none are asked for.
inline constexpr size_t kWindowWords = 8;
// Bytes a window may reach each side of an edit, per word of context (text without spaces).
inline constexpr size_t kWindowBytesPerWord = 16;

// The windows of `field` in `text`, in order: each edit (as diff_pieces() keeps them) with
// `words` words each side (white-space separated), stopping early after a clause mark
// (. ; : ! ? before white space) or at a line break, and within `words` * kWindowBytesPerWord
// bytes (then at a code point boundary). Windows whose gap holds at most `words` words (and
// bytes as above) are merged, and no cut is shorter than its statement would be (such gaps and ends
// of the field are shown). Empty when the field has no edit.
std::vector<EditWindow> edit_windows(std::string_view text, const std::vector<LoggedEdit>& edits,
                                     const std::string& field, size_t words);

// The one window of a whole field: every piece, nothing cut.
EditWindow whole_window(std::string_view text, const std::vector<LoggedEdit>& edits,
                        const std::string& field);

// How review and report state what a window leaves out: "⟨12 words, 80 bytes not shown⟩"
// for the bytes `left_out` (words are runs of non-white-space).
std::string cut_statement(std::string_view left_out);

struct TerminalStyle {
  bool color = false;                   // ANSI colours (red removed, green added)
  bool columns = false;                 // two columns instead of inline
  size_t width = 100;                   // total width in terminal cells (code points)
  bool show_rules = true;               // list every edit with its rule under the text
  bool whole = false;                   // whole fields instead of windows around the edits
  size_t context_words = kWindowWords;  // the windows' words each side of an edit
};

// Draws one record: a header line (input:line, action, guard and flags), each edited field
// (whole: a line with its JSON Pointer, then its text; else per window a line with the
// pointer and the logged byte offsets of its edits, then its text between the statements
// of what is cut) and, with show_rules, one line per edit. Ends with a newline.
std::string render_terminal(const ReviewRecord& record, const TerminalStyle& style);

}  // namespace evenhand::review
