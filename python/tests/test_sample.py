"""tiers.sample against `tiers sample`: the same sheet byte for byte (its media links too) and
the same plan for the same inputs and options, the same warnings and refusals."""
import json
import warnings

import pytest

import tiers
from conftest import SAMPLES, cli

NODS_A = SAMPLES / "review" / "seminar-a.nods.json"
NODS_B = SAMPLES / "review" / "seminar-b.nods.json"


@pytest.mark.parametrize("inputs,options,argv", [
    ([NODS_A, NODS_B], {"n": 8}, ["--n", "8"]),
    ([NODS_B], {"n": 8, "seed": 4, "strata": [0.6], "context": "500ms"},
     ["--n", "8", "--seed", "4", "--strata", "0.6", "--context", "500ms"]),
    ([NODS_A, NODS_B], {"n": 40, "strata": "0.5,0.7,0.9", "allocation": "equal", "jobs": 2},
     ["--n", "40", "--strata", "0.5,0.7,0.9", "--allocation", "equal", "--jobs", "2"]),
])
def test_the_sheet_is_the_command_lines(tmp_path, inputs, options, argv):
    sheet = tmp_path / "sheet.csv"
    status, out, err = cli("sample", *inputs, "--tier", "nods", *argv, "-o", sheet)
    assert status == 0, err
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", tiers.TiersWarning)  # inputs without media, say
        drawn = tiers.sample(inputs, "nods", output=tmp_path / "again.csv", **options)
    assert drawn.text == sheet.read_text(encoding="utf-8")
    assert (tmp_path / "again.csv").read_text(encoding="utf-8") == drawn.text
    assert len(drawn) == options["n"]
    assert sum(s["drawn"] for s in drawn.strata) == options["n"]
    assert set(drawn.to_pandas()["stratum"]) <= {s["stratum"] for s in drawn.strata}


def test_the_plan_is_the_command_lines():
    status, out, err = cli("sample", NODS_A, NODS_B, "--tier", "nods", "--strata",
                           "0.5,0.7,0.9", "--plan", "--json", "--margin", "0.1")
    assert status == 0, err
    plan = tiers.sample([NODS_A, NODS_B], "nods", strata=[0.5, 0.7, 0.9], plan=True,
                        margin=0.1)
    assert plan == json.loads(out)


def test_documents_are_sampled_as_files_are():
    # A clip's random key comes from the seed and its file's name: a document given with the
    # file's name draws the file's sample.
    by_path = tiers.sample([NODS_A], "nods", n=10, seed=2)
    by_doc = tiers.sample([(str(NODS_A), tiers.read(NODS_A))], "nods", n=10, seed=2)
    assert by_doc.text == by_path.text
    unnamed = tiers.sample([tiers.read(NODS_A)], "nods", n=10, seed=2)
    assert {r["file"] for r in unnamed} == {"document-1"}


def test_sample_warnings_and_refusals():
    with pytest.warns(tiers.TiersWarning, match="got no clip"):
        tiers.sample(SAMPLES / "panel-discussion.json", "gestures", by="label", n=3, seed=3)
    with pytest.raises(tiers.ReadError, match="no tier") as e:
        tiers.sample(NODS_B, "gestures", n=4)
    assert e.value.diagnostics[0].code == "sample.tier"
    with pytest.raises(tiers.UsageError, match="strata"):
        tiers.sample(NODS_B, "nods", n=4, strata=[0.7, 0.5])
    with pytest.raises(tiers.UsageError, match="n="):
        tiers.sample(NODS_B, "nods")
