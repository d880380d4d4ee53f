#!/usr/bin/env python3
"""Synthetic JSONL corpus for evenhand benchmarks (Python 3 standard library only).

Writes invented English-like records: sentence templates filled from a vocabulary of a few
thousand invented words (built from syllables, with Zipf-like frequencies) plus common
English function words, and gendered mentions (pronouns, kinship terms, titles, first
names) at roughly one mention per 15-25 words, with about 70% of records holding at least
one mention. Output is deterministic for a given --seed, --mb and --shape.

Shapes:
  plain  {"id": "...", "text": "..."}
  chat   {"id": "...", "messages": [{"role": "...", "content": "..."}, ...]}
  mixed  about half plain, a third chat, the rest plain records with extra members
         (title, meta) that a --field selection should leave alone.

The data is synthetic and meant only for throughput measurements; the word list is
invented (common practice for synthetic benchmarks), the gendered words are ordinary
English words and first names.
"""

import argparse
import itertools
import json
import random
import sys

# --------------------------------------------------------------------------------------
# Vocabulary (fixed: the same invented language for every seed).

VOCAB_SEED = 20240611

ONSETS = ("b bl br c ch cl cr d dr f fl fr g gl gr h j k l m n p pl pr qu r s sc sh sk sl "
          "sm sn sp st str sw t th tr v w wh y z").split()
VOWELS = "a e i o u a e i o ea ai oa ou ie ee oo".split()
CODAS = ("", "", "", "n", "r", "l", "s", "t", "m", "nd", "nt", "st", "rk", "ck", "ll",
         "ng", "sh", "ft", "mp", "x")
NOUN_SUFFIXES = ("", "", "", "", "tion", "ment", "ness", "er", "ity", "age", "ard", "ism")
ADJ_SUFFIXES = ("", "ous", "ful", "ish", "al", "ic", "ive", "less", "able", "y")

FUNCTION_WORDS = set("""a an the of and or but to in on at by for with from into over under
after before about between through during without within is are was were be been being have
has had do does did will would can could should may might must shall that this these those
it its they them their we us our you your i me my not no so as if than then there here when
where while which who whom what why how all any some each every both few more most other such
only own same very just also too now out up down off again once""".split())

PREPOSITIONS = ("in on at by for with from into over under after before about between "
                "through during without within across beside near toward").split()
DETERMINERS = ("the the the a a an this that every each some one another our their your "
               "its").split()
CONJUNCTIONS = "and but so yet while because although".split()

# Gendered mentions: (female, male) pairs. Ordinary English words, not a rule pack.
PRONOUN_SUBJ = ("she", "he")
PRONOUN_OBJ = ("her", "him")
PRONOUN_POSS = ("her", "his")
PRONOUN_REFL = ("herself", "himself")
PRONOUN_INDEP = ("hers", "his")
KIN = [("mother", "father"), ("sister", "brother"), ("daughter", "son"), ("aunt", "uncle"),
       ("niece", "nephew"), ("grandmother", "grandfather"), ("wife", "husband"),
       ("mom", "dad"), ("girlfriend", "boyfriend"), ("granddaughter", "grandson"),
       ("stepmother", "stepfather"), ("bride", "groom")]
PEOPLE = [("woman", "man"), ("girl", "boy"), ("lady", "gentleman"), ("queen", "king"),
          ("princess", "prince"), ("actress", "actor"), ("waitress", "waiter"),
          ("heroine", "hero"), ("businesswoman", "businessman"), ("chairwoman", "chairman"),
          ("policewoman", "policeman"), ("spokeswoman", "spokesman")]
PEOPLE_PLURAL = [("women", "men"), ("girls", "boys"), ("ladies", "gentlemen"),
                 ("mothers", "fathers"), ("sisters", "brothers"), ("daughters", "sons"),
                 ("aunts", "uncles"), ("queens", "kings"), ("wives", "husbands")]
TITLES = [("Mrs.", "Mr."), ("Ms.", "Mr."), ("Madam", "Sir"), ("Lady", "Lord"),
          ("Miss", "Master")]
