#include "review/html_report.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <optional>

#include "audit/manifest.h"
#include "review/diff.h"

namespace evenhand::review {

const std::vector<std::string>& report_cautions() {
  // Kept word for word equal to the README's "Cautions" (tests/review checks it).
  static const std::vector<std::string> k = {
      "Augmentation does not prove a model fair. It changes how often words co-occur in the "
      "training data; it does not measure or guarantee anything about the trained model. "
      "Evaluate the model itself.",
      "Swapping can produce wrong or offensive text where sex matters: medical (pregnancy, "
      "prostate or ovarian conditions), legal, biographical or historical records. The English "
      "pack ships context guards that block such records, but no list is complete. Review.",
      "Binary word lists erase people. A female/male pack says nothing about non-binary people "
      "and can misgender real, named people. Prefer rewriting toward neutral forms where the "
      "language allows it, and do not rewrite text about identifiable individuals without need.",
      "Review a sample of the output before training: the audit log (`--edits`) lists every "
      "edit with the rule that made it.",
      "Whether a given use of training data, or this kind of rewriting, meets a legal "
      "obligation is a question for local law and qualified counsel, not for this tool.",
  };
  return k;
}

namespace {

std::string esc(std::string_view s) {
  std::string out;
  out.reserve(s.size());
  for (char c : s) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

// `code` spans of a caution become <code>.
std::string with_code(std::string_view s) {
  std::string out;
  bool open = false;
  for (char c : s) {
    if (c == '`') {
      out += open ? "</code>" : "<code>";
      open = !open;
    } else {
      out += esc(std::string_view(&c, 1));
    }
  }
  if (open) out += "</code>";
  return out;
}

std::string num(double v, int digits = 0) {
  char buf[64];
  if (digits == 0 && std::fabs(v - std::round(v)) < 1e-9) {
    // thousands separated by a narrow no-break space (U+202F): a number never wraps
    std::snprintf(buf, sizeof buf, "%.0f", v);
    std::string s = buf, out;
    size_t start = s[0] == '-' ? 1 : 0;
    for (size_t i = 0; i < s.size(); ++i) {
      out += s[i];
      size_t left = s.size() - i - 1;
      if (i >= start && left > 0 && left % 3 == 0) out += "\u202F";
    }
    return out;
  }
  std::snprintf(buf, sizeof buf, "%.*f", digits ? digits : 2, v);
  return buf;
}

std::string fmt(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f", v);
  return buf;
}

// A tick step of 1, 2 or 5 times a power of ten giving about `n` ticks up to `max`.
double nice_step(double max, int n) {
  if (max <= 0) return 1;
  double raw = max / n;
  double p = std::pow(10, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0})
    if (raw <= m * p) return m * p;
  return 10 * p;
}

const char* kGroupColors[] = {"#0f766e", "#c2410c", "#6d28d9", "#a16207", "#be123c", "#1d4ed8"};

const char* group_color(size_t g) {
  return kGroupColors[g % (sizeof kGroupColors / sizeof kGroupColors[0])];
}

struct Series {
  std::string name;
  std::vector<double> values;  // per category; NaN: no bar
  std::string style;           // "before", "planned", "after"
};

// The legend of a chart whose bars are coloured by category and styled by series: per
// series one swatch per category colour, drawn in the series' style, then its name.
std::string legend(const std::vector<Series>& series, size_t categories, double x, double y) {
  std::string s;
  size_t n = std::max<size_t>(categories, 1);
  for (const auto& se : series) {
    for (size_t c = 0; c < n; ++c) {
      s += "<rect class=\"bar swatch " + se.style + "\" x=\"" + fmt(x + 7.0 * c) + "\" y=\"" +
           fmt(y) + "\" width=\"6\" height=\"10\" fill=\"" + group_color(c) + "\" stroke=\"" +
           group_color(c) + "\"/>";
    }
    x += 7.0 * n + 3;
    s += "<text class=\"tick\" x=\"" + fmt(x) + "\" y=\"" + fmt(y + 9) + "\">" + esc(se.name) +
         "</text>";
    x += 14 + 7.0 * se.name.size();
  }
  return s;
}

// Grouped vertical bars: one cluster per category (coloured by category), one bar per
// series (before light, planned outlined, after solid).
std::string grouped_bars(const std::string& id, const std::string& title,
                         const std::vector<std::string>& categories,
                         const std::vector<Series>& series) {
  double max = 0;
  for (const auto& s : series)
    for (double v : s.values)
      if (v == v) max = std::max(max, v);
  double step = nice_step(max, 4);
  double top = std::max(step, std::ceil(max / step) * step);
  const double W = 460, H = 250, L = 56, R = 12, T = 34, B = 44;
  double plot_w = W - L - R, plot_h = H - T - B;
  std::string s;
  s += "<svg id=\"" + id + "\" class=\"chart\" viewBox=\"0 0 " + fmt(W) + " " + fmt(H) +
       "\" role=\"img\" aria-label=\"" + esc(title) + "\" xmlns=\"http://www.w3.org/2000/svg\">";
  s += "<title>" + esc(title) + "</title>";
  s += "<text class=\"ct\" x=\"" + fmt(L) + "\" y=\"18\">" + esc(title) + "</text>";
  for (double v = 0; v <= top + 1e-9; v += step) {
    double y = T + plot_h - v / top * plot_h;
    s += "<line class=\"grid\" x1=\"" + fmt(L) + "\" x2=\"" + fmt(W - R) + "\" y1=\"" + fmt(y) +
         "\" y2=\"" + fmt(y) + "\"/>";
    s += "<text class=\"tick\" x=\"" + fmt(L - 6) + "\" y=\"" + fmt(y + 4) +
         "\" text-anchor=\"end\">" + num(v) + "</text>";
  }
  size_t nc = std::max<size_t>(categories.size(), 1), ns = std::max<size_t>(series.size(), 1);
  double cw = plot_w / nc;
  double bw = std::min(34.0, cw * 0.8 / ns);
  for (size_t c = 0; c < categories.size(); ++c) {
    double x0 = L + c * cw + (cw - bw * ns) / 2;
    for (size_t k = 0; k < series.size(); ++k) {
      double v = c < series[k].values.size() ? series[k].values[c] : NAN;
      if (v != v) continue;
      double h = top > 0 ? v / top * plot_h : 0;
      double x = x0 + k * bw, y = T + plot_h - h;
      s += "<rect class=\"bar " + series[k].style + "\" data-series=\"" + esc(series[k].name) +
           "\" x=\"" + fmt(x + 1) + "\" y=\"" + fmt(y) + "\" width=\"" + fmt(bw - 2) +
           "\" height=\"" + fmt(h) + "\" fill=\"" + group_color(c) + "\" stroke=\"" +
           group_color(c) + "\"><title>" + esc(categories[c]) + ", " + esc(series[k].name) + ": " +
           num(v, v == std::round(v) ? 0 : 1) + "</title></rect>";
      s += "<text class=\"val\" x=\"" + fmt(x + bw / 2) + "\" y=\"" + fmt(y - 3) +
           "\" text-anchor=\"middle\">" + num(std::round(v)) + "</text>";
    }
    s += "<text class=\"cat\" x=\"" + fmt(L + c * cw + cw / 2) + "\" y=\"" + fmt(H - B + 18) +
         "\" text-anchor=\"middle\">" + esc(categories[c]) + "</text>";
  }
  s += legend(series, categories.size(), L, H - 14);
  s += "</svg>";
  return s;
}

struct HRow {
  std::string label, note;
  double value = 0;
};

// `s` cut to at most `n` code points, with an ellipsis when cut.
std::string clip(const std::string& s, size_t n) {
  size_t cps = 0;
  for (size_t i = 0; i < s.size(); ++i) {
    if ((static_cast<unsigned char>(s[i]) & 0xC0) == 0x80) continue;
    if (++cps > n) return s.substr(0, i) + "\u2026";
  }
  return s;
}

// Horizontal bars, one row each, longest first as given.
std::string hbars(const std::string& id, const std::string& title, const std::vector<HRow>& rows,
                  const std::string& color, const std::string& empty_note) {
  const double W = 940, L = 330, R = 70, row_h = 22, T = 30;
  double H = T + std::max<size_t>(rows.size(), 1) * row_h + 10;
  double max = 0;
  for (const auto& r : rows) max = std::max(max, r.value);
  std::string s;
  s += "<svg id=\"" + id + "\" class=\"chart wide\" viewBox=\"0 0 " + fmt(W) + " " + fmt(H) +
       "\" role=\"img\" aria-label=\"" + esc(title) + "\" xmlns=\"http://www.w3.org/2000/svg\">";
  s += "<title>" + esc(title) + "</title>";
  s += "<text class=\"ct\" x=\"0\" y=\"18\">" + esc(title) + "</text>";
  if (rows.empty()) {
    s += "<text class=\"empty\" x=\"" + fmt(L) + "\" y=\"" + fmt(T + 15) + "\">" + esc(empty_note) +
         "</text>";
  }
  for (size_t i = 0; i < rows.size(); ++i) {
    double y = T + i * row_h;
    double w = max > 0 ? rows[i].value / max * (W - L - R) : 0;
    s += "<text class=\"cat\" x=\"" + fmt(L - 8) + "\" y=\"" + fmt(y + 15) +
         "\" text-anchor=\"end\">" + esc(clip(rows[i].label, 36));
    if (!rows[i].note.empty()) s += " <tspan class=\"note\">" + esc(rows[i].note) + "</tspan>";
    s += "</text>";
    s += "<rect class=\"bar after\" x=\"" + fmt(L) + "\" y=\"" + fmt(y + 3) + "\" width=\"" +
         fmt(std::max(w, 1.0)) + "\" height=\"" + fmt(row_h - 7) + "\" fill=\"" + color +
         "\"><title>" + esc(rows[i].label) + ": " + num(rows[i].value) + "</title></rect>";
    s += "<text class=\"val\" x=\"" + fmt(L + w + 6) + "\" y=\"" + fmt(y + 15) + "\">" +
         num(rows[i].value) + "</text>";
  }
  s += "</svg>";
  return s;
}

const PairResult* pair_of(const TargetResult& t, uint16_t a, uint16_t b) {
  for (const auto& p : t.pairs)
    if (p.a == a && p.b == b) return &p;
  return nullptr;
}

std::string pval(const PairResult* p) {
  if (p && p->too_few) return "too few";
  if (!p || !p->p) return "&ndash;";
  char buf[32];
  std::snprintf(buf, sizeof buf, *p->p < 0.001 ? "%.1e" : "%.3f", *p->p);
  return buf;
}

std::string zval(const PairResult* p) {
  if (!p) return "&ndash;";
  char buf[32];
  std::snprintf(buf, sizeof buf, "%+.2f", p->stat.z);
  return buf;
}

// Diverging bars of z, before (light) next to after (solid), sorted by |z| before.
std::string association_chart(const AssociationReport& a, const std::vector<size_t>& order,
                              uint16_t ga, uint16_t gb) {
  const CorpusAssociations& before = a.corpora[0];
  const CorpusAssociations* after = a.corpora.size() > 1 ? &a.corpora[1] : nullptr;
  const double W = 940, L = 150, R = 20, row_h = 26, T = 52;
  double H = T + std::max<size_t>(order.size(), 1) * row_h + 26;
  double max = 2;
  for (size_t t : order)
    for (const auto* c : {&before, after})
      if (c)
        if (const auto* p = pair_of(c->targets[t], ga, gb))
          max = std::max(max, std::fabs(p->stat.z));
  max = std::ceil(max);
  double mid = L + (W - L - R) / 2, half = (W - L - R) / 2;
  auto xz = [&](double z) { return mid + z / max * half; };
  std::string title = "Skew of target words: z of " + a.groups[ga] + " vs " + a.groups[gb];
  std::string s;
  s += "<svg id=\"chart-associations\" class=\"chart wide\" viewBox=\"0 0 " + fmt(W) + " " +
       fmt(H) + "\" role=\"img\" aria-label=\"" + esc(title) +
       "\" xmlns=\"http://www.w3.org/2000/svg\"><title>" + esc(title) + "</title>";
  s += "<text class=\"ct\" x=\"0\" y=\"18\">" + esc(title) + "</text>";
  s += "<text class=\"tick\" x=\"" + fmt(mid - 8) + "\" y=\"40\" text-anchor=\"end\">&#8592; " +
       esc(a.groups[gb]) + "</text>";
  s += "<text class=\"tick\" x=\"" + fmt(mid + 8) + "\" y=\"40\">" + esc(a.groups[ga]) +
       " &#8594;</text>";
  for (double z : {-1.96, 1.96}) {
    if (std::fabs(z) > max) continue;
    s += "<line class=\"sig\" x1=\"" + fmt(xz(z)) + "\" x2=\"" + fmt(xz(z)) + "\" y1=\"" +
         fmt(T - 4) + "\" y2=\"" + fmt(H - 22) + "\"/>";
  }
  for (size_t i = 0; i < order.size(); ++i) {
    size_t t = order[i];
    double y = T + i * row_h;
    s += "<text class=\"cat\" x=\"" + fmt(L - 10) + "\" y=\"" + fmt(y + 16) +
         "\" text-anchor=\"end\">" + esc(a.targets.labels[t]) + "</text>";
    int k = 0;
    for (const auto* c : {&before, after}) {
      if (!c) continue;
      const auto* p = pair_of(c->targets[t], ga, gb);
      double z = p ? p->stat.z : 0;
      double x0 = std::min(xz(0), xz(z)), w = std::fabs(xz(z) - xz(0));
      s += std::string("<rect class=\"bar ") + (k == 0 ? "before" : "after") + "\" data-target=\"" +
           esc(a.targets.labels[t]) + "\" x=\"" + fmt(x0) + "\" y=\"" + fmt(y + 3 + k * 10) +
           "\" width=\"" + fmt(std::max(w, 0.8)) + "\" height=\"9\" fill=\"" +
           group_color(z >= 0 ? ga : gb) + "\" stroke=\"" + group_color(z >= 0 ? ga : gb) +
           "\"><title>" + esc(a.targets.labels[t]) + " " + c->label + ": z " + zval(p) + ", p " +
           pval(p) + "</title></rect>";
      ++k;
    }
  }
  s += "<line class=\"axis\" x1=\"" + fmt(mid) + "\" x2=\"" + fmt(mid) + "\" y1=\"" + fmt(T - 4) +
       "\" y2=\"" + fmt(H - 22) + "\"/>";
  for (double z = -max; z <= max + 1e-9; z += nice_step(max, 3)) {
    s += "<text class=\"tick\" x=\"" + fmt(xz(z)) + "\" y=\"" + fmt(H - 6) +
         "\" text-anchor=\"middle\">" + num(z, 0) + "</text>";
  }
  s += "</svg>";
  return s;
}

// Shares of a balance run's target groups in its basis: what the target asked, what the
// input had, what the plan expected and what was written (from the groups' counts).
struct ShareRow {
  std::string group;
  size_t color = 0;  // the group's index in the manifest, as in the other charts
  double target = 0, before = 0, after = 0;
  std::optional<double> expected;
};

std::vector<ShareRow> share_rows(const ManifestView& m) {
  const BalanceView& b = *m.balance;
  bool mentions = b.basis == "mentions";
  double weights = 0, before = 0, after = 0;
  std::vector<ShareRow> rows;
  for (const auto& [group, weight] : b.target) {
    ShareRow r{group, 0, weight, 0, 0, std::nullopt};
    for (size_t g = 0; g < m.groups.size(); ++g) {
      if (m.groups[g].name != group) continue;
      const GroupRow& gr = m.groups[g];
      r.color = g;
      r.before = double(mentions ? gr.before_mentions : gr.before_records);
      r.after = double(mentions ? gr.after_mentions : gr.after_records);
    }
    for (const auto& [eg, share] : b.expected_share)
      if (eg == group) r.expected = share;
    weights += weight;
    before += r.before;
    after += r.after;
    rows.push_back(std::move(r));
  }
  for (auto& r : rows) {
    r.target = weights > 0 ? r.target / weights : 0;
    r.before = before > 0 ? r.before / before : 0;
    r.after = after > 0 ? r.after / after : 0;
  }
  return rows;
}

bool within(const ShareRow& r, double tolerance) {
  return std::fabs(r.after - r.target) <= tolerance + 1e-12;
}

std::string pct(double share) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f%%", 100 * share);
  return buf;
}

// Per target group three bars of its share: before (light), the target (outlined, inside a
// band of +-tolerance) and after (solid), on one 0-100% scale.
std::string balance_chart(const std::vector<ShareRow>& rows, double tolerance) {
  const double W = 940, L = 150, R = 70, bar_h = 14, T = 34, gap = 12;
  const double block = 3 * bar_h + gap, plot = W - L - R;
  double H = T + std::max<size_t>(rows.size(), 1) * block + 24;
  auto xs = [&](double share) { return L + std::clamp(share, 0.0, 1.0) * plot; };
  std::string title = "Share of each target group: before, target and after";
  std::string s = "<svg id=\"chart-balance\" class=\"chart wide\" viewBox=\"0 0 " + fmt(W) + " " +
                  fmt(H) + "\" role=\"img\" aria-label=\"" + esc(title) +
                  "\" xmlns=\"http://www.w3.org/2000/svg\"><title>" + esc(title) + "</title>";
  s += "<text class=\"ct\" x=\"0\" y=\"18\">" + esc(title) + "</text>";
  for (double t = 0; t <= 1.0001; t += 0.25) {
    s += "<line class=\"grid\" x1=\"" + fmt(xs(t)) + "\" x2=\"" + fmt(xs(t)) + "\" y1=\"" +
         fmt(T - 6) + "\" y2=\"" + fmt(H - 20) + "\"/><text class=\"tick\" x=\"" + fmt(xs(t)) +
         "\" y=\"" + fmt(H - 6) + "\" text-anchor=\"middle\">" + pct(t) + "</text>";
  }
  for (size_t i = 0; i < rows.size(); ++i) {
    const ShareRow& r = rows[i];
    const char* color = group_color(r.color);
    double y = T + i * block;
    s += "<rect class=\"band\" x=\"" + fmt(xs(r.target - tolerance)) + "\" y=\"" + fmt(y - 2) +
         "\" width=\"" + fmt(xs(r.target + tolerance) - xs(r.target - tolerance)) + "\" height=\"" +
         fmt(3 * bar_h + 4) + "\"><title>target " + pct(r.target) + " \u00b1 " +
         fmt(100 * tolerance) + " points</title></rect>";
    s += "<text class=\"cat\" x=\"" + fmt(L - 10) + "\" y=\"" + fmt(y + 1.5 * bar_h + 4) +
         "\" text-anchor=\"end\">" + esc(r.group) + "</text>";
    const std::pair<const char*, double> bars[] = {
        {"before", r.before}, {"planned", r.target}, {"after", r.after}};
    for (size_t k = 0; k < 3; ++k) {
      const char* name = k == 1 ? "target" : bars[k].first;
      double by = y + k * bar_h;
      s += std::string("<rect class=\"bar ") + bars[k].first + "\" data-series=\"" + name +
           "\" data-group=\"" + esc(r.group) + "\" x=\"" + fmt(L) + "\" y=\"" + fmt(by + 1) +
           "\" width=\"" + fmt(std::max(xs(bars[k].second) - L, 1.0)) + "\" height=\"" +
           fmt(bar_h - 2) + "\" fill=\"" + color + "\" stroke=\"" + color + "\"><title>" +
           esc(r.group) + ", " + name + ": " + pct(bars[k].second) + "</title></rect>";
      s += "<text class=\"val\" x=\"" + fmt(xs(bars[k].second) + 5) + "\" y=\"" +
           fmt(by + bar_h - 3) + "\">" + name + " " + pct(bars[k].second) + "</text>";
    }
  }
  return s + "</svg>";
}

// The balance section: the target, tolerance and basis, the shares reached, and what the
// plan changed against the fewest changes any plan could make.
std::string balance_section(const ManifestView& m) {
  const BalanceView& b = *m.balance;
  std::vector<ShareRow> rows = share_rows(m);
  bool reached = std::all_of(rows.begin(), rows.end(),
                             [&](const ShareRow& r) { return within(r, b.tolerance); });
  std::string h = "<section id=\"balance\"><h2>Balance<small>basis " + esc(b.basis) +
                  ", tolerance \u00b1" + fmt(100 * b.tolerance) +
                  " points</small></h2><p class=\"lead\" id=\"balance-verdict\">";
  h += reached ? "<b class=\"ok\">Target reached:</b> every target group's share of the written "
                 "corpus is within the tolerance."
               : "<b class=\"bad\">Target missed:</b> a share of the written corpus is outside "
                 "the tolerance (marked below).";
  h += " Shares are of " + esc(b.basis) +
       " among the target's groups, counted before (the input) and after (what was written).</p>";
  h += balance_chart(rows, b.tolerance);
  h += "<table id=\"table-balance\"><tr><th>group</th><th class=\"n\">target</th><th "
       "class=\"n\">before</th><th class=\"n\">planned</th><th class=\"n\">after</th><th "
       "class=\"n\">after &minus; target</th></tr>";
  for (const auto& r : rows) {
    h += "<tr><td>" + esc(r.group) + "</td><td class=\"n\">" + pct(r.target) +
         "</td><td class=\"n\">" + pct(r.before) + "</td><td class=\"n\">" +
         (r.expected ? pct(*r.expected) : "&ndash;") + "</td><td class=\"n\">" + pct(r.after) +
         "</td><td class=\"n" + (within(r, b.tolerance) ? "" : " bad") + "\">" +
         fmt(100 * (r.after - r.target)) + " points</td></tr>";
  }
  h += "</table><p id=\"balance-plan\">The plan changes " + num(double(b.planned_changed)) +
       " records; no plan can reach the target with fewer than " + num(double(b.lower_bound)) +
       ". ";
  h += b.minimal ? "<b class=\"ok\">Proved minimal.</b>"
                 : "<b class=\"bad\">Not proved minimal</b> (the exact search stopped or found "
                   "nothing better; the gap is at most " +
                       num(double(b.planned_changed - std::min(b.planned_changed, b.lower_bound))) +
                       " records).";
  h += " Written:";
  for (size_t i = 0; i < b.actions.size(); ++i)
    h += std::string(i ? "," : "") + " " + esc(b.actions[i].first) + " " +
         num(double(b.actions[i].second));
  h += ". The plan aimed within \u00b1" + fmt(100 * b.planned_tolerance) +
       " points; per-record decisions match it in expectation.";
  if (!b.plan.empty()) h += " Plan: " + esc(b.plan) + ".";
  return h + "</p></section>\n";
}

// The "look here first" list: what a reviewer should read before the rest (thresholds in
// html_report.h and the README).
std::string look_first_section(const ManifestView& m) {
  std::vector<std::string> items;
  auto item = [&](const char* kind, const std::string& text) {
    items.push_back("<li data-kind=\"" + std::string(kind) + "\">" + text + "</li>");
  };
  if (m.balance) {
    for (const auto& r : share_rows(m))
      if (!within(r, m.balance->tolerance))
        item("balance", "<b>" + esc(r.group) + "</b> is " + pct(r.after) + " of " +
                            esc(m.balance->basis) + " after the run, target " + pct(r.target) +
                            " \u00b1 " + fmt(100 * m.balance->tolerance) + " points.");
  }
  std::vector<HitRow> hits = m.entry_hits;
  std::stable_sort(hits.begin(), hits.end(),
                   [](const HitRow& a, const HitRow& b) { return a.hits > b.hits; });
  for (const auto& e : hits)
    if (e.hits >= kLookEntryHits && m.edits > 0 && double(e.hits) / m.edits >= kLookEntryShare)
      item("entry", "<b>" + esc(e.forms) + "</b> <span class=\"ptr\">" + esc(e.rule) +
                        "</span> made " + num(double(e.hits)) + " edits, " +
                        pct(double(e.hits) / m.edits) +
                        " of all: one entry drives much of the run; read some of its edits.");
  size_t words = 0;
  std::string names;
  for (const auto& e : hits) {
    if (!e.common_word || e.hits == 0 || ++words > kLookWordNames) continue;
    names += (words > 1 ? ", <b>" : "<b>") + esc(e.forms) + "</b> " + num(double(e.hits));
  }
  if (words > kLookWordNames) names += " and " + std::to_string(words - kLookWordNames) + " more";
  if (words)
    item("word-name",
         "Name pairs swapped of which one name is also a common English word (<code>~word</code> "
         "in the pack: Mary|John for \u201cjohn\u201d): " +
             names + ". Check that they named persons.");
  auto reasons = [](const std::vector<std::pair<std::string, uint64_t>>& by) {
    std::string s;
    for (size_t i = 0; i < by.size(); ++i)
      s += (i ? ", " : " (") + esc(by[i].first) + " " + num(double(by[i].second)) +
           (i + 1 == by.size() ? ")" : "");
    return s;
  };
  if (uint64_t g = m.record_count("guarded"))
    item("guarded", "<b>Guarded records: " + num(double(g)) + "</b>" +
                        reasons(m.guarded_by_reason) +
                        ", left as they were: see Guarded records below.");
  if (uint64_t f = m.record_count("flagged"))
    item("flagged", "<b>Flagged records: " + num(double(f)) + "</b>" +
                        reasons(m.flagged_by_reason) +
                        ": agreement the engine could not settle; see Agreement cases below.");
  std::string h = "<section id=\"look-first\"><h2>Look here first</h2>";
  if (items.empty()) return h + "<p class=\"muted\">Nothing stands out.</p></section>\n";
  h += "<ul class=\"look\">";
  for (const auto& i : items) h += i;
  return h + "</ul></section>\n";
}

// The header rows of the association table: with an after corpus, a row naming the two
// column groups above the columns, and every column label saying which corpus it is.
std::string association_head(const AssociationReport& a, bool after) {
  std::string h;
  if (after)
    h += "<tr><th colspan=\"2\"></th><th class=\"colgroup\" colspan=\"4\">before (the input "
         "corpus)</th><th class=\"colgroup\" colspan=\"4\">after (the written corpus)</th></tr>";
  h += "<tr><th>target</th><th class=\"n\">occurs</th>";
  for (const char* when : {"before", "after"}) {
    if (std::string(when) == "after" && !after) break;
    for (size_t g = 0; g < 2; ++g)
      h += "<th class=\"n\">with " + esc(a.groups[g]) + " " + when + "</th>";
    h += std::string("<th class=\"n\">z ") + when + "</th><th class=\"n\">p " + when + "</th>";
  }
  return h + "</tr>";
}

// A field as review shows it by default: per window around its edits, a line with the
// pointer and the edits' logged offsets, then the text between the statements of the cuts.
std::string field_html(const ReviewRecord& r, const FieldText& f) {
  std::string s;
  auto cut = [&](size_t at, size_t n) {
    return "<span class=\"cut\">" + esc(cut_statement(std::string_view(f.text).substr(at, n))) +
           "</span>";
  };
  for (const auto& w : edit_windows(f.text, r.edits, f.pointer, kWindowWords)) {
    std::string label = f.pointer;
    for (const LoggedEdit* e : w.edits)
      label += (label.empty() ? "@" : " @") + std::to_string(e->at);
    s += "<div class=\"ptr\">" + esc(label) + "</div><div class=\"text\">";
    if (w.cut_before) s += cut(w.begin - w.cut_before, w.cut_before) + " ";
    for (const auto& p : w.pieces) {
      if (p.kind == Piece::same) {
        s += esc(p.text);
      } else if (p.kind == Piece::removed) {
        s += "<del title=\"" + esc(p.edit->why + " " + p.edit->rule) + "\">" + esc(p.text) +
             "</del>";
      } else {
        s += "<ins title=\"" + esc(p.edit->why + " " + p.edit->rule) + "\">" + esc(p.text) +
             "</ins>";
      }
    }
    if (w.cut_after) s += " " + cut(w.end, w.cut_after);
    s += "</div>";
  }
  return s;
}

const char* kStyle = R"CSS(
:root{--ink:#1c1917;--muted:#57534e;--line:#e7e5e4;--paper:#fafaf9;--card:#fff;--accent:#0f766e}
*{box-sizing:border-box}
body{margin:0;background:var(--paper);color:var(--ink);font:15px/1.5 system-ui,-apple-system,"Segoe UI",Roboto,"DejaVu Sans",sans-serif}
header{background:#1c1917;color:#fafaf9;padding:28px 40px 22px}
header h1{margin:0;font-size:26px;font-weight:650;letter-spacing:.2px}
header p{margin:6px 0 0;color:#d6d3d1;font-size:14px}
header code{color:#fafaf9}
main{max-width:1040px;margin:0 auto;padding:8px 28px 60px}
section{background:var(--card);border:1px solid var(--line);border-radius:10px;padding:18px 22px;margin:20px 0}
h2{font-size:18px;margin:0 0 10px;font-weight:650}
h2 small{font-weight:400;color:var(--muted);font-size:13px;margin-left:8px}
p.lead{color:var(--muted);margin:0 0 12px;font-size:14px}
.tiles{display:grid;grid-template-columns:repeat(auto-fill,minmax(140px,1fr));gap:10px}
.tile{border:1px solid var(--line);border-radius:8px;padding:10px 12px}
.tile b{display:block;font-size:22px;font-weight:650}
.tile span{color:var(--muted);font-size:13px}
.tile.warn b{color:#b45309}
.charts{display:grid;grid-template-columns:1fr 1fr;gap:14px}
svg.chart{width:100%;height:auto;display:block}
svg text{font-family:inherit;fill:var(--ink)}
svg .ct{font-size:14px;font-weight:600}
svg .tick{font-size:11px;fill:var(--muted)}
svg .val{font-size:11px;fill:var(--muted)}
svg .cat{font-size:12.5px}
svg .note{fill:var(--muted);font-size:11px}
svg .empty{font-size:13px;fill:var(--muted);font-style:italic}
svg .grid{stroke:var(--line)}
svg .axis{stroke:#78716c;stroke-width:1}
svg .sig{stroke:#a8a29e;stroke-dasharray:3 3}
svg .bar.before{fill-opacity:.3}
svg .bar.planned{fill-opacity:0;stroke-width:1.5;stroke-dasharray:3 2}
svg .bar.after{fill-opacity:.95}
table{border-collapse:collapse;width:100%;font-size:13.5px;margin-top:10px}
th,td{text-align:left;padding:5px 8px;border-bottom:1px solid var(--line);vertical-align:top}
th{font-weight:600;color:var(--muted);font-size:12.5px}
td.n,th.n{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
th.colgroup{text-align:center;border-bottom:2px solid var(--line)}
td.hash{font-family:ui-monospace,"DejaVu Sans Mono",monospace;font-size:12px;word-break:break-all}
.rec{border-top:1px solid var(--line);padding:12px 0}
.rec:first-of-type{border-top:0}
.rec h3{font-size:13.5px;margin:0 0 6px;font-weight:600;font-family:ui-monospace,"DejaVu Sans Mono",monospace}
.rec h3 span{font-family:system-ui,sans-serif;font-weight:400;color:var(--muted);margin-left:8px}
.ptr{font-family:ui-monospace,"DejaVu Sans Mono",monospace;font-size:12px;color:var(--muted)}
.text{white-space:pre-wrap;background:var(--paper);border-radius:6px;padding:8px 10px;margin:3px 0 6px}
del{background:#fee2e2;color:#991b1b;text-decoration:line-through;border-radius:3px;padding:0 2px}
.cut{color:var(--muted);font-style:italic}
ins{background:#dcfce7;color:#166534;text-decoration:none;border-radius:3px;padding:0 2px;font-weight:600}
ul.edits{margin:0;padding-left:18px;font-size:12.5px;color:var(--muted)}
.cautions li{margin:6px 0}
ul.look{margin:0;padding-left:20px}
ul.look li{margin:4px 0}
.ok{color:#166534}
.bad,td.bad{color:#b91c1c}
svg .band{fill:#a8a29e;fill-opacity:.18}
.muted{color:var(--muted)}
@media (max-width:760px){.charts{grid-template-columns:1fr}}
)CSS";

}  // namespace

std::string render_report(const ReportInput& in) {
  const ManifestView& m = *in.manifest;
  std::string h;
  h += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  h += "<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; "
       "style-src 'unsafe-inline'; img-src data:\">\n";
  h += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
  h += "<title>evenhand report: " + esc(m.pack_name) + ", " + esc(m.mode) + "</title>\n";
  h += "<style>" + std::string(kStyle) + "</style>\n</head>\n<body>\n";
  h += "<header><h1>What this run changed</h1><p>pack <code>" + esc(m.pack_name) + " " +
       esc(m.pack_version) + "</code> &middot; axis " + esc(m.axis) + " &middot; mode " +
       esc(m.mode) + " &middot; started " + esc(m.started_at) + " &middot; evenhand " +
       esc(m.tool_version) + "</p></header>\n<main>\n";

  if (m.balance) h += balance_section(m);
  h += look_first_section(m);

  // Summary
  h += "<section id=\"summary\"><h2>Summary</h2><div class=\"tiles\">";
  auto tile = [&](const std::string& label, uint64_t v, bool warn = false) {
    h += std::string("<div class=\"tile") + (warn && v ? " warn" : "") + "\"><b>" + num(double(v)) +
         "</b><span>" + esc(label) + "</span></div>";
  };
  tile("records read", m.record_count("read"));
  tile("records written", m.record_count("written"));
  tile("counterfactuals added", m.record_count("added"));
  tile("records replaced", m.record_count("replaced"));
  tile("edits", m.edits);
  tile("guarded records", m.record_count("guarded"), true);
  tile("flagged records", m.record_count("flagged"), true);
  tile("rejected records", m.record_count("rejected"), true);
  h += "</div></section>\n";

  // Groups
  std::vector<std::string> cats;
  Series bm{"before", {}, "before"}, pm{"planned", {}, "planned"}, am{"after", {}, "after"};
  Series br{"before", {}, "before"}, pr{"planned", {}, "planned"}, ar{"after", {}, "after"};
  bool planned = false;
  for (const auto& g : m.groups) {
    cats.push_back(g.name);
    bm.values.push_back(double(g.before_mentions));
    am.values.push_back(double(g.after_mentions));
    br.values.push_back(double(g.before_records));
    ar.values.push_back(double(g.after_records));
    pm.values.push_back(g.planned && g.planned_basis == "mentions" ? *g.planned : NAN);
    pr.values.push_back(g.planned && g.planned_basis == "records" ? *g.planned : NAN);
    planned = planned || g.planned.has_value();
  }
  std::vector<Series> sm = {bm}, sr = {br};
  auto any = [](const Series& x) {
    return std::any_of(x.values.begin(), x.values.end(), [](double v) { return v == v; });
  };
  if (any(pm)) sm.push_back(pm);  // a plan has one basis: its series goes on that chart only
  if (any(pr)) sr.push_back(pr);
  sm.push_back(am);
  sr.push_back(ar);
  h += "<section id=\"groups\"><h2>Groups before and after<small>axis " + esc(m.axis) +
       "</small></h2><p class=\"lead\">Mentions count every word or name of a group; a "
       "record counts toward the group it mentions most (ties and records without "
       "mentions count toward none).</p><div class=\"charts\">";
  h += grouped_bars("chart-groups-mentions", "Mentions per group", cats, sm);
  h += grouped_bars("chart-groups-records", "Records led by each group", cats, sr);
  h += "</div><table><tr><th>group</th><th class=\"n\">mentions before</th>";
  if (planned) h += "<th class=\"n\">planned</th>";
  h += "<th class=\"n\">mentions after</th><th class=\"n\">records before</th><th "
       "class=\"n\">records after</th></tr>";
  for (const auto& g : m.groups) {
    h += "<tr><td>" + esc(g.name) + "</td><td class=\"n\">" + num(double(g.before_mentions)) +
         "</td>";
    if (planned)
      h += "<td class=\"n\">" + (g.planned ? num(*g.planned, 1) + " " + esc(g.planned_basis) : "") +
           "</td>";
    h += "<td class=\"n\">" + num(double(g.after_mentions)) + "</td><td class=\"n\">" +
         num(double(g.before_records)) + "</td><td class=\"n\">" + num(double(g.after_records)) +
         "</td></tr>";
  }
  h += "</table></section>\n";

  // Entries
  std::vector<HitRow> hits = m.entry_hits;
  std::stable_sort(hits.begin(), hits.end(),
                   [](const HitRow& a, const HitRow& b) { return a.hits > b.hits; });
  const size_t kTop = 20;
  std::vector<HRow> rows;
  for (size_t i = 0; i < hits.size() && i < kTop; ++i)
    rows.push_back({hits[i].forms, hits[i].rule, double(hits[i].hits)});
  h += "<section id=\"entries\"><h2>Pack entries that fired<small>top " +
       std::to_string(std::min(kTop, hits.size())) + " of " + std::to_string(hits.size()) +
       " by edits</small></h2><p class=\"lead\">Each bar is one line of the pack (its forms "
       "per group, and where it is written); the count is the edits it made in written "
       "counterfactuals.</p>";
  h += hbars("chart-entries", "Edits per pack entry", rows, "#0f766e", "No pack entry fired.");
  h += "<p class=\"muted\">" + num(double(m.edits)) + " edits in all; " +
       num(double(m.protected_skips)) + " mentions left alone in protected spans; " +
       num(double(m.ambiguous)) + " low-margin context decisions.</p></section>\n";

  // Agreement flags
  rows.clear();
  for (const auto& [k, v] : m.flagged_by_reason) rows.push_back({k, "", double(v)});
  std::stable_sort(rows.begin(), rows.end(),
                   [](const HRow& a, const HRow& b) { return a.value > b.value; });
  h += "<section id=\"agreement\"><h2>Agreement cases flagged<small>" +
       num(double(m.record_count("flagged"))) +
       " records</small></h2><p class=\"lead\">Counterfactuals whose agreement (a verb, a "
       "contraction) the engine could not settle; what happened to them follows "
       "<code>--on-flagged</code>.</p>";
  h += hbars("chart-flagged", "Flagged records by reason", rows, "#b45309",
             "No record was flagged.");
  if (!in.flagged.empty()) {
    h += "<table><tr><th>record</th><th>flags</th><th>outcome</th></tr>";
    size_t shown = std::min(in.flagged.size(), kReportListed);
    for (size_t i = 0; i < shown; ++i) {
      const ReviewRecord* r = in.flagged[i];
      std::string fl;
      for (const auto& f : r->flags) fl += esc(f.code) + ": " + esc(f.detail) + "<br>";
      h += "<tr><td class=\"ptr\">" + esc(r->input) + ":" + std::to_string(r->line) + "</td><td>" +
           fl + "</td><td>" + esc(r->flag_outcome) + "</td></tr>";
    }
    h += "</table>";
    size_t total = std::max(in.flagged_total, in.flagged.size());
    if (total > shown)
      h += "<p class=\"muted\">The first " + std::to_string(shown) + " of " +
           std::to_string(total) + ".</p>";
  }
  h += "</section>\n";

  // Guards
  rows.clear();
  for (const auto& [k, v] : m.guarded_by_reason) rows.push_back({k, "", double(v)});
  h += "<section id=\"guards\"><h2>Guarded records<small>" +
       num(double(m.record_count("guarded"))) +
       " records left as they were</small></h2><p class=\"lead\">A guard phrase of the pack "
       "(for example a sex-specific medical term) stopped the rewrite of the whole record; "
       "its mentions are still counted.</p>";
  h += hbars("chart-guarded", "Guarded records by reason", rows, "#7c2d12",
             "No record was guarded.");
  if (!in.guarded.empty()) {
    h += "<table><tr><th>record</th><th>reason</th><th>phrase</th><th>rule</th></tr>";
    size_t shown = std::min(in.guarded.size(), kReportListed);
    for (size_t i = 0; i < shown; ++i) {
      const ReviewRecord* r = in.guarded[i];
      h += "<tr><td class=\"ptr\">" + esc(r->input) + ":" + std::to_string(r->line) + "</td><td>" +
           esc(r->guard) + "</td><td>" + esc(r->guard_phrase) + "</td><td class=\"ptr\">" +
           esc(r->guard_rule) + "</td></tr>";
    }
    h += "</table>";
    size_t total = std::max(in.guarded_total, in.guarded.size());
    if (total > shown)
      h += "<p class=\"muted\">The first " + std::to_string(shown) + " of " +
           std::to_string(total) + ".</p>";
  }
  h += "</section>\n";

  // Associations
  if (in.associations && !in.associations->corpora.empty() && in.associations->groups.size() >= 2) {
    const auto& a = *in.associations;
    const auto& before = a.corpora[0];
    const CorpusAssociations* after = a.corpora.size() > 1 ? &a.corpora[1] : nullptr;
    std::vector<size_t> order;
    for (size_t t = 0; t < a.targets.labels.size(); ++t)
      if (pair_of(before.targets[t], 0, 1) || (after && pair_of(after->targets[t], 0, 1)))
        order.push_back(t);
    auto absz = [&](size_t t) {
      const auto* p = pair_of(before.targets[t], 0, 1);
      return p ? std::fabs(p->stat.z) : 0.0;
    };
    std::stable_sort(order.begin(), order.end(),
                     [&](size_t x, size_t y) { return absz(x) > absz(y); });
    const size_t kChart = 25;
    std::vector<size_t> top(order.begin(), order.begin() + std::min(kChart, order.size()));
    h += "<section id=\"associations\"><h2>Target words and groups<small>" +
         std::to_string(order.size()) + " of " + std::to_string(a.targets.labels.size()) +
         " targets occur</small></h2><p class=\"lead\">How much more often each target word "
         "occurs within " +
         std::to_string(a.options.window) + " words of " + esc(a.groups[0]) + " words than of " +
         esc(a.groups[1]) +
         " words: a log-odds ratio with an informative Dirichlet prior (alpha<sub>0</sub> = " +
         num(a.options.prior, 0) +
         "), as a z-score (Monroe, Colaresi &amp; Quinn 2008). "
         "Light bars: before; solid bars: after. Dashed lines: |z| = 1.96. p: two-sided "
         "exact conditional test of z; below " +
         std::to_string(a.options.min_cooccurrences) +
         " co-occurrences with the two groups, too few for one. Co-occurrence in the text says "
         "nothing about a trained model.</p>";
    h += association_chart(a, top, 0, 1);
    h += "<table id=\"table-associations\">" + association_head(a, after != nullptr);
    for (size_t t : order) {
      const auto& b = before.targets[t];
      const auto* pb = pair_of(b, 0, 1);
      h += "<tr><td>" + esc(a.targets.labels[t]) + "</td><td class=\"n\">" +
           num(double(b.occurrences)) + "</td><td class=\"n\">" + num(double(b.y[0])) +
           "</td><td class=\"n\">" + num(double(b.y[1])) + "</td><td class=\"n\">" + zval(pb) +
           "</td><td class=\"n\">" + pval(pb) + "</td>";
      if (after) {
        const auto& f = after->targets[t];
        const auto* pf = pair_of(f, 0, 1);
        h += "<td class=\"n\">" + num(double(f.y[0])) + "</td><td class=\"n\">" +
             num(double(f.y[1])) + "</td><td class=\"n\">" + zval(pf) + "</td><td class=\"n\">" +
             pval(pf) + "</td>";
      }
      h += "</tr>";
    }
    h += "</table></section>\n";
  }

  // Sample
  h += "<section id=\"sample\"><h2>A sample of the edits<small>" +
       std::to_string(in.sample.size()) + " of " + std::to_string(in.sample_from) +
       " rewritten records, spread across pack entries</small></h2>";
  if (in.sample.empty())
    h += "<p class=\"muted\">No audit log was given (<code>--edits</code>), or it holds no "
         "rewritten record.</p>";
  for (const auto* r : in.sample) {
    h += "<div class=\"rec\"><h3>" + esc(r->input) + ":" + std::to_string(r->line) + "<span>" +
         esc(r->action) + ", " + std::to_string(r->edits.size()) + " edits</span></h3>";
    for (const auto& f : r->fields) h += field_html(*r, f);
    h += "<ul class=\"edits\">";
    for (const auto& e : r->edits) {
      h += "<li>" + esc(e.from) + " &#8594; " + esc(e.to) + " &middot; " + esc(e.why);
      if (!e.rule.empty()) h += " <span class=\"ptr\">" + esc(e.rule) + "</span>";
      if (!e.note.empty()) h += " (" + esc(e.note) + ")";
      h += "</li>";
    }
    h += "</ul></div>";
  }
  h += "</section>\n";

  // Files
  h += "<section id=\"files\"><h2>Inputs and outputs</h2><table><tr><th>role</th><th>path</th>"
       "<th class=\"n\">bytes</th><th class=\"n\">records</th><th>SHA-256</th></tr>";
  auto file_row = [&](const std::string& role, const FileRow& f) {
    h += "<tr><td>" + esc(role) + "</td><td class=\"ptr\">" + esc(f.path) +
         (f.compression.empty() || f.compression == "none" ? "" : " (" + esc(f.compression) + ")") +
         "</td><td class=\"n\">" + num(double(f.bytes)) + "</td><td class=\"n\">" +
         num(double(f.records)) + "</td><td class=\"hash\">" + esc(f.sha256) + "</td></tr>";
  };
  for (const auto& f : m.inputs) file_row("input", f);
  for (const auto& f : m.outputs) file_row("output: " + f.role, f);
  for (const auto& f : in.read) {
    h += "<tr><td>" + esc(f.role) + "</td><td class=\"ptr\">" + esc(f.path) +
         "</td><td class=\"n\">" + num(double(f.bytes)) + "</td><td></td><td class=\"hash\">" +
         esc(f.sha256) + "</td></tr>";
  }
  h += "</table><p class=\"muted\">Pack <code>" + esc(m.pack_name) + "</code> SHA-256 <code>" +
       esc(m.pack_sha256) + "</code>. Command line: <code>";
  for (size_t i = 0; i < m.command_line.size(); ++i) h += (i ? " " : "") + esc(m.command_line[i]);
  h += "</code></p></section>\n";

  // Cautions
  h += "<section id=\"cautions\" class=\"cautions\"><h2>Cautions</h2><ul>";
  for (const auto& c : in.cautions) h += "<li>" + with_code(c) + "</li>";
  h += "</ul></section>\n</main>\n</body>\n</html>\n";
  return h;
}

}  // namespace evenhand::review
