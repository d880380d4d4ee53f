#!/usr/bin/python3
"""An independent check of `evenhand associations` (statistic, exact p-value, "too few").

The corpora are generated here, so the tables they hold are known: a record "She w w w" puts
its words in the female context only, "He w w w" in the male one, "She w w w he" in both
(windows of 10 words never cross records). The reference computes, from those tables alone,
the z of Monroe, Colaresi & Quinn (2008, "Fightin' Words", Political Analysis 16(4), eq. 22
with an informative Dirichlet prior; from memory) with numpy, and the two-sided p-value of the
exact conditional test by enumerating every placement of the target's co-occurrences with
scipy.stats.multivariate_hypergeom (source: Debian python3-scipy). Then, on generated corpora
(invented data, a statistical check): with no association, the p-values of 200 targets are
spread evenly over (0, 1] (Kolmogorov-Smirnov against uniform does not reject at 1%, fixed
seed), and 100 targets with 0 to 9 co-occurrences are "too few" by default and, without the
minimum, do not get p <= 0.05 more often than 5% (binomial test at 1%); planted associations
get small p-values.

Usage: associations_reference.py --bin PATH/evenhand. Exits 1 with the first difference.
numpy and scipy are required (.ci/deps installs them); without them the check fails.
"""
import argparse
import itertools
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
from scipy import stats

PRIOR = 100.0
FILLER = "table"
TOL = 1e-9


def fail(msg):
    print("associations reference: " + msg, file=sys.stderr)
    sys.exit(1)


def reference_z(ya, na, yb, nb, alpha):
    ya, na, yb, nb = (np.float64(v) for v in (ya, na, yb, nb))
    la = np.log((ya + alpha) / (na + PRIOR - ya - alpha))
    lb = np.log((yb + alpha) / (nb + PRIOR - yb - alpha))
    return (la - lb) / np.sqrt(1 / (ya + alpha) + 1 / (yb + alpha))


def reference_p(A, B, C, yA, yB, yC, alpha):
    """Exact two-sided p of |z| under the multivariate hypergeometric law of the placement."""
    Y = yA + yB + yC
    na, nb = A + C, B + C
    obs = abs(reference_z(yA + yC, na, yB + yC, nb, alpha))
    law = stats.multivariate_hypergeom(m=[A, B, C], n=Y)
    p = 0.0
    for kA in range(0, min(A, Y) + 1):
        for kC in range(0, min(C, Y - kA) + 1):
            kB = Y - kA - kC
            if kB > B:
                continue
            if abs(reference_z(kA + kC, na, kB + kC, nb, alpha)) >= obs * (1 - TOL):
                p += law.pmf([kA, kB, kC])
    return min(1.0, p)


class Corpus:
    """Records built from per-target placements, with the table each target ends up with."""

    def __init__(self):
        self.records = []
        self.words = 0

    def add(self, kind, words):
        self.words += len(words)
        body = " ".join(words)
        text = {"a": "She " + body, "b": "He " + body, "s": "She " + body + " he", "n": body}[kind]
        self.records.append(text)

    def write(self, path):
        with open(path, "w") as f:
            for r in self.records:
                f.write(json.dumps({"text": r}) + "\n")


def run_audit(binary, tmp, corpus, targets, extra=()):
    cpath, tpath, out = (os.path.join(tmp, n) for n in ("c.jsonl", "t.txt", "a.json"))
    corpus.write(cpath)
    with open(tpath, "w") as f:
        f.write("\n".join(targets) + "\n")
    cmd = [binary, "associations", "--pack", "en-gender", "--in", cpath, "--targets", tpath,
           "--out", out, *extra]
    r = subprocess.run(cmd, capture_output=True, text=True)
    if r.returncode != 0:
        fail("evenhand failed: " + r.stderr.strip())
    with open(out) as f:
        doc = json.load(f)
    corpus_json = doc["corpora"][0]
    result = {}
    for t in corpus_json["targets"]:
        pair = next((p for p in t["pairs"] if p["a"] == "female" and p["b"] == "male"), None)
        result[t["target"]] = (t, pair)
    return doc, corpus_json, result


