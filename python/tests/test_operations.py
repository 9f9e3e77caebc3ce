"""tiers.check and tiers.agree against `tiers check --format json|sarif` and `tiers agree
--json`: the same reports for the same inputs and options, the same refusals."""
import json
import pathlib

import pytest

import tiers
from conftest import ROOT, SAMPLES, cli

CORPUS = ROOT / "tests" / "check-corpus"


def _corpus_cases():
    """Each file (or folder) of the check corpus with its options (NAME.args beside it)."""
    cases = []
    for path in sorted(CORPUS.iterdir()):
        if path.suffix == ".args" or path.name.endswith(".profile.json"):
            continue
        stem = path.name.split(".")[0] + "." + path.name.split(".")[1]
        args_file = CORPUS / (stem + ".args")
        args = args_file.read_text().split() if args_file.exists() else []
        cases.append(pytest.param(path.name, args, id=path.name))
    return cases


def _keywords(args):
    """The command line's check options as tiers.check's keyword arguments."""
    return {args[k][2:].replace("-", "_"): args[k + 1] for k in range(0, len(args), 2)}


@pytest.mark.parametrize("name,args", _corpus_cases())
def test_check_reports_what_the_command_line_reports(name, args, monkeypatch):
    monkeypatch.chdir(CORPUS)
    status, out, err = cli("check", name, "--format", "json", *args)
    assert status in (0, 1), err
    report = tiers.check(name, **_keywords(args))
    assert report.to_json() == out
    assert report == json.loads(out)
    assert report.ok == (status == 0)
    status, sarif, err = cli("check", name, "--format", "sarif", *args)
    assert report.to_sarif() == sarif


def test_check_of_the_samples_with_captions_words_and_a_profile(monkeypatch):
    monkeypatch.chdir(SAMPLES.parent)
    argv = ["samples/panel-discussion.json", "samples/panel-discussion.vtt", "--captions",
            "captions", "--profile", "broadcast-captions"]
    status, out, err = cli("check", *argv, "--format", "json")
    report = tiers.check(["samples/panel-discussion.json", "samples/panel-discussion.vtt"],
                         captions="captions", profile="broadcast-captions", jobs=2)
    assert report.to_json() == out
    # The rows gather every file's problems, each naming its file, as the JSON lists them.
    problems = report.problems.to_pandas()
    assert len(problems) == sum(len(f["problems"]) for f in json.loads(out)["files"])
    assert set(problems["file"]) <= {"samples/panel-discussion.json",
                                     "samples/panel-discussion.vtt"}
    assert {"rule", "severity", "message", "line", "column"} <= set(problems.columns)
    assert report.summary.files == 2


def test_check_with_words_measures_the_lag():
    path = SAMPLES / "panel-discussion.json"
    status, out, err = cli("check", path, "--captions", "captions", "--words", "words",
                           "--format", "json")
    report = tiers.check(path, captions="captions", words="words")
    assert report.to_json() == out
    [lag] = report.lag
    assert lag["file"] == str(path)
    assert lag["median"] == json.loads(out)["files"][0]["lag"]["median"]


def test_check_reads_as_the_reading_options_say(tmp_path):
    table = tmp_path / "gestures.csv"
    table.write_text("Begin,End,Value\n0,25,beat\n25,50,rest\n")
    argv = ["--columns", "start=Begin,end=End,text=Value", "--time-unit", "frames", "--rate",
            "25"]
    status, out, err = cli("check", table, "--format", "json", *argv)
    report = tiers.check(table, columns={"start": "Begin", "end": "End", "text": "Value"},
                         time_unit="frames", rate="25")
    assert report.to_json() == out


def test_a_file_that_cannot_be_read_is_a_problem_not_an_exception(tmp_path):
    broken = tmp_path / "broken.vtt"
    broken.write_text("not a WebVTT file\n")
    report = tiers.check(broken)
    assert not report.ok
    assert report.problems[0]["severity"] == "error"
    status, out, err = cli("check", broken, "--format", "json")
    assert report.to_json() == out


def test_check_refusals():
    with pytest.raises(tiers.ReadError) as e:
        tiers.check(SAMPLES / "panel-discussion.json", profile="no-such-profile")
    assert e.value.diagnostics
    with pytest.raises(tiers.UsageError, match="rate"):
        tiers.check(SAMPLES / "panel-discussion.json", rate="fast")
    with pytest.raises(tiers.UsageError, match="unknown reading option"):
        tiers.check(SAMPLES / "panel-discussion.json", colums="x")


GESTURES = SAMPLES / "panel-discussion.json"
MACHINE = SAMPLES / "panel-discussion.machine-gestures.json"


