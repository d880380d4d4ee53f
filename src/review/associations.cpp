#include "review/associations.h"

#include <simdjson.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <set>
#include <tuple>
#include <unordered_map>

#include "audit/json_writer.h"
#include "evenhand/version.h"
#include "text/tokenize.h"

namespace evenhand::review {

namespace {

const char* const kClitics[] = {"'s", "'d", "'ll", "'re", "'ve", "'m"};

// The word without a trailing clitic, or empty when it has none.
std::string_view strip_clitic(std::string_view folded) {
  for (const char* c : kClitics) {
    std::string_view cv(c);
    if (folded.size() > cv.size() && folded.substr(folded.size() - cv.size()) == cv)
      return folded.substr(0, folded.size() - cv.size());
  }
  return {};
}

// The pack entry of one word that rewrites `folded` (or its stem before a clitic, as the
// counter matches group words), or null.
const pack::LexEntry* rewriting_entry(const pack::CompiledPack& pack, std::string_view folded) {
  for (std::string_view w : {folded, strip_clitic(folded)}) {
    if (w.empty()) continue;
    if (const auto* entries = pack.lookup(w))
      for (const auto& e : *entries)
        if (e.words.size() == 1) return &e;
  }
  return nullptr;
}

}  // namespace

Result<TargetList> parse_targets(std::string_view text, const std::string& source,
                                 const pack::CompiledPack* pack) {
  TargetList out;
  out.source = source;
  std::set<std::string> seen;
  size_t pos = 0;
  uint64_t line_no = 0;
  while (pos < text.size()) {
    size_t nl = text.find('\n', pos);
    if (nl == std::string_view::npos) nl = text.size();
    std::string_view line = text.substr(pos, nl - pos);
    pos = nl + 1;
    ++line_no;
    if (size_t hash = line.find('#'); hash != std::string_view::npos) line = line.substr(0, hash);
    std::vector<std::string> words;
    size_t i = 0;
    while (i < line.size()) {
      while (i < line.size() && (line[i] == ' ' || line[i] == '\t' || line[i] == '\r')) ++i;
      size_t j = i;
      while (j < line.size() && line[j] != ' ' && line[j] != '\t' && line[j] != '\r') ++j;
      if (j > i) words.push_back(pack::fold_word(line.substr(i, j - i)));
      i = j;
    }
    if (words.empty()) continue;
    for (const auto& w : words) {
      std::string why;
      if (!seen.insert(w).second) {
        why = "target word '" + w + "' is listed twice";
      } else if (const pack::LexEntry* e = pack ? rewriting_entry(*pack, w) : nullptr) {
        const pack::SourceRef& at =
            e->is_name ? pack->names()[e->set].where : pack->sets()[e->set].where;
        why = "target word '" + w + "' is a " + (e->is_name ? "name" : "form") +
              " the pack rewrites (" + pack->file_path(at.str()) +
              "), so it would never count as a target";
      }
      if (!why.empty()) {
        Error err = make_error(ErrorKind::input, source, std::move(why));
        err.line = line_no;
        return err;
      }
    }
    out.labels.push_back(words.front());
    out.variants.push_back(std::move(words));
  }
  if (out.labels.empty()) return make_error(ErrorKind::input, source, "no target words");
  return out;
}

// ---------------------------------------------------------------------------------------
// Counting

struct CooccurrenceCounter::Impl {
  std::shared_ptr<const rewrite::Engine> engine;
  std::unique_ptr<rewrite::Worker> worker;
  rewrite::RecordResult result;  // lists the mentions the engine counts (list_mentions)
  size_t window;
  struct Hash {
    using is_transparent = void;
    size_t operator()(std::string_view v) const { return std::hash<std::string_view>{}(v); }
  };
  std::unordered_map<std::string, uint32_t, Hash, std::equal_to<>> target_of;  // variant -> target
  CooccurrenceCounts counts;
  text::Tokenizer tokenizer;
  std::vector<text::Token> tokens;

