#!/usr/bin/python3
"""Hostile input through the command line, and nothing lost when a conversion is killed.

- 1,500 random mutations of the samples, 250 for each format (flipped, inserted, deleted,
  duplicated bytes and spliced-in format tokens; seeded): `tiers convert` gives only status 0 or
  1, never a crash or a hang, and every status 1 comes with a message `FILE[:LINE:COLUMN]:
  error: … [code]`.
- Hostile files: binary garbage, UTF-16, invalid UTF-8, JSON nested a million levels deep, an
  XML entity-expansion bomb, a number with thousands of digits, a time of 1e300 s, NaN, a 20 MB
  field, a million tiers: each status 1 with a located message, within the time limit.
- A conversion of a large file to an existing output, killed with SIGKILL at random moments,
  leaves the old file or the whole new one, never a partial one.
- A batch conversion on three threads, interrupted by SIGINT or SIGTERM while two or more of
  them write, leaves no temporary file of any thread.

Usage: hostile_cli.py TIERS SAMPLES_DIR WORK_DIR
"""
import json
import os
import random
import shutil
import re
import signal
import subprocess
import sys
import time

failures = []
LOCATED = re.compile(r"^[^:\n]+(:\d+:\d+)?: error: .+ \[[a-z0-9.-]+\]$", re.M)
TOKENS = {"json": [b'{', b'}', b'[', b']', b'"', b',', b':', b'"start"', b'1e300', b'\\u00'],
          "csv": [b',', b'"', b'\n', b'\r', b'start', b'00:00:01;02'],
          "tsv": [b'\t', b'"', b'\n', b'end', b'1.5e'],
          "vtt": [b'-->', b'\n\n', b'<v ', b'</', b'&amp', b'NOTE', b'00:00.000', b'\x00'],
          "ttml": [b'<p ', b'</div>', b'begin="', b'<!DOCTYPE', b'&', b'<span', b'12f"'],
          "tiers": [b'|', b'\n', b'tier ', b'"', b'\\u{', b'@', b'00:00:99']}


def check(what, ok, detail=""):
    print(("ok  " if ok else "FAIL"), what, detail)
    if not ok:
        failures.append(what)


def convert(tiers, path, fmt, work, timeout=60):
    out = os.path.join(work, "out.json")
    start = time.monotonic()
    try:
        r = subprocess.run([tiers, "convert", path, "--from", fmt, "--to", "json", "-o", out,
                            "--allow-loss"], capture_output=True, text=True, timeout=timeout,
                           errors="replace")
    except subprocess.TimeoutExpired:
        return None, "", time.monotonic() - start
    return r.returncode, r.stderr, time.monotonic() - start


def mutate(data, rng, tokens):
    data = bytearray(data)
    for _ in range(rng.randint(1, 6)):
        op = rng.randrange(5)
        at = rng.randrange(len(data) + 1)
        if op == 0 and data:
            data[min(at, len(data) - 1)] = rng.randrange(256)
        elif op == 1:
            data[at:at] = bytes([rng.randrange(256)])
        elif op == 2 and data:
            del data[at:at + rng.randint(1, 20)]
        elif op == 3 and data:
            chunk = data[at:at + rng.randint(1, 40)]
            data[at:at] = chunk
        else:
            data[at:at] = rng.choice(tokens)
    return bytes(data)


