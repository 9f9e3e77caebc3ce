#!/usr/bin/python3
"""`tiers cooccur` through the command line, against references outside the project.

Two invented documents, made here from a seed: a small one (40 word annotations, so that tables
have zero cells) and a large one (200,000 word annotations, 16 labels, under 9 gesture labels
whose spans overlap one another, with one planted association: "this" is said more often
during "deictic"). For every pair the command shows (over 200 tables in all):
- the counts O11, R1, C1 and N equal a plain Python recomputation of each relation (overlap,
  and starts-in with a ±window);
- Fisher's exact p, two-sided and one-sided (greater), equal scipy.stats.fisher_exact
  (Debian python3-scipy) to a relative 1e-6;
- G² equals scipy.stats.chi2_contingency(table, correction=False, lambda_="log-likelihood");
- the log odds ratio and its 95 % interval equal statsmodels' Table2x2 (Debian
  python3-statsmodels) of the table with 0.5 added to every cell when one is 0
  (Haldane-Anscombe; statsmodels' own shift_zeros replaces only the zero cells);
- the adjusted p equals statsmodels.stats.multitest.multipletests(method="fdr_bh") over the
  pairs shown;
- expected = R1·C1/N, ratio = O11/E, PMI = log2(O11/E) (arithmetic).
The planted pair comes first by G², and its adjusted p is below 1e-6.

Counts of three shards (--shard K/3), combined (--combine), give the single run's table byte for
byte, the permutation test's too (the shards shifting for the combined table's pairs, --pairs);
a shard given twice is refused.

The permutation test (--permutations 999, seed 2026) on six invented recordings finds a planted
association ("there" said in most "point" strokes) at p <= 0.01, gives the same p whatever
--jobs, and does not find one between independent tiers (randomly placed nods; p > 0.05 for
the fixed seeds: under the null an independent pair's p is uniform, so any one pair would fall
below 0.05 for one seed in twenty — the seeds are fixed, not chosen per run).

Usage: cooccur_reference.py TIERS OUTPUT_DIR
"""
import csv
import io
import json
import math
import os
import random
import subprocess
import sys

import numpy as np
from scipy.stats import chi2_contingency, fisher_exact
from statsmodels.stats.contingency_tables import Table2x2
from statsmodels.stats.multitest import multipletests

failures = []
WORDS = ["the", "this", "a", "and", "we", "garden", "here", "big", "seeds", "water", "so",
         "there", "round", "up", "little", "that"]
GESTURES = ["deictic", "iconic", "beat", "metaphoric", "rest", "wave", "hold", "shrug", "nod"]


def check(ok, what):
    print(("ok  " if ok else "FAIL"), what)
    if not ok:
        failures.append(what)


def document(n, seed):
    """Words one per second; gestures over whole seconds, overlapping one another."""
    rng = random.Random(seed)
    gestures = []
    t = 0
    while t < n:
        length = rng.randint(1, 6)
        gestures.append((t, t + length, rng.choice(GESTURES)))
        if rng.random() < 0.3:  # a second gesture over part of the same time
            gestures.append((t + 1, t + 1 + rng.randint(1, 4), rng.choice(GESTURES)))
        t += length + rng.randint(0, 4)
    deictic = set()
    for s, e, g in gestures:
        if g == "deictic":
            deictic.update(range(s, e))
    words = []
    for k in range(n):
        w = "this" if k in deictic and rng.random() < 0.3 else rng.choice(WORDS)
        words.append((k, k + 1, w))
    return words, gestures


def write_tiers(path, words, gestures):
    with open(path, "w") as fh:
        fh.write(f"tiers 1\nmedia uri={os.path.basename(path)[:-6]}.mp4\n\ntier words interval\n")
        for s, e, w in words:
            fh.write(f"  {s} {e} | {w}\n")
        fh.write("\ntier gestures interval\n")
        for s, e, g in sorted(gestures):
            fh.write(f"  {s} {e} | {g}\n")


