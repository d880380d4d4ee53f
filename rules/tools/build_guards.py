#!/usr/bin/env python3
"""Builds rules/en-gender/guards-wordnet.txt: the sex-specific guard phrases of the English pack
(a record holding one is not rewritten on the gender axis; rules/README.md, `[guard REASON]`).

Reproducible: the same inputs give byte-identical output (no dates, no randomness, sorted).
Python 3 standard library only. Inputs (none is committed; install them first):

  * WordNet 3.0 (Princeton University) as shipped by the Debian package wordnet-base
    (/usr/share/wordnet: data.noun, index.noun, noun.exc, data.verb, index.verb, verb.exc,
    data.adj, index.adj, adj.exc, index.adv, cntlist.rev);
  * rules/en-gender/guards.txt (hand-written guards): a phrase listed there is left out here,
    since a pack may list a phrase only once.

Method (also written into the output header, with counts):

  1. Roots: the noun synsets of ROOTS, each named by a lemma and its WordNet sense number
     (pregnancy, childbirth, conception, menstruation, lactation, the female and male
     reproductive systems and genitalia, sex-specific conditions and procedures ...).
  2. The closure of each root under hyponym pointers (~) and, for anatomy, part meronyms (%p),
     followed transitively.
  3. Conditions and procedures of those organs: a noun.state or noun.act synset (lexicographer
     files 26 and 04) whose gloss names an organ lemma of step 2 (a one-word lower-case lemma
     of an anatomy closure whose first sense is in that closure, as a whole word) joins the set
     ("cancer of the prostate gland").
  4. Adjectives and verbs derived from the set: an adjective or verb synset with a pointer of
     DERIVED_POINTERS (+ derivationally related, \\ pertainym, = attribute) to a synset of the
     set joins it ("pregnant", "menstruate").
  5. A lemma of the set is kept only if its FIRST sense in its part of speech (WordNet orders
     senses by tagged frequency) is in the set: "birth" (first sense: the time when something
     begins), "labor" (work), "breast" (chest), "period", "conception" (idea), "deliver" are
     dropped; "pregnancy", "childbirth", "uterus", "menstruate" are kept. Lemmas with a
     capital letter or a digit (proper names, abbreviations such as "ED", "OB") and lemmas of
     fewer than MIN_LETTERS letters are dropped too.
     5b. A phrase is dropped when its word's tagged occurrences in SemCor (cntlist.rev),
     over all lemmas it may be a form of and all parts of speech, fall more often on senses
     outside the set ("come", "cock", "brooding"). 5c. A one-word phrase is dropped when it is,
     or may be a form of, a lemma of any part of speech whose first sense is outside the set
     ("births": birth; "lactate": the salt). EXCLUDED lists lemmas left out by hand.
  6. Forms: nouns with their plurals (noun.exc where it lists one, else the regular spelling);
     verbs with 3sg, past and -ing (verb.exc where it lists one, else the regular spelling);
     adjectives as they are. Underscores become spaces.

Output: a pack file with one `[guard sex-specific]` section, one phrase a line, sorted.
"""
import argparse
import os
import re
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import build_names  # noqa: E402  (BuildError)
import build_person_context as wn  # noqa: E402  (WordNet readers, plural)
import build_verbs  # noqa: E402  (verb inflection, licence)

REPO = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DEFAULT_OUT = os.path.join(REPO, "rules", "en-gender", "guards-wordnet.txt")
HAND = os.path.join(REPO, "rules", "en-gender", "guards.txt")
REASON = "sex-specific"
MIN_LETTERS = 4

