r"""Render a :class:`pandas.DataFrame` of results as Markdown, CSV, LaTeX, JSON (or HTML) text.

CSV and JSON are for machines: every selected column, every float at full ``repr`` precision
(``%.17g``), nothing folded.  When every column is written (no column choice), each value
column of :data:`UNCERTAIN_COLUMNS` present also gets a text column ``<column>_concise`` with the
rounded concise form (``-2.903724377034(2)``, ungrouped; a value without an uncertainty is its
full ``repr`` followed by ``" (no uncertainty)"``).  Markdown, LaTeX and HTML are for people and papers:

* digits are grouped in threes after the decimal point (``-2.903 724 377 034``; thin spaces
  ``\,`` in LaTeX, narrow no-break spaces in Markdown/HTML; ISO 80000-1 §7.3.1);
* a value with an uncertainty is written in the parenthesis notation ``-2.903 724 377 034(2)``
  with only the digits the uncertainty supports (an uncertainty column selected beside its
  value is then not repeated).  The uncertainty of an energy is its ``error_bar_hartree``, of a
  reference its ``reference_uncertainty_hartree`` (:data:`UNCERTAINTY_COLUMNS`), of an ionization
  energy the energy's bar converted to its unit (the nonrelativistic threshold is exact;
  :data:`PROPAGATED_UNCERTAINTY`), taken from the row whether or not the uncertainty column is
  shown;
* a value of :data:`UNCERTAIN_COLUMNS` without an uncertainty is shown as computed and marked
  ``†``; a value whose uncertainty lies beyond ``max_decimals`` is rounded there and marked
  ``‡``; an energy whose bar is flagged ``reliable: false`` is marked ``§``.  The table is followed
  by one note per mark used (:data:`MARK_NOTES`);
* reference values are printed from their exact text (``reference_hartree_text``) when the frame
  has it, so digits beyond float64 survive;
* small differences and increments are printed in scientific notation with 3 digits;
* ``reference_key`` becomes ``\cite{key}`` in LaTeX (the keys are the entries of
  ``data/references.bib``);
* term symbols ``1^1S`` become :math:`1\,^1\mathrm{S}`.

The LaTeX is a booktabs ``tabular`` (wrapped in ``table`` with ``\caption``/``\label`` when a
caption is given); the document needs ``\usepackage{booktabs}``.
"""

from __future__ import annotations

import html as _html
import io
import json
import math
import re

import pandas as pd

from twoel.errors import InputError
from twoel.report.numbers import (NARROW_NBSP, format_uncertain, group_digits, latex_number, latex_scientific,
                      text_scientific)

TABLE_FORMATS = ("markdown", "csv", "latex", "json")

#: value column -> the column holding its standard uncertainty (same unit)
UNCERTAINTY_COLUMNS = {
    "energy_hartree": "error_bar_hartree",
    "reference_hartree": "reference_uncertainty_hartree",
    "quantum_defect": "quantum_defect_uncertainty",   # twoel levels (twoel.analysis.levels)
    "effective_n": "quantum_defect_uncertainty",      # σ(n*) = σ(δ)
}

#: value column -> (column of the energy's error bar, unit it is converted to): an ionization
#: energy ``-Z²/2 - E`` has the bar of ``E`` (the nonrelativistic threshold is exact), scaled by the
#: unit conversion (the CODATA uncertainty of the conversion factor, 1e-12 relative, is left out)
PROPAGATED_UNCERTAINTY = {
    "ionization_energy_hartree": ("error_bar_hartree", "hartree"),
    "ionization_energy_ev": ("error_bar_hartree", "eV"),
    "ionization_energy_cm1": ("error_bar_hartree", "cm-1"),
}

#: value columns whose printed digits need an uncertainty (marked when they have none)
UNCERTAIN_COLUMNS = frozenset({"energy_hartree", "reference_hartree", "extrapolated_hartree",
                               "correlation_energy_hartree", "quantum_defect", "effective_n",
                               *PROPAGATED_UNCERTAINTY})

#: mark -> (plain-text symbol, LaTeX math symbol)
MARKS = {"nobar": ("\u2020", r"\dagger"), "rounded": ("\u2021", r"\ddagger"), "unreliable": ("\u00a7", r"\S")}

