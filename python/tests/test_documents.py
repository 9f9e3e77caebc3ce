"""tiers.retime, tiers.edit and tiers.derive against `tiers retime`, `tiers edit` and `tiers
derive`: the same documents (as the same bytes in every format) and reports for the same
options, the same refusals. The inputs are the samples and the golden cases'."""
import json
import warnings

import pytest

import tiers
from conftest import GOLDEN, SAMPLES, cli

PANEL = SAMPLES / "panel-discussion.json"
FRAMES = SAMPLES / "panel-discussion.frames.csv"


def _cli_document(tmp_path, *argv):
    """The document a command writes with -o, read back, and its standard output."""
    out = tmp_path / "out.json"
    status, stdout, err = cli(*argv, "-o", out)
    assert status == 0, err
    return tiers.read(out), stdout


@pytest.mark.parametrize("words,options,argv", [
    ("words", {"captions": "captions", "lead_in": "0.12s", "hold": "0.3s"},
     ["--captions", "captions", "--words", "words", "--lead-in", "0.12s", "--hold", "0.3s"]),
    ("words", {"captions": "captions", "max_cps": 12, "min_gap": "2f"},
     ["--captions", "captions", "--words", "words", "--max-cps", "12", "--min-gap", "2f"]),
    ("words", {"captions": "captions", "profile": "broadcast-captions"},
     ["--captions", "captions", "--words", "words", "--profile", "broadcast-captions"]),
])
def test_retime_is_the_command_lines(tmp_path, words, options, argv):
    expected, report = _cli_document(tmp_path, "retime", PANEL, "--json", *argv)
    r = tiers.retime(PANEL, words, **options)
    assert r == json.loads(report)
    assert tiers.dumps(r.document, "json") == tiers.dumps(expected, "json")


def test_retime_onto_a_words_file_and_from_documents(tmp_path):
    vtt = SAMPLES / "panel-discussion.vtt"
    expected, report = _cli_document(tmp_path, "retime", vtt, "--words", f"{PANEL}:words",
                                     "--json")
    r = tiers.retime(vtt, f"{PANEL}:words")
    assert r == json.loads(report)
    assert tiers.dumps(r.document, "json") == tiers.dumps(expected, "json")
    # Documents instead of paths: the same cues moved; the given document is left as it was.
    captions = tiers.read(vtt)
    before = tiers.dumps(captions, "json")
    again = tiers.retime(captions, tiers.read(PANEL), to="vtt")
    assert again.cues == r.cues
    assert tiers.dumps(captions, "json") == before


def test_retime_refusals():
    with pytest.raises(tiers.UsageError, match="wordz") as e:
        tiers.retime(PANEL, "wordz", captions="captions")
    assert e.value.diagnostics[0].code == "retime.tier"
    with pytest.raises(tiers.UsageError, match="lead_in"):
        tiers.retime(PANEL, captions="captions", lead_in="soon")


@pytest.mark.parametrize("steps,from_zero,argv", [
    ([("cut", "00:00:10..00:00:20"), ("select", ["captions", "gestures"]),
      ("rename", "captions=subtitles"), ("shift", "1s")], True,
     ["--cut", "00:00:10..00:00:20", "--from-zero", "--select", "captions", "--select",
      "gestures", "--rename", "captions=subtitles", "--shift", "1s"]),
    ([("cut", "00:00:10..00:00:12"), ("select", "gestures"), ("shift", "-5f")], False,
     ["--cut", "00:00:10..00:00:12", "--select", "gestures", "--shift", "-5f"]),
    ([("scale", "25:24000/1001"), ("snap", "24000/1001"), ("drop", "head-nods")], False,
     ["--scale", "25:24000/1001", "--snap", "24000/1001", "--drop", "head-nods"]),
])
def test_edit_is_the_command_lines(tmp_path, steps, from_zero, argv):
    expected, _ = _cli_document(tmp_path, "edit", PANEL, *argv)
    doc = tiers.read(PANEL)
    before = tiers.dumps(doc, "json")
    edited = tiers.edit(doc, *steps, from_zero=from_zero)
    assert tiers.dumps(edited, "json") == tiers.dumps(expected, "json")
    assert tiers.dumps(doc, "json") == before  # a copy is edited


