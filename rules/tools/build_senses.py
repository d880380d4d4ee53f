#!/usr/bin/env python3
"""Builds rules/en-gender/senses.data: word lists the engine reads to tell a person word from
another sense of it, and to notice person words the pack cannot rewrite.

Reproducible: the same inputs give byte-identical output (no dates, no randomness, sorted).
Python 3 standard library only. Inputs (none is committed; install them first):

  * WordNet 3.0 (Princeton University) as shipped by the Debian package wordnet-base
    (/usr/share/wordnet: data.noun, index.noun, noun.exc; index.verb, index.adj, index.adv);
  * rules/en-gender/words.txt and names.txt: every form of the pack's word sets and names
    (what the pack maps).

Kinds and their method (also written into the output header, with counts):

  unpaired     a gendered person word the pack has no set for ("guy", "lady", "wench"):
               (1) the noun synsets under female (female_person) and male (male_person),
               following hyponym pointers (~) transitively; (2) their one-word lower-case
               a-z lemmas whose FIRST sense (WordNet orders senses by tagged frequency) is one
               of those synsets, so that the usual meaning is a woman or a man, and that
               WordNet does not also hold as a verb, adjective or adverb ("miss", "broad",
               "flirt"); (3) minus every one-word form of words.txt and names.txt; (4) plus
               their plurals (noun.exc where it lists one, -man -> -men, else the regular
               spelling) that the pack does not map; (5) minus NEUTRAL_IN_USE, words whose
               current use is mostly sex-neutral ("fellow").
  network      a word of computing: the one-word lower-case a-z lemmas of the synsets filed
               under the topic computer science (WordNet domain pointers ;c) and of the
               synsets under computer and computer network (hyponyms, transitively) whose
               FIRST sense is one of those synsets ("server", "router"; not "guest"), with
               their plurals.
  network-sense  a form of the pack's word sets with a computing sense: a lemma (or the
               plural of one) of which some sense is one of the network synsets above
               ("host": a computer that serves others on a network).

Usage: python3 rules/tools/build_senses.py [--check] [--wordnet DIR] [--out FILE]
  --check  compare with the existing output instead of writing it; exit 1 if different, 2 if
           an input is missing.
"""
import argparse
import os
import re
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import build_names  # noqa: E402  (BuildError)
import build_person_context as bpc  # noqa: E402  (WordNet readers)
import build_verbs  # noqa: E402  (DEFAULT_WORDNET)

REPO = bpc.REPO
PACK = os.path.join(REPO, "rules", "en-gender")
DEFAULT_OUT = os.path.join(PACK, "senses.data")
FORMAT_LINE = "format evenhand-senses 1"
LEMMA = re.compile(r"[a-z]+")
# Roots, checked against WordNet: (offset in data.noun, first lemma).
SEX_ROOTS = [("09619168", "female"), ("09624168", "male")]
NETWORK_ROOTS = [("03082979", "computer"), ("03085333", "computer_network")]
COMPUTER_SCIENCE = ("06128570", "computer_science")
# Lemmas whose first WordNet sense is a man or a woman but whose current use is mostly
# sex-neutral; they are no unpaired person words. "fellow": "fellow students", "a research
# fellow", "a fellow who lends you his umbrella" (common practice; the labelled development
# half of tests/external/real-text and real-text-neutral reads it so: WordNet 3.0 gives it
# three person senses outside the male subtree, as many as inside it).
NEUTRAL_IN_USE = {"fellow"}


def check_root(nouns, off, lemma):
    if off not in nouns or nouns[off].words[0].lower() != lemma:
        raise build_names.BuildError(f"WordNet synset {off} is not '{lemma}' (WordNet 3.0?)")


def pack_forms():
    """Every form the pack maps (words.txt columns, names.txt names), lower-cased words."""
    forms = set()
    for name in ("words.txt", "names.txt"):
        path = os.path.join(PACK, name)
        try:
            with open(path, encoding="utf-8") as f:
                lines = f.read().split("\n")
        except OSError as e:
            raise build_names.BuildError(f"cannot read {path}: {e}")
        for line in lines:
            line = line.split("#", 1)[0]
            if not line.strip() or line.lstrip().startswith("["):
                continue
            for col in line.split("|"):
                words = [w for w in col.split() if not w.startswith("@")]
                if len(words) == 1:  # a multiword form is no word of its own
                    forms.add(words[0].lower())
    return forms