# (lemma, WordNet 3.0 noun sense number, follow part meronyms): the roots of step 1.
ROOTS = [
    ("pregnancy", 1, False),             # the state of being pregnant
    ("gestation", 1, False),             # the period during which an embryo develops
    ("conception", 2, False),            # the act of becoming pregnant
    ("parturition", 1, False),           # the process of giving birth (birth, calving ...)
    ("childbirth", 1, False),            # the parturition process in human beings
    ("abortion", 1, False),              # termination of pregnancy
    ("miscarriage", 2, False),           # a natural loss of the products of conception
    ("menstruation", 1, False),
    ("menarche", 1, False),
    ("menopause", 1, False),
    ("ovulation", 1, False),
    ("lactation", 1, False),             # the period following birth when milk is secreted
    ("lactation", 2, False),             # the production and secretion of milk
    ("lactation", 3, False),             # feeding an infant at the breast
    ("obstetrics", 1, False),
    ("gynecology", 1, False),
    ("obstetrician", 1, False),
    ("gynecologist", 1, False),
    ("midwife", 1, False),
    ("female_reproductive_system", 1, True),
    ("male_reproductive_system", 1, True),
    ("female_genitalia", 1, True),
    ("male_genitalia", 1, True),
    ("mammary_gland", 1, True),          # milk-secreting organ of female mammals
    ("sperm", 1, False),                 # the male gamete
    ("semen", 1, False),
    ("ovum", 1, False),                  # the female gamete
    ("impotence", 2, False),             # inability (usually of the male) to copulate
    ("prostate_cancer", 1, False),
    ("testicular_cancer", 1, False),
    ("endometriosis", 1, False),
    ("premenstrual_syndrome", 1, False),
    ("castration", 1, False),            # neutering a male animal by removing the testicles
    ("castration", 2, False),            # surgical removal of the testes or ovaries
    ("eunuch", 1, False),
    ("maiden_name", 1, False),           # a woman's surname before marriage
]
# Lemmas of the closures left out by hand, as a pattern over the whole lemma (common practice,
# general knowledge of English): hatching and being born are the young's acts, not the
# mother's (the labelling guide counts them as not sex-specific); the urethra, nipples, a
# prolapse, elephantiasis and the flagellum's "whiplike" belong to both sexes; "parity",
# "para", "confinement", "erection", "cervical" (of the neck, as guards.txt says) and "seminal"
# (a seminal thinker: tests/external/real-text, brown-cg02) have common senses in ordinary text
# that WordNet ranks lower.
EXCLUDED = re.compile(r"(?:hatch|hatching|be_born|urethr\w*|nipples?|mamm?illae?|"
                      r"prolaps\w*|elephantiasis|ventral|whiplike|lash-like|parity|para|"
                      r"confinement|erection|cervical|seminal)")
CONDITION_FILES = {4, 26}
LATIN_ENDINGS = ("is", "us", "ia", "ae", "um", "a", "x")  # noun.act, noun.state (lexnames(5WN))
DERIVED_POINTERS = {"+", "\\", "="}


def read_glosses(path):
    out = {}
    for line in wn.read_lines(path):
        if line and not line.startswith(" ") and " | " in line:
            out[line.split(" ", 1)[0]] = line.split(" | ", 1)[1]
    return out


def read_exc(path):
    out = {}
    for line in wn.read_lines(path):
        f = line.split()
        if len(f) >= 2:
            out.setdefault(f[1], []).append(f[0])
    return out


def closure(nouns, root, parts):
    seen, stack = set(), [root]
    while stack:
        off = stack.pop()
        if off in seen:
            continue
        seen.add(off)
        for sym, target, pos in nouns[off].ptrs:
            if pos == "n" and (sym == "~" or (parts and sym == "%p")):
                stack.append(target)
    return seen


def root_sets(nouns, index):
    """(all synsets of the roots' closures, the anatomy closures' synsets)."""
    found, anatomy = set(), set()
    for lemma, sense, parts in ROOTS:
        entry = index.get(lemma)
        if entry is None or len(entry[1]) < sense:
            raise build_names.BuildError(f"WordNet has no noun sense {sense} of {lemma!r}")
        part = closure(nouns, entry[1][sense - 1], parts)
        found |= part
        if parts:
            anatomy |= part
    return found, anatomy


def conditions(nouns, index, glosses, anatomy):
    """Step 3: noun.act and noun.state synsets whose gloss names an organ of the closures (a
    one-word lemma whose first sense is in them: "ball" and "member" are not organs here)."""
    organs = {w for off in anatomy for w in nouns[off].words
              if w.isalpha() and w.islower() and len(w) >= MIN_LETTERS
              and index[w][1][0] in anatomy}
    pattern = re.compile(r"\b(?:" + "|".join(sorted(organs)) + r")\b")
    return {off for off, s in nouns.items()
            if s.lexfile in CONDITION_FILES and pattern.search(glosses[off].split(";")[0])}


def derived(data, nouns_set):
    """Step 4: synsets of another part of speech that point at a synset of the set."""
    return {off for off, s in data.items()
            if any(sym in DERIVED_POINTERS and pos == "n" and t in nouns_set
                   for sym, t, pos in s.ptrs)}