def main():
    tiers, samples, work = sys.argv[1:4]
    os.makedirs(work, exist_ok=True)
    rng = random.Random(1500)
    files = {"json": "panel-discussion.json", "csv": "panel-discussion.csv",
             "tsv": "panel-discussion.tsv", "vtt": "panel-discussion.vtt",
             "ttml": "panel-discussion.ttml", "tiers": "panel-discussion.tiers"}
    bad = []
    statuses = {0: 0, 1: 0}
    for fmt, name in files.items():
        with open(os.path.join(samples, name), "rb") as fh:
            original = fh.read()
        for k in range(250):
            path = os.path.join(work, f"mutant.{fmt}")
            with open(path, "wb") as fh:
                fh.write(mutate(original, rng, TOKENS[fmt]))
            status, err, _ = convert(tiers, path, fmt, work)
            if status not in (0, 1) or (status == 1 and not LOCATED.search(err)):
                kept = os.path.join(work, f"finding-{fmt}-{k}.{fmt}")
                os.replace(path, kept)
                bad.append((kept, status, err[-300:]))
            else:
                statuses[status] += 1
    for b in bad[:10]:
        print("   ", b)
    check("1,500 mutations of the samples: only status 0 or 1, every 1 with a located message",
          not bad, f"({statuses[0]} read, {statuses[1]} refused, {len(bad)} bad)")

    hostile = {
        "garbage.json": bytes(random.Random(1).randrange(256) for _ in range(100_000)),
        "utf16.vtt": "WEBVTT\n\n00:00.000 --> 00:01.000\nhi\n".encode("utf-16"),
        "latin1.csv": "tier,start,end,text\nt,1,2,caf\xe9\n".encode("latin-1"),
        "deep.json": b"[" * 1_000_000 + b"]" * 1_000_000,
        "bomb.ttml": (b'<?xml version="1.0"?><!DOCTYPE tt [<!ENTITY a "aaaaaaaaaa">'
                      + b"".join(b'<!ENTITY %c "&%c;&%c;&%c;&%c;&%c;&%c;&%c;&%c;&%c;&%c;">'
                                 % ((98 + k,) + (97 + k,) * 10) for k in range(9))
                      + b']><tt xmlns="http://www.w3.org/ns/ttml"><body><div><p>&j;</p></div>'
                        b'</body></tt>'),
        "digits.json": b'{"format": "tiers", "version": 1, "tiers": [{"name": "t", "annotations": '
                       b'[{"start": ' + b"7" * 5000 + b', "end": 1}]}]}',
        "huge.csv": b"tier,start,end,text\nt,1e300,2,x\n",
        "nan.csv": b"tier,start,end,text\nt,nan,2,x\n",
        "field.csv": b"tier,start,end,text\nt,1,2,\"" + b"x" * (20 << 20) + b"\"\n",
        "tiers.json": b'{"format": "tiers", "version": 1, "tiers": [' + b",".join(
            b'{"name": "t%d"}' % k for k in range(1_000_000)) + b"]}",
    }
    for name, data in hostile.items():
        path = os.path.join(work, name)
        with open(path, "wb") as fh:
            fh.write(data)
        fmt = name.rsplit(".", 1)[1]
        status, err, seconds = convert(tiers, path, fmt, work)
        first = err.strip().splitlines()[0] if err.strip() else ""
        check(f"hostile {name}: status 1 with a located message", status == 1 and
              LOCATED.search(err) is not None, f"({seconds:.1f} s) {first[:110]}")
        os.remove(path)

    # Kill a conversion mid-write: the target is the old file or the whole new one.
    big = os.path.join(work, "big.csv")
    with open(big, "w") as fh:
        fh.write("tier,start,end,text\n")
        for k in range(400_000):
            fh.write(f"words,{k * 0.3:.3f},{k * 0.3 + 0.25:.3f},word{k % 977}\n")
    target = os.path.join(work, "target.tiers")
    old = b"tiers 1\n# the old file, which must stay whole\n"
    complete = None
    outcomes = {"old": 0, "new": 0}
    for k in range(12):
        with open(target, "wb") as fh:
            fh.write(old)
        proc = subprocess.Popen([tiers, "convert", big, "-o", target], stderr=subprocess.DEVNULL)
        time.sleep(0.05 + 0.12 * k)
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        with open(target, "rb") as fh:
            now = fh.read()
        if complete is None and now != old:
            complete = now
        state = "old" if now == old else "new" if now == complete and now.endswith(b"\n") else "partial"
        if state == "partial":
            check("a killed conversion leaves no partial output", False, f"(kill {k})")
            break
        outcomes[state] += 1
    else:
        finished = subprocess.run([tiers, "convert", big, "-o", target]).returncode == 0
        with open(target, "rb") as fh:
            whole = fh.read()
        check("a conversion killed with SIGKILL leaves the old file or the whole new one",
              finished and (complete is None or complete == whole),
              f"({outcomes['old']} times the old file, {outcomes['new']} the new one)")
    for leftover in os.listdir(work):
        if leftover.startswith(".tiers-"):
            os.remove(os.path.join(work, leftover))  # SIGKILL cannot be caught: documented

    parallel_interrupt(tiers, work, big)
    file_names_not_utf8(tiers, work, samples)
    in_place(tiers, work)
    print(f"{len(failures)} failures")
    return 1 if failures else 0


