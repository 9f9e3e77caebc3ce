#!/usr/bin/env python3
"""The benchmarks of tiers (scripts/bench runs this after a release build).

For each size (default 100 MB and 1 GB of CSV; the other formats as large as the same corpus
makes them, WebVTT and TTML from a caption-only corpus of the same size), it measures:
  - every format's read and write (bench/tiers-bench, in one process: seconds, MB/s,
    annotations/s, peak resident memory), and for the formats that stream, the reader alone
    handing annotations to a counter (no document);
  - tiers check, merge, agree and derive as whole commands (wall time, peak memory);
  - the raw read speed of the machine (`wc -l` on each file);
  - `tiers convert` from every format to JSON and from JSON to every format (peak memory);
  - at the smallest size, the standard-library Python script bench/baseline_convert.py doing the
    CSV to JSON and JSON to CSV conversions, against `tiers convert` doing the same;
  - the archive: `tiers check --captions captions --words words --jobs 2` over folders of
    invented hour-long programmes (default 360 and 3,600 files), scaled to a year's 36,000,
    and the largest again as a dataset (`check --dataset`), which must be no slower;
and prints every measurement, then each target of issue 17 with its figure and whether it is
met, and writes the same as JSON (build/bench/results.json). Speed is measured here, never in
unit tests.

Usage: run.py BUILD_DIR OUT_DIR [SIZE…] [--archive N,N…]   (sizes like 100M, 1G)
"""
import json
import os
import subprocess
import sys
import tempfile
import time

MB = 1_000_000
READ_TARGETS = {"csv": 200, "tsv": 200, "vtt": 200, "tiers": 200, "json": 150, "ttml": 60}
STREAMS = ("csv", "tsv", "tiers", "json")  # formats whose readers stream (format::stream)
CONVERT_MEMORY = 1.5  # peak resident memory over the input's size
CHECK_MEMORY = 2.5
SCRIPT_RATIO = 20     # tiers convert against bench/baseline_convert.py
LINEAR = 1.2          # seconds per byte at the largest size over those at the smallest
YEAR_FILES, YEAR_SECONDS = 36_000, 300
EXTENSIONS = {"json": "json", "csv": "csv", "tsv": "tsv", "tiers": "tiers", "vtt": "vtt",
              "ttml": "ttml"}


def size_of(text):
    units = {"K": 10**3, "M": 10**6, "G": 10**9}
    return int(float(text[:-1]) * units[text[-1].upper()]) if text[-1].upper() in units else int(text)


def measure(argv, cwd=None, quiet=False):
    """Wall seconds and peak resident bytes of one command (its own process). Its output is
    kept in temporary files (a pipe read only at the end would stall a talkative command), or
    dropped with `quiet`."""
    with open(os.devnull, "wb") as null:
        out_fh = null if quiet else tempfile.TemporaryFile()
        err_fh = null if quiet else tempfile.TemporaryFile()
        start = time.monotonic()
        proc = subprocess.Popen(argv, stdout=out_fh, stderr=err_fh, cwd=cwd)
        _, status, usage = os.wait4(proc.pid, 0)
        seconds = time.monotonic() - start
        out = err = ""
        if not quiet:
            out_fh.seek(0)
            err_fh.seek(0)
            out, err = out_fh.read().decode(), err_fh.read().decode()[-2000:]
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


# `check --dataset` against the same files named as a folder: no slower, allowing for the
# machine's run-to-run noise (the same command varies by up to a third, docs/performance.md).
DATASET_PACE = 1.1
COOCCUR_RATE = 5_000_000  # A annotations a second per core, counted after reading (issue 20)
PYTHON_READ_RATIO = 1.2  # tiers.read's time over the C++ reader's, same file (issue 22)
TO_PANDAS_RATE = 1_000_000  # annotations a second into a DataFrame: 1,000,000 within a second
SAMPLE_RATE = 5_000_000  # annotations a second per core through tiers sample's draw (issue 21)


def archive(build, out_dir, files):
    """Generates (once) a folder of `files` invented hour-long programmes; returns it."""
    folder = os.path.join(out_dir, f"archive-{files}")
    if not os.path.exists(os.path.join(folder, ".done")):
        print(f"generating {folder}: {files} programmes", flush=True)
        subprocess.run([os.path.join(build, "bench", "tiers-corpus"), "--files", str(files),
                        "--out", folder], check=True, stdout=subprocess.DEVNULL)
        open(os.path.join(folder, ".done"), "w").close()
    return folder


def folder_bytes(folder):
    return sum(e.stat().st_size for e in os.scandir(folder) if e.name.endswith(".json"))


