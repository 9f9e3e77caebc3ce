"""Shared fixtures of the package's tests: the `tiers` program they compare with, the samples
and the golden cases of the command line, and a scratch folder."""
import os
import pathlib
import subprocess

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[2]


def _env(name, fallback):
    value = os.environ.get(name)
    return pathlib.Path(value) if value else fallback


TIERS = _env("TIERS_EXE", ROOT / "build" / "dev" / "tools" / "tiers" / "tiers")
SAMPLES = _env("TIERS_SAMPLES", ROOT / "samples")
GOLDEN = ROOT / "tests" / "golden"


def cli(*args, cwd=None):
    """Runs the tiers program; returns (status, stdout, stderr)."""
    r = subprocess.run([str(TIERS), *map(str, args)], capture_output=True, cwd=cwd)
    return r.returncode, r.stdout.decode(), r.stderr.decode()  # line ends as written


@pytest.fixture
def scratch(tmp_path):
    return tmp_path
