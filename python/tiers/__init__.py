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
from .errors import (EditError, Error, LossError, MergeError, ReadError, TiersWarning,
                     UsageError, WriteError)
from .reports import CheckReport, Report, Rows, Sample, check_report_of, report_of

__all__ = ["Annotation", "AnnotationList", "Attributes", "CheckReport", "Diagnostic",
           "Document", "EditError", "Error",
           "LossError", "Media", "MergeError", "ParentLink", "ReadError", "Source", "Tier", "TierList",
           "Report", "Rows", "Sample", "TiersWarning", "UsageError", "WriteError", "__version__",
           "agree", "check", "cooccur", "dataset", "derive", "dumps", "edit", "estimate", "merge", "read_recording", "retime", "sample", "formats", "from_pandas", "loads", "read", "write"]


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


def retime(doc, words=None, *, captions=None, lead_in="0", hold="0", min_gap=None,
           min_duration=None, max_cps=None, profile=None, to=None, **reading_options):
    """retime(doc, words=None, *, captions=None, lead_in='0', hold='0', min_gap=None,
    min_duration=None, max_cps=None, profile=None, to=None, **reading_options) -> Report

    Moves caption cues onto their words' timings, as `tiers retime` does (docs/retime.md).
    `doc` is a Document (left as it was) or a path; `words` the word timings: a tier of the
    document (default: its only tier, else 'words'), 'FILE' or 'FILE:TIER', or a Document.
    Durations as on the command line ('0.12s', '2f'); what is not given comes from `profile`'s
    caption rules. `to` names the format the result will be written in, whose time grid the
    new times keep to. The report has the fields of `tiers retime --json` (`cues`, `summary`);
    `report.document` is the re-timed document.
    """
    document, text = _tiers._retime(doc, words, captions or "", str(lead_in), str(hold),
                                    None if min_gap is None else str(min_gap),
                                    None if min_duration is None else str(min_duration),
                                    max_cps, profile, to, **reading_options)
    report = report_of(text)
    report.document = document
    return report


def edit(doc, *steps, from_zero=False, **reading_options):
    """edit(doc, *steps, from_zero=False, **reading_options) -> Document

    Time and tier operations in the order given, as `tiers edit` applies its options
    (docs/cli.md, "edit"): each step is a pair ('shift', '-0.48s'), ('scale', '25:24'),
    ('snap', '25'), ('cut', '10..20'), ('drop', 'tier'), ('rename', 'old=new') or ('select',
    ['a', 'b']). `doc` is a Document (left as it was) or a path; the edited copy is returned.
    A step that cannot be done raises EditError naming it, and nothing is changed.
    """
    return _tiers._edit(doc, [(name, value) for name, value in steps], from_zero,
                        **reading_options)


def derive(signal, *, format="", rate="", scores=None, on=0.5, off=None, smooth=1,
           min_duration="0", bridge="0", confidence="mean", agent="", agent_version="",
           tier_name="", label=""):
    """derive(signal, *, format='', rate='', scores=None, on=0.5, off=None, smooth=1,
    min_duration='0', bridge='0', confidence='mean', agent='', agent_version='', tier_name='',
    label='') -> Document

    Interval tiers from a detector's per-frame scores, as `tiers derive` makes them
    (docs/derive.md): a tier per score column (or `scores`, a list), an interval where the
    score reaches `on` until it falls below `off`, after a median over `smooth` rows, gaps
    shorter than `bridge` joined and intervals shorter than `min_duration` dropped. `format`
    is csv, tsv or jsonl (default: by the extension); `rate` the frame rate of a frame column.
    A bad table raises ReadError with its located diagnostics.
    """
    if scores is not None and not isinstance(scores, str):
        scores = ",".join(scores)
    return _tiers._derive(signal, format, str(rate), scores or "", on, off, smooth,
                          str(min_duration), str(bridge), confidence, agent, agent_version,
                          tier_name, label)


def _pairs(value):
    """{'a': 'x'} or ['a=x'] as ['a=x']."""
    if value is None:
        return []
    if isinstance(value, dict):
        return [f"{k}={v}" for k, v in value.items()]
    return [value] if isinstance(value, str) else list(value)