  struct Word {
    std::string folded;
    int32_t group = -1;  // group of the mention this word belongs to
  };
  std::vector<Word> words;    // the word tokens of one field
  std::vector<int64_t> dist;  // [word * groups + g]: words to the nearest word of group g

  // Fills `words` with the field's word tokens, each marked with the group of the engine's
  // mention that overlaps it (`mentions`: this field's, sorted by begin). A mention's range
  // may leave out a trailing clitic ("mother" of "mother's"); a multiword mention marks each
  // of its words, so the window reaches from either end of it.
  void read_words(std::string_view text, std::span<const rewrite::RecordResult::Mention> mentions) {
    tokenizer.tokenize_without_space(text, tokens);
    words.clear();
    size_t m = 0;
    for (const auto& t : tokens) {
      if (t.kind != text::TokenKind::word) continue;
      Word w;
      w.folded = pack::fold_word(text.substr(t.begin, t.end - t.begin));
      while (m < mentions.size() && mentions[m].end <= t.begin) ++m;
      if (m < mentions.size() && mentions[m].begin < t.end) w.group = mentions[m].group;
      words.push_back(std::move(w));
    }
  }

  // Fills `dist` for the field's words.
  void measure_distances() {
    size_t G = counts.groups, W = words.size();
    const int64_t far = INT64_MAX / 4;
    dist.assign(W * G, far);
    for (size_t g = 0; g < G; ++g) {
      int64_t last = -far;
      for (size_t p = 0; p < W; ++p) {
        if (words[p].group == static_cast<int32_t>(g)) last = static_cast<int64_t>(p);
        dist[p * G + g] = static_cast<int64_t>(p) - last;
      }
      last = far;
      for (size_t p = W; p-- > 0;) {
        if (words[p].group == static_cast<int32_t>(g)) last = static_cast<int64_t>(p);
        dist[p * G + g] = std::min(dist[p * G + g], last - static_cast<int64_t>(p));
      }
    }
  }