def parallel_interrupt(tiers, work, big):
    """`convert DIR -d OUT --jobs 3` interrupted by SIGINT or SIGTERM while two or more threads
    are writing: every thread's temporary file is removed, and each output is whole or absent."""
    import json
    import shutil
    inputs = os.path.join(work, "many")
    os.makedirs(inputs, exist_ok=True)
    for k in range(6):
        shutil.copy(big, os.path.join(inputs, f"part{k}.csv"))
    seen = []
    for k, sig in enumerate([signal.SIGINT, signal.SIGTERM, signal.SIGINT]):
        out = os.path.join(work, f"many-out-{k}")
        shutil.rmtree(out, ignore_errors=True)
        proc = subprocess.Popen([tiers, "convert", inputs, "-d", out, "--to", "json", "--jobs", "3"],
                                stderr=subprocess.DEVNULL)
        temps, deadline = [], time.monotonic() + 60
        while proc.poll() is None and time.monotonic() < deadline:
            temps = [f for f in (os.listdir(out) if os.path.isdir(out) else []) if ".tiers-" in f]
            if len(temps) >= 2:
                proc.send_signal(sig)
                break
            time.sleep(0.001)
        proc.wait()
        if len(temps) < 2:
            continue  # finished before two threads were writing at once: try again
        seen.append(len(temps))
        left = [f for f in os.listdir(out) if ".tiers-" in f]
        whole = True
        for f in os.listdir(out):
            if f.endswith(".json"):
                try:
                    with open(os.path.join(out, f)) as fh:
                        json.load(fh)
                except ValueError:
                    whole = False
        check(f"{signal.Signals(sig).name} to convert -d --jobs 3 while {len(temps)} temporaries "
              "exist removes every one, and leaves only whole outputs",
              proc.returncode == -sig and not left and whole,
              f"(status {proc.returncode}, left {left})")
    check("parallel writes were interrupted while several threads wrote", len(seen) > 0,
          f"({len(seen)} of 3 runs)")
    # Files and folders made by many threads get the modes the umask gives (the umask is read
    # once, never set while threads create files).
    nested = os.path.join(work, "nested")
    for k in range(8):
        os.makedirs(os.path.join(nested, f"d{k}"), exist_ok=True)
        shutil.copy(os.path.join(inputs, "part0.csv"), os.path.join(nested, f"d{k}", "p.csv"))
    out = os.path.join(work, "nested-out")
    shutil.rmtree(out, ignore_errors=True)
    r = subprocess.run([tiers, "convert", nested, "-d", out, "--to", "tsv", "--jobs", "3"],
                       preexec_fn=lambda: os.umask(0o027), capture_output=True)
    modes = set()
    for root, dirs, files in os.walk(out):
        modes |= {("dir", os.stat(os.path.join(root, d)).st_mode & 0o777) for d in dirs}
        modes |= {("file", os.stat(os.path.join(root, f)).st_mode & 0o777) for f in files}
    check("with umask 027, every folder made is 0750 and every file 0640",
          r.returncode == 0 and modes == {("dir", 0o750), ("file", 0o640)},
          f"(status {r.returncode}, modes {sorted((k, oct(m)) for k, m in modes)})")


def file_names_not_utf8(tiers, work, samples):
    """A file system's names may hold any bytes; what tiers writes is UTF-8 all the same."""
    folder = os.path.join(work, "names").encode()
    shutil.rmtree(folder, ignore_errors=True)
    os.makedirs(folder)
    path = os.path.join(folder, b"caf\xe9.vtt")  # Latin-1, not UTF-8
    shutil.copy(os.path.join(samples, "panel-discussion.vtt"), path)
    r = subprocess.run([tiers.encode(), b"convert", path, b"--to", b"json"], capture_output=True)
    try:
        names = [t["name"] for t in json.loads(r.stdout.decode("utf-8"))["tiers"]]
    except (UnicodeDecodeError, ValueError) as e:
        names = [f"not UTF-8 JSON: {e}"]
    check("a tier named after a file name that is not UTF-8 is named with U+FFFD, and said",
          r.returncode == 0 and names[0] == "caf\ufffd" and b"[input.name]" in r.stderr,
          f"(status {r.returncode}, names {names[:2]})")
    for fmt in ("json", "sarif"):
        r = subprocess.run([tiers.encode(), b"check", folder, b"--format", fmt.encode()],
                           capture_output=True)
        try:
            json.loads(r.stdout.decode("utf-8"))
            ok = True
        except (UnicodeDecodeError, ValueError):
            ok = False
        check(f"check --format {fmt} of a file whose name is not UTF-8 writes UTF-8 JSON", ok,
              f"(status {r.returncode})")


def in_place(tiers, work):
    """convert -d DIR into DIR replaces an input only with --in-place, and only when lossless."""
    folder = os.path.join(work, "in-place")
    shutil.rmtree(folder, ignore_errors=True)
    os.makedirs(folder)
    clean = b"WEBVTT\n\n00:00.000 --> 00:01.000\nfirst\n\n00:01.000 --> 00:02.000\nsecond\n"
    # A timing line the reader skips (with a warning): rewriting would drop "lost".
    skipped = (b"WEBVTT\n\n00:00.000 --> 00:01.000\nkept\n\n00:01.000 -> 00:02.000\nlost\n")
    files = {"clean.vtt": clean, "skipped.vtt": skipped}
    for name, data in files.items():
        with open(os.path.join(folder, name), "wb") as fh:
            fh.write(data)

    def contents():
        out = {}
        for name in files:
            with open(os.path.join(folder, name), "rb") as fh:
                out[name] = fh.read()
        return out

    r = subprocess.run([tiers, "convert", folder, "-d", folder, "--to", "vtt", "--allow-loss"],
                       capture_output=True, text=True)
    check("convert -d into its own folder without --in-place is refused before writing",
          r.returncode == 2 and "--in-place" in r.stderr and contents() == files,
          f"(status {r.returncode})")
    r = subprocess.run([tiers, "convert", folder, "-d", folder, "--to", "vtt", "--in-place",
                        "--allow-loss"], capture_output=True, text=True)
    now = contents()
    check("--in-place rewrites a lossless input and leaves one whose reading warned as it was",
          r.returncode == 1 and now["skipped.vtt"] == skipped and
          now["clean.vtt"] != clean and b"00:00:01.000 -->" in now["clean.vtt"] and "[vtt.block]" in r.stderr and
          "--in-place" in r.stderr, f"(status {r.returncode})")


if __name__ == "__main__":
    sys.exit(main())