@pytest.mark.parametrize("options,argv", [
    ({}, []),
    ({"min_confidence": 0.6}, ["--min-confidence", "0.6"]),
    ({"step": "1f", "collar": "5f", "rate": "25"}, ["--step", "1f", "--collar", "5f", "--rate",
                                                     "25"]),
    ({"match": "overlap", "min_overlap": 0.3, "any_label": True},
     ["--match", "overlap", "--min-overlap", "0.3", "--any-label"]),
])
def test_agree_reports_what_the_command_line_reports(options, argv):
    status, out, err = cli("agree", GESTURES, MACHINE, "--tier", "gestures", "--json", *argv)
    assert status == 0, err
    report = tiers.agree(GESTURES, MACHINE, tier="gestures", **options)
    assert report == json.loads(out)
    assert report.reference.file == str(GESTURES)


def test_agree_takes_documents_as_well_as_paths():
    by_path = tiers.agree(GESTURES, MACHINE, tier="gestures")
    by_doc = tiers.agree(tiers.read(GESTURES), tiers.read(MACHINE), tier="gestures")
    assert by_doc.reference.file == "" and by_doc.candidate.file == ""
    for field in ("frames", "segments", "kappa", "precision", "recall", "f1"):
        assert by_doc[field] == by_path[field]


def test_agree_among_annotators(tmp_path):
    doc = tiers.read(GESTURES)
    second = tiers.Tier("second-coder")
    for a in doc["gestures"]:
        second.annotations.append(tiers.Annotation(a.start, a.end, a.text))
    second.annotations[0].text = "iconic"
    doc.tiers.append(second)
    path = tmp_path / "coders.json"
    tiers.write(doc, path)
    status, out, err = cli("agree", path, "--tiers", "gestures,second-coder", "--json")
    assert status == 0, err
    report = tiers.agree(path, tiers=["gestures", "second-coder"])
    assert report == json.loads(out)
    assert 0 < report.alpha < 1


def test_agree_refusals():
    with pytest.raises(tiers.UsageError, match="tier"):
        tiers.agree(GESTURES, MACHINE)  # several tiers, none named
    with pytest.raises(tiers.UsageError, match="no tier"):
        tiers.agree(GESTURES, MACHINE, tier="nods")
    with pytest.raises(tiers.UsageError, match="step"):
        tiers.agree(GESTURES, MACHINE, tier="gestures", step="ten")
    captions = SAMPLES / "panel-discussion.vtt"  # WebVTT knows no frame rate
    with pytest.raises(tiers.UsageError, match="rate"):
        tiers.agree(captions, captions, tier="panel-discussion", step="2f")
    assert tiers.agree(captions, captions, tier="panel-discussion", step="2f", rate="25").kappa == 1


@pytest.mark.parametrize("options,argv", [
    ({}, []),
    ({"relation": "starts-in", "window": "0.2s", "min_count": 1, "sort": "fisher"},
     ["--relation", "starts-in", "--window", "0.2s", "--min-count", "1", "--sort", "fisher"]),
    ({"fold_case": True, "b_labels": ["beat", "iconic"], "permutations": 99, "seed": 7},
     ["--fold-case", "--b-labels", "beat,iconic", "--permutations", "99", "--seed", "7"]),
])
def test_cooccur_reports_what_the_command_line_reports(options, argv):
    status, out, err = cli("cooccur", GESTURES, "--a", "words", "--b", "gestures", "--json",
                           *argv)
    assert status == 0, err
    report = tiers.cooccur(GESTURES, "words", "gestures", **options)
    assert report == json.loads(out)
    assert len(report.to_pandas("pairs")) == len(report.pairs)


def test_cooccur_over_folders_and_documents(monkeypatch):
    monkeypatch.chdir(SAMPLES.parent)
    reading = ["--columns", "tier=coder,start=start_frame,end=end_frame,text=gesture",
               "--time-unit", "frames", "--rate", "25"]
    status, out, err = cli("cooccur", "samples/market-corpus/coding", "--a", "coder-a", "--b",
                           "coder-b", "--json", "--jobs", "2", *reading)
    assert status == 0, err
    options = {"columns": "tier=coder,start=start_frame,end=end_frame,text=gesture",
               "time_unit": "frames", "rate": "25"}
    report = tiers.cooccur("samples/market-corpus/coding", "coder-a", "coder-b", jobs=2,
                           **options)
    assert report == json.loads(out)
    docs = [tiers.read(p, **options)
            for p in sorted((SAMPLES / "market-corpus" / "coding").iterdir())]
    assert tiers.cooccur(docs, "coder-a", "coder-b").pairs == report.pairs


def test_cooccur_refusals():
    with pytest.raises(tiers.ReadError, match="no tier"):
        tiers.cooccur(GESTURES, "words", "nods")
    with pytest.raises(tiers.UsageError, match="window"):
        tiers.cooccur(SAMPLES / "panel-discussion.vtt", "panel-discussion",
                      "panel-discussion.words", window="2f")
    with pytest.raises(tiers.UsageError, match="relation"):
        tiers.cooccur(GESTURES, "words", "gestures", relation="near")
