#!/usr/bin/env python3
"""Builds rules/en-gender/verbs.data, the English verb forms the rewrite engine needs to make a
verb agree with a plural subject ("she goes" -> "they go", "she's gone" -> "they've gone").

Reproducible: the same inputs give byte-identical output (no dates, no randomness, sorted).
Python 3 standard library only. Input: WordNet 3.0 (Princeton University) as shipped by the
Debian package wordnet-base (/usr/share/wordnet/): index.verb (the verb lemmas), verb.exc
(the irregular inflections) and index.adj (the adjective lemmas). Nothing else.

The method (also written into the output header):

  1. Lemmas: the first field of every index.verb line, kept when it is one word of the letters
     a-z (collocations such as "ask_for" and hyphenated verbs such as "ad-lib" are left out:
     the engine sees single tokens). "be" is left out: its forms carry person and number
     (is/are, was/were) and the engine keeps them in a small hand list (verb_agreement.cpp).
  2. verb.exc lines "form base [base...]" whose form is one word of the letters a-z and
     differs from its base are sorted by their form: a form ending in "ing" is a present
     participle; any other form ending in "s" is a third-person singular present (verb.exc
     lists these only where the spelling is irregular: has, quizzes, gasses); every other form
     is a past tense or past participle (verb.exc does not say which; the engine treats both
     alike). Bases that are not lemmas of step 1 are dropped, as WordNet's morphy would not
     return them either.
  3. For each lemma, the past and -ing forms come from verb.exc when verb.exc has one of
     that kind for it, and are generated from the lemma by the regular English spelling
     rules otherwise; the 3sg form is always generated, and verb.exc's 3sg forms are added
     (verb.exc lists "swops swap" but not the regular "swaps"). The spelling rules:
       3sg: ends in s, x, z, ch or sh -> +es; consonant + y -> ies; consonant + o -> oes
            (do, go, echo, veto); else +s.
       past: ends in e -> +d; consonant + y -> ied; else +ed.
       -ing: ends in e but not ee, ie, oe or ye -> drop the e, +ing; else +ing (verb.exc
            lists the -ying forms: dying, lying, tying; the rest keep the e: birdieing).
     verb.exc spells out the doubled consonants (abetted, abetting), so the regular rules
     never double. One addition: when a past form in verb.exc is the lemma + "t" or the lemma
     less its last letter + "t" (dreamt, learnt, spelt, built), the regular -ed form is added
     too, because WordNet lists such -t forms as exceptions while the -ed form (dreamed,
     learned) is regular and so not listed. This may add a rare form (builded) that does no
     harm: it is only ever looked up, never produced. A small hand list (HAND_PASTS below,
     from memory) gives the pasts spelled like the lemma (put, cut, read), which verb.exc
     does not list, and regular pasts of a second sense that an irregular entry hides
     (lied beside lay, hanged beside hung).
  4. Check against WordNet's morphy (morphy(7WN), rules of detachment for verbs: "s" -> "",
     "ies" -> "y", "es" -> "e", "es" -> "", "ed" -> "e", "ed" -> "", "ing" -> "e",
     "ing" -> ""): every generated form must detach back to its lemma by one of those rules,
     and every form taken from verb.exc maps to its lemma there; the build stops otherwise.
     One kind is exempt: morphy has no "ied" -> "y" rule for verbs (verb.exc lists most such
     pasts: "tried try"), so the consonant+y pasts verb.exc leaves out rest on the spelling
     rule alone; the header says how many.
  5. Past forms that are also adjective lemmas in index.adj (tired, married, gone) are
     listed, so the engine can tell where "she's X" could be "she is X" or "she has X".

The output starts with the WordNet licence, copied from the top of index.verb (it asks that
its notice appear on all copies, modifications included).

Output format (documented in the output header as well): UTF-8 text (ASCII in fact), one
record per line, fields separated by one space, lines starting with "#" are comments.
  format evenhand-verbs 1           the first record; the format version
  v LEMMA 3SG PAST ING              one verb; 3SG, PAST and ING are comma-separated lists
  a FORM                            a past form that is also an adjective
"v" lines are sorted by lemma, "a" lines by form.

Usage: python3 rules/tools/build_verbs.py [--check] [--wordnet DIR] [--out PATH]
  --check  compare with the existing output instead of writing it; exit 1 if different.
"""

import argparse
import os
import re
import sys

REPO = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DEFAULT_WORDNET = "/usr/share/wordnet"
DEFAULT_OUT = os.path.join(REPO, "rules", "en-gender", "verbs.data")
WORD = re.compile(r"^[a-z]+$")
VOWELS = set("aeiou")