#: mark -> the note printed under a table that uses it
MARK_NOTES = {
    "nobar": "no uncertainty (the basis family gives no error bar, or the source states none): "
             "shown as computed, up to {digits} significant digits; not all of them are correct",
    "rounded": "rounded to {decimals} decimals; the stated uncertainty is smaller "
               "(every digit in the .csv/.json)",
    "unreliable": "error bar flagged reliable: false (the nested bases do not converge regularly)",
}

#: value column -> the column holding its exact decimal text
TEXT_COLUMNS = {"reference_hartree": "reference_hartree_text"}

#: columns printed in scientific notation (3 significant digits) for people
SCIENTIFIC_COLUMNS = frozenset({
    "difference_hartree", "increment_hartree", "error_bar_hartree", "extrapolation_error_hartree",
    "reference_uncertainty_hartree", "condition_number", "residual_hartree", "ratio_error_hartree",
    "quantum_defect_uncertainty",
})

#: columns printed as term symbols / citation keys
STATE_COLUMNS = frozenset({"state"})
CITATION_COLUMNS = frozenset({"reference_key", "key"})

#: unit -> (plain-text form, LaTeX form), appended to a column label by :func:`_in_unit`
_UNIT_TEXT = {"Eh": ("Eh", r"$E_\mathrm{h}$"), "eV": ("eV", "eV"), "cm-1": ("cm⁻¹", r"cm$^{-1}$")}


def _in_unit(plain: str, latex: str, unit: str = "Eh") -> tuple[str, str]:
    """The (plain-text, LaTeX) labels of a quantity with its unit in parentheses."""
    plain_unit, latex_unit = _UNIT_TEXT[unit]
    return (f"{plain} ({plain_unit})", f"{latex} ({latex_unit})")


#: column name -> (plain-text label, LaTeX label)
COLUMN_LABELS = {
    "Z": ("Z", r"$Z$"),
    "ion": ("ion", "ion"),
    "state": ("state", "state"),
    "family": ("family", "family"),
    "size": ("size", "size"),
    "n_terms": ("N", r"$N$"),
    "energy_hartree": _in_unit("E", r"$E$"),
    "error_bar_hartree": _in_unit("error bar", r"$\sigma_E$"),
    "reference_hartree": _in_unit("E_ref", r"$E_\mathrm{ref}$"),
    "reference_uncertainty_hartree": _in_unit("σ_ref", r"$\sigma_\mathrm{ref}$"),
    "reference_key": ("ref.", "Ref."),
    "reference_source": ("source", "source"),
    "difference_hartree": _in_unit("E − E_ref", r"$E-E_\mathrm{ref}$"),
    "agreeing_digits": ("digits", "digits"),
    "increment_hartree": _in_unit("ΔE", r"$\Delta E$"),
    "extrapolated_hartree": _in_unit("E_extrap", r"$E_\mathrm{extrap}$"),
    "extrapolation_error_hartree": _in_unit("E − E_extrap", r"$E-E_\mathrm{extrap}$"),
    "ionization_energy_hartree": _in_unit("I", r"$I$"),
    "ionization_energy_ev": _in_unit("I", r"$I$", "eV"),
    "ionization_energy_cm1": _in_unit("I", r"$I$", "cm-1"),
    "correlation_energy_hartree": _in_unit("E_corr", r"$E_\mathrm{corr}$"),
    "virial_ratio": ("−V/T", r"$-\langle V\rangle/\langle T\rangle$"),
    "bound": ("bound", "bound"),
    "effective_n": ("n*", r"$n^*$"),
    "quantum_defect": ("δ", r"$\delta$"),
    "quantum_defect_uncertainty": ("σ_δ", r"$\sigma_\delta$"),
}

_LATEX_SPECIAL = {"&": r"\&", "%": r"\%", "$": r"\$", "#": r"\#", "_": r"\_", "{": r"\{", "}": r"\}",
                  "~": r"\textasciitilde{}", "^": r"\textasciicircum{}", "\\": r"\textbackslash{}"}
_TERM = re.compile(r"^(\d+)\^(\d+)([SPDFGHIK])$")
_TERM_IN_TEXT = re.compile(r"(?<![\w^])(\d+)\^(\d+)([SPDFGHIK])(?!\w)")
_ION = re.compile(r"^([A-Z][a-z]?)(\d*)([+-])$")