FIRST_NAMES = [
    ("Mary", "John"), ("Patricia", "Robert"), ("Jennifer", "Michael"), ("Linda", "William"),
    ("Elizabeth", "David"), ("Barbara", "Richard"), ("Susan", "Joseph"), ("Jessica", "Thomas"),
    ("Sarah", "Charles"), ("Karen", "Christopher"), ("Nancy", "Daniel"), ("Lisa", "Matthew"),
    ("Betty", "Anthony"), ("Margaret", "Mark"), ("Sandra", "Donald"), ("Ashley", "Steven"),
    ("Kimberly", "Paul"), ("Emily", "Andrew"), ("Donna", "Joshua"), ("Michelle", "Kenneth"),
    ("Carol", "Kevin"), ("Amanda", "Brian"), ("Melissa", "George"), ("Deborah", "Timothy"),
    ("Stephanie", "Ronald"), ("Rebecca", "Jason"), ("Laura", "Edward"), ("Helen", "Jeffrey"),
    ("Sharon", "Ryan"), ("Cynthia", "Jacob"), ("Kathleen", "Gary"), ("Amy", "Nicholas"),
    ("Anna", "Eric"), ("Shirley", "Jonathan"), ("Angela", "Stephen"), ("Ruth", "Larry"),
    ("Brenda", "Justin"), ("Pamela", "Scott"), ("Nicole", "Brandon"), ("Katherine", "Benjamin"),
    ("Samantha", "Samuel"), ("Christine", "Gregory"), ("Emma", "Alexander"), ("Rachel", "Frank"),
    ("Catherine", "Patrick"), ("Olivia", "Raymond"), ("Victoria", "Jack"), ("Julia", "Dennis"),
    ("Grace", "Peter"), ("Chloe", "Henry"), ("Sophia", "Oliver"), ("Isabella", "Lucas"),
    ("Hannah", "Ethan"), ("Natalie", "Noah"), ("Alice", "Arthur"), ("Claire", "Hugo"),
    ("Lucy", "Leo"), ("Eva", "Oscar"), ("Ella", "Felix"), ("Zoe", "Adam"),
]
NEUTRAL_PEOPLE = ("person colleague friend neighbour teacher doctor engineer student parent "
                  "child manager visitor customer author driver nurse pilot clerk baker "
                  "farmer singer writer partner cousin sibling spouse").split()
NEUTRAL_SUBJ = ("they", "we", "you", "someone", "everyone", "nobody")

EXTRA_CHARS = ("\u2014", "\u2019", "\u201c", "\u201d", "\u00e9", "\u00f6", "\u2026")
ROLES_SYSTEM = ("You are a helpful assistant.", "You answer briefly and politely.",
                "You are a careful reviewer of travel notes.")
SOURCES = ("forum", "wiki", "news", "letters", "reviews", "minutes")


def _invent_words(rng, count, min_syll, max_syll, suffixes, taken):
    out = []
    while len(out) < count:
        n = rng.randint(min_syll, max_syll)
        w = "".join(rng.choice(ONSETS) + rng.choice(VOWELS) + rng.choice(CODAS)
                    for _ in range(n)) + rng.choice(suffixes)
        if len(w) < 3 or w in taken:
            continue
        taken.add(w)
        out.append(w)
    return out


def _zipf_cum_weights(n, s=1.07, q=15.0):
    """Zipf-Mandelbrot weights 1/(rank+q)^s: a long tail without one dominant word."""
    cum, total = [], 0.0
    for r in range(1, n + 1):
        total += 1.0 / ((r + q) ** s)
        cum.append(total)
    return cum