# Past forms verb.exc cannot give (from memory, general knowledge of English): verbs whose past
# tense or past participle is spelled like the lemma (verb.exc lists only forms that differ
# from their base: "came come" but not the participle "come"), and regular pasts of a second
# sense hidden by an irregular entry (verb.exc has "lay lie" and "lain lie" but not "lied").
# A lemma listed here takes these forms plus its verb.exc pasts, and no generated one ("puted").
HAND_PASTS = {
    "bet": ["bet"], "bid": ["bid"], "broadcast": ["broadcast"], "burst": ["burst"],
    "cast": ["cast"], "cost": ["cost"], "cut": ["cut"], "forecast": ["forecast"],
    "hit": ["hit"], "hurt": ["hurt"], "let": ["let"], "put": ["put"], "quit": ["quit"],
    "read": ["read"], "rid": ["rid"], "set": ["set"], "shed": ["shed"], "shut": ["shut"],
    "slit": ["slit"], "split": ["split"], "spread": ["spread"], "thrust": ["thrust"],
    "upset": ["upset"], "fit": ["fit"], "knit": ["knit"], "wed": ["wed"], "beat": ["beat"],
    "come": ["come"], "become": ["become"], "overcome": ["overcome"], "run": ["run"],
    "outrun": ["outrun"], "overrun": ["overrun"],
    "lie": ["lied"], "hang": ["hanged"], "shine": ["shined"], "weave": ["weaved"],
}

# Rules of detachment for verbs, morphy(7WN): (suffix, ending).
MORPHY_VERB_RULES = [("s", ""), ("ies", "y"), ("es", "e"), ("es", ""), ("ed", "e"), ("ed", ""),
                     ("ing", "e"), ("ing", "")]


def fail(msg):
    sys.stderr.write("build_verbs.py: " + msg + "\n")
    sys.exit(2)


def read_lines(path):
    try:
        with open(path, encoding="ascii") as f:
            return f.read().split("\n")
    except OSError as e:
        fail("cannot read %s: %s (install the Debian package wordnet-base)" % (path, e))


def read_licence(path):
    """The WordNet licence as index.verb carries it: its leading lines that start with a space
    ("  1 This software and database is ..."), without the line numbers."""
    out = []
    for line in read_lines(path):
        if not line.startswith(" "):
            break
        out.append(re.sub(r"^\s*\d+ ?", "", line).rstrip())
    if not out:
        fail("no licence lines at the top of %s" % path)
    return out


def read_index(path):
    """The lemmas of a WordNet index file (lines not starting with a space)."""
    out = set()
    for line in read_lines(path):
        if not line or line.startswith(" "):
            continue
        out.add(line.split(" ", 1)[0])
    return out


def third_singular(lemma):
    if lemma.endswith(("s", "x", "z", "ch", "sh")):
        return lemma + "es"
    if len(lemma) >= 2 and lemma.endswith("y") and lemma[-2] not in VOWELS:
        return lemma[:-1] + "ies"
    if len(lemma) >= 2 and lemma.endswith("o") and lemma[-2] not in VOWELS:
        return lemma + "es"
    return lemma + "s"


def regular_past(lemma):
    if lemma.endswith("e"):
        return lemma + "d"
    if len(lemma) >= 2 and lemma.endswith("y") and lemma[-2] not in VOWELS:
        return lemma[:-1] + "ied"
    return lemma + "ed"


def present_participle(lemma):
    if lemma.endswith("e") and len(lemma) >= 3 and not lemma.endswith(("ee", "ie", "oe", "ye")):
        return lemma[:-1] + "ing"
    return lemma + "ing"


def morphy_bases(form):
    """The candidate bases of `form` by the verb rules of detachment (before the lemma check)."""
    out = []
    for suffix, ending in MORPHY_VERB_RULES:
        if form.endswith(suffix) and len(form) > len(suffix):
            out.append(form[: len(form) - len(suffix)] + ending)
    return out