def kept_lemmas(data, index, synsets):
    """Step 5: lemmas of the synsets whose first sense is one of them; the rest dropped."""
    kept, dropped = set(), set()
    for off in synsets:
        for w in data[off].words:
            w = re.sub(r"\(.*\)$", "", w)  # adjective markers such as (a), (p)
            lemma = w.lower()
            if w != lemma or any(c.isdigit() for c in w) or \
                    sum(c.isalpha() for c in w) < MIN_LETTERS:
                dropped.add(w)
            elif EXCLUDED.fullmatch(lemma):
                dropped.add(lemma)
            elif index[lemma][1][0] in synsets:
                kept.add(lemma)
            else:
                dropped.add(lemma)
    return kept, dropped - kept


def read_sense_counts(path, indexes):
    """lemma -> [((pos, synset offset), tagged occurrences)] from cntlist.rev, whose lines are
    `lemma%ss_type:... sense_number count`; the index file of the part of speech turns the sense
    number into the synset. Adjective satellites (ss_type 5) count as adjectives."""
    pos_of = {"1": "n", "2": "v", "3": "a", "4": "r", "5": "a"}
    out = {}
    for line in wn.read_lines(path):
        f = line.split()
        if len(f) != 3:
            continue
        lemma, rest = f[0].split("%", 1)
        pos = pos_of[rest[0]]
        senses = indexes.get(pos, {}).get(lemma, (0, []))[1]
        if int(f[1]) <= len(senses):
            out.setdefault(lemma, []).append(((pos, senses[int(f[1]) - 1]), int(f[2])))
    return out


def base_forms(word, exceptions):
    """word and the lemmas it may be a form of (noun and verb detachment rules, .exc files)."""
    if word in exceptions:  # an irregular form ("testes") is a form of its listed bases only
        return {word} | exceptions[word]
    out = {word} | set(build_verbs.morphy_bases(word))
    for suffix, ending in (("s", ""), ("es", ""), ("ies", "y")):
        if word.endswith(suffix) and len(word) > len(suffix):
            out.add(word[: len(word) - len(suffix)] + ending)
    return out


def mostly_elsewhere(phrase, counts, exceptions, inside):
    """Step 5b: whether the word's tagged occurrences in SemCor (cntlist.rev), over all its
    lemmas and parts of speech, fall more often on senses outside the set than inside."""
    word = phrase.replace(" ", "_")
    hits = [(key, n) for lemma in base_forms(word, exceptions) for key, n in counts.get(lemma, [])]
    inn = sum(n for key, n in hits if key in inside)
    return sum(n for key, n in hits) - inn > inn


def other_first_sense(phrase, indexes, exceptions, inside):
    """Step 5c: whether a one-word phrase is, or may be a form of, a lemma of any part of
    speech whose first sense is outside the set ("lactate" the salt, "births")."""
    if " " in phrase:
        return False
    for lemma in base_forms(phrase, exceptions):
        for pos, index in indexes.items():
            if lemma in index and (pos, index[lemma][1][0]) not in inside:
                return True
    return False


def noun_forms(lemma, irregular):
    if lemma.endswith(LATIN_ENDINGS) and lemma not in irregular:
        return [lemma]  # "mastitis", "uterus", "labia": no regular plural (noun.exc lists some)
    if "_" in lemma:
        head, _, last = lemma.rpartition("_")
        return [lemma] + [head + "_" + p for p in wn.plural(last, irregular)]
    return [lemma] + wn.plural(lemma, irregular)


def verb_forms(lemma, irregular):
    if "_" in lemma:  # a phrasal verb inflects its first word: give_birth -> gave_birth
        head, _, rest = lemma.partition("_")
        return [f + "_" + rest for f in verb_forms(head, irregular)]
    if lemma in irregular:
        return [lemma] + irregular[lemma] + [build_verbs.third_singular(lemma),
                                              build_verbs.present_participle(lemma)]
    return [lemma, build_verbs.third_singular(lemma), build_verbs.regular_past(lemma),
            build_verbs.present_participle(lemma)]


def hand_phrases():
    out, section = set(), None
    with open(HAND, encoding="utf-8") as f:
        for line in f:
            body = line.split("#", 1)[0].strip()
            if body.startswith("[") and body.endswith("]"):
                section = body
            elif body and section and section.startswith("[guard"):
                out.add(body.lower())
    return out


