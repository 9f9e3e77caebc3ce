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
from .reports import Report, report_of

__all__ = ["Annotation", "AnnotationList", "Attributes", "Diagnostic", "Document", "Error",
           "LossError", "Media", "ParentLink", "ReadError", "Source", "Tier", "TierList",
           "Report", "TiersWarning", "UsageError", "WriteError", "__version__", "dumps",
           "estimate", "formats", "from_pandas", "loads", "read", "write"]


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
