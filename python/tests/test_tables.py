"""Documents as pandas DataFrames: the CSV writer's table, with exact times, and back."""
import io
import warnings

import numpy as np
import pandas as pd
import pytest

import tiers
from conftest import SAMPLES

DOCS = ["panel-discussion.json", "panel-discussion.vtt", "panel-discussion.ttml",
        "panel-discussion.machine-gestures.json", "review/seminar-a.nods.json"]


def csv_of(doc):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", tiers.TiersWarning)
        return tiers.dumps(doc, "csv", allow_loss=True)


@pytest.mark.parametrize("name", DOCS)
def test_to_pandas_is_the_csv_writers_table(name):
    doc = tiers.read(SAMPLES / name)
    df = doc.to_pandas()
    expected = pd.read_csv(io.StringIO(csv_of(doc)), dtype=str, keep_default_na=False)
    assert list(df.columns) == list(expected.columns) + ["start_ns", "end_ns"]
    assert len(df) == len(expected) == sum(len(t) for t in doc)
    for column in expected.columns:
        mine = df[column]
        if column in ("start", "end", "confidence"):
            theirs = pd.to_numeric(expected[column].replace("", np.nan))
            assert np.allclose(mine.to_numpy(float), theirs.to_numpy(float), rtol=0, atol=1e-12,
                               equal_nan=True), column
        else:
            assert mine.astype(object).where(mine.notna(), "").astype(str).tolist() == \
                expected[column].tolist(), column
    assert df["start_ns"].dtype == np.int64
    assert df["start_ns"].tolist() == [a.start_ns for t in doc for a in t]
    assert str(df["tier"].dtype) == "category"


@pytest.mark.parametrize("name", DOCS)
def test_from_pandas_reads_the_table_back_exactly(name):
    doc = tiers.read(SAMPLES / name)
    back = tiers.from_pandas(doc.to_pandas())
    assert csv_of(back) == csv_of(doc)


def test_from_pandas_maps_columns_as_the_csv_reader_does():
    df = pd.DataFrame({"onset": [1.0, 2.5], "offset": [2.0, 3.0], "label": ["beat", "point"]})
    doc = tiers.from_pandas(df, columns={"start": "onset", "end": "offset", "text": "label"},
                            tier_name="gestures")
    assert [(a.start_ns, a.end_ns, a.text) for a in doc["gestures"]] == \
        [(1_000_000_000, 2_000_000_000, "beat"), (2_500_000_000, 3_000_000_000, "point")]
    frames = pd.DataFrame({"tier": ["g", "g"], "start": [25, 50], "end": [50, 75],
                           "text": ["a", "b"]})
    doc = tiers.from_pandas(frames, time_unit="frames", rate="25")
    assert [a.start for a in doc["g"]] == [1.0, 2.0]


def test_to_pandas_of_an_empty_document():
    df = tiers.Document().to_pandas()
    assert len(df) == 0 and list(df.columns) == ["tier", "start", "end", "text", "start_ns",
                                                  "end_ns"]