def build(wordnet):
    path = lambda name: os.path.join(wordnet, name)
    nouns, noun_index = wn.read_data(path("data.noun")), wn.read_index(path("index.noun"))
    verbs, verb_index = wn.read_data(path("data.verb")), wn.read_index(path("index.verb"))
    adjs, adj_index = wn.read_data(path("data.adj")), wn.read_index(path("index.adj"))
    found, anatomy = root_sets(nouns, noun_index)
    conds = conditions(nouns, noun_index, read_glosses(path("data.noun")), anatomy) - found
    noun_set = found | conds
    st = {"roots": len(ROOTS), "closure": len(found), "conditions": len(conds)}
    phrases, dropped = set(), set()
    noun_irr, verb_irr = read_exc(path("noun.exc")), read_exc(path("verb.exc"))
    for data, index, synsets, forms in (
            (nouns, noun_index, noun_set, lambda l: noun_forms(l, noun_irr)),
            (verbs, verb_index, derived(verbs, noun_set), lambda l: verb_forms(l, verb_irr)),
            (adjs, adj_index, derived(adjs, noun_set), lambda l: [l])):
        kept, gone = kept_lemmas(data, index, synsets)
        dropped |= {w.replace("_", " ") for w in gone}
        for lemma in kept:
            phrases.update(f.replace("_", " ") for f in forms(lemma))
    indexes = {"n": noun_index, "v": verb_index, "a": adj_index,
               "r": wn.read_index(path("index.adv"))}
    counts = read_sense_counts(path("cntlist.rev"), indexes)
    inside = {("n", o) for o in noun_set} | {("v", o) for o in derived(verbs, noun_set)} | \
        {("a", o) for o in derived(adjs, noun_set)}
    exceptions = {}
    for name in ("noun.exc", "verb.exc", "adj.exc"):
        for base, inflected in read_exc(path(name)).items():
            for form in inflected:
                exceptions.setdefault(form, set()).add(base)
    elsewhere = {p for p in phrases if mostly_elsewhere(p, counts, exceptions, inside)
                 or other_first_sense(p, indexes, exceptions, inside)
                 or sum(c.isalpha() for c in p) < MIN_LETTERS}
    st["elsewhere"] = sorted(elsewhere)
    phrases -= elsewhere
    hand = hand_phrases()
    st["hand"] = len(phrases & hand)
    st["dropped"] = sorted(dropped)
    return sorted(phrases - hand), st, build_verbs.read_licence(path("index.verb"))


def render(phrases, st, licence):
    head = [
        "Generated by rules/tools/build_guards.py; do not edit (re-run it instead; its --check",
        "runs as a ctest test). Sex-specific phrases: a record holding one is not rewritten on",
        "the gender axis (the manifest counts it under the reason sex-specific).",
        "",
        "Source: WordNet 3.0 (Princeton University), Debian package wordnet-base",
        "(/usr/share/wordnet). Method (build_guards.py's docstring says it in full): the noun",
        f"synsets under {st['roots']} roots (pregnancy, gestation, conception, parturition,",
        "childbirth, abortion, miscarriage, menstruation, menarche, menopause, ovulation,",
        "lactation, obstetrics, gynecology, obstetrician, gynecologist, midwife, the female and",
        "male reproductive systems and genitalia with their parts, mammary gland, sperm, semen,",
        "ovum, impotence, prostate and testicular cancer, endometriosis, premenstrual syndrome,",
        "castration, eunuch, maiden name) by hyponyms (and part meronyms for anatomy):",
        f"{st['closure']} synsets; {st['conditions']} noun.act/noun.state synsets whose gloss names",
        "one of those organs; adjectives and verbs derived from them. A lemma is kept only if",
        "its first WordNet sense is one of these synsets; lemmas with capitals or digits or",
        "under four letters are dropped. Nouns get plurals, verbs their inflections.",
        f"{len(phrases)} phrases; {st['hand']} more are in guards.txt (hand-written) and left out",
        f"here; {len(st['dropped'])} lemmas dropped by the first-sense and spelling rule, e.g.:",
    ]
    dropped = ", ".join(st["dropped"][:400])
    head += [l for l in _wrap(dropped)]
    head += ["", "WordNet licence:"] + licence
    lines = ["# " + l if l else "#" for l in head]
    lines += ["", f"[guard {REASON}]"] + phrases
    return "\n".join(lines) + "\n"


def _wrap(text, width=92):
    line = ""
    for word in text.split(" "):
        if line and len(line) + 1 + len(word) > width:
            yield line
            line = word
        else:
            line = f"{line} {word}" if line else word
    if line:
        yield line


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--wordnet", default=build_verbs.DEFAULT_WORDNET)
    p.add_argument("--out", default=DEFAULT_OUT)
    p.add_argument("--check", action="store_true")
    args = p.parse_args()
    return build_names.build_and_write("build_guards.py", lambda: render(*build(args.wordnet)), args.out, args.check)


if __name__ == "__main__":
    sys.exit(main())