class table:
    """The measurements (rows) and the targets with their figures, printed as they come."""

    def __init__(self):
        self.rows, self.targets = [], []

    def add(self, size, operation, fmt, path, seconds, rss, annotations=0, note="", bytes_=None):
        bytes_ = bytes_ if bytes_ is not None else os.path.getsize(path)
        r = {"size": size, "operation": operation, "format": fmt, "bytes": bytes_,
             "seconds": round(seconds, 4), "mb_per_s": round(bytes_ / MB / seconds, 1),
             "annotations_per_s": round(annotations / seconds) if annotations else None,
             "peak_rss_bytes": rss, "rss_per_input": round(rss / bytes_, 2), "note": note}
        self.rows.append(r)
        print(f"{size // MB:>5} MB  {operation:<8} {fmt:<10} {bytes_ / MB:9.1f} MB  "
              f"{seconds:8.3f} s  {r['mb_per_s']:8.1f} MB/s  "
              f"{(r['annotations_per_s'] or 0) / 1e6:6.2f} M ann/s  {rss / MB:8.1f} MB RSS "
              f"({r['rss_per_input']:.2f}x)  {note}", flush=True)
        return r

    def target(self, name, figure, goal, met):
        self.targets.append({"target": name, "figure": figure, "goal": goal, "met": met})


def measure_python(t, build, size, files, cpp_read):
    """The Python package (when the build has it): tiers.read against tiers-bench's read of the
    same file, and to_pandas of what it read."""
    package = os.path.join(build, "python")
    if not os.path.isdir(os.path.join(package, "tiers")):
        print("python: the build has no Python package (pybind11 missing?): not measured")
        return
    mb = size // MB
    env = dict(os.environ, PYTHONPATH=package)
    script = os.path.join(os.path.dirname(os.path.abspath(__file__)), "python_bench.py")
    for fmt in ("json", "csv"):
        if fmt not in cpp_read:
            continue
        r = subprocess.run(["/usr/bin/python3", script, files[fmt]], capture_output=True,
                           text=True, env=env)
        if r.returncode:
            print(f"python bench of {fmt} failed: {r.stderr[-500:]}")
            continue
        p = json.loads(r.stdout)
        t.add(size, "py read", fmt, files[fmt], p["read_seconds"], 0, p["annotations"],
              note="tiers.read in Python, the same reader")
        ratio = p["read_seconds"] / max(cpp_read[fmt], 1e-9)
        t.target(f"python read {fmt} at {mb} MB: time over the C++ reader's", f"{ratio:.2f}x",
                 f"<= {PYTHON_READ_RATIO}x", ratio <= PYTHON_READ_RATIO)
        rate = p["annotations"] / max(p["to_pandas_seconds"], 1e-9)
        t.add(size, "to_pandas", fmt, files[fmt], p["to_pandas_seconds"], 0, p["annotations"],
              note="Document.to_pandas of what was read")
        t.target(f"to_pandas at {mb} MB ({p['annotations']:,} annotations): annotations a second",
                 f"{rate / 1e6:.2f} million", f">= {TO_PANDAS_RATE / 1e6:.0f} million",
                 rate >= TO_PANDAS_RATE)


