"""docs/python.md: every ```python snippet runs, in order, in one namespace, from the
repository's root — the page shows what the package does, not what it once did."""
import re

from conftest import ROOT


def test_every_snippet_of_the_python_page_runs(monkeypatch, capsys):
    page = (ROOT / "docs" / "python.md").read_text(encoding="utf-8")
    snippets = re.findall(r"```python\n(.*?)```", page, re.S)
    assert len(snippets) >= 8
    monkeypatch.chdir(ROOT)
    namespace = {}
    for k, code in enumerate(snippets):
        exec(compile(code, f"docs/python.md snippet {k + 1}", "exec"), namespace)
    out = capsys.readouterr().out
    assert "Tier('coder-a'" in out and "refused:" in out and "csv.time" in out