def test_edit_refusals():
    with pytest.raises(tiers.EditError, match="rename") as e:
        tiers.edit(PANEL, ("rename", "captions=words"))
    assert e.value.diagnostics[0].code == "edit.exists"
    with pytest.raises(tiers.UsageError, match="no edit"):
        tiers.edit(PANEL, ("stretch", "2"))
    with pytest.raises(tiers.UsageError, match="OLD=NEW"):
        tiers.edit(PANEL, ("rename", "captions"))


@pytest.mark.parametrize("options,argv", [
    ({"rate": 25, "on": 0.6, "off": 0.4, "bridge": "0.2s", "min_duration": "0.2s",
      "agent": "demo-detector", "agent_version": "0.3"},
     ["--rate", "25", "--on", "0.6", "--off", "0.4", "--bridge", "0.2s", "--min-duration",
      "0.2s", "--agent", "demo-detector", "--agent-version", "0.3"]),
    ({"rate": "25", "scores": ["hands_moving"], "tier_name": "hands", "label": "moving",
      "bridge": "5f", "min_duration": "5f", "confidence": "max", "smooth": 3},
     ["--rate", "25", "--scores", "hands_moving", "--tier-name", "hands", "--label", "moving",
      "--bridge", "5f", "--min-duration", "5f", "--confidence", "max", "--smooth", "3"]),
])
def test_derive_is_the_command_lines(tmp_path, options, argv):
    expected, _ = _cli_document(tmp_path, "derive", FRAMES, *argv)
    assert tiers.dumps(tiers.derive(FRAMES, **options), "json") == tiers.dumps(expected, "json")


def test_derive_refusals():
    with pytest.raises(tiers.UsageError, match="off"):
        tiers.derive(FRAMES, rate=25, on=0.4, off=0.6)
    case = GOLDEN / "derive-bad-score"
    status, out, err = cli("derive", "scores.csv", "--rate", "25", "-o", "x.json", cwd=case)
    assert status == 1
    with pytest.raises(tiers.ReadError) as e:
        tiers.derive(case / "scores.csv", rate=25)
    assert e.value.diagnostics[0].line > 0
    assert e.value.diagnostics[0].message in err


def _golden_argv(case):
    """A golden case's command line, without the program's name and its -o."""
    argv = (GOLDEN / case / "cmd").read_text().split()
    k = argv.index("-o")
    return argv[1:k] + argv[k + 2:]


def _keywords(argv):
    """merge's options as tiers.merge's keyword arguments, and its inputs."""
    inputs, options, k = [], {}, 0
    while k < len(argv):
        if not argv[k].startswith("--"):
            inputs.append(argv[k])
            k += 1
            continue
        key = argv[k][2:].replace("-", "_")
        if key in ("shift", "align"):
            options.setdefault(key, []).append(argv[k + 1])
        else:
            options[key] = argv[k + 1]
        k += 2
    return inputs, options


@pytest.mark.parametrize("case", ["merge-human-first", "merge-plan", "merge-review-min",
                                  "merge-from-estimate"])
def test_merge_is_the_command_lines(tmp_path, monkeypatch, case):
    monkeypatch.chdir(GOLDEN / case)
    argv = _golden_argv(case)
    expected, _ = _cli_document(tmp_path, "merge", *argv)
    inputs, options = _keywords(argv)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", tiers.TiersWarning)  # merge's notes
        merged = tiers.merge(*inputs, **options)
    assert tiers.dumps(merged, "json") == tiers.dumps(expected, "json")


def test_merge_takes_documents_and_refuses_as_the_command_line(monkeypatch):
    monkeypatch.chdir(GOLDEN / "merge-clash")
    status, out, err = cli("merge", "human.json", "detector.json", "-o", "x.json")
    assert status == 1
    with pytest.raises(tiers.MergeError) as e:
        tiers.merge("human.json", "detector.json")
    # The command line names the merge as the file of its own problems; the messages are one.
    assert ["merge: " + str(d) for d in e.value.diagnostics] == err.splitlines()
    human, detector = tiers.read("human.json"), tiers.read("detector.json")
    merged = tiers.merge(("human.json", human), ("detector.json", detector),
                         clash="prefix-file")
    by_path = tiers.merge("human.json", "detector.json", clash="prefix-file")
    assert tiers.dumps(merged, "json") == tiers.dumps(by_path, "json")
    with pytest.raises(tiers.UsageError, match="clash"):
        tiers.merge(human, detector, clash="rename")