def measure_size(t, build, out_dir, size, smallest, here):
    tiers = os.path.join(build, "tools", "tiers", "tiers")
    bench = os.path.join(build, "bench", "tiers-bench")
    folder = corpus(build, out_dir, size)
    mb = size // MB
    files = {f: os.path.join(folder, "corpus." + f) for f in EXTENSIONS}
    cpp_read = {}
    for fmt, path in files.items():
        seconds, rss, code, out, err = measure([bench, path])
        if code:
            print(err)
            continue
        r = json.loads(out)
        cpp_read[fmt] = r["read_seconds"]
        row = t.add(size, "read", fmt, path, r["read_seconds"], r["peak_rss_bytes"],
                    r["annotations"])
        goal = READ_TARGETS[fmt]
        t.target(f"read {fmt} at {mb} MB", f"{row['mb_per_s']} MB/s", f">= {goal} MB/s",
                 row["mb_per_s"] >= goal)
        if fmt in STREAMS:
            seconds, rss, code, out, err = measure([bench, "--stream", path])
            if code == 0:
                r = json.loads(out)
                t.add(size, "stream", fmt, path, r["read_seconds"], r["peak_rss_bytes"],
                      r["annotations"], note="the reader alone: no document built")
        wc_seconds, _, _, _, _ = measure(["wc", "-l", path])
        t.add(size, "wc -l", fmt, path, wc_seconds, 0, note="the machine's raw read speed")
    measure_python(t, build, size, files, cpp_read)
    for fmt in ("json", "csv", "tsv", "tiers"):
        target = os.path.join(folder, "written." + fmt)
        seconds, rss, code, out, err = measure([bench, files["json"], fmt, target])
        if code:
            print(err)
            continue
        r = json.loads(out)
        t.add(size, "write", fmt, target, r["write_seconds"], rss, r["annotations"])
        os.remove(target)
    # Conversions: every format to JSON, JSON to every format; memory against the input.
    pairs = [(f, "json") for f in EXTENSIONS if f != "json"] + \
            [("json", f) for f in EXTENSIONS if f != "json"]
    for source, dest in pairs:
        target = os.path.join(folder, "converted." + dest)
        # What the target cannot carry is listed and dropped (--allow-loss): the conversion's
        # speed and memory are measured, not its refusal.
        seconds, rss, code, _, err = measure([tiers, "convert", files[source], "-o", target,
                                              "--allow-loss"])
        if code:
            print(f"convert {source} to {dest} failed: {err[-500:]}")
            continue
        row = t.add(size, "convert", f"{source}>{dest}", files[source], seconds, rss)
        t.target(f"convert {source} to {dest} at {mb} MB: memory", f"{row['rss_per_input']}x",
                 f"<= {CONVERT_MEMORY}x the input", row["rss_per_input"] <= CONVERT_MEMORY)
        if size == smallest and {source, dest} == {"csv", "json"}:
            script_out = os.path.join(folder, "baseline." + dest)
            p_seconds, p_rss, code, _, err = measure(
                [sys.executable, os.path.join(here, "baseline_convert.py"), files[source],
                 script_out])
            if code:
                print(f"baseline_convert.py failed: {err[-500:]}")
            else:
                t.add(size, "python", f"{source}>{dest}", files[source], p_seconds, p_rss,
                      note="bench/baseline_convert.py (csv, json modules)")
                ratio = p_seconds / seconds
                t.target(f"convert {source} to {dest} against the script at {mb} MB",
                         f"{ratio:.1f}x (tiers {seconds:.2f} s, script {p_seconds:.2f} s)",
                         f">= {SCRIPT_RATIO}x", ratio >= SCRIPT_RATIO)
                os.remove(script_out)
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
    seconds, rss, code, out, err = measure([bench, "--cooccur", files["json"], "words",
                                            "gestures"])
    if code:
        print(f"cooccur failed: {err[-500:]}")
    else:
        r = json.loads(out)
        rate = r["annotations"] / max(r["count_seconds"], 1e-9)
        t.add(size, "cooccur", "json", files["json"], r["count_seconds"], rss,
              r["annotations"], note="words against gestures, counted after reading, one thread")
        t.target(f"cooccur at {mb} MB: A annotations a second per core after reading",
                 f"{rate / 1e6:.1f} million", f">= {COOCCUR_RATE / 1e6:.0f} million",
                 rate >= COOCCUR_RATE)
    seconds, rss, code, out, err = measure([bench, "--sample", files["json"], "detector"])
    if code:
        print(f"sample failed: {err[-500:]}")
    else:
        r = json.loads(out)
        rate = r["annotations"] / max(r["sample_seconds"], 1e-9)
        t.add(size, "sample", "json", files["json"], r["sample_seconds"], rss, r["annotations"],
              note="500 drawn from four confidence bands of the detector tier, after reading")
        # Below some 40,000 annotations nearly all are candidates (500 a band): the rate then
        # measures the fixed cost of the sample, not the pass over the tier.
        if r["annotations"] >= 40_000:
            t.target(f"sample at {mb} MB: annotations a second per core after reading",
                     f"{rate / 1e6:.1f} million", f">= {SAMPLE_RATE / 1e6:.0f} million",
                     rate >= SAMPLE_RATE)
    for name, (argv, source) in commands.items():
        seconds, rss, code, out, err = measure(argv)
        if code not in (0, 1):
            print(f"{name} failed: {err[-500:]}")
            continue
        row = t.add(size, name, "csv" if name == "derive" else "json", source, seconds, rss)
        if name == "check":
            t.target(f"check at {mb} MB: memory", f"{row['rss_per_input']}x",
                     f"<= {CHECK_MEMORY}x the input", row["rss_per_input"] <= CHECK_MEMORY)