def fill(kind_sizes, placements, rng):
    """kind_sizes: {kind: (records, words each)}; placements: {target: {kind: count}}.
    Places each target's tokens in random distinct slots of that kind; the rest is filler."""
    slots = {k: [FILLER] * (r * w) for k, (r, w) in kind_sizes.items()}
    free = {k: list(rng.permutation(len(s))) for k, s in slots.items()}
    for target, where in placements.items():
        for kind, count in where.items():
            if count > len(free[kind]):
                fail("generator: not enough %s slots" % kind)
            for _ in range(count):
                slots[kind][free[kind].pop()] = target
    corpus = Corpus()
    for kind, (records, width) in kind_sizes.items():
        for i in range(records):
            corpus.add(kind, slots[kind][i * width:(i + 1) * width])
    return corpus


def check_fixed_tables(binary, tmp):
    # (A, B, C, yA, yB, yC): words only in the female context, only in the male one, in
    # both, and the target's count among each. Small enough to enumerate every outcome.
    tables = [(12, 12, 0, 5, 0, 0), (20, 8, 0, 3, 3, 0), (30, 15, 6, 7, 1, 2),
              (9, 27, 9, 2, 5, 3), (40, 40, 0, 0, 0, 0), (6, 50, 4, 0, 1, 0),
              (25, 25, 10, 4, 4, 1), (18, 36, 0, 12, 6, 0),
              # lopsided: p far below e^-40 times the likeliest outcome's probability
              (600, 300, 0, 40, 2, 0), (60, 60, 30, 25, 0, 5)]
    rng = np.random.default_rng(20261205)
    for i, (A, B, C, yA, yB, yC) in enumerate(tables):
        sizes = {"a": (A, 1), "b": (B, 1), "s": (C, 1), "n": (2, 5)}
        target = "quorble"
        corpus = fill(sizes, {target: {"a": yA, "b": yB, "s": yC, "n": 1}}, rng)
        for extra in (["--min-cooccurrences", "0"], []):
            doc, cj, res = run_audit(binary, tmp, corpus, [target], extra)
            t, pair = res[target]
            N = A + B + C + 10
            c_w = yA + yB + yC + 1
            alpha = PRIOR * c_w / N
            got = (cj["words"], t["occurrences"], cj["context"]["female"], cj["context"]["male"],
                   t["cooccurrences"]["female"], t["cooccurrences"]["male"],
                   pair["shared_context"], pair["shared_cooccurrences"])
            want = (N, c_w, A + C, B + C, yA + yC, yB + yC, C, yC)
            if got != want:
                fail("table %d: counts %s, expected %s" % (i, got, want))
            z = reference_z(yA + yC, A + C, yB + yC, B + C, alpha)
            if abs(pair["z"] - z) > TOL * max(1, abs(z)):
                fail("table %d: z %r, reference %r" % (i, pair["z"], z))
            few = (yA + yB + 2 * yC) < 10
            if extra:  # no minimum: always a p-value
                p = reference_p(A, B, C, yA, yB, yC, alpha)
                if pair["too_few"] or pair["p"] is None or abs(pair["p"] - p) > TOL * p:
                    fail("table %d: p %r, reference %r" % (i, pair["p"], p))
                print("table %d %s: z %.6f p %.6g (reference z %.6f p %.6g)"
                      % (i, (A, B, C, yA, yB, yC), pair["z"], pair["p"], z, p))
            elif pair["too_few"] != few or (pair["p"] is None) != few:
                fail("table %d: too_few %r p %r with %d co-occurrences (minimum 10)"
                     % (i, pair["too_few"], pair["p"], yA + yB + 2 * yC))
            if extra == [] and doc["method"]["min_cooccurrences"] != 10:
                fail("default minimum is not 10")


def target_names(count):
    letters = "bcdfghjklmnpqrstvwxz"
    names = ["zu" + a + b + "o" for a, b in itertools.product(letters, letters)]
    return names[:count]