  void add_field(std::string_view text, std::span<const rewrite::RecordResult::Mention> mentions) {
    read_words(text, mentions);
    measure_distances();
    size_t G = counts.groups;
    for (size_t p = 0; p < words.size(); ++p) {
      const Word& w = words[p];
      if (w.group >= 0) continue;  // group words are not context
      ++counts.words;
      auto t = target_of.find(w.folded);
      if (t == target_of.end()) {
        std::string_view stem = strip_clitic(w.folded);
        if (!stem.empty()) t = target_of.find(stem);
      }
      bool target = t != target_of.end();
      if (target) ++counts.occurrences[t->second];
      auto near = [&](size_t g) { return dist[p * G + g] <= static_cast<int64_t>(window); };
      for (size_t a = 0, pair = 0; a < G; ++a) {
        if (!near(a)) {
          pair += G - a - 1;
          continue;
        }
        ++counts.context_total[a];
        if (target) ++counts.target_total[t->second][a];
        for (size_t b = a + 1; b < G; ++b, ++pair) {
          if (!near(b)) continue;
          ++counts.shared_context[pair];
          if (target) ++counts.shared_total[t->second][pair];
        }
      }
    }
  }
};

CooccurrenceCounter::CooccurrenceCounter(std::shared_ptr<const rewrite::Engine> engine,
                                         const TargetList& targets, size_t window)
    : impl_(std::make_unique<Impl>()) {
  impl_->engine = std::move(engine);
  impl_->worker = impl_->engine->make_worker();
  impl_->result.list_mentions = true;
  impl_->window = window;
  for (uint32_t t = 0; t < targets.variants.size(); ++t)
    for (const auto& v : targets.variants[t]) impl_->target_of.emplace(v, t);
  auto& c = impl_->counts;
  c.groups = impl_->engine->pack()->groups().size();
  c.occurrences.assign(targets.labels.size(), 0);
  c.context_total.assign(c.groups, 0);
  c.target_total.assign(targets.labels.size(), std::vector<uint64_t>(c.groups, 0));
  size_t pairs = c.groups * (c.groups - 1) / 2;
  c.shared_context.assign(pairs, 0);
  c.shared_total.assign(targets.labels.size(), std::vector<uint64_t>(pairs, 0));
}

CooccurrenceCounter::~CooccurrenceCounter() = default;

void CooccurrenceCounter::add_record(std::span<const std::string_view> fields) {
  ++impl_->counts.records;
  impl_->worker->rewrite(fields, impl_->result);
  auto& mentions = impl_->result.mentions;
  std::sort(mentions.begin(), mentions.end(), [](const auto& x, const auto& y) {
    return std::tie(x.field, x.begin) < std::tie(y.field, y.begin);
  });
  size_t m = 0;
  for (uint32_t f = 0; f < fields.size(); ++f) {
    size_t first = m;
    while (m < mentions.size() && mentions[m].field == f) ++m;
    impl_->add_field(fields[f], std::span(mentions).subspan(first, m - first));
  }
}

const CooccurrenceCounts& CooccurrenceCounter::counts() const {
  return impl_->counts;
}

// ---------------------------------------------------------------------------------------
// Statistics

LogOdds log_odds_z(double y_a, double n_a, double y_b, double n_b, double alpha_w, double alpha_0) {
  LogOdds r;
  r.delta = std::log((y_a + alpha_w) / (n_a + alpha_0 - y_a - alpha_w)) -
            std::log((y_b + alpha_w) / (n_b + alpha_0 - y_b - alpha_w));
  r.variance = 1 / (y_a + alpha_w) + 1 / (y_b + alpha_w);
  r.z = r.delta / std::sqrt(r.variance);
  return r;
}

size_t pair_index(size_t groups, size_t a, size_t b) {
  return a * groups - a * (a + 1) / 2 + (b - a - 1);
}

namespace {

double log_choose(double n, double k) {
  return std::lgamma(n + 1) - std::lgamma(k + 1) - std::lgamma(n - k + 1);
}

// A hypergeometric law: k of `draws` drawn from `total` items fall among `marked` of them.
struct Hypergeometric {
  uint64_t total, marked, draws;
  double log_p(uint64_t k) const {
    return log_choose(double(marked), double(k)) +
           log_choose(double(total - marked), double(draws - k)) -
           log_choose(double(total), double(draws));
  }
  uint64_t lo() const { return draws > total - marked ? draws - (total - marked) : 0; }
  uint64_t hi() const { return std::min(marked, draws); }
  uint64_t mode() const {
    double m = (double(draws) + 1) * (double(marked) + 1) / (double(total) + 2);
    return std::clamp(static_cast<uint64_t>(m), lo(), hi());
  }
  // Calls visit(k, log P(k)) for every k with log P(k) >= cut (the law is log-concave, so
  // these form one run around the mode).
  template <class Visit>
  void each_above(double cut, Visit&& visit) const {
    uint64_t m = mode();
    for (uint64_t k = m;; --k) {
      double l = log_p(k);
      if (l < cut) break;
      visit(k, l);
      if (k == lo()) break;
    }
    for (uint64_t k = m + 1; k <= hi(); ++k) {
      double l = log_p(k);
      if (l < cut) break;
      visit(k, l);
    }
  }
};

// ln(e^x + e^y) without overflow.
double log_add(double x, double y) {
  if (x < y) std::swap(x, y);
  return y == -HUGE_VAL ? x : x + std::log1p(std::exp(y - x));
}

}  // namespace

double exact_p(const PairTable& t, double alpha_w, double alpha_0) {
  double n_a = double(t.only_a + t.shared), n_b = double(t.only_b + t.shared);
  auto absz = [&](uint64_t ka, uint64_t kb, uint64_t ks) {
    return std::fabs(log_odds_z(double(ka + ks), n_a, double(kb + ks), n_b, alpha_w, alpha_0).z);
  };
  double observed = absz(t.y_only_a, t.y_only_b, t.y_shared);
  double limit = observed - 1e-9 * std::max(1.0, observed);  // ties count
  uint64_t y = t.y_only_a + t.y_only_b + t.y_shared;
  // k_s first (shared words among all context words), then k_a given k_s.
  Hypergeometric shared{t.only_a + t.only_b + t.shared, t.shared, y};
  auto given = [&](uint64_t ks) { return Hypergeometric{t.only_a + t.only_b, t.only_a, y - ks}; };
  uint64_t ks_mode = shared.mode();
  double top = shared.log_p(ks_mode) + given(ks_mode).log_p(given(ks_mode).mode());
  double seen = shared.log_p(t.y_shared) + given(t.y_shared).log_p(t.y_only_a);
  double cut = std::min(top, seen) - 40;  // the observed outcome is always summed
  double log_mass = -HUGE_VAL, log_extreme = -HUGE_VAL;
  shared.each_above(cut, [&](uint64_t ks, double ls) {
    given(ks).each_above(cut - ls, [&](uint64_t ka, double la) {
      log_mass = log_add(log_mass, ls + la);
      if (absz(ka, y - ks - ka, ks) >= limit) log_extreme = log_add(log_extreme, ls + la);
    });
  });
  double p = std::exp(log_extreme - log_mass);
  return std::clamp(p, std::numeric_limits<double>::min(), 1.0);
}

CorpusAssociations compute_associations(const CooccurrenceCounts& c, const AssociationOptions& o) {
  CorpusAssociations out;
  out.records = c.records;
  out.words = c.words;
  out.context = c.context_total;
  size_t T = c.occurrences.size();
  out.targets.resize(T);
  for (size_t t = 0; t < T; ++t) {
    auto& tr = out.targets[t];
    tr.occurrences = c.occurrences[t];
    tr.y = c.target_total[t];
    if (tr.occurrences == 0 || c.words == 0) continue;
    tr.alpha = o.prior * static_cast<double>(tr.occurrences) / static_cast<double>(c.words);
    for (uint16_t a = 0; a < c.groups; ++a)
      for (uint16_t b = a + 1; b < c.groups; ++b) {
        PairResult pr;
        pr.a = a;
        pr.b = b;
        uint64_t n_a = c.context_total[a], n_b = c.context_total[b];
        pr.stat = log_odds_z(double(tr.y[a]), double(n_a), double(tr.y[b]), double(n_b), tr.alpha,
                             o.prior);
        size_t k = pair_index(c.groups, a, b);
        pr.shared_context = c.shared_context[k];
        pr.shared_cooccurrences = c.shared_total[t][k];
        pr.too_few = tr.y[a] + tr.y[b] < o.min_cooccurrences;
        if (!pr.too_few) {
          PairTable tab;
          tab.shared = pr.shared_context;
          tab.only_a = n_a - tab.shared;
          tab.only_b = n_b - tab.shared;
          tab.y_shared = pr.shared_cooccurrences;
          tab.y_only_a = tr.y[a] - tab.y_shared;
          tab.y_only_b = tr.y[b] - tab.y_shared;
          pr.p = exact_p(tab, tr.alpha, o.prior);
        }
        tr.pairs.push_back(pr);
      }
  }
  return out;
}

// ---------------------------------------------------------------------------------------
// JSON

std::string render_associations(const AssociationReport& r) {
  std::string out;
  audit::JsonWriter w(out, 2);
  w.begin_object();
  w.key("schema").value(kAssociationsSchema);
  w.key("tool").begin_object().key("name").value("evenhand").key("version").value(kVersion);
  w.end_object();
  w.key("pack").begin_object();
  w.key("name").value(r.pack_name).key("version").value(r.pack_version);
  w.key("sha256").value(r.pack_sha256).key("axis").value(r.axis);
  w.key("groups").begin_array();
  for (const auto& g : r.groups) w.value(g);
  w.end_array().end_object();
  w.key("method").begin_object();
  w.key("statistic").value("log-odds ratio with informative Dirichlet prior, z-score");
  w.key("window").value(static_cast<uint64_t>(r.options.window));
  w.key("prior").value(r.options.prior);
  w.key("test").value("exact conditional test of z (multivariate hypergeometric), two-sided");
  w.key("min_cooccurrences").value(r.options.min_cooccurrences);
  w.key("protect").begin_array();
  for (const auto& p : r.protect) w.value(p);
  w.end_array();
  w.end_object();
  w.key("targets").begin_object();
  w.key("source").value(r.targets.source);
  w.key("words").begin_array();
  for (size_t t = 0; t < r.targets.labels.size(); ++t) {
    w.begin_array();
    for (const auto& v : r.targets.variants[t]) w.value(v);
    w.end_array();
  }
  w.end_array().end_object();
  w.key("corpora").begin_array();
  for (const auto& c : r.corpora) {
    w.begin_object();
    w.key("label").value(c.label);
    w.key("inputs").begin_array();
    for (const auto& [path, sha] : c.inputs)
      w.begin_object().key("path").value(path).key("sha256").value(sha).end_object();
    w.end_array();
    w.key("records").value(c.records).key("words").value(c.words);
    w.key("context").begin_object();
    for (size_t g = 0; g < r.groups.size() && g < c.context.size(); ++g)
      w.key(r.groups[g]).value(c.context[g]);
    w.end_object();
    w.key("targets").begin_array();
    for (size_t t = 0; t < c.targets.size() && t < r.targets.labels.size(); ++t) {
      const auto& tr = c.targets[t];
      w.begin_object();
      w.key("target").value(r.targets.labels[t]);
      w.key("occurrences").value(tr.occurrences);
      w.key("alpha").value(tr.alpha);
      w.key("cooccurrences").begin_object();
      for (size_t g = 0; g < r.groups.size() && g < tr.y.size(); ++g)
        w.key(r.groups[g]).value(tr.y[g]);
      w.end_object();
      w.key("pairs").begin_array();
      for (const auto& p : tr.pairs) {
        w.begin_object();
        w.key("a").value(r.groups[p.a]).key("b").value(r.groups[p.b]);
        w.key("log_odds").value(p.stat.delta).key("variance").value(p.stat.variance);
        w.key("z").value(p.stat.z);
        w.key("shared_context").value(p.shared_context);
        w.key("shared_cooccurrences").value(p.shared_cooccurrences);
        w.key("too_few").value(p.too_few);
        w.key("p");
        if (p.p)
          w.value(*p.p);
        else
          w.null();
        w.end_object();
      }
      w.end_array().end_object();
    }
    w.end_array().end_object();
  }
  w.end_array();
  w.end_object();
  out += '\n';
  return out;
}

namespace {

using simdjson::dom::element;

std::string sget(element e, const char* k) {
  std::string_view v;
  return e[k].get_string().get(v) ? std::string() : std::string(v);
}
uint64_t uget(element e, const char* k) {
  uint64_t v = 0;
  return e[k].get_uint64().get(v) ? 0 : v;
}
double dget(element e, const char* k) {
  double v = 0;
  return e[k].get_double().get(v) ? 0 : v;
}

}  // namespace

Result<AssociationReport> read_associations(const std::string& path) {
  simdjson::dom::parser parser;
  element doc;
  auto fail = [&](const std::string& why) { return make_error(ErrorKind::input, path, why); };
  if (auto err = parser.load(path).get(doc))
    return fail(std::string("cannot read associations: ") + simdjson::error_message(err));
  if (!doc.is_object() || sget(doc, "schema") != kAssociationsSchema)
    return fail(std::string("not an associations file of schema ") + kAssociationsSchema);
  AssociationReport r;
  element pk = doc["pack"];
  r.pack_name = sget(pk, "name");
  r.pack_version = sget(pk, "version");
  r.pack_sha256 = sget(pk, "sha256");
  r.axis = sget(pk, "axis");
  simdjson::dom::array arr;
  if (pk["groups"].get_array().get(arr)) return fail("'pack.groups' is missing");
  for (element g : arr) {
    std::string_view s;
    if (g.get_string().get(s)) return fail("'pack.groups' holds a non-string");
    r.groups.emplace_back(s);
  }
  element m = doc["method"];
  r.options.window = uget(m, "window");
  r.options.prior = dget(m, "prior");
  r.options.min_cooccurrences = uget(m, "min_cooccurrences");
  if (!m["protect"].get_array().get(arr))  // absent in files written before it was added
    for (element x : arr) {
      std::string_view v;
      if (x.get_string().get(v)) return fail("'method.protect' holds a non-string");
      r.protect.emplace_back(v);
    }
  r.targets.source = sget(doc["targets"], "source");
  if (doc["targets"]["words"].get_array().get(arr)) return fail("'targets.words' is missing");
  for (element t : arr) {
    simdjson::dom::array vs;
    if (t.get_array().get(vs)) return fail("'targets.words' holds a non-array");
    std::vector<std::string> v;
    for (element x : vs) {
      std::string_view s;
      if (!x.get_string().get(s)) v.emplace_back(s);
    }
    if (v.empty()) return fail("'targets.words' holds an empty entry");
    r.targets.labels.push_back(v.front());
    r.targets.variants.push_back(std::move(v));
  }
  if (doc["corpora"].get_array().get(arr)) return fail("'corpora' is missing");
  for (element c : arr) {
    CorpusAssociations ca;
    ca.label = sget(c, "label");
    ca.records = uget(c, "records");
    ca.words = uget(c, "words");
    simdjson::dom::array ins;
    if (!c["inputs"].get_array().get(ins))
      for (element i : ins) ca.inputs.emplace_back(sget(i, "path"), sget(i, "sha256"));
    for (const auto& g : r.groups) ca.context.push_back(uget(c["context"], g.c_str()));
    simdjson::dom::array ts;
    if (c["targets"].get_array().get(ts)) return fail("'corpora[].targets' is missing");
    for (element t : ts) {
      TargetResult tr;
      tr.occurrences = uget(t, "occurrences");
      tr.alpha = dget(t, "alpha");
      for (const auto& g : r.groups) tr.y.push_back(uget(t["cooccurrences"], g.c_str()));
      simdjson::dom::array ps;
      if (!t["pairs"].get_array().get(ps))
        for (element p : ps) {
          PairResult pr;
          auto a = std::find(r.groups.begin(), r.groups.end(), sget(p, "a"));
          auto b = std::find(r.groups.begin(), r.groups.end(), sget(p, "b"));
          if (a == r.groups.end() || b == r.groups.end())
            return fail("a pair names a group that is not in 'pack.groups'");
          pr.a = static_cast<uint16_t>(a - r.groups.begin());
          pr.b = static_cast<uint16_t>(b - r.groups.begin());
          pr.stat.delta = dget(p, "log_odds");
          pr.stat.variance = dget(p, "variance");
          pr.stat.z = dget(p, "z");
          pr.shared_context = uget(p, "shared_context");
          pr.shared_cooccurrences = uget(p, "shared_cooccurrences");
          bool few = false;
          pr.too_few = !p["too_few"].get_bool().get(few) && few;
          double pv = 0;
          if (!p["p"].get_double().get(pv)) pr.p = pv;
          tr.pairs.push_back(pr);
        }
      ca.targets.push_back(std::move(tr));
    }
    if (ca.targets.size() != r.targets.labels.size())
      return fail("corpus '" + ca.label + "' lists another number of targets than 'targets.words'");
    r.corpora.push_back(std::move(ca));
  }
  return r;
}

}  // namespace evenhand::review