def _latex_term(match) -> str:
    return rf"${match.group(1)}\,^{{{match.group(2)}}}\mathrm{{{match.group(3)}}}$"


def latex_text(text: str) -> str:
    """Escape plain text for LaTeX, writing term symbols such as ``2^3S`` in math mode."""
    text = str(text)
    out, pos = [], 0
    for m in _TERM_IN_TEXT.finditer(text):
        out += [latex_escape(text[pos:m.start()]), _latex_term(m)]
        pos = m.end()
    out.append(latex_escape(text[pos:]))
    return "".join(out)


def latex_ion(label: str) -> str:
    """``Be2+`` -> ``Be$^{2+}$``, ``H-`` -> ``H$^{-}$``; other labels are escaped."""
    m = _ION.match(str(label))
    if not m:
        return latex_escape(label)
    return rf"{m.group(1)}$^{{{m.group(2)}{m.group(3)}}}$"


def latex_escape(text: str) -> str:
    """Escape LaTeX special characters in plain text."""
    return "".join(_LATEX_SPECIAL.get(ch, ch) for ch in str(text))


def _missing(value) -> bool:
    if value is None:
        return True
    try:
        return bool(pd.isna(value))
    except (TypeError, ValueError):
        return False


def select_columns(frame: pd.DataFrame, columns=None) -> list[str]:
    """Validate a column choice (a list or a comma-separated string; ``None``/``"all"``: all)."""
    if columns is None:
        return [str(c) for c in frame.columns]
    if isinstance(columns, str):
        if columns.strip().lower() == "all":
            return [str(c) for c in frame.columns]
        columns = [c.strip() for c in columns.split(",") if c.strip()]
    columns = list(columns)
    if not columns:
        raise InputError("the column list is empty")
    unknown = [c for c in columns if c not in frame.columns]
    if unknown:
        raise InputError(f"unknown column(s) {', '.join(unknown)}; available: "
                         f"{', '.join(str(c) for c in frame.columns)}")
    if len(set(columns)) != len(columns):
        raise InputError("a column is listed twice")
    return columns


def _shown_columns(columns: list[str]) -> list[str]:
    """Columns people see: uncertainty and exact-text columns folded into their value column."""
    folded = {UNCERTAINTY_COLUMNS[c] for c in columns if UNCERTAINTY_COLUMNS.get(c) in columns}
    folded |= {TEXT_COLUMNS[c] for c in columns if TEXT_COLUMNS.get(c) in columns}
    return [c for c in columns if c not in folded]


def _positive(value):
    """``value`` as a float if it is a finite positive number, else None."""
    if _missing(value):
        return None
    try:
        x = abs(float(value))
    except (TypeError, ValueError):
        return None
    return x if math.isfinite(x) and x > 0 else None


def cell_uncertainty(row, column: str):
    """Standard uncertainty of ``row[column]`` in the column's unit, or None if it has none.

    From the row's uncertainty column (:data:`UNCERTAINTY_COLUMNS`) or propagated from the
    energy's bar (:data:`PROPAGATED_UNCERTAINTY`); the uncertainty column need not be shown.
    """
    index = getattr(row, "index", ())
    unc_col = UNCERTAINTY_COLUMNS.get(column)
    if unc_col is not None and unc_col in index:
        return _positive(row[unc_col])
    propagated = PROPAGATED_UNCERTAINTY.get(column)
    if propagated is not None and propagated[0] in index:
        bar = _positive(row[propagated[0]])
        if bar is None:
            return None
        if propagated[1] == "hartree":
            return bar
        from twoel.units import hartree_to

        return abs(float(hartree_to(bar, propagated[1])))
    return None


def _exact_value(row, column: str):
    """The cell value, from its exact text column when the row has one."""
    value = row[column]
    text_col = TEXT_COLUMNS.get(column)
    if text_col is not None and text_col in row.index and not _missing(row[text_col]):
        value = str(row[text_col])
    return value


def _last_place(uncertainty) -> int:
    """Exponent of the last digit the (1-digit) uncertainty reaches (rounding 0.96 -> 1 up)."""
    from decimal import ROUND_HALF_UP, Decimal

    u = abs(Decimal(repr(float(uncertainty))))
    last = u.adjusted()
    if u.quantize(Decimal(1).scaleb(last), rounding=ROUND_HALF_UP).adjusted() > last:
        last += 1
    return last


