"""The operations' results: a command's JSON report as a Python object."""
import json


class Report(dict):
    """A report with the fields of the command's JSON (docs/cli.md), as keys and as attributes:
    `report.overall.precision` is `report["overall"]["precision"]`."""

    def __getattr__(self, name):
        try:
            return self[name]
        except KeyError:
            raise AttributeError(f"the report has no field {name!r} (its fields: "
                                 f"{', '.join(self)})") from None

    def to_json(self):
        """The report as the command's JSON."""
        return json.dumps(self, ensure_ascii=False, indent=2)

    def to_pandas(self, field):
        """A list field of the report (rows of objects) as a DataFrame."""
        import pandas
        return pandas.DataFrame(list(self[field]))

    def __repr__(self):
        return f"Report({self.get('format', '?')}: {', '.join(k for k in self if k != 'format')})"


def report_of(text):
    """A report from the JSON a command writes."""
    return json.loads(text, object_hook=Report)


def check_report_of(run):
    """The report of a finished check (_tiers._CheckRun)."""
    return CheckReport(report_of(run.json()), run)


class Rows(list):
    """Rows of a report (dicts with the same fields), as a list and as a DataFrame."""

    def to_pandas(self):
        """The rows as a DataFrame, one column per field."""
        import pandas
        return pandas.DataFrame(list(self))


class CheckReport(Report):
    """What `tiers check --format json` reports (docs/cli.md, "check"): `files` (each with its
    `path`, `problems`, `lag` and `tiers`) and `summary`; `problems` and `lag` gather the files'
    rows, each naming its `file`."""

    def __init__(self, fields, run):
        super().__init__(fields)
        self._run = run

    @property
    def problems(self):
        """Every problem of every file, in the report's order, each with its `file`."""
        return Rows({"file": f["path"], **p} for f in self["files"] for p in f["problems"])

    @property
    def lag(self):
        """Each file's lag of captions behind words (those with one), with its `file`."""
        return Rows({"file": f["path"], **f["lag"]} for f in self["files"] if "lag" in f)

    @property
    def ok(self):
        """Whether no error was found (what `tiers check`'s exit status 0 says)."""
        return self["summary"]["errors"] == 0

    def to_json(self):
        """The report exactly as `tiers check --format json` writes it."""
        return self._run.json()

    def to_sarif(self):
        """The report as `tiers check --format sarif` writes it (SARIF 2.1.0)."""
        return self._run.sarif()

    def __repr__(self):
        s = self["summary"]
        return (f"CheckReport({s['files']} files: {s['errors']} errors, {s['warnings']} "
                f"warnings, {s['notes']} notes)")


class Sample(Rows):
    """A review sample: the rows of the sheet `tiers sample` writes (every field a string, as in
    the CSV), `strata` (each stratum's annotations and how many were drawn), and `text`, the
    sheet's CSV byte for byte."""

    def __init__(self, text, strata):
        import csv
        import io
        super().__init__(csv.DictReader(io.StringIO(text, newline="")))
        self.text = text
        self.strata = Rows(strata)

    def write(self, path):
        """Writes the sheet (its media links are relative to the folder `tiers.sample` was
        told, `output`'s)."""
        with open(path, "w", encoding="utf-8", newline="") as f:
            f.write(self.text)

    def __repr__(self):
        return f"Sample({len(self)} clips from {len(self.strata)} strata)"
