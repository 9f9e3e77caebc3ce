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


def test_every_public_name_has_a_docstring_and_a_stub():
    import ast
    import tiers
    stub = ast.parse((ROOT / "python" / "tiers" / "__init__.pyi").read_text(encoding="utf-8"))
    stubbed = {n.name for n in stub.body if isinstance(n, (ast.FunctionDef, ast.ClassDef))}
    stubbed |= {a.asname for n in stub.body if isinstance(n, ast.ImportFrom) for a in n.names}
    for name in tiers.__all__:
        if name == "__version__":
            continue
        assert getattr(tiers, name).__doc__, name
        assert name in stubbed, f"{name} has no stub in __init__.pyi"