def check_generated(binary, tmp):
    rng = np.random.default_rng(7)
    # Unequal contexts (male twice the female), as in real text, and some shared words.
    sizes = {"a": (2500, 8), "b": (5000, 8), "s": (600, 5), "n": (300, 8)}
    slots = {k: r * w for k, (r, w) in sizes.items()}
    context = slots["a"] + slots["b"] + slots["s"]
    names = target_names(305)
    null, planted, rare = names[:200], names[200:205], names[205:]
    placements = {}
    for t in null + rare:  # no association: spread in proportion to context sizes
        m = int(rng.integers(20, 121)) if t in null else int(rng.integers(0, 10))
        split = rng.multivariate_hypergeometric([slots["a"], slots["b"], slots["s"]], m)
        placements[t] = {"a": int(split[0]), "b": int(split[1]), "s": int(split[2]), "n": 2}
    for t in planted:  # twice the female share it would have without association
        m = 60
        k_a = int(rng.binomial(m, 2 * slots["a"] / context))
        placements[t] = {"a": k_a, "b": m - k_a}
    corpus = fill(sizes, placements, rng)
    _, _, res = run_audit(binary, tmp, corpus, names)
    pvals = []
    for t in null:
        pair = res[t][1]
        if pair["too_few"] or pair["p"] is None:
            fail("null target %s: no p-value" % t)
        if not 0 < pair["p"] <= 1:
            fail("null target %s: p = %r outside (0, 1]" % (t, pair["p"]))
        pvals.append(pair["p"])
    ks = stats.kstest(pvals, "uniform")
    below = sum(p <= 0.05 for p in pvals)
    print("no association: 200 targets, KS D = %.4f, p = %.4f; %d with p <= 0.05; min p %.4g"
          % (ks.statistic, ks.pvalue, below, min(pvals)))
    if ks.pvalue < 0.01:
        fail("no association, yet the p-values are not spread evenly (KS p = %.4g)" % ks.pvalue)
    for t in planted:
        pair = res[t][1]
        print("planted %s: y %s z %.3f p %.3g" % (t, res[t][0]["cooccurrences"], pair["z"],
                                                  pair["p"]))
        if pair["p"] is None or pair["p"] > 1e-3 or pair["z"] <= 0:
            fail("planted association %s: p = %r, z = %r" % (t, pair["p"], pair["z"]))
    check_rare(binary, tmp, corpus, names, rare, res)


def check_rare(binary, tmp, corpus, names, rare, res):
    """Targets with 0 to 9 co-occurrences: "too few" by default; with no minimum, a p-value
    that is 1 without co-occurrences and not too small too often (a valid test of a discrete
    law has P(p <= 0.05) <= 0.05)."""
    for t in rare:
        tr, pair = res[t]
        n = tr["cooccurrences"]["female"] + tr["cooccurrences"]["male"]
        if pair is None or pair["too_few"] != (n < 10) or (pair["p"] is None) != (n < 10):
            fail("rare target %s with %d co-occurrences: %r" % (t, n, pair))
    _, _, res0 = run_audit(binary, tmp, corpus, names, ["--min-cooccurrences", "0"])
    small = 0
    for t in rare:
        tr, pair = res0[t]
        if pair is None:
            continue  # occurs nowhere (cannot happen: every target has two outside contexts)
        n = tr["cooccurrences"]["female"] + tr["cooccurrences"]["male"]
        if pair["p"] is None or not 0 < pair["p"] <= 1 or (n == 0 and pair["p"] != 1):
            fail("rare target %s with %d co-occurrences: p = %r" % (t, n, pair["p"]))
        small += pair["p"] <= 0.05
    test = stats.binomtest(small, len(rare), 0.05, alternative="greater")
    print("no association, 0 to 9 co-occurrences: %d of %d with p <= 0.05 (binomial p %.3g)"
          % (small, len(rare), test.pvalue))
    if test.pvalue < 0.01:
        fail("rare targets: too many small p-values without association")


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--bin", required=True)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        check_fixed_tables(args.bin, tmp)
        check_generated(args.bin, tmp)
    print("associations reference: all checks passed")


if __name__ == "__main__":
    main()
