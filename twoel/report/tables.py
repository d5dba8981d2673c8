"""Render a :class:`pandas.DataFrame` of results as Markdown, CSV, LaTeX or JSON text.

The renderers are written here (no optional pandas extras needed).  Floats are printed with
``repr`` precision unless a column format is given, so no digit is lost on the way to a paper.
"""

from __future__ import annotations

import io
import json
import math

import pandas as pd

from ..errors import InputError

TABLE_FORMATS = ("markdown", "csv", "latex", "json")


def _cell(value, float_format: str | None = None) -> str:
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "—"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        value = float(value)  # numpy scalars print as np.float64(...) under repr
        return format(value, float_format) if float_format else repr(value)
    if hasattr(value, "item") and not isinstance(value, str):
        return _cell(value.item(), float_format)
    return str(value)


def to_markdown(frame: pd.DataFrame, formats: dict[str, str] | None = None) -> str:
    formats = formats or {}
    header = "| " + " | ".join(str(c) for c in frame.columns) + " |"
    rule = "|" + "|".join("---:" if pd.api.types.is_numeric_dtype(frame[c]) else "---" for c in frame.columns) + "|"
    lines = [header, rule]
    for _, row in frame.iterrows():
        lines.append("| " + " | ".join(_cell(row[c], formats.get(c)) for c in frame.columns) + " |")
    return "\n".join(lines) + "\n"


def to_csv(frame: pd.DataFrame) -> str:
    buffer = io.StringIO()
    frame.to_csv(buffer, index=False, float_format="%.17g")
    return buffer.getvalue()


_LATEX_SPECIAL = {"&": r"\&", "%": r"\%", "$": r"\$", "#": r"\#", "_": r"\_", "{": r"\{", "}": r"\}",
                  "~": r"\textasciitilde{}", "^": r"\textasciicircum{}", "\\": r"\textbackslash{}"}


def latex_escape(text: str) -> str:
    """Escape LaTeX special characters in plain text."""
    return "".join(_LATEX_SPECIAL.get(ch, ch) for ch in str(text))


def _latex_cell(value, float_format: str | None = None) -> str:
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "---"
    if hasattr(value, "item") and not isinstance(value, str):
        value = value.item()
    if isinstance(value, float):
        text = format(value, float_format) if float_format else repr(value)
        if "e" in text:
            mantissa, exponent = text.split("e")
            return "$" + mantissa + r"\times 10^{" + str(int(exponent)) + "}$"
        return "$" + text + "$"
    return latex_escape(_cell(value))


def to_latex(frame: pd.DataFrame, caption: str | None = None, formats: dict[str, str] | None = None) -> str:
    """A booktabs ``tabular`` (inside ``table`` when a caption is given)."""
    formats = formats or {}
    align = "".join("r" if pd.api.types.is_numeric_dtype(frame[c]) else "l" for c in frame.columns)
    lines = []
    if caption:
        lines += [r"\begin{table}", r"\centering", rf"\caption{{{latex_escape(caption)}}}"]
    lines += [rf"\begin{{tabular}}{{{align}}}", r"\toprule",
              " & ".join(latex_escape(c) for c in frame.columns) + r" \\", r"\midrule"]
    for _, row in frame.iterrows():
        lines.append(" & ".join(_latex_cell(row[c], formats.get(c)) for c in frame.columns) + r" \\")
    lines += [r"\bottomrule", r"\end{tabular}"]
    if caption:
        lines.append(r"\end{table}")
    return "\n".join(lines) + "\n"


def to_json(frame: pd.DataFrame) -> str:
    records = []
    for _, row in frame.iterrows():
        record = {}
        for c in frame.columns:
            v = row[c]
            if isinstance(v, float) and math.isnan(v):
                v = None
            elif hasattr(v, "item"):
                v = v.item()
            record[str(c)] = v
        records.append(record)
    return json.dumps(records, indent=2, ensure_ascii=False) + "\n"


def render(frame: pd.DataFrame, fmt: str, caption: str | None = None) -> str:
    """Render ``frame`` in one of :data:`TABLE_FORMATS`."""
    if fmt == "markdown":
        return to_markdown(frame)
    if fmt == "csv":
        return to_csv(frame)
    if fmt == "latex":
        return to_latex(frame, caption=caption)
    if fmt == "json":
        return to_json(frame)
    raise InputError(f"unknown table format {fmt!r}; choose one of {', '.join(TABLE_FORMATS)}")