def measure_archive(t, build, out_dir, counts):
    """The archive year: check (captions against words, 2 jobs) over folders of programmes."""
    tiers = os.path.join(build, "tools", "tiers", "tiers")
    runs = []
    for n in counts:
        folder = archive(build, out_dir, n)
        argv = [tiers, "check", folder, "--jobs", "2", "--captions", "captions", "--words",
                "words"]
        seconds, rss, code, _, _ = measure(argv, quiet=True)
        if code not in (0, 1):
            print(f"check of {folder} failed with status {code}")
            continue
        bytes_ = folder_bytes(folder)
        t.add(bytes_, "archive", f"{n} files", folder, seconds, rss, bytes_=bytes_,
              note=f"{n / seconds:.0f} files/s")
        runs.append((n, seconds, rss))
    if not runs:
        return
    n, seconds, rss = max(runs)
    # The same programmes as a dataset: a description whose one source is the folder's files.
    folder = archive(build, out_dir, n)
    described = os.path.join(out_dir, f"archive-{n}.dataset.json")
    with open(described, "w") as fh:
        json.dump({"format": "tiers-dataset", "version": 1,
                   "sources": [{"pattern": f"archive-{n}/session-{{id}}.json"}]}, fh)
    argv = [tiers, "check", "--dataset", described, "--jobs", "2", "--captions", "captions",
            "--words", "words"]
    d_seconds, d_rss, code, _, _ = measure(argv, quiet=True)
    if code in (0, 1):
        t.add(folder_bytes(folder), "archive", f"{n} recordings (--dataset)", folder, d_seconds,
              d_rss, bytes_=folder_bytes(folder), note=f"{n / d_seconds:.0f} recordings/s")
        t.target(f"check --dataset over {n} recordings, per recording, against the folder",
                 f"{d_seconds / seconds:.2f}x", f"<= {DATASET_PACE}x (no slower, within noise)",
                 d_seconds / seconds <= DATASET_PACE)
    year = seconds / n * YEAR_FILES
    t.target(f"a year ({YEAR_FILES} programmes) checked, scaled from {n} files",
             f"{year:.0f} s", f"< {YEAR_SECONDS} s", year < YEAR_SECONDS)
    if len(runs) > 1:
        n0, s0, r0 = min(runs)
        ratio = (seconds / n) / (s0 / n0)
        t.target(f"archive linear: seconds per file at {n} files over {n0}", f"{ratio:.2f}",
                 f"<= {LINEAR}", ratio <= LINEAR)
        t.target(f"archive memory: peak at {n} files over {n0}", f"{rss / r0:.2f}x",
                 f"<= {LINEAR}x (flat)", rss / r0 <= LINEAR)


def main():
    args = sys.argv[1:]
    counts = [360, 3600]
    if "--archive" in args:
        k = args.index("--archive")
        counts = [int(x) for x in args[k + 1].split(",") if x]
        del args[k:k + 2]
    build, out_dir = args[:2]
    sizes = [size_of(s) for s in (args[2:] or ["100M", "1G"])]
    os.makedirs(out_dir, exist_ok=True)
    here = os.path.dirname(os.path.abspath(__file__))
    t = table()
    for size in sizes:
        measure_size(t, build, out_dir, size, min(sizes), here)
    measure_archive(t, build, out_dir, counts)

    # Linearity: seconds per byte at the largest size against the smallest.
    linearity = []
    if len(sizes) > 1:
        small, large = min(sizes), max(sizes)
        for op in sorted({(r["operation"], r["format"]) for r in t.rows}):
            a = [r for r in t.rows if (r["operation"], r["format"]) == op and r["size"] == small]
            b = [r for r in t.rows if (r["operation"], r["format"]) == op and r["size"] == large]
            if a and b and a[0]["seconds"] > 0 and op[0] not in ("wc -l", "python"):
                ratio = (b[0]["seconds"] / b[0]["bytes"]) / (a[0]["seconds"] / a[0]["bytes"])
                linearity.append({"operation": op[0], "format": op[1], "ratio": round(ratio, 3)})
                t.target(f"linear: {op[0]} {op[1]}, seconds per byte at {large // MB} MB over "
                         f"{small // MB} MB", f"{ratio:.2f}", f"<= {LINEAR}", ratio <= LINEAR)
    print("\ntargets (issue 17):")
    for x in t.targets:
        print(f"  {'met   ' if x['met'] else 'MISSED'}  {x['target']}: {x['figure']} "
              f"(target {x['goal']})")
    met = sum(x["met"] for x in t.targets)
    print(f"{met} of {len(t.targets)} targets met")
    with open(os.path.join(out_dir, "results.json"), "w") as fh:
        json.dump({"rows": t.rows, "targets": t.targets, "linearity": linearity}, fh, indent=1)
    print(f"results: {os.path.join(out_dir, 'results.json')}")


if __name__ == "__main__":
    main()
