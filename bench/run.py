#!/usr/bin/env python3
"""The benchmarks of tiers (scripts/bench runs this after a release build).

For each size (default 100 MB and 1 GB of CSV; the other formats as large as the same corpus
makes them, WebVTT and TTML from a caption-only corpus of the same size), it measures:
  - every format's read and write (bench/tiers-bench, in one process: seconds, MB/s,
    annotations/s, peak resident memory);
  - tiers check, merge, agree and derive as whole commands (wall time, peak memory);
  - the raw read speed of the machine (`wc -l` on each file);
  - at the smallest size, the standard-library Python script bench/baseline_convert.py doing the
    CSV to JSON conversion, against `tiers convert` doing the same;
and prints a table with the targets of issue 8 and whether they are met, then writes the same
as JSON (build/bench/results.json). Speed is measured here, never in unit tests.

Usage: run.py BUILD_DIR OUT_DIR [SIZE…]   (sizes like 100M, 1G)
"""
import json
import os
import subprocess
import sys
import time

MB = 1_000_000
READ_TARGETS = {"csv": 200, "tsv": 200, "vtt": 200, "tiers": 200, "json": 100}


def size_of(text):
    units = {"K": 10**3, "M": 10**6, "G": 10**9}
    return int(float(text[:-1]) * units[text[-1].upper()]) if text[-1].upper() in units else int(text)


def measure(argv, cwd=None):
    """Wall seconds and peak resident bytes of one command (its own process)."""
    start = time.monotonic()
    proc = subprocess.Popen(argv, stdout=subprocess.PIPE, stderr=subprocess.PIPE, cwd=cwd)
    _, status, usage = os.wait4(proc.pid, 0)
    seconds = time.monotonic() - start
    out = proc.stdout.read().decode()
    err = proc.stderr.read().decode()
    code = os.waitstatus_to_exitcode(status)
    return seconds, usage.ru_maxrss * 1024, code, out, err


def corpus(build, out_dir, size):
    """Generates (once) a corpus whose CSV is about `size` bytes; returns its folder."""
    folder = os.path.join(out_dir, f"corpus-{size // MB}MB")
    done = os.path.join(folder, ".done")
    if os.path.exists(done):
        return folder
    gen = os.path.join(build, "bench", "tiers-corpus")
    probe = os.path.join(out_dir, "probe")
    subprocess.run([gen, "--hours", "2", "--only", "csv,vtt,ttml", "--out", probe], check=True)
    per_hour = os.path.getsize(os.path.join(probe, "corpus.csv")) / 2
    captions_per_hour = os.path.getsize(os.path.join(probe, "corpus.vtt")) / 2
    hours = max(1, round(size / per_hour))
    caption_hours = max(1, round(size / captions_per_hour))
    print(f"generating {folder}: {hours} hours, captions {caption_hours} hours", flush=True)
    subprocess.run([gen, "--hours", str(hours), "--out", folder,
                    "--only", "json,tiers,csv,tsv,signal,machine"], check=True)
    subprocess.run([gen, "--hours", str(caption_hours), "--out", folder, "--only", "vtt,ttml"],
                   check=True)
    open(done, "w").close()
    return folder


