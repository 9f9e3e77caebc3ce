"""tiers.dataset and tiers.read_recording against `tiers dataset --json` and `tiers convert
--dataset`: the same listing, the same recordings, the same located refusals."""
import json

import pytest

import tiers
from conftest import GOLDEN, ROOT, SAMPLES, cli

MARKET = SAMPLES / "market-corpus" / "dataset.json"
LACKING = ROOT / "tests" / "check-corpus" / "dataset.missing-source" / "dataset.json"


@pytest.mark.parametrize("description", [MARKET, LACKING])
def test_the_listing_is_the_command_lines(description):
    status, out, err = cli("dataset", description, "--json")
    listing = tiers.dataset(description, jobs=2)
    assert listing == json.loads(out)
    assert (listing.complete == len(listing.recordings)) == (status == 0)
    assert list(listing.to_pandas("recordings")["id"]) == [r["id"] for r in listing.recordings]


def test_a_recording_is_read_as_convert_dataset_reads_it(tmp_path):
    status, out, err = cli("convert", "--dataset", MARKET, "-d", tmp_path, "--to", "json")
    assert status == 0, err
    for r in tiers.dataset(MARKET).recordings:
        doc = tiers.read_recording(MARKET, r["id"])
        expected = tiers.read(tmp_path / (r["id"] + ".json"))
        assert tiers.dumps(doc, "json") == tiers.dumps(expected, "json")


def test_dataset_refusals(monkeypatch):
    monkeypatch.chdir(GOLDEN / "dataset-bad-description")
    with pytest.raises(tiers.ReadError) as e:
        tiers.dataset("dataset.json")
    expected = (GOLDEN / "dataset-bad-description" / "expected.stderr").read_text()
    assert [str(d) for d in e.value.diagnostics] == expected.splitlines()
    with pytest.raises(tiers.ReadError, match="has no file for") as lacking:
        tiers.read_recording(LACKING, "kiosk-b")
    assert lacking.value.diagnostics[0].code == "dataset.missing-source"
    with pytest.raises(tiers.UsageError, match="no recording 'kiosk-z'"):
        tiers.read_recording(LACKING, "kiosk-z")