class Vocabulary:
    """The invented word lists, identical for every seed."""

    def __init__(self):
        rng = random.Random(VOCAB_SEED)
        taken = set(FUNCTION_WORDS) | set(PREPOSITIONS) | set(DETERMINERS)
        for pairs in (KIN, PEOPLE, PEOPLE_PLURAL, TITLES, FIRST_NAMES):
            for f, m in pairs:
                taken.add(f.lower())
                taken.add(m.lower())
        taken.update(("her", "him", "his", "hers", "she", "he", "herself", "himself"))
        taken.update(NEUTRAL_PEOPLE)
        self.nouns = _invent_words(rng, 2600, 1, 2, NOUN_SUFFIXES, taken)
        verbs = _invent_words(rng, 900, 1, 2, ("",), taken)
        self.verbs_s = [v + ("es" if v.endswith(("s", "sh", "ch", "x")) else "s") for v in verbs]
        self.verbs_ed = [v + ("d" if v.endswith("e") else "ed") for v in verbs]
        self.verbs_ing = [(v[:-1] if v.endswith("e") and len(v) > 3 else v) + "ing" for v in verbs]
        self.verbs = verbs
        self.adjs = _invent_words(rng, 900, 1, 2, ADJ_SUFFIXES, taken)
        self.advs = [a + "ly" for a in _invent_words(rng, 250, 1, 2, ("",), taken)]
        self.surnames = [w.capitalize() + rng.choice(("", "son", "ton", "ley", "ford", "man"))
                         for w in _invent_words(rng, 400, 2, 3, ("",), taken)]
        # A handful of invented words carry accents or typographic marks (UTF-8 paths).
        for i in range(41, len(self.nouns), 97):
            w = self.nouns[i]
            self.nouns[i] = w[:-1] + "\u00e9" if len(w) > 3 else w


