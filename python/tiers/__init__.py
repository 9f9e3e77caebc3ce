"""tiers: time-aligned annotation tiers — caption cues, word timings, detector scores, human
codings — read, written, checked and turned into pandas tables, exactly as the `tiers` program
does (the same C++ library, libtiers).

    >>> import tiers
    >>> doc = tiers.read("samples/panel-discussion.json")
    >>> doc["words"]
    Tier('words', interval, 68 annotations, machine demo-aligner 1.4, child of 'captions')
    >>> df = doc.to_pandas()

Times are exact: `Annotation.start_ns` and `end_ns` are integer nanoseconds; `start` and `end`
are float seconds for convenience. Errors raise `tiers.Error` subclasses carrying the located
diagnostics. See docs/python.md.
"""
from ._tiers import (Annotation, AnnotationList, Attributes, Diagnostic, Document, Media,
                     ParentLink, Source, Tier, TierList, __version__, dumps, formats, loads, read,
                     write)
from . import _tiers
from .errors import Error, LossError, ReadError, TiersWarning, UsageError, WriteError
from .reports import CheckReport, Report, Rows, check_report_of, report_of

__all__ = ["Annotation", "AnnotationList", "Attributes", "CheckReport", "Diagnostic",
           "Document", "Error",
           "LossError", "Media", "ParentLink", "ReadError", "Source", "Tier", "TierList",
           "Report", "Rows", "TiersWarning", "UsageError", "WriteError", "__version__",
           "agree", "check", "dumps", "estimate", "formats", "from_pandas", "loads", "read", "write"]


def from_pandas(df, *, columns=None, tier_name="tier", time_unit=None, rate=None,
                **reading_options):
    """from_pandas(df, *, columns=None, tier_name='tier', time_unit=None, rate=None,
    **reading_options) -> Document

    A DataFrame read as the CSV reader reads a table: one row per annotation, the columns found
    by their names (tier, start, end or duration, text, confidence, id, parent, markup; other
    columns become attributes) or as `columns` maps them ('role=column,…' or a dict). A frame
    from Document.to_pandas() comes back exactly: its start_ns and end_ns columns give the times
    to the nanosecond. Without a tier column every row is in the tier `tier_name`.
    """
    table = df
    if "start_ns" in df.columns and "end_ns" in df.columns:
        table = df.drop(columns=["start_ns", "end_ns"])
        table["start"] = _tiers._seconds_text(df["start_ns"].to_numpy("int64"))
        table["end"] = _tiers._seconds_text(df["end_ns"].to_numpy("int64"))
        if time_unit not in (None, "s"):
            raise UsageError("from_pandas: start_ns and end_ns are nanoseconds: time_unit is "
                             "for frames without them", [])
    text = table.to_csv(index=False, lineterminator="\n")
    return loads(text, "csv", columns=columns, tier_name=tier_name, time_unit=time_unit,
                 rate=rate, **reading_options)


def estimate(sheets, *, level=0.95, target_precision=None):
    """estimate(sheets, *, level=0.95, target_precision=None) -> Report

    A machine tier's precision from reviewed sample sheets (what `tiers sample` wrote, with the
    verdicts filled in): a path, or a list of paths when the sample was reviewed in parts. The
    report has the fields of `tiers estimate --json` (docs/review.md): `overall` (precision,
    low, high, se, reviewed, correct, annotations), `strata` and `labels` (with Wilson's and
    Clopper-Pearson's intervals; `report.to_pandas("strata")`), `unreviewed_strata`, and with
    `target_precision` the `threshold` that reaches it. A bad sheet raises ReadError with its
    located diagnostics.
    """
    import os
    paths = [sheets] if isinstance(sheets, (str, bytes, os.PathLike)) else list(sheets)
    return report_of(_tiers._estimate_json(paths, level, target_precision))


def _paths(inputs):
    import os
    return [inputs] if isinstance(inputs, (str, bytes, os.PathLike)) else list(inputs)


def check(inputs, *, profile=None, captions=None, words=None, jobs=0, **reading_options):
    """check(inputs, *, profile=None, captions=None, words=None, jobs=0, **reading_options)
    -> CheckReport

    Checks files as `tiers check` does: `inputs` is a path or a list of paths, folders searched
    for tier files; `profile` a built-in profile's name or a profile file; `captions` the
    caption tier; `words` the word timings (a tier of each file, or FILE or FILE:TIER); `jobs`
    files at once (0: one per core). The reading options are read()'s. The report has the
    fields of `tiers check --format json` (`files`, `summary`), and `problems` and `lag` as
    rows (`report.problems.to_pandas()`), `ok`, `to_json()` and `to_sarif()`. A file that
    cannot be read is a problem of the report, not an exception.
    """
    run = _tiers._check(_paths(inputs), profile, captions, words, jobs, **reading_options)
    return check_report_of(run)


def agree(reference, candidate=None, *, tier=None, ref_tier=None, cand_tier=None, tiers=None,
          step="10ms", match="boundaries", collar="200ms", min_overlap=0.5, any_label=False,
          min_confidence=0.0, empty="missing", **reading_options):
    """agree(reference, candidate=None, *, tier=None, ref_tier=None, cand_tier=None, tiers=None,
    step='10ms', match='boundaries', collar='200ms', min_overlap=0.5, any_label=False,
    min_confidence=0.0, empty='missing', **reading_options) -> Report

    How far a candidate tier agrees with a reference, as `tiers agree --json` reports it
    (docs/agreement.md): frame-wise Cohen's kappa, precision, recall and F1 with the confusion
    matrix (`report.frames`), and segments matched one to one (`report.segments`). `reference`
    and `candidate` are paths (read with the reading options) or Documents; with one document,
    name two of its tiers (ref_tier=, cand_tier=). With `tiers=[A, B, C…]`, several annotators'
    tiers of one document: Krippendorff's alpha and every pair's kappa. Durations are given as
    on the command line: '10ms', '1.5s', '2f' (frames at the document's rate, or rate=).
    """
    if tiers is not None:
        tiers = [tiers] if isinstance(tiers, str) else list(tiers)
    return report_of(_tiers._agree_json(reference, candidate, tier, ref_tier, cand_tier, tiers,
                                        step, match, collar, min_overlap, any_label,
                                        min_confidence, empty, **reading_options))
