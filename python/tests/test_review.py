"""tiers.estimate against `tiers estimate --json`: the same report, the same refusals."""
import json

import pytest

import tiers
from conftest import GOLDEN, SAMPLES, cli

REVIEWED = SAMPLES / "review" / "nods.reviewed.csv"


@pytest.mark.parametrize("options,argv", [
    ({}, []),
    ({"target_precision": 0.8}, ["--target-precision", "0.8"]),
    ({"level": 0.9, "target_precision": 0.7}, ["--level", "0.9", "--target-precision", "0.7"]),
])
def test_the_estimate_is_the_command_lines(options, argv):
    status, out, err = cli("estimate", REVIEWED, "--json", *argv)
    assert status == 0, err
    report = tiers.estimate(REVIEWED, **options)
    assert report == json.loads(out)
    assert report.to_json() and json.loads(report.to_json()) == json.loads(out)
    assert report.overall.reviewed == 392
    strata = report.to_pandas("strata")
    assert list(strata["name"]) == ["[0,0.5)", "[0.5,0.7)", "[0.7,0.9)", "[0.9,1]"]


def test_sheets_in_parts_and_their_refusals(monkeypatch):
    case = GOLDEN / "estimate-parts-disagree"
    monkeypatch.chdir(case)
    with pytest.raises(tiers.ReadError) as e:
        tiers.estimate(["part-1.csv", "part-2.csv"])
    expected = (case / "expected.stderr").read_text().splitlines()
    assert [str(d) for d in e.value.diagnostics] == expected


def test_a_bad_verdict_is_located(monkeypatch):
    case = GOLDEN / "estimate-bad-verdict"
    monkeypatch.chdir(case)
    with pytest.raises(tiers.ReadError) as e:
        tiers.estimate("reviewed.csv")
    assert [str(d) for d in e.value.diagnostics] == \
        (case / "expected.stderr").read_text().splitlines()
    with pytest.raises(tiers.UsageError):
        tiers.estimate(REVIEWED, level=1.5)