def merge(*inputs, plan=None, clash=None, shift=None, align=None, max_offset=None, into=None,
          human=None, machine=None, strategy=None, min_confidence=None, min_duration=None,
          review=None, review_min=None, **reading_options):
    """merge(*inputs, plan=None, clash=None, shift=None, align=None, max_offset=None, into=None,
    human=None, machine=None, strategy=None, min_confidence=None, min_duration=None,
    review=None, review_min=None, **reading_options) -> Document

    The tiers of several documents of one recording in one, as `tiers merge` joins them
    (docs/merge.md): `inputs` are paths (read with the reading options), Documents (called
    input-1, input-2, … in messages and the recorded plan) or (name, Document) pairs, after a
    `plan` file's own inputs. `clash` ('fail', 'prefix-file', 'prefix-source') settles tiers
    of the same name; `shift` ({tier: '-0.04s'}) and `align` ({tier: reference}) correct times;
    `into`, `human` and `machine` combine a human and a machine tier (with `strategy`,
    `min_confidence` — a number, or 'from-estimate' —, `min_duration`, and a `review` tier of
    where they disagree). The result records the inputs and the plan. A refusal raises
    MergeError with the diagnostics; notes and warnings become TiersWarning.
    """
    def text(v):
        return "" if v is None else str(v)
    return _tiers._merge(list(inputs), text(plan), text(clash), _pairs(shift), _pairs(align),
                         text(max_offset), text(into), text(human), text(machine),
                         text(strategy), text(min_confidence), text(min_duration), text(review),
                         text(review_min), **reading_options)


def cooccur(inputs, a, b, *, relation="overlap", window="0", fold_case=False, min_count=1,
            b_labels=None, sort="g2", permutations=0, seed=1, jobs=0, **reading_options):
    """cooccur(inputs, a, b, *, relation='overlap', window='0', fold_case=False, min_count=1,
    b_labels=None, sort='g2', permutations=0, seed=1, jobs=0, **reading_options) -> Report

    Which labels of tier `a` go with which labels of tier `b` over a corpus, as `tiers
    cooccur --json` reports it (docs/cooccur.md): `inputs` is a path, a folder, a Document or
    a list of them; each annotation of A co-occurs with B's labels by `relation` ('overlap',
    'within', 'starts-in'), B widened by `window`. The report's `pairs` (also
    `report.to_pandas("pairs")`) hold each pair's count, expected count, G², Fisher's p
    (adjusted by Benjamini-Hochberg), log odds with their interval, PMI, and with
    `permutations` a p from circular shifts of B (seeded by `seed`).
    """
    import os
    given = [inputs] if isinstance(inputs, (str, bytes, os.PathLike, Document)) else list(inputs)
    if b_labels is not None and not isinstance(b_labels, str):
        b_labels = ",".join(b_labels)
    return report_of(_tiers._cooccur_json(given, a, b, relation, str(window), fold_case,
                                          min_count, b_labels or "", sort, permutations, seed,
                                          jobs, **reading_options))


def sample(inputs, tier, n=0, *, seed=1, strata=None, by=None, allocation="proportional",
           context="0", plan=False, margin=0.05, level=0.95, review_rate=250, output=None,
           jobs=0, **reading_options):
    """sample(inputs, tier, n=0, *, seed=1, strata=None, by=None, allocation='proportional',
    context='0', plan=False, margin=0.05, level=0.95, review_rate=250, output=None, jobs=0,
    **reading_options) -> Sample or Report

    A stratified random sample of a machine tier's annotations for review, as `tiers sample`
    draws it (docs/review.md): `n` clips from the tier `tier` of every input (paths, folders,
    Documents), in strata of confidence (`strata`: limits such as [0.5, 0.7, 0.9]), of label
    or of file (`by`), shared out by `allocation`; the same seed, the same sample. The Sample
    holds the sheet's rows and its CSV; with `output`, it is written there, its media links
    relative to that folder. With plan=True, no draw: the sizes for a margin of error (a
    Report with the fields of `tiers sample --plan --json`).
    """
    import os
    given = [inputs] if isinstance(inputs, (str, bytes, os.PathLike, Document)) else list(inputs)
    if strata is not None and not isinstance(strata, str):
        strata = ",".join(str(v) for v in strata)
    folder = os.path.dirname(os.fspath(output)) or "." if output is not None else "."
    text, rows = _tiers._sample(given, tier, n, seed, strata or "", by or "", allocation,
                                str(context), plan, margin, level, review_rate, folder, jobs,
                                **reading_options)
    if plan:
        return report_of(text)
    drawn = Sample(text, rows)
    if output is not None:
        drawn.write(output)
    return drawn


def dataset(description, *, jobs=0, **reading_options):
    """dataset(description, *, jobs=0, **reading_options) -> Report

    A dataset description's recordings, as `tiers dataset --json` lists them (docs/dataset.md):
    `sources` (each pattern, and how many recordings have a file for it), `complete`, and
    `recordings` (each with its files — None where it lacks one —, the patterns it lacks, and,
    when it could be read, its tiers, annotations and duration; `report.to_pandas
    ("recordings")`). The reading options are the run's, which each source's `read` overrides.
    A bad description raises ReadError with its located diagnostics.
    """
    return report_of(_tiers._dataset_json(description, jobs, **reading_options))


def read_recording(description, id, **reading_options):
    """read_recording(description, id, **reading_options) -> Document

    One recording of a dataset description read as every `--dataset` run reads it: each of its
    files with its source's reading settings and the tiers' source and kind, joined into one
    document. A file it lacks, or one that cannot be read, raises ReadError.
    """
    return _tiers._read_recording(description, id, **reading_options)
