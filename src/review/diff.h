// Edits shown against their text: a field is cut into kept, removed and added pieces, and a
// record is drawn for a terminal either inline or as two columns (original, counterfactual),
// wrapped to a width. Without colour, edits are bracketed so they stay visible in a pager
// or a file: inline "[-her-]{+his+}", columns "[her]" and "[his]".
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

struct TerminalStyle {
  bool color = false;      // ANSI colours (red removed, green added)
  bool columns = false;    // two columns instead of inline
  size_t width = 100;      // total width in terminal cells (code points)
  bool show_rules = true;  // list every edit with its rule under the text
};

// Draws one record: a header line (input:line, action, guard and flags), each edited field
// and, with show_rules, one line per edit. Ends with a newline.
std::string render_terminal(const ReviewRecord& record, const TerminalStyle& style);

}  // namespace evenhand::review