def _number_text(row, column: str, columns: list[str], max_decimals: int | None):
    """``(text, mark)``: ungrouped fixed-point or concise text of a float cell (None: print it in
    scientific notation) and the mark of :data:`MARKS` it needs (or None)."""
    value = _exact_value(row, column)
    uncertainty = cell_uncertainty(row, column)
    mark = None
    if column in UNCERTAIN_COLUMNS:
        if uncertainty is None:
            mark = "nobar"
        elif max_decimals is not None and -_last_place(uncertainty) > max_decimals:
            mark = "rounded"
        elif column == "energy_hartree" and "reliable" in row.index and not _missing(row["reliable"]) \
                and not bool(row["reliable"]):
            mark = "unreliable"
    if isinstance(value, float) and uncertainty is None and "e" in repr(value):
        return None, mark
    return format_uncertain(value, uncertainty, max_decimals=max_decimals), mark


def concise_text(row, column: str) -> str | None:
    """Machine text of ``row[column]``: the concise form, ungrouped, at every supported digit;
    a value without an uncertainty is its full text followed by ``" (no uncertainty)"``."""
    if _missing(row[column]):
        return None
    try:
        if not math.isfinite(float(row[column])):
            return None
    except (TypeError, ValueError):
        return None
    value = _exact_value(row, column)
    uncertainty = cell_uncertainty(row, column)
    if uncertainty is None:
        return format_uncertain(value) + " (no uncertainty)"
    return format_uncertain(value, uncertainty)


def _with_mark(text: str, mark: str | None, style: str) -> str:
    if mark is None:
        return text
    plain_mark, latex_mark = MARKS[mark]
    if style == "latex":
        return text[:-1] + "^{" + latex_mark + "}$" if text.endswith("$") else text + f"$^{{{latex_mark}}}$"
    return text + plain_mark


def _significant_digits(text: str) -> int:
    digits = "".join(ch for ch in text.split("(")[0] if ch.isdigit()).lstrip("0")
    return len(digits)


def _table_notes(frame: pd.DataFrame, columns: list[str], shown: list[str], max_decimals: int | None,
                 formats: dict | None = None) -> list[tuple[str, str]]:
    """``[(mark, note text)]`` for the marks the shown cells use, in :data:`MARKS` order."""
    used: dict[str, int] = {}
    for _, row in frame.iterrows():
        for column in shown:
            if column not in UNCERTAIN_COLUMNS or (formats or {}).get(column) or _missing(row[column]):
                continue
            try:
                if not math.isfinite(float(row[column])):
                    continue
            except (TypeError, ValueError):
                continue
            text, mark = _number_text(row, column, columns, max_decimals)
            if mark is not None:
                used[mark] = max(used.get(mark, 0), _significant_digits(text or ""))
    return [(mark, MARK_NOTES[mark].format(digits=used[mark], decimals=max_decimals))
            for mark in MARKS if mark in used]


def _display_cell(row, column: str, columns: list[str], style: str, max_decimals: int | None,
                  formats: dict | None = None) -> str:
    """One cell for ``style`` in ``("markdown", "latex", "html")``.

    A format spec in ``formats[column]`` (e.g. ``".12f"``) prints a float exactly so, ungrouped.
    """
    value = row[column]
    if _missing(value):
        return "---" if style == "latex" else "—"
    spec = (formats or {}).get(column)
    if spec and (isinstance(value, float) or getattr(getattr(value, "dtype", None), "kind", "") == "f"):
        text = format(float(value), spec)
        if style != "latex":
            return text
        if "e" in text:
            mantissa, exponent = text.split("e")
            return "$" + mantissa + r"\times 10^{" + str(int(exponent)) + "}$"
        return "$" + text + "$"
    if isinstance(value, (bool,)) or type(value).__name__ == "bool_":
        return "yes" if value else "no"
    if column in CITATION_COLUMNS:
        keys = [k.strip() for k in str(value).split(";") if k.strip()]
        if style == "latex":
            return r"\cite{" + ",".join(keys) + "}"
        return ", ".join(f"[{k}]" for k in keys)
    if column in STATE_COLUMNS and style == "latex":
        m = _TERM.match(str(value))
        return _latex_term(m) if m else latex_escape(value)
    if column == "ion" and style == "latex":
        return latex_ion(value)
    if isinstance(value, (int,)) or (hasattr(value, "dtype") and getattr(value.dtype, "kind", "") in "iu"):
        return f"${int(value)}$" if style == "latex" else str(int(value))
    if isinstance(value, float) or (hasattr(value, "dtype") and getattr(value.dtype, "kind", "") == "f"):
        value = float(value)
        if not math.isfinite(value):
            return "---" if style == "latex" else "—"
        if column == "Z" and value == int(value):
            text = str(int(value))
            return f"${text}$" if style == "latex" else text
        text, mark = (None, None) if column in SCIENTIFIC_COLUMNS else \
            _number_text(row, column, columns, max_decimals)
        if text is None:
            text = latex_scientific(value) if style == "latex" else text_scientific(value)
        elif style == "latex":
            text = latex_number(text)
        else:
            text = group_digits(text, NARROW_NBSP)
        return _with_mark(text, mark, style)
    return latex_escape(value) if style == "latex" else str(value)


