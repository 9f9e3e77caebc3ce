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
