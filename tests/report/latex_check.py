"""A small LaTeX well-formedness checker for the generated tables (used by several tests)."""

import re
import shutil
import subprocess
from pathlib import Path

_ESCAPED = re.compile(r"\\\\|\\[{}$&%#_]")


def check_latex_table(text: str) -> dict:
    """Raise AssertionError unless braces, math shifts, environments and row widths are balanced.

    Returns ``{"environments": [...], "columns": n, "rows": [cells per row]}``.
    """
    plain = _ESCAPED.sub("", text)
    depth = 0
    for i, ch in enumerate(plain):
        if ch == "{":
            depth += 1
        elif ch == "}":
            depth -= 1
            assert depth >= 0, f"unbalanced '}}' at {i}"
    assert depth == 0, "unclosed '{'"
    stack, seen = [], []
    for kind, name in re.findall(r"\\(begin|end)\{([^}]*)\}", text):
        if kind == "begin":
            stack.append(name)
            seen.append(name)
        else:
            assert stack and stack[-1] == name, f"\\end{{{name}}} does not close {stack[-1:]!r}"
            stack.pop()
    assert not stack, f"unclosed environments {stack}"
    spec = re.search(r"\\begin\{tabular\}\{([^}]*)\}", text)
    assert spec, "no tabular"
    ncols = len(re.findall(r"[lrc]", spec.group(1)))
    body = text[text.index(r"\toprule"):text.index(r"\bottomrule")]
    rows = []
    for line in body.splitlines():
        line = line.strip()
        if not line or line in (r"\toprule", r"\midrule"):
            continue
        assert line.endswith(r"\\"), f"row does not end with \\\\: {line!r}"
        cells = _ESCAPED.sub("", line[:-2]).split("&")
        assert all(c.count("$") % 2 == 0 for c in cells), f"unbalanced $ in {line!r}"
        rows.append(len(cells))
    assert rows and all(n == ncols for n in rows), f"row widths {rows} vs {ncols} columns"
    for rule in (r"\toprule", r"\midrule", r"\bottomrule"):
        assert text.count(rule) == 1
    return {"environments": seen, "columns": ncols, "rows": rows}


def tex_engine():
    return shutil.which("pdflatex") or shutil.which("lualatex") or shutil.which("xelatex")


def compile_latex(table: str, folder: Path, bib_keys=()) -> Path:
    """Compile ``table`` in a minimal document; returns the PDF path (raises on failure)."""
    engine = tex_engine()
    items = "".join(rf"\bibitem{{{k}}} {k}." for k in bib_keys)
    bibliography = rf"\begin{{thebibliography}}{{9}}{items}\end{{thebibliography}}" if bib_keys else ""
    document = (r"\documentclass{article}" "\n" r"\usepackage{booktabs}" "\n"
                r"\usepackage[margin=5mm,landscape]{geometry}" "\n" r"\begin{document}" "\n"
                + table + "\n" + bibliography + "\n" r"\end{document}" "\n")
    (folder / "doc.tex").write_text(document, encoding="utf-8")
    done = subprocess.run([engine, "-interaction=nonstopmode", "-halt-on-error", "doc.tex"],
                          cwd=folder, capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stdout[-2000:]
    return folder / "doc.pdf"