def _header(column: str, style: str) -> str:
    plain_label, latex_label = COLUMN_LABELS.get(column, (column, None))
    if style == "latex":
        return latex_label if latex_label is not None else latex_escape(column)
    return plain_label


def _numeric(frame: pd.DataFrame, column: str) -> bool:
    return pd.api.types.is_numeric_dtype(frame[column]) and not pd.api.types.is_bool_dtype(frame[column])


def to_markdown(frame: pd.DataFrame, formats: dict[str, str] | None = None, columns=None,
                max_decimals: int | None = 15) -> str:
    """A GitHub-style pipe table with grouped digits and concise uncertainties.

    ``formats`` maps a column to a format spec (``".12f"``) printed as is, without grouping.
    """
    columns = select_columns(frame, columns)
    shown = _shown_columns(columns)
    header = "| " + " | ".join(_header(c, "markdown") for c in shown) + " |"
    rule = "|" + "|".join("---:" if _numeric(frame, c) else "---" for c in shown) + "|"
    lines = [header, rule]
    for _, row in frame.iterrows():
        cells = [_display_cell(row, c, columns, "markdown", max_decimals, formats).replace("|", r"\|")
                 for c in shown]
        lines.append("| " + " | ".join(cells) + " |")
    notes = _table_notes(frame, columns, shown, max_decimals, formats)
    if notes:
        lines.append("")
        lines += [f"{MARKS[mark][0]} {text}" + ("  " if i < len(notes) - 1 else "")
                  for i, (mark, text) in enumerate(notes)]
    return "\n".join(lines) + "\n"


def _concise_columns(frame: pd.DataFrame, columns: list[str]) -> list[str]:
    """The value columns that get a ``<column>_concise`` text column in CSV/JSON."""
    return [c for c in columns if c in UNCERTAIN_COLUMNS and _numeric(frame, c)
            and f"{c}_concise" not in frame.columns]


def with_concise_columns(frame: pd.DataFrame, columns=None) -> pd.DataFrame:
    """A copy of ``frame`` with a text column ``<column>_concise`` after each value column of
    :data:`UNCERTAIN_COLUMNS` (see :func:`concise_text`)."""
    columns = select_columns(frame, columns)
    extra = _concise_columns(frame, columns)
    out = frame[columns].copy()
    for column in extra:
        texts = [concise_text(row, column) for _, row in frame.iterrows()]
        out.insert(list(out.columns).index(column) + 1, f"{column}_concise", texts)
    return out


def to_csv(frame: pd.DataFrame, columns=None) -> str:
    """CSV of the selected columns, floats at full precision.

    Without a column choice, every column plus the ``<column>_concise`` text columns.
    """
    table = with_concise_columns(frame) if columns is None else frame[select_columns(frame, columns)]
    buffer = io.StringIO()
    table.to_csv(buffer, index=False, float_format="%.17g", lineterminator="\n")
    return buffer.getvalue()