def recount(words, gestures, relation, window):
    """The tables by their definition; words lie at [k, k + 1), so each gesture looks only at
    the words near it."""
    n = len(words)
    r1, c1, o11 = {}, {}, {}
    labels = [set() for _ in words]
    for gs, ge, g in gestures:
        lo, hi = gs - window, ge + window
        for k in range(max(0, math.floor(lo) - 1), min(n, math.ceil(hi) + 1)):
            s, e = words[k][0], words[k][1]
            if (relation == "overlap" and s < hi and lo < e) or \
                    (relation == "starts-in" and lo <= s < hi):
                labels[k].add(g)
    for (s, e, w), found in zip(words, labels):
        r1[w] = r1.get(w, 0) + 1
        for g in found:
            c1[g] = c1.get(g, 0) + 1
            o11[(w, g)] = o11.get((w, g), 0) + 1
    return n, r1, c1, o11


def cooccur(tiers, path, *args):
    r = subprocess.run([tiers, "cooccur", path, "--a", "words", "--b", "gestures", "--json",
                        *args], capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers cooccur {args}: {r.stderr}")
    return json.loads(r.stdout)


def close(got, want, rel=1e-6, tiny=1e-300):
    return abs(got - want) <= max(rel * abs(want), tiny)


def compare(name, got, words, gestures, relation, window):
    n, r1, c1, o11 = recount(words, gestures, relation, window)
    pairs = got["pairs"]
    check(got["n"] == n and len(pairs) == len(o11),
          f"{name}: N {got['n']} (expected {n}), {len(pairs)} pairs (expected {len(o11)})")
    bad = {"counts": 0, "fisher": 0, "g2": 0, "log odds": 0, "arithmetic": 0}
    for p in pairs:
        key = (p["a"], p["b"])
        if (p["count"], p["a_total"], p["b_total"]) != (o11.get(key), r1.get(p["a"]),
                                                         c1.get(p["b"])):
            bad["counts"] += 1
            continue
        a = p["count"]
        b = p["a_total"] - a
        c = p["b_total"] - a
        d = n - a - b - c
        table = np.array([[a, b], [c, d]])
        two = fisher_exact(table, alternative="two-sided")[1]
        greater = fisher_exact(table, alternative="greater")[1]
        if not (close(p["fisher_p"], two) and close(p["fisher_p_greater"], greater)):
            bad["fisher"] += 1
            print(f"     {key}: fisher {p['fisher_p']}, {p['fisher_p_greater']}; scipy {two}, "
                  f"{greater}")
        g2 = chi2_contingency(table, correction=False, lambda_="log-likelihood")[0]
        if not close(p["g2"], g2, 1e-9, 1e-9):
            bad["g2"] += 1
        # Haldane-Anscombe: 0.5 added to every cell when one is 0. statsmodels' shift_zeros
        # replaces only the zero cells (0.13.5), so the correction is made here and statsmodels
        # computes the log odds and Woolf's interval of the corrected table.
        t = Table2x2(table + 0.5 if (table == 0).any() else table, shift_zeros=False)
        low, high = t.log_oddsratio_confint(0.05)
        if not (close(p["log_odds"], t.log_oddsratio, 1e-9, 1e-12)
                and close(p["log_odds_low"], low, 1e-9, 1e-12)
                and close(p["log_odds_high"], high, 1e-9, 1e-12)):
            bad["log odds"] += 1
        e = p["a_total"] * p["b_total"] / n
        if not (close(p["expected"], e, 1e-12) and close(p["ratio"], a / e, 1e-12)
                and close(p["pmi"], math.log2(a / e), 1e-9, 1e-12)):
            bad["arithmetic"] += 1
    for what, count in bad.items():
        check(count == 0, f"{name}: {what} of {len(pairs)} tables ({count} differ)")
    adjusted = multipletests([p["fisher_p"] for p in pairs], method="fdr_bh")[1]
    check(all(close(p["p_adjusted"], q, 1e-9, 1e-300) for p, q in zip(pairs, adjusted)),
          f"{name}: Benjamini-Hochberg as statsmodels' fdr_bh")
    return len(pairs)


def planted_recording(seed):
    """Ten minutes of words every 0.5 s; strokes of two kinds, and "there" said in most
    'point' strokes (the planted association); nods placed at random, independent of both."""
    rng = random.Random(seed)
    strokes, nods, words = [], [], []
    t = 1.0
    while t < 590:
        length = rng.choice([1.0, 1.5, 2.0])
        strokes.append((t, t + length, rng.choice(["point", "trace"])))
        t += length + rng.choice([2.0, 3.0, 5.0])
    t = 0.5
    while t < 595:
        nods.append((t, t, "nod"))
        t += rng.uniform(3, 12)
    planted = {int(s * 2) + 1 for s, e, g in strokes if g == "point" and rng.random() < 0.8}
    for k in range(1200):
        w = "there" if k in planted else rng.choice(WORDS[2:])
        words.append((k / 2, k / 2 + 0.4, w))
    return words, strokes, nods


def permutations(tiers, out):
    folder = os.path.join(out, "planted")
    os.makedirs(folder, exist_ok=True)
    for r in range(6):
        words, strokes, nods = planted_recording(200 + r)
        with open(os.path.join(folder, f"session-{r}.tiers"), "w") as fh:
            fh.write("tiers 1\n\ntier words interval\n")
            for s, e, w in words:
                fh.write(f"  {s} {e} | {w}\n")
            fh.write("\ntier strokes interval\n")
            for s, e, g in strokes:
                fh.write(f"  {s} {e} | {g}\n")
            fh.write("\ntier nods instant\n")
            for s, e, g in nods:
                fh.write(f"  {s} | {g}\n")

    def run(b, *args):
        r = subprocess.run([tiers, "cooccur", folder, "--a", "words", "--b", b, "--json",
                            "--permutations", "999", "--seed", "2026", *args],
                           capture_output=True, text=True)
        if r.returncode != 0:
            raise SystemExit(f"FAIL tiers cooccur --b {b}: {r.stderr}")
        return {(p["a"], p["b"]): p for p in json.loads(r.stdout)["pairs"]}

    strokes = run("strokes", "--jobs", "1")
    planted = strokes.get(("there", "point"), {})
    check(planted.get("perm_p", 1) <= 0.01,
          f"the planted pair (there, point): permutation p {planted.get('perm_p')} <= 0.01")
    again = run("strokes", "--jobs", "2")
    check(all(again[k]["perm_p"] == v["perm_p"] for k, v in strokes.items()),
          "the same seed gives the same permutation p with --jobs 1 and 2")
    nods = run("nods", "--window", "0.25s")
    independent = nods.get(("there", "nod"), {})
    check(independent.get("perm_p", 0) > 0.05,
          f"independent tiers (there, nod): permutation p {independent.get('perm_p')} > 0.05 "
          "(seed 2026)")


def concordance(tiers, path, words, gestures):
    """Every co-occurrence of every pair shown: as many distinct (word, pair) rows as O11, each
    with a Media Fragments link covering both annotations, and its context."""
    table = path[:-6] + ".concordance.csv"
    got = cooccur(tiers, path, "--concordance", table, "--context", "2")
    with open(table, newline="") as fh:
        rows = list(csv.DictReader(fh))
    distinct = {}
    for r in rows:
        distinct.setdefault((r["a"], r["b"]), set()).add((r["a_start"], r["a_end"]))
    check(all(len(distinct.get((p["a"], p["b"]), ())) == p["count"] for p in got["pairs"]),
          f"concordance: each pair's distinct word rows number its count ({len(rows)} rows)")
    ok = True
    for r in rows:
        lo = min(float(r["a_start"]), float(r["b_start"]))
        hi = max(float(r["a_end"]), float(r["b_end"]))
        k = int(float(r["a_start"]))
        before = " ".join(w for _, _, w in words[max(0, k - 2):k])
        after = " ".join(w for _, _, w in words[k + 1:k + 3])
        ok = ok and r["link"] == f"small.mp4#t={lo:g},{hi:g}" and r["before"] == before \
            and r["after"] == after and r["a_text"] == words[k][2]
    check(ok and rows, "concordance: links (W3C Media Fragments, NPT seconds) and context")


def shards(tiers, folder, out):
    """Counts of three shards, combined, give the single run's table byte for byte."""
    def run(*args):
        r = subprocess.run([tiers, "cooccur", *args], capture_output=True, text=True)
        if r.returncode != 0:
            raise SystemExit(f"FAIL tiers cooccur {args}: {r.stderr}")
        return r.stdout
    parts = []
    for k in (1, 2, 3):
        part = os.path.join(out, f"part-{k}.counts.json")
        run(folder, "--a", "words", "--b", "strokes", "--fold-case", "--shard", f"{k}/3", "-o",
            part)
        parts.append(part)
    one = run(folder, "--a", "words", "--b", "strokes", "--fold-case", "--json")
    combined = run("--combine", *parts, "--json")
    check(one == combined, "three shards' counts combined give one run's table, byte for byte")
    # The permutation test in shards: the combined table names the pairs, each shard counts
    # its recordings' shifts for them, and the sums give one run's p-values.
    table = os.path.join(out, "combined-table.txt")
    with open(table, "w") as fh:
        fh.write(combined)
    shifted = []
    for k in (1, 2, 3):
        part = os.path.join(out, f"part-{k}.shifted.counts.json")
        run(folder, "--a", "words", "--b", "strokes", "--fold-case", "--shard", f"{k}/3",
            "--permutations", "199", "--seed", "11", "--pairs", table, "-o", part)
        shifted.append(part)
    one = run(folder, "--a", "words", "--b", "strokes", "--fold-case", "--permutations", "199",
              "--seed", "11", "--json")
    check(run("--combine", *shifted, "--json") == one and '"perm_p": null' not in one,
          "shards' permutation counts combined give one run's p-values, byte for byte")
    r = subprocess.run([tiers, "cooccur", "--combine", parts[0], parts[0]], capture_output=True,
                       text=True)
    check(r.returncode == 1 and "combine each shard once" in r.stderr,
          "a shard combined twice is refused")


def main():
    tiers, out = sys.argv[1:3]
    os.makedirs(out, exist_ok=True)
    tables = 0
    small = document(40, 7)
    path = os.path.join(out, "small.tiers")
    write_tiers(path, *small)
    tables += compare("small, overlap", cooccur(tiers, path), *small, "overlap", 0)
    tables += compare("small, overlap ±0.5 s", cooccur(tiers, path, "--window", "0.5s"), *small,
                      "overlap", 0.5)
    tables += compare("small, starts-in ±0.5 s", cooccur(tiers, path, "--relation", "starts-in",
                                                         "--window", "500ms"),
                      *small, "starts-in", 0.5)
    concordance(tiers, path, *small)
    large = document(200_000, 11)
    path = os.path.join(out, "large.tiers")
    write_tiers(path, *large)
    got = cooccur(tiers, path)
    tables += compare("large, overlap", got, *large, "overlap", 0)
    top = got["pairs"][0]
    check((top["a"], top["b"]) == ("this", "deictic") and top["p_adjusted"] < 1e-6,
          f"the planted pair comes first by G² ({top['a']}, {top['b']}, p adjusted "
          f"{top['p_adjusted']})")
    check(tables >= 200, f"{tables} tables compared (at least 200)")
    text = subprocess.run([tiers, "cooccur", path, "--a", "words", "--b", "gestures",
                           "--format", "csv"], capture_output=True, text=True).stdout
    rows = list(csv.DictReader(io.StringIO(text)))
    check([(r["a"], r["b"], int(r["count"])) for r in rows] ==
          [(p["a"], p["b"], p["count"]) for p in got["pairs"]], "CSV holds the JSON's pairs")
    permutations(tiers, out)
    shards(tiers, os.path.join(out, "planted"), out)
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
