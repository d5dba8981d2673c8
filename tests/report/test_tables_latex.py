"""Tables: LaTeX well-formedness (parsed, and compiled when a TeX engine exists), the other
formats, column choice and citation keys."""

import io
import shutil
import json
import subprocess
import sys

import pandas as pd
import pytest

from twoel.errors import InputError
from twoel.report.tables import latex_ion, latex_text, render, select_columns

from latex_check import check_latex_table, compile_latex, tex_engine

# Reference value: C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006).
HE_REF = "-2.903724377034119598311159245194404"


@pytest.fixture
def frame():
    return pd.DataFrame([
        {"Z": 2.0, "ion": "He", "state": "1^1S", "n_terms": 22, "energy_hartree": -2.9037139450243044,
         "error_bar_hartree": 2e-12, "reference_hartree": float(HE_REF), "reference_hartree_text": HE_REF,
         "reference_uncertainty_hartree": 1e-33, "reference_key": "schwartz2006",
         "difference_hartree": 1.0432009815097842e-05, "bound": True, "note": "50% & more_{x}"},
        {"Z": 4.0, "ion": "Be2+", "state": "2^3S", "n_terms": 7, "energy_hartree": -13.6,
         "error_bar_hartree": None, "reference_hartree": None, "reference_hartree_text": None,
         "reference_uncertainty_hartree": None, "reference_key": None,
         "difference_hartree": None, "bound": False, "note": "~^\\"},
    ])


def test_latex_is_well_formed_and_groups_digits(frame):
    text = render(frame, "latex", caption="1^1S energies & more", label="tab:x")
    info = check_latex_table(text)
    assert info["environments"] == ["table", "tabular"]
    assert r"$-2.903\,713\,945\,024(2)$" in text              # value with its error bar folded
    assert r"\cite{schwartz2006}" in text
    assert r"$-2.903\,724\,377\,034\,120^{\ddagger}$" in text   # reference from its text, rounded at 15
    assert r"$-13.6^{\dagger}$" in text                                # no error bar: marked
    assert r"$\dagger$ no uncertainty" in text and r"$\ddagger$ rounded to 15 decimals" in text
    assert r"$1.04\times 10^{-5}$" in text
    assert r"$2\,^{3}\mathrm{S}$" in text and r"Be$^{2+}$" in text
    assert r"50\% \& more\_\{x\}" in text
    assert info["columns"] == len(frame.columns) - 3    # bar, reference text and uncertainty folded


def test_latex_without_caption_is_a_bare_tabular(frame):
    info = check_latex_table(render(frame, "latex"))
    assert info["environments"] == ["tabular"]


def test_checker_rejects_broken_latex():
    good = "\\begin{tabular}{rl}\n\\toprule\na & b \\\\\n\\midrule\n$1$ & x \\\\\n\\bottomrule\n\\end{tabular}\n"
    check_latex_table(good)
    for bad in (good.replace("\\end{tabular}", ""), good.replace("$1$", "$1"),
                good.replace("x \\\\", "x & y \\\\"), good.replace("a &", "{a &")):
        with pytest.raises(AssertionError):
            check_latex_table(bad)


def test_series_command_latex_is_well_formed(tmp_path):
    out = subprocess.run([sys.executable, "-m", "twoel", "series", "--Z", "1:3", "--size", "1",
                          "--format", "latex", "--quiet"], capture_output=True, text=True, check=True)
    info = check_latex_table(out.stdout)
    assert info["rows"] and len(info["rows"]) == 4                # header + 3 ions
    if tex_engine() is None:
        pytest.skip("no TeX engine installed: parsed only")
    pdf = compile_latex(out.stdout, tmp_path, bib_keys=("nakashima2007", "schwartz2006"))
    assert pdf.read_bytes()[:5] == b"%PDF-"


@pytest.mark.skipif(tex_engine() is None, reason="no TeX engine installed")
def test_generated_table_compiles(frame, tmp_path):
    pdf = compile_latex(render(frame, "latex", caption="test"), tmp_path, bib_keys=("schwartz2006",))
    assert pdf.stat().st_size > 1000