def to_latex(frame: pd.DataFrame, caption: str | None = None, formats: dict[str, str] | None = None,
             columns=None, label: str | None = None, max_decimals: int | None = 15) -> str:
    """A booktabs ``tabular`` (inside ``table`` when a caption is given)."""
    columns = select_columns(frame, columns)
    shown = _shown_columns(columns)
    align = "".join("r" if _numeric(frame, c) else "l" for c in shown)
    lines = []
    if caption:
        lines += [r"\begin{table}", r"\centering", rf"\caption{{{latex_text(caption)}}}"]
        if label:
            lines.append(rf"\label{{{latex_escape(label)}}}")
    lines += [rf"\begin{{tabular}}{{{align}}}", r"\toprule",
              " & ".join(_header(c, "latex") for c in shown) + r" \\", r"\midrule"]
    for _, row in frame.iterrows():
        lines.append(" & ".join(_display_cell(row, c, columns, "latex", max_decimals, formats)
                                for c in shown) + r" \\")
    lines += [r"\bottomrule", r"\end{tabular}"]
    notes = _table_notes(frame, columns, shown, max_decimals, formats)
    if notes:
        lines.append(r"\par\smallskip{\footnotesize " + r" \\ ".join(
            f"${MARKS[mark][1]}$ " + latex_text(text) for mark, text in notes) + "}")
    if caption:
        lines.append(r"\end{table}")
    return "\n".join(lines) + "\n"


def to_json(frame: pd.DataFrame, columns=None) -> str:
    """A JSON list of records (NaN becomes ``null``), floats at full precision.

    Without a column choice, every column plus the ``<column>_concise`` text fields.
    """
    if columns is None:
        frame = with_concise_columns(frame)
    columns = select_columns(frame, columns)
    records = []
    for _, row in frame.iterrows():
        record = {}
        for c in columns:
            v = row[c]
            if _missing(v):
                v = None
            elif hasattr(v, "item"):
                v = v.item()
            if isinstance(v, float) and not math.isfinite(v):
                v = None
            record[str(c)] = v
        records.append(record)
    return json.dumps(records, indent=2, ensure_ascii=False) + "\n"


def to_html(frame: pd.DataFrame, columns=None, caption: str | None = None,
            max_decimals: int | None = 15) -> str:
    """A plain HTML ``<table>`` with the same cells as the Markdown table."""
    columns = select_columns(frame, columns)
    shown = _shown_columns(columns)
    out = ["<table>"]
    if caption:
        out.append(f"<caption>{_html.escape(caption)}</caption>")
    out.append("<thead><tr>" + "".join(f"<th>{_html.escape(_header(c, 'html'))}</th>" for c in shown)
               + "</tr></thead>")
    out.append("<tbody>")
    for _, row in frame.iterrows():
        cells = []
        for c in shown:
            align = ' style="text-align:right"' if _numeric(frame, c) else ""
            cells.append(f"<td{align}>{_html.escape(_display_cell(row, c, columns, 'html', max_decimals))}</td>")
        out.append("<tr>" + "".join(cells) + "</tr>")
    out += ["</tbody>", "</table>"]
    notes = _table_notes(frame, columns, shown, max_decimals)
    if notes:
        out.append('<p class="table-notes">' + "<br>".join(
            f"{MARKS[mark][0]} {_html.escape(text)}" for mark, text in notes) + "</p>")
    return "\n".join(out) + "\n"


def render(frame: pd.DataFrame, fmt: str, caption: str | None = None, columns=None,
           label: str | None = None, max_decimals: int | None = 15) -> str:
    """Render ``frame`` in one of :data:`TABLE_FORMATS` (or ``"html"``).

    Parameters
    ----------
    frame : pandas.DataFrame
        One row per result.
    fmt : str
        ``"markdown"``, ``"csv"``, ``"latex"``, ``"json"`` or ``"html"``.
    caption : str, optional
        Table caption (LaTeX: wraps the tabular in a ``table`` float).
    columns : list of str or str, optional
        Columns to keep, in order (comma-separated text allowed; ``"all"``/``None``: all).
    label : str, optional
        LaTeX ``\\label``.
    max_decimals : int, optional
        Most digits after the point in the human formats (default 15).
    """
    if fmt == "markdown":
        return to_markdown(frame, columns=columns, max_decimals=max_decimals)
    if fmt == "csv":
        return to_csv(frame, columns=columns)
    if fmt == "latex":
        return to_latex(frame, caption=caption, columns=columns, label=label, max_decimals=max_decimals)
    if fmt == "json":
        return to_json(frame, columns=columns)
    if fmt == "html":
        return to_html(frame, columns=columns, caption=caption, max_decimals=max_decimals)
    raise InputError(f"unknown table format {fmt!r}; choose one of {', '.join(TABLE_FORMATS)}")