def main():
    build, out_dir = sys.argv[1:3]
    sizes = [size_of(s) for s in (sys.argv[3:] or ["100M", "1G"])]
    os.makedirs(out_dir, exist_ok=True)
    tiers = os.path.join(build, "tools", "tiers", "tiers")
    bench = os.path.join(build, "bench", "tiers-bench")
    here = os.path.dirname(os.path.abspath(__file__))
    rows = []

    def add(size, operation, fmt, path, seconds, rss, annotations, target=None, met=None, note=""):
        bytes_ = os.path.getsize(path)
        rows.append({"size": size, "operation": operation, "format": fmt, "bytes": bytes_,
                     "seconds": round(seconds, 4), "mb_per_s": round(bytes_ / MB / seconds, 1),
                     "annotations_per_s": round(annotations / seconds) if annotations else None,
                     "peak_rss_bytes": rss, "rss_per_input": round(rss / bytes_, 2),
                     "target": target, "met": met, "note": note})
        r = rows[-1]
        print(f"{size // MB:>5} MB  {operation:<8} {fmt:<7} {bytes_ / MB:9.1f} MB  "
              f"{seconds:8.3f} s  {r['mb_per_s']:8.1f} MB/s  "
              f"{(r['annotations_per_s'] or 0) / 1e6:6.2f} M ann/s  {rss / MB:8.1f} MB RSS "
              f"({r['rss_per_input']:.2f}x)  {target or ''} {'' if met is None else ('met' if met else 'MISSED')} {note}",
              flush=True)

    for size in sizes:
        folder = corpus(build, out_dir, size)
        files = {f: os.path.join(folder, "corpus." + f) for f in ("json", "csv", "tsv", "tiers", "vtt", "ttml")}
        for fmt, path in files.items():
            seconds, rss, code, out, err = measure([bench, path])
            if code:
                print(err)
                continue
            r = json.loads(out)
            speed = r["bytes"] / MB / r["read_seconds"]
            target = READ_TARGETS.get(fmt)
            add(size, "read", fmt, path, r["read_seconds"], r["peak_rss_bytes"], r["annotations"],
                f">= {target} MB/s, <= 2x memory" if target else "<= 2x memory",
                (speed >= target if target else True) and r["peak_rss_bytes"] <= 2 * r["bytes"])
            wc_seconds, _, _, _, _ = measure(["wc", "-l", path])
            add(size, "wc -l", fmt, path, wc_seconds, 0, 0, note="the machine's raw read speed")
        for fmt in ("json", "csv", "tsv", "tiers"):
            target = os.path.join(folder, "written." + fmt)
            seconds, rss, code, out, err = measure([bench, files["json"], fmt, target])
            if code:
                print(err)
                continue
            r = json.loads(out)
            add(size, "write", fmt, target, r["write_seconds"], rss, r["annotations"])
            os.remove(target)
        commands = {
            "check": ([tiers, "check", files["json"], "--captions", "captions", "--words", "words",
                       "--format", "json", "-o", os.path.join(folder, "check.json")], files["json"]),
            "merge": ([tiers, "merge", files["json"], os.path.join(folder, "corpus.machine.json"),
                       "--clash", "prefix-file", "--into", "combined", "--human", "corpus:gestures",
                       "--machine", "corpus.machine:gestures", "--min-confidence", "0.5",
                       "--review", "review", "-o", os.path.join(folder, "merged.json")], files["json"]),
            "agree": ([tiers, "agree", files["json"], "--ref-tier", "gestures", "--cand-tier",
                       "detector", "--json"], files["json"]),
            "derive": ([tiers, "derive", os.path.join(folder, "corpus.signal.csv"), "--rate", "25",
                        "--on", "0.6", "--off", "0.4", "--min-duration", "0.2s", "-o",
                        os.path.join(folder, "derived.json")], os.path.join(folder, "corpus.signal.csv")),
        }
        for name, (argv, source) in commands.items():
            seconds, rss, code, out, err = measure(argv)
            if code not in (0, 1):
                print(f"{name} failed: {err[-500:]}")
                continue
            add(size, name, "json" if name != "derive" else "csv", source, seconds, rss, 0,
                "<= 2x memory", rss <= 2 * os.path.getsize(source))
        if size == min(sizes):
            converted = os.path.join(folder, "converted.json")
            t_seconds, t_rss, _, _, _ = measure([tiers, "convert", files["csv"], "-o", converted])
            p_seconds, p_rss, code, _, err = measure(
                [sys.executable, os.path.join(here, "baseline_convert.py"), files["csv"],
                 os.path.join(folder, "baseline.json")])
            add(size, "convert", "csv>json", files["csv"], t_seconds, t_rss, 0,
                ">= 20x the Python script", p_seconds / t_seconds >= 20,
                f"python {p_seconds:.2f} s: {p_seconds / t_seconds:.1f}x")
            add(size, "python", "csv>json", files["csv"], p_seconds, p_rss, 0,
                note="bench/baseline_convert.py (csv, json modules)")

    # Linearity: seconds per byte at the largest size against the smallest.
    linearity = []
    if len(sizes) > 1:
        small, large = min(sizes), max(sizes)
        for op in sorted({(r["operation"], r["format"]) for r in rows}):
            a = [r for r in rows if (r["operation"], r["format"]) == op and r["size"] == small]
            b = [r for r in rows if (r["operation"], r["format"]) == op and r["size"] == large]
            if a and b and a[0]["seconds"] > 0:
                ratio = (b[0]["seconds"] / b[0]["bytes"]) / (a[0]["seconds"] / a[0]["bytes"])
                print(f"linearity {op[0]:<8} {op[1]:<8}: seconds per byte at {large // MB} MB are "
                      f"{ratio:.2f} x those at {small // MB} MB")
                linearity.append({"operation": op[0], "format": op[1], "ratio": round(ratio, 3)})
    with open(os.path.join(out_dir, "results.json"), "w") as fh:
        json.dump({"rows": rows, "linearity": linearity}, fh, indent=1)
    print(f"results: {os.path.join(out_dir, 'results.json')}")


if __name__ == "__main__":
    main()