def test_markdown_csv_json(frame):
    md = render(frame, "markdown")
    assert "-2.903\u202f713\u202f945\u202f024(2)" in md and "[schwartz2006]" in md
    table, _, notes = md.partition("\n\n")
    assert table.count("\n") == 3 and "error bar" not in table      # header, rule, two rows
    assert notes.startswith("\u2020 no uncertainty") and "\u2021 rounded to 15 decimals" in notes
    csv_text = render(frame, "csv")
    back = pd.read_csv(io.StringIO(csv_text))
    assert back["energy_hartree"][0] == frame["energy_hartree"][0]    # full precision round trip
    concise = [c for c in back.columns if c.endswith("_concise")]
    assert [c for c in back.columns if c not in concise] == list(frame.columns)
    assert concise == ["energy_hartree_concise", "reference_hartree_concise"]
    assert back["energy_hartree_concise"][0] == "-2.903713945024(2)"
    assert back["energy_hartree_concise"][1] == "-13.6 (no uncertainty)"
    records = json.loads(render(frame, "json"))
    assert records[0]["energy_hartree"] == frame["energy_hartree"][0]
    assert records[1]["reference_hartree"] is None
    html = render(frame, "html")
    assert html.count("<tr>") == 3 and html.count("<th>") == md.splitlines()[0].count("|") - 1
    assert '<p class="table-notes">\u2020 no uncertainty' in html
    assert "<td style=\"text-align:right\">-2.903\u202f713\u202f945\u202f024(2)</td>" in html


def test_column_choice(frame):
    assert select_columns(frame, "Z, energy_hartree") == ["Z", "energy_hartree"]
    assert select_columns(frame, "all") == list(frame.columns)
    text = render(frame, "csv", columns=["ion", "Z"])
    assert text.splitlines()[0] == "ion,Z"
    md = render(frame, "markdown", columns=["Z", "energy_hartree"])
    assert "-2.903\u202f713\u202f945\u202f024(2) |" in md      # the row's bar is used when not shown
    with pytest.raises(InputError, match="unknown column"):
        select_columns(frame, "Z,nope")
    with pytest.raises(InputError, match="twice"):
        select_columns(frame, ["Z", "Z"])
    with pytest.raises(InputError):
        render(frame, "docx")


def test_series_command_columns_option():
    out = subprocess.run([sys.executable, "-m", "twoel", "series", "--Z", "2", "--size", "1", "--quiet",
                          "--format", "csv", "--columns", "Z,reference_key,energy_hartree"],
                         capture_output=True, text=True, check=True)
    header, row = out.stdout.splitlines()
    assert header == "Z,reference_key,energy_hartree" and row.split(",")[1] == "schwartz2006"
    bad = subprocess.run([sys.executable, "-m", "twoel", "series", "--Z", "2", "--size", "1", "--quiet",
                          "--columns", "Z,nope"], capture_output=True, text=True)
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1 and "unknown column" in bad.stderr


def test_latex_text_helpers():
    assert latex_text("2^3S and 10% of x_1") == r"$2\,^{3}\mathrm{S}$ and 10\% of x\_1"
    assert latex_ion("H-") == r"H$^{-}$" and latex_ion("Z=1.5") == "Z=1.5"


@pytest.mark.skipif(tex_engine() is None or shutil.which("bibtex") is None, reason="no TeX engine/bibtex")
def test_citations_resolve_against_references_bib(tmp_path):
    # the \cite keys of a table resolve with BibTeX against data/references.bib (no "undefined")
    from pathlib import Path

    bib = Path(__file__).resolve().parents[2] / "data" / "references.bib"
    shutil.copy(bib, tmp_path / "references.bib")
    table = subprocess.run([sys.executable, "-m", "twoel", "series", "--Z", "1:2", "--size", "0",
                            "--format", "latex", "--quiet"], capture_output=True, text=True, check=True).stdout
    (tmp_path / "doc.tex").write_text(
        "\\documentclass{article}\n\\usepackage{booktabs}\n\\usepackage[margin=5mm,landscape]{geometry}\n"
        "\\begin{document}\n" + table + "\\nocite{*}\\bibliographystyle{plain}\\bibliography{references}\n"
        "\\end{document}\n", encoding="utf-8")
    engine = tex_engine()
    for command in ([engine, "-interaction=nonstopmode", "doc.tex"], ["bibtex", "doc"],
                    [engine, "-interaction=nonstopmode", "doc.tex"], [engine, "-interaction=nonstopmode", "doc.tex"]):
        done = subprocess.run(command, cwd=tmp_path, capture_output=True, text=True, timeout=120)
        assert done.returncode == 0, done.stdout[-1500:]
    log = (tmp_path / "doc.log").read_text(errors="replace")
    assert "undefined" not in log.lower()
    import re

    n_entries = len(re.findall(r"^@\w+\s*\{", bib.read_text(encoding="utf-8"), flags=re.M))
    assert (tmp_path / "doc.bbl").read_text().count("\\bibitem") == n_entries >= 3