def lemmas(nouns, offsets):
    return {w.lower() for off in offsets for w in nouns[off].words if LEMMA.fullmatch(w)}


def plurals(word, irregular):
    if word not in irregular and word.endswith("man") and word != "human":
        return [word[:-3] + "men"]  # English compounds of man (common practice)
    return bpc.plural(word, irregular)


def with_plurals(words, irregular):
    out = set(words)
    for w in words:
        out.update(plurals(w, irregular))
    return out


def other_pos(wordnet):
    """Lemmas that WordNet also holds as a verb, adjective or adverb (index.verb/adj/adv)."""
    out = set()
    for pos in ("verb", "adj", "adv"):
        out |= set(bpc.read_index(os.path.join(wordnet, "index." + pos)))
    return out


def read_irregular(wordnet):
    irregular = {}
    for line in bpc.read_lines(os.path.join(wordnet, "noun.exc")):
        f = line.split()
        if len(f) >= 2:
            irregular.setdefault(f[1], []).append(f[0])
    return irregular


def build(args):
    nouns = bpc.read_data(os.path.join(args.wordnet, "data.noun"))
    index = bpc.read_index(os.path.join(args.wordnet, "index.noun"))
    irregular = read_irregular(args.wordnet)
    for off, lemma in SEX_ROOTS + NETWORK_ROOTS + [COMPUTER_SCIENCE]:
        check_root(nouns, off, lemma)
    forms = pack_forms()
    sexed = set()
    for off, _ in SEX_ROOTS:
        sexed |= bpc.hyponym_closure(nouns, off)
    usual = {w for w in lemmas(nouns, sexed) if index.get(w, (0, [None]))[1][0] in sexed}
    usual -= forms | other_pos(args.wordnet) | NEUTRAL_IN_USE
    unpaired = with_plurals(usual, irregular) - forms
    net = set()
    for off, _ in NETWORK_ROOTS:
        net |= bpc.hyponym_closure(nouns, off)
    cs = COMPUTER_SCIENCE[0]
    net |= {o for o, s in nouns.items() if any(p[0] == ";c" and p[1] == cs for p in s.ptrs)}
    network = with_plurals({w for w in lemmas(nouns, net) if index[w][1][0] in net}, irregular)
    sense = set()
    for w in forms:
        for lemma in {w} | {b for b, ps in irregular.items() if w in ps} | {w[:-1]}:
            if lemma in index and any(o in net for o in index[lemma][1]):
                if w == lemma or w in plurals(lemma, irregular):
                    sense.add(w)
    return render({"unpaired": unpaired, "network": network - forms, "network-sense": sense})


def render(kinds):
    out = [FORMAT_LINE,
           "# Generated by rules/tools/build_senses.py from WordNet 3.0 (Princeton University;",
           "# Debian wordnet-base) and the pack's words.txt and names.txt; do not edit by hand.",
           "# Kinds (method in the script's header): unpaired = gendered person words the pack",
           "# has no set for; network = words of computing; network-sense = pack forms with a",
           "# computing sense. One 'kind word' a line."]
    for kind in ("unpaired", "network", "network-sense"):
        out.append(f"# {kind}: {len(kinds[kind])}")
    for kind in ("unpaired", "network", "network-sense"):
        out.extend(f"{kind} {w}" for w in sorted(kinds[kind]))
    return "\n".join(out) + "\n"


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--wordnet", default=build_verbs.DEFAULT_WORDNET)
    p.add_argument("--out", default=DEFAULT_OUT)
    p.add_argument("--check", action="store_true")
    args = p.parse_args()
    return build_names.build_and_write("build_senses.py", lambda: build(args), args.out, args.check)


if __name__ == "__main__":
    sys.exit(main())
