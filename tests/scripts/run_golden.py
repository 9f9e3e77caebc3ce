#!/usr/bin/python3
"""Runs one golden CLI test: a folder with `cmd`, inputs and the expected results.

A case folder holds:
  cmd               the arguments after `tiers`, one line, shell quoting (shlex)
  stdin             optional: fed to standard input
  expected.stdout   standard output, exactly (absent: empty)
  expected.stderr   standard error, exactly (absent: empty)
  expected.status   exit status (absent: 0)
  expected.files/   every file the command creates or changes, with its exact content
  anything else     inputs, copied into a scratch folder where the command runs

The scratch folder also has `samples`, a link to the project's samples. After the run, the
folder must hold the inputs, unchanged, plus exactly the expected files: a partial output or a
leftover temporary file fails the test.

Usage: run_golden.py TIERS CASE_DIR SAMPLES_DIR OUTPUT_DIR [--update]
OUTPUT_DIR receives the tiers documents the case produced, for the schema test.
"""
import os
import shlex
import shutil
import subprocess
import sys
import tempfile

SPECIAL = {"cmd", "stdin", "expected.stdout", "expected.stderr", "expected.status", "expected.files"}


def listing(root):
    out = {}
    for dirpath, dirnames, filenames in os.walk(root):
        dirnames[:] = [d for d in dirnames if not os.path.islink(os.path.join(dirpath, d))]
        for f in filenames:
            full = os.path.join(dirpath, f)
            if os.path.islink(full):
                continue
            with open(full, "rb") as fh:
                out[os.path.relpath(full, root)] = fh.read()
    return out


def read(path, default=b""):
    try:
        with open(path, "rb") as fh:
            return fh.read()
    except FileNotFoundError:
        return default


def main():
    tiers, case, samples, output_dir = sys.argv[1:5]
    tiers = os.path.abspath(tiers)  # the command runs in a scratch folder
    update = "--update" in sys.argv[5:]
    name = os.path.basename(os.path.normpath(case))
    with open(os.path.join(case, "cmd")) as fh:
        args = shlex.split(fh.read())
    with tempfile.TemporaryDirectory(prefix="tiers-golden-") as work:
        for entry in os.listdir(case):
            if entry in SPECIAL:
                continue
            src = os.path.join(case, entry)
            (shutil.copytree if os.path.isdir(src) else shutil.copy2)(src, os.path.join(work, entry))
        os.symlink(os.path.abspath(samples), os.path.join(work, "samples"))
        before = listing(work)
        proc = subprocess.run([tiers] + args, cwd=work, input=read(os.path.join(case, "stdin")),
                              capture_output=True, timeout=120)
        after = listing(work)
        created = {p: c for p, c in after.items() if before.get(p) != c}

        os.makedirs(output_dir, exist_ok=True)
        for path, content in created.items():
            if path.endswith(".json") and content.startswith(b'{\n  "format": "tiers"'):
                with open(os.path.join(output_dir, name + "--" + path.replace("/", "_")), "wb") as fh:
                    fh.write(content)
        if proc.stdout.startswith(b'{\n  "format": "tiers"'):
            with open(os.path.join(output_dir, name + "--stdout.json"), "wb") as fh:
                fh.write(proc.stdout)

        if update:
            write_expected(case, proc, created)
            print(f"updated {name}")
            return 0

        failures = []
        want_status = int(read(os.path.join(case, "expected.status"), b"0").strip() or 0)
        if proc.returncode != want_status:
            failures.append(f"exit status {proc.returncode}, expected {want_status}")
        for stream, got in (("stdout", proc.stdout), ("stderr", proc.stderr)):
            want = read(os.path.join(case, "expected." + stream))
            if got != want:
                failures.append(f"{stream} differs:\n--- expected\n{want.decode(errors='replace')}"
                                f"\n--- got\n{got.decode(errors='replace')}")
        expected_files = listing(os.path.join(case, "expected.files"))
        for path in sorted(set(created) | set(expected_files)):
            if path not in expected_files:
                failures.append(f"unexpected file created or changed: {path}")
            elif path not in created:
                failures.append(f"expected file not written: {path}")
            elif created[path] != expected_files[path]:
                failures.append(f"file {path} differs from expected.files/{path}")
        for path in before:
            if path not in after:
                failures.append(f"input removed: {path}")
        if failures:
            print(f"FAIL {name}: " + " ".join(shlex.quote(a) for a in args))
            for f in failures:
                print("  " + f)
            return 1
        print(f"ok {name}")
        return 0


def write_expected(case, proc, created):
    for stream, got in (("stdout", proc.stdout), ("stderr", proc.stderr)):
        path = os.path.join(case, "expected." + stream)
        if got:
            with open(path, "wb") as fh:
                fh.write(got)
        elif os.path.exists(path):
            os.remove(path)
    status_path = os.path.join(case, "expected.status")
    if proc.returncode:
        with open(status_path, "w") as fh:
            fh.write(f"{proc.returncode}\n")
    elif os.path.exists(status_path):
        os.remove(status_path)
    files_dir = os.path.join(case, "expected.files")
    shutil.rmtree(files_dir, ignore_errors=True)
    for path, content in created.items():
        os.makedirs(os.path.dirname(os.path.join(files_dir, path)), exist_ok=True)
        with open(os.path.join(files_dir, path), "wb") as fh:
            fh.write(content)


if __name__ == "__main__":
    sys.exit(main())