class Generator:
    """Draws sentences and records from one seeded random stream."""

    def __init__(self, vocab, seed):
        self.v = vocab
        self.rng = random.Random(seed)
        self.seed = seed
        self.mentions = 0  # gendered mention tokens written (for --stats)
        self.gendered = 0.0  # probability that a person slot is gendered, per record
        rng = self.rng

        def stream(words, cum=None, k=1 << 16):
            if cum is None:
                cum = _zipf_cum_weights(len(words))
            choices = rng.choices
            while True:
                yield from choices(words, cum_weights=cum, k=k)

        self.noun = stream(vocab.nouns).__next__
        self.adj = stream(vocab.adjs).__next__
        self.adv = stream(vocab.advs).__next__
        vidx = list(range(len(vocab.verbs)))
        self.verb_i = stream(vidx).__next__
        self.prep = stream(PREPOSITIONS, _zipf_cum_weights(len(PREPOSITIONS), 0.8, 1.0)).__next__
        self.det = stream(DETERMINERS, list(itertools.accumulate([1] * len(DETERMINERS)))).__next__
        self.rand = rng.random
        self.names = FIRST_NAMES
        self.templates = self._templates()

    # Person references --------------------------------------------------------------
    def _g(self):
        """Returns 0 (female) or 1 (male)."""
        return 0 if self.rand() < 0.5 else 1

    def person_subj(self):
        r = self.rand()
        if r >= self.gendered:
            r2 = self.rand()
            if r2 < 0.35:
                return NEUTRAL_SUBJ[int(r2 * 17) % len(NEUTRAL_SUBJ)]
            return "the " + NEUTRAL_PEOPLE[int(r2 * 1000) % len(NEUTRAL_PEOPLE)]
        g = self._g()
        r = self.rand()
        self.mentions += 1
        if r < 0.42:
            return PRONOUN_SUBJ[g]
        if r < 0.70:
            return self.names[int(r * 9973) % len(self.names)][g]
        if r < 0.84:
            kin = KIN[int(r * 7919) % len(KIN)][g]
            if r < 0.79:
                return ("my ", "our ", "your ", "the ")[int(r * 131) % 4] + kin
            self.mentions += 1
            return PRONOUN_POSS[self._g()] + " " + kin
        if r < 0.93:
            return (TITLES[int(r * 337) % len(TITLES)][g] + " "
                    + self.v.surnames[int(r * 65537) % len(self.v.surnames)])
        return "the " + PEOPLE[int(r * 4099) % len(PEOPLE)][g]

    def person_obj(self):
        r = self.rand()
        if r >= self.gendered:
            if r < self.gendered + (1 - self.gendered) * 0.4:
                return ("them", "us", "you", "me")[int(r * 53) % 4]
            return "the " + NEUTRAL_PEOPLE[int(r * 1009) % len(NEUTRAL_PEOPLE)]
        g = self._g()
        r = self.rand()
        self.mentions += 1
        if r < 0.55:
            return PRONOUN_OBJ[g]
        if r < 0.80:
            return self.names[int(r * 9973) % len(self.names)][g]
        if r < 0.92:
            return ("my ", "the ", "their ")[int(r * 31) % 3] + KIN[int(r * 7919) % len(KIN)][g]
        return "the " + PEOPLE_PLURAL[int(r * 4099) % len(PEOPLE_PLURAL)][g]

    def person_poss(self):
        r = self.rand()
        if r >= self.gendered:
            return ("their", "our", "your", "my", "the")[int(r * 97) % 5]
        g = self._g()
        r = self.rand()
        self.mentions += 1
        if r < 0.7:
            return PRONOUN_POSS[g]
        name = self.names[int(r * 9973) % len(self.names)][g]
        return name + ("\u2019s" if r > 0.97 else "'s")

    def refl(self):
        if self.rand() < self.gendered:
            self.mentions += 1
            return PRONOUN_REFL[self._g()]
        return "themselves"

    # Sentences ----------------------------------------------------------------------
    def np(self):
        r = self.rand()
        if r < 0.45:
            return self.det() + " " + self.noun()
        if r < 0.8:
            return self.det() + " " + self.adj() + " " + self.noun()
        return self.det() + " " + self.noun() + " of the " + self.noun()

    def _templates(self):
        ved = self.v.verbs_ed
        vs = self.v.verbs_s
        ving = self.v.verbs_ing
        vb = self.v.verbs
        vi = self.verb_i
        ps, po, pp, np, prep, adj, adv, noun = (self.person_subj, self.person_obj,
                                                self.person_poss, self.np, self.prep,
                                                self.adj, self.adv, self.noun)
        return [
            lambda: f"{ps()} {ved[vi()]} {np()} {prep()} {np()}.",
            lambda: f"{pp()} {noun()} {vs[vi()]} {adv()} {prep()} {np()}.",
            lambda: f"{np()} {ved[vi()]} {po()} {prep()} {np()}.",
            lambda: f"when {ps()} {ved[vi()]} {np()}, {ps()} {ved[vi()]} {np()} {adv()}.",
            lambda: f"{ps()} said that {pp()} {noun()} had {ved[vi()]} {np()}.",
            lambda: f"{np()} {vs[vi()]} {prep()} {np()} and {vs[vi()]} {adv()}.",
            lambda: f"there is {np()} {prep()} {np()} that {vs[vi()]} {adj()}.",
            lambda: f"{np()} was {adj()}, {self._conj()} {np()} {ved[vi()]} {prep()} {np()}.",
            lambda: f"{ps()} {ved[vi()]} {self.refl()} {prep()} {np()} {prep()} {np()}.",
            lambda: f"did {ps()} {vb[vi()]} {np()} {prep()} {pp()} {noun()}?",
            lambda: f"{ps()} was {ving[vi()]} {np()} with {po()} {prep()} {np()}.",
            lambda: f"{adv()}, {np()} {ved[vi()]} {np()} {prep()} {np()}.",
            lambda: f"{np()} and {np()} {ved[vi()]} {adj()} {prep()} {np()}.",
            lambda: f"\u201c{np()} is {adj()},\u201d {ps()} {ved[vi()]}.",
        ]

    def _conj(self):
        return CONJUNCTIONS[int(self.rand() * len(CONJUNCTIONS))]

    def sentence(self):
        t = self.templates
        s = t[int(self.rand() * len(t))]()
        if s[0] == "\u201c":
            return "\u201c" + s[1].upper() + s[2:]
        return s[0].upper() + s[1:]

    def paragraph(self, lo, hi):
        rng = self.rng
        n = rng.randint(lo, hi)
        sent = self.sentence
        return " ".join([sent() for _ in range(n)])

    def text(self, lo, hi):
        """Prose of lo..hi sentences, sometimes split into paragraphs by newlines."""
        n = self.rng.randint(lo, hi)
        if n > 6 and self.rand() < 0.4:
            parts, left = [], n
            while left > 0:
                k = min(left, self.rng.randint(2, 6))
                parts.append(self.paragraph(k, k))
                left -= k
            return "\n\n".join(parts)
        return self.paragraph(n, n)

    def start_record(self):
        # 30% of records carry no gendered mention at all; the rest carry them at a rate
        # of very roughly one per 15-25 words (see --stats).
        if self.rand() < 0.26:
            self.gendered = 0.0
        else:
            self.gendered = 0.45 + 0.4 * self.rand()

    # Records ------------------------------------------------------------------------
    def plain(self, rid):
        self.start_record()
        return {"id": rid, "text": self.text(1, 14)}

    def chat(self, rid):
        self.start_record()
        rng = self.rng
        msgs = []
        if self.rand() < 0.3:
            msgs.append({"role": "system", "content": ROLES_SYSTEM[rng.randrange(3)]})
        for _ in range(rng.randint(1, 3)):
            msgs.append({"role": "user", "content": self.text(1, 3)})
            if self.rand() < 0.2:
                items = "\n".join(f"{i}. {self.sentence()}" for i in range(1, rng.randint(3, 5)))
                msgs.append({"role": "assistant", "content": self.paragraph(1, 2) + "\n" + items})
            else:
                msgs.append({"role": "assistant", "content": self.text(2, 8)})
        return {"id": rid, "messages": msgs}

    def extra(self, rid):
        self.start_record()
        return {"id": rid, "title": self.np().capitalize(), "text": self.text(2, 10),
                "meta": {"source": SOURCES[self.rng.randrange(len(SOURCES))],
                         "score": self.rng.randrange(-5, 400), "lang": "en",
                         "reviewed": self.rand() < 0.5, "note": None}}


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--mb", type=float, default=10.0,
                    help="target uncompressed size in MB (10^6 bytes); the last record may "
                         "overshoot by a few kB (default 10)")
    ap.add_argument("--shape", choices=("chat", "plain", "mixed"), default="mixed")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--out", "-o", default="-", help="output file ('-' is stdout, default)")
    ap.add_argument("--stats", action="store_true",
                    help="print records, words, mentions and mention density to stderr")
    args = ap.parse_args(argv)

    gen = Generator(Vocabulary(), args.seed)
    target = int(args.mb * 1_000_000)
    out = sys.stdout.buffer if args.out == "-" else open(args.out, "wb")
    dumps = json.JSONEncoder(ensure_ascii=False, separators=(", ", ": ")).encode
    rand = gen.rand
    written = records = with_mention = words = mention_words = 0
    prefix = f"{args.shape[0]}{args.seed}-"
    chunk, chunk_bytes = [], 0
    want_words = args.stats
    try:
        while written < target:
            rid = f"{prefix}{records:09d}"
            before = gen.mentions
            if args.shape == "plain":
                rec = gen.plain(rid)
            elif args.shape == "chat":
                rec = gen.chat(rid)
            else:
                r = rand()
                rec = gen.plain(rid) if r < 0.5 else gen.chat(rid) if r < 0.85 else gen.extra(rid)
            line = (dumps(rec) + "\n").encode("utf-8")
            records += 1
            if want_words:
                if "text" in rec:
                    n = len(rec["text"].split())
                else:
                    n = sum(len(m["content"].split()) for m in rec["messages"])
                words += n
                if gen.mentions > before:
                    mention_words += n
            if gen.mentions > before:
                with_mention += 1
            chunk.append(line)
            chunk_bytes += len(line)
            written += len(line)
            if chunk_bytes >= (4 << 20):
                out.write(b"".join(chunk))
                chunk, chunk_bytes = [], 0
        out.write(b"".join(chunk))
        out.flush()
    except BrokenPipeError:
        return 1
    finally:
        if out is not sys.stdout.buffer:
            out.close()
    mentions = gen.mentions
    if args.stats:
        print(f"records {records}, bytes {written}, words {words}, mentions {mentions}, "
              f"words per mention {words / max(mentions, 1):.1f} "
              f"({mention_words / max(mentions, 1):.1f} in records with one), "
              f"records with a mention {100.0 * with_mention / max(records, 1):.1f}%",
              file=sys.stderr)
    return 0


if __name__ == "__main__":
    sys.exit(main())
