#!/usr/bin/env python3
"""How long `tiers` takes to list an archive before any work: folders of N files (default
10,000, 20,000, 40,000 and 400,000; 1,000 a folder), each a tiny CSV, listed by
`tiers convert ROOT -d OUT --to json --shard 1/N` (which lists, de-duplicates, takes its shard
and checks every output path for clashes, then converts one file) and by `tiers check ROOT
--shard 1/N`. Prints CPU seconds (user + system) per command and per 100,000 files: the cost
each worker of a cluster array job pays before its first file. Linear in N is the target; a
pairwise look-up shows as the per-file cost growing with N.

Usage: listing.py BUILD_DIR OUT_DIR [N…]
"""
import os
import shutil
import subprocess
import sys
import time


def cpu_seconds(argv):
    start = time.monotonic()
    proc = subprocess.Popen(argv, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    _, status, usage = os.wait4(proc.pid, 0)
    return usage.ru_utime + usage.ru_stime, time.monotonic() - start, os.waitstatus_to_exitcode(status)


def archive(out_dir, n):
    root = os.path.join(out_dir, f"listing-{n}")
    done = os.path.join(root, ".done")
    if os.path.exists(done):
        return root
    shutil.rmtree(root, ignore_errors=True)
    for k in range(n):
        folder = os.path.join(root, f"batch{k // 1000:04d}")
        if k % 1000 == 0:
            os.makedirs(folder)
        with open(os.path.join(folder, f"programme{k:06d}.csv"), "w") as fh:
            fh.write("start,end,text\n1,2,x\n")
    open(done, "w").close()
    return root


def main():
    build, out_dir = sys.argv[1:3]
    counts = [int(c) for c in sys.argv[3:]] or [10_000, 20_000, 40_000, 400_000]
    tiers = os.path.join(build, "tools", "tiers", "tiers")
    os.makedirs(out_dir, exist_ok=True)
    print(f"{'files':>8}  {'command':<34} {'cpu s':>7} {'wall s':>7} {'cpu s / 100k':>13}")
    for n in counts:
        root = archive(out_dir, n)
        out = os.path.join(out_dir, f"listing-out-{n}")
        shutil.rmtree(out, ignore_errors=True)
        for name, argv in (("convert -d --shard 1/N", [tiers, "convert", root, "-d", out, "--to",
                                                       "json", "--shard", f"1/{n}"]),
                           ("check --shard 1/N", [tiers, "check", root, "--shard", f"1/{n}",
                                                  "--format", "json"])):
            cpu, wall, code = cpu_seconds(argv)
            status = "" if code == 0 else f"  (exit {code})"
            print(f"{n:>8}  {name:<34} {cpu:>7.2f} {wall:>7.2f} {cpu / n * 100_000:>13.2f}{status}",
                  flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
