"""Reading and writing through Python against the command line: the same documents, the same
bytes, the same refusals."""
import pathlib

import pytest

import tiers
from conftest import GOLDEN, SAMPLES, cli

# Every sample the command line reads without options, and two that need them.
PLAIN = sorted(p for p in SAMPLES.glob("*") if p.suffix in (".json", ".csv", ".tsv", ".vtt",
                                                              ".ttml", ".tiers")
               and p.name not in ("panel-discussion.frames.csv", "gesture-types.timecode.csv"))
WITH_OPTIONS = [
    (SAMPLES / "gesture-types.timecode.csv",
     ["--columns", "tier=track,start=onset,end=offset,text=label", "--rate", "25"],
     {"columns": {"tier": "track", "start": "onset", "end": "offset", "text": "label"},
      "rate": 25}),
    (SAMPLES / "market-corpus" / "aligner" / "stall-1.csv",
     ["--columns", "start=t_begin_ms,end=t_end_ms,text=token", "--time-unit", "ms",
      "--tier-name", "words", "--source", "machine:aligner"],
     {"columns": "start=t_begin_ms,end=t_end_ms,text=token", "time_unit": "ms",
      "tier_name": "words", "source": "machine:aligner"}),
]


@pytest.mark.parametrize("path", PLAIN, ids=lambda p: p.name)
def test_every_sample_reads_as_the_command_line_reads_it(path):
    status, expected, err = cli("convert", path, "--to", "json")
    assert status == 0, err
    assert tiers.dumps(tiers.read(path), "json") == expected
    assert tiers.dumps(tiers.read(str(path)), "json") == expected  # str or PathLike
    assert tiers.dumps(tiers.loads(path.read_bytes(), path.suffix[1:],
                                   tier_name=path.stem), "json") == expected


@pytest.mark.parametrize("path,argv,options", WITH_OPTIONS, ids=lambda v: getattr(v, "name", ""))
def test_reading_options_are_the_command_lines(path, argv, options):
    status, expected, err = cli("convert", path, *argv, "--to", "json")
    assert status == 0, err
    assert tiers.dumps(tiers.read(path, **options), "json") == expected


@pytest.mark.parametrize("fmt", ["json", "tiers", "csv", "tsv", "vtt", "ttml"])
def test_writing_is_the_command_lines(fmt, scratch):
    source = SAMPLES / "panel-discussion.json"
    out = scratch / f"out.{fmt}"
    status, _, err = cli("convert", source, "-o", out, "--allow-loss")
    assert status == 0, err
    doc = tiers.read(source)
    with pytest.warns(tiers.TiersWarning) if fmt not in ("json", "tiers") else _nothing():
        mine = tiers.dumps(doc, fmt, allow_loss=True)
    assert mine == out.read_bytes().decode()
    written = scratch / f"mine.{fmt}"
    with pytest.warns(tiers.TiersWarning) if fmt not in ("json", "tiers") else _nothing():
        tiers.write(doc, written, allow_loss=True)
    assert written.read_bytes().decode() == mine


def test_a_lossy_write_is_refused_with_the_losses_and_writes_nothing(scratch):
    doc = tiers.read(SAMPLES / "panel-discussion.json")
    status, _, err = cli("convert", SAMPLES / "panel-discussion.json", "-o", scratch / "cli.csv")
    assert status == 1
    with pytest.raises(tiers.LossError) as e:
        tiers.write(doc, scratch / "out.csv")
    assert e.value.losses and all(loss in err for loss in e.value.losses)
    assert not (scratch / "out.csv").exists()


def _golden_read_errors():
    """Golden cases where `convert`/`info` of one file fails on its content."""
    for case in sorted(GOLDEN.iterdir()):
        cmd = (case / "cmd").read_text().split()
        status = case / "expected.status"
        if (len(cmd) < 2 or cmd[0] not in ("convert", "info") or not status.exists()
                or status.read_text().strip() != "1" or not (case / cmd[1]).is_file()):
            continue
        errors = [line for line in (case / "expected.stderr").read_text().splitlines()
                  if line.startswith(cmd[1] + ":") and ": error: " in line]
        options = [a for a in cmd[2:] if a.startswith("--") and a not in ("--to", "-o")]
        if errors and not options:
            yield case, cmd[1], errors


@pytest.mark.parametrize("case,name,errors", list(_golden_read_errors()),
                         ids=lambda v: v.name if isinstance(v, pathlib.Path) else "")
def test_errors_carry_the_located_diagnostics_the_command_line_prints(case, name, errors,
                                                                       monkeypatch):
    monkeypatch.chdir(case)
    with pytest.raises(tiers.ReadError) as e:
        tiers.read(name)
    # Each interface names its own way to give the format.
    mine = [str(d).replace("name it with format=", "name it with --from")
            for d in e.value.diagnostics if d.severity == "error"]
    assert mine == errors
    first = next(d for d in e.value.diagnostics if d.severity == "error")
    assert first.file == name and first.code
    if first.offset is not None:  # a problem in the content, not with the file as a whole
        assert first.line >= 1 and first.column >= 1


def test_a_missing_file_and_a_bad_option_are_errors_of_their_own(scratch):
    with pytest.raises(tiers.ReadError) as e:
        tiers.read(scratch / "nothing.json")
    assert e.value.diagnostics[0].code == "io.open"
    with pytest.raises(tiers.UsageError):
        tiers.read(SAMPLES / "panel-discussion.csv", time_unit="fortnights")
    with pytest.raises(ValueError):  # a UsageError is a ValueError
        tiers.read(SAMPLES / "panel-discussion.csv", colour="blue")
    with pytest.raises(tiers.UsageError):
        tiers.dumps(tiers.Document(), "docx")


class _nothing:
    def __enter__(self):
        return self

    def __exit__(self, *exc):
        return False