def build(wordnet):
    lemmas = {w for w in read_index(os.path.join(wordnet, "index.verb")) if WORD.match(w)}
    lemmas.discard("be")
    adjectives = read_index(os.path.join(wordnet, "index.adj"))

    exc = {"s": {}, "past": {}, "ing": {}}  # kind -> lemma -> set of forms
    dropped = 0
    for line in read_lines(os.path.join(wordnet, "verb.exc")):
        fields = line.split()
        if len(fields) < 2:
            continue
        form, bases = fields[0], fields[1:]
        if not WORD.match(form):
            continue
        if form.endswith("ing"):
            kind = "ing"
        elif form.endswith("s"):
            kind = "s"
        else:
            kind = "past"
        for base in bases:
            if base == form or base == "be":
                continue
            if base not in lemmas:
                dropped += 1
                continue
            exc[kind].setdefault(base, set()).add(form)

    records = []
    unchecked = []
    for lemma in sorted(lemmas):
        forms = {}
        for kind, gen in (("s", third_singular), ("past", regular_past),
                          ("ing", present_participle)):
            listed = set(exc[kind].get(lemma, ()))
            if kind == "s":
                # verb.exc lists 3sg forms only beside the regular one (quizzes, swops for
                # swap), so the generated form is always kept too.
                chosen = listed | {gen(lemma)}
            elif listed:
                chosen = set(listed)
                if kind == "past" and any(f in (lemma + "t", lemma[:-1] + "t") and f != lemma
                                          for f in listed):
                    chosen.add(gen(lemma))
            else:
                chosen = {gen(lemma)}
            if kind == "past" and lemma in HAND_PASTS:
                hand = set(HAND_PASTS[lemma])
                chosen = (chosen if listed else set()) | hand
                listed |= hand
            for f in chosen:
                if f in listed or lemma in morphy_bases(f):
                    continue
                # morphy has no "ied" -> "y" rule for verbs (verb.exc lists 279 such pasts,
                # e.g. "tried try"); the other -ied pasts are left to the spelling rule.
                if kind == "past" and f.endswith("ied") and lemma.endswith("y"):
                    unchecked.append(f)
                    continue
                fail("generated form %r does not detach back to %r by morphy's rules"
                     % (f, lemma))
            forms[kind] = sorted(chosen)
        records.append((lemma, forms))

    past_forms = {f for _, forms in records for f in forms["past"]}
    adj_pasts = sorted(f for f in past_forms if f in adjectives)
    licence = read_licence(os.path.join(wordnet, "index.verb"))
    return records, adj_pasts, dropped, len(unchecked), licence


def render(records, adj_pasts, dropped, unchecked, licence):
    out = []
    out.append("# verbs.data: English verb forms for subject-verb agreement, built by")
    out.append("# rules/tools/build_verbs.py from WordNet 3.0 (Princeton University; Debian package")
    out.append("# wordnet-base: index.verb, verb.exc, index.adj). Do not edit: re-run the tool.")
    out.append("#")
    out.append("# The WordNet licence, as the WordNet files carry it:")
    for line in licence:
        out.append(("# " + line).rstrip())
    out.append("#")
    out.append("# Records, one a line, fields separated by one space:")
    out.append("#   format evenhand-verbs 1     first record: the format and its version")
    out.append("#   v LEMMA 3SG PAST ING        a verb: its lemma (base form), third-person singular")
    out.append("#                               present, past tense or past participle forms,")
    out.append("#                               present participles; each list comma-separated")
    out.append("#   a FORM                      a past form that WordNet also lists as an adjective")
    out.append("# Method (see build_verbs.py): lemmas are the one-word a-z entries of index.verb,")
    out.append("# except \"be\" (hand list in the engine). Past and -ing forms come from verb.exc")
    out.append("# where it lists one for the lemma (a form ending in -ing is a present participle,")
    out.append("# another ending in -s a 3sg present, any other a past form), and are otherwise")
    out.append("# generated; the 3sg is always generated and verb.exc's 3sg forms are added. The")
    out.append("# regular spelling rules (3sg: s/x/z/ch/sh +es, consonant+y -ies,")
    out.append("# consonant+o +es, else +s; past: e +d, consonant+y -ied, else +ed; -ing: e (not")
    out.append("# ee/ie/oe/ye) -ing, else +ing), checked to detach back to the lemma by")
    out.append("# WordNet's morphy rules. A -t past in verb.exc (dreamt) adds the regular -ed too.")
    out.append("# A hand list (from memory) adds pasts spelled like the lemma (put) and hidden")
    hand = ", ".join("%s %s" % (k, "/".join(v)) for k, v in sorted(HAND_PASTS.items())) + "."
    line = "# regular ones (lied):"
    for word in hand.split(" "):
        if len(line) + 1 + len(word) > 92:
            out.append(line)
            line = "#  "
        line += " " + word
    out.append(line)
    out.append("# morphy has no verb rule ied -> y, so %d consonant+y pasts not in verb.exc (-ied)"
               % unchecked)
    out.append("# rest on the spelling rule alone.")
    out.append("# %d lemmas, %d adjective past forms, %d verb.exc bases not in index.verb dropped."
               % (len(records), len(adj_pasts), dropped))
    out.append("format evenhand-verbs 1")
    for lemma, forms in records:
        out.append("v %s %s %s %s" % (lemma, ",".join(forms["s"]), ",".join(forms["past"]),
                                      ",".join(forms["ing"])))
    for f in adj_pasts:
        out.append("a " + f)
    return "\n".join(out) + "\n"


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--check", action="store_true")
    ap.add_argument("--wordnet", default=DEFAULT_WORDNET)
    ap.add_argument("--out", default=DEFAULT_OUT)
    args = ap.parse_args()
    text = render(*build(args.wordnet))
    if args.check:
        try:
            with open(args.out, encoding="ascii") as f:
                old = f.read()
        except OSError:
            old = None
        if old != text:
            sys.stderr.write("build_verbs.py: %s is not up to date\n" % args.out)
            return 1
        return 0
    with open(args.out, "w", encoding="ascii", newline="\n") as f:
        f.write(text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
