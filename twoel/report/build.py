"""Reproducible report folders: tables, figures, an index page and a provenance file.

:func:`build_report` turns a report *configuration* (a plain dict, see :data:`DEMO_CONFIG`) into
a folder::

    <out>/index.md             the page (optionally index.html too)
    <out>/tables/<t>.{md,csv,tex,json}
    <out>/figures/<f>.{png,svg}
    <out>/references.bib       the BibTeX entries cited by the LaTeX tables
    <out>/provenance.json      package versions, constants, the configuration, every solve's
                               parameters and basis definition, and every number in the tables

The folder is built in a temporary sibling and renamed into place at the end
(:func:`twoel.io.atomic_directory`), so an interrupted build leaves nothing behind, and an
existing folder is refused unless ``overwrite=True``.  :func:`rebuild_from_provenance` re-runs
the configuration stored in a provenance file and checks every block of it with
:mod:`twoel.report.reproduce`: each number within its own tolerance (or bit for bit in strict
mode), the recorded computations, the CODATA constants, and, as information, the versions,
platform, BLAS library and thread settings.

This module orchestrates; the numbers come from :mod:`twoel.analysis.sweep`, the text from
:mod:`twoel.report.tables`, the figures from :mod:`twoel.report.plots`.
"""

from __future__ import annotations

import copy
import json
import math
import platform
import sys
from dataclasses import dataclass, field
from pathlib import Path
from typing import ClassVar

from twoel import constants
from twoel._version import __version__
from twoel.errors import InputError
from twoel.results import Result

PROVENANCE_FORMAT = "twoel-report-provenance"
PROVENANCE_VERSION = 1

#: packages whose versions are recorded (a change may change the last bits of a number)
RECORDED_PACKAGES = ("numpy", "scipy", "sympy", "pandas", "mpmath", "python-flint", "matplotlib",
                     "tqdm")

#: columns of the series table shown in the human formats
SERIES_COLUMNS = ["Z", "ion", "state", "n_terms", "energy_hartree", "reference_hartree",
                  "reference_uncertainty_hartree", "reference_key", "difference_hartree",
                  "ionization_energy_ev", "ionization_energy_cm1"]
CONVERGENCE_COLUMNS = ["size", "n_terms", "energy_hartree", "increment_hartree",
                       "extrapolated_hartree", "difference_hartree"]
LEVEL_COLUMNS = ["ion", "state", "size", "n_terms", "energy_hartree", "reference_hartree",
                 "reference_key", "difference_hartree", "ionization_energy_cm1"]

#: an invented scenario, small enough to build in a few seconds
DEMO_CONFIG = {
    "name": "demo-isoelectronic",
    "title": "Helium-like ions Z = 1-6: a quick variational check before a beam-time proposal",
    "scenario": (
        "Invented scenario. The (fictional) Tarn Valley ion-storage group is writing a beam-time "
        "proposal on helium-like ions from H- to C4+. Before quoting energies they want to know "
        "how far a small Hylleraas basis (all terms r1^i r2^j r12^k with i + j + k <= 4) is from "
        "the published nonrelativistic limits, how the He energy converges with the basis, and "
        "where the lowest S and P levels of He lie (from an exponentially correlated basis of "
        "200 terms). This report answers those three questions."),
    "series": {"Z": "1:6", "state": "1^1S", "family": "hylleraas", "size": 4},
    "convergence": {"Z": 2, "state": "1^1S", "family": "hylleraas", "sizes": [0, 1, 2, 3, 4, 5, 6]},
    "levels": {"Z": 2, "family": "exponential",
               "states": [{"state": "1^1S", "size": 200}, {"state": "2^3S", "size": 200},
                          {"state": "2^1S", "size": 200}, {"state": "2^3P", "size": 200},
                          {"state": "2^1P", "size": 200}]},
}

_SOLVE_KEYS = ("state", "family", "size", "parameters", "optimize", "options")
_SECTION_KEYS = {
    "series": {"Z", *_SOLVE_KEYS},
    "convergence": {"Z", "sizes", *[k for k in _SOLVE_KEYS if k != "size"]},
    "levels": {"Z", "family", "parameters", "optimize", "options", "states"},
}
_TOP_KEYS = {"name", "title", "scenario", "series", "convergence", "levels"}


# --------------------------------------------------------------------------- configuration

def _check_keys(where: str, mapping: dict, allowed: set) -> None:
    if not isinstance(mapping, dict):
        raise InputError(f"{where} must be a table of settings, got {type(mapping).__name__}")
    unknown = sorted(set(mapping) - allowed)
    if unknown:
        raise InputError(f"unknown setting(s) {', '.join(unknown)} in {where} "
                         f"(allowed: {', '.join(sorted(allowed))})")


def _charges(value, where: str) -> list[float]:
    from twoel.system import parse_charge, parse_charge_range

    if isinstance(value, str):
        return [float(z) for z in parse_charge_range(value)]
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return [float(parse_charge(value))]
    if isinstance(value, list) and value:
        return [float(parse_charge(z)) for z in value]
    raise InputError(f"{where}.Z must be a charge, a list of charges or a range text like '1:6'")


def _check_optimize(where: str, mapping: dict) -> None:
    """``optimize`` is a JSON boolean (or null: the family's choice); ``"no"`` is not false."""
    value = mapping.get("optimize")
    if value is not None and not isinstance(value, bool):
        raise InputError(f"{where}.optimize must be true or false (a JSON/TOML boolean), "
                         f"got {value!r}")


def _check_parameters(where: str, mapping: dict) -> None:
    """``parameters`` is a table of names and finite numbers (bohr⁻¹), not text."""
    options = mapping.get("options")
    if options is not None and not isinstance(options, dict):
        raise InputError(f"{where}.options must be a table of settings, got {type(options).__name__}")
    value = mapping.get("parameters")
    if value is None:
        return
    if not isinstance(value, dict):
        raise InputError(f"{where}.parameters must be a table of name = number, got {type(value).__name__}")
    for name, number in value.items():
        if isinstance(number, bool) or not isinstance(number, (int, float)) or not math.isfinite(number):
            raise InputError(f"{where}.parameters.{name} must be a finite number (bohr⁻¹), got {number!r}")


def _solve_keywords(section: dict, size=None) -> dict:
    keywords = {k: section[k] for k in ("state", "family", "parameters", "optimize", "options")
                if section.get(k) is not None}
    if size is not None:
        keywords["size"] = size
    return keywords


def _one_charge(section: str, mapping: dict) -> float:
    """Check the settings of a one-ion ``section`` and return its single charge."""
    _check_keys(section, mapping, _SECTION_KEYS[section])
    charges = _charges(mapping.get("Z"), section)
    if len(charges) != 1:
        raise InputError(f"{section}.Z must be one charge")
    return charges[0]


def _normalize_series(s: dict) -> dict:
    _check_keys("series", s, _SECTION_KEYS["series"])
    _check_optimize("series", s)
    _check_parameters("series", s)
    return {**{k: s[k] for k in _SOLVE_KEYS if k in s}, "Z": _charges(s.get("Z"), "series")}


def _normalize_convergence(c: dict) -> dict:
    charge = _one_charge("convergence", c)
    _check_optimize("convergence", c)
    _check_parameters("convergence", c)
    sizes = c.get("sizes")
    if not isinstance(sizes, list) or not sizes or not all(isinstance(n, int) and not isinstance(n, bool) for n in sizes):
        raise InputError("convergence.sizes must be a non-empty list of integers")
    if sorted(set(sizes)) != sizes:
        raise InputError("convergence.sizes must increase strictly")
    return {**{k: c[k] for k in _SOLVE_KEYS if k in c and k != "size"}, "Z": charge, "sizes": list(sizes)}


def _normalize_levels(lv: dict) -> dict:
    charge = _one_charge("levels", lv)
    _check_optimize("levels", lv)
    _check_parameters("levels", lv)
    states = lv.get("states")
    if not isinstance(states, list) or not states:
        raise InputError("levels.states must be a non-empty list of {state, size} entries")
    clean = []
    for i, entry in enumerate(states):
        if isinstance(entry, str):
            entry = {"state": entry}
        _check_keys(f"levels.states[{i}]", entry, {"state", "size"})
        if "state" not in entry:
            raise InputError(f"levels.states[{i}] needs a 'state'")
        clean.append({"state": str(entry["state"]), "size": entry.get("size")})
    return {**{k: lv[k] for k in ("family", "parameters", "optimize", "options") if k in lv},
            "Z": charge, "states": clean}


#: section name -> its normalizer, in the order the sections appear in a report
_SECTION_NORMALIZERS = {"series": _normalize_series, "convergence": _normalize_convergence,
                        "levels": _normalize_levels}


def normalize_config(config: dict) -> dict:
    """Validate a report configuration and make every choice explicit (a new dict).

    Charges become lists of floats, sizes lists of ints; the result is what the provenance
    file records and what a re-run uses.
    """
    config = copy.deepcopy(config)
    _check_keys("the report configuration", config, _TOP_KEYS)
    name = str(config.get("name") or "report")
    if not name.replace("-", "").replace("_", "").replace(".", "").isalnum() or name.startswith("."):
        raise InputError(f"report name {name!r} may hold only letters, digits, '-', '_' and '.'")
    out = {"name": name, "title": str(config.get("title") or name),
           "scenario": str(config.get("scenario") or "")}
    if not any(k in config for k in _SECTION_NORMALIZERS):
        raise InputError("the report configuration needs at least one of: series, convergence, levels")
    for section, normalize in _SECTION_NORMALIZERS.items():
        if section in config:
            out[section] = normalize(config[section])
    return out


def load_config(path) -> dict:
    """Read a report configuration from a JSON or TOML file (never evaluated)."""
    from twoel.io import read_input_text, shown_path

    path = Path(path)
    text = read_input_text(path, "configuration file")
    try:
        if path.suffix.lower() == ".toml":
            import tomllib

            return tomllib.loads(text)
        return json.loads(text)
    except (ValueError, TypeError, RecursionError) as exc:
        what = "TOML" if path.suffix.lower() == ".toml" else "JSON"
        detail = "nested too deeply" if isinstance(exc, RecursionError) else str(exc).splitlines()[0][:200]
        raise InputError(f"{shown_path(path)} is not valid {what}: {detail}") from None


# --------------------------------------------------------------------------- computation

def report_tasks(config: dict) -> dict[str, list[dict]]:
    """The :func:`twoel.solve` keyword sets of every section of a normalized configuration."""
    tasks: dict[str, list[dict]] = {}
    if "series" in config:
        s = config["series"]
        tasks["series"] = [{"Z": z, **_solve_keywords(s, s.get("size"))} for z in s["Z"]]
    if "convergence" in config:
        c = config["convergence"]
        tasks["convergence"] = [{"Z": c["Z"], **_solve_keywords(c, n)} for n in c["sizes"]]
    if "levels" in config:
        lv = config["levels"]
        tasks["levels"] = [{"Z": lv["Z"], **_solve_keywords({**lv, "state": e["state"]}, e["size"])}
                           for e in lv["states"]]
    return tasks


def _task_place(section: str, index: int, task: dict) -> str:
    """Where task ``index`` of ``section`` comes from in the configuration."""
    return {"series": f"series at Z = {task['Z']:g}", "convergence": f"convergence.sizes[{index}]",
            "levels": f"levels.states[{index}]"}[section]


def check_tasks(sections: dict[str, list[dict]]) -> None:
    """Check every task of :func:`report_tasks` the way :func:`twoel.solve` does, before any solve.

    Charge, state, family, size (every entry of ``convergence.sizes`` and of ``levels.states``),
    options and parameters are checked at once, so a typo in the last size fails in a moment,
    not after the solves before it.  The first problem is raised as a one-line
    :class:`~twoel.errors.TwoelError` of the same type, naming its place in the configuration.
    """
    import warnings

    from twoel.errors import TwoelError
    from twoel.solver.pipeline import check_inputs   # the checks solve() runs first, no solving

    for section, tasks in sections.items():
        for index, task in enumerate(tasks):
            try:
                with warnings.catch_warnings():
                    warnings.simplefilter("ignore")
                    check_inputs(task["Z"], task.get("state", "1^1S"), task.get("family"),
                                 task.get("size"), task.get("parameters"), task.get("optimize"),
                                 task.get("options"))
            except TwoelError as exc:
                raise type(exc)(f"{_task_place(section, index, task)}: {exc}") from None
            except (TypeError, ValueError, AttributeError) as exc:
                raise InputError(f"{_task_place(section, index, task)}: {exc}") from None


def package_versions() -> dict[str, str | None]:
    from importlib import metadata

    versions = {"python": platform.python_version(), "twoel": __version__}
    for name in RECORDED_PACKAGES:
        try:
            versions[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            versions[name] = None
    return versions


@dataclass(frozen=True, repr=False)
class ReportResult(Result):
    """What :func:`build_report` wrote.

    Attributes
    ----------
    path : pathlib.Path
        The report folder.
    files : tuple of str
        The files written, relative to ``path``.
    numbers : dict
        Every float of every table, ``{table: {column: [values]}}``, each in the unit its column
        name carries (``energy_hartree`` in Eh, ``ionization_energy_cm1`` in cm⁻¹ ...).
    reproduction : dict or None
        After :func:`rebuild_from_provenance`: ``{"identical", "compared", "differences",
        "package_changes"}`` and the keys of :func:`twoel.report.reproduce.check_reproduction`
        (``"reproduced"``, ``"mode"``, ``"verdict"`` ...).
    notes : tuple of str
        The notes shown on the index page.
    """

    SUMMARY: ClassVar[tuple[str, ...]] = ("path",)

    path: Path
    files: tuple[str, ...]
    numbers: dict
    reproduction: dict | None = None
    notes: tuple[str, ...] = field(default=())

    def to_dict(self) -> dict:
        """JSON-ready dictionary (the folder as text)."""
        return self._with_aliases({"path": str(self.path), "files": list(self.files),
                                   "numbers": self.numbers, "reproduction": self.reproduction,
                                   "notes": list(self.notes)})


def _hartree_fock_limits(charges) -> dict:
    """HF limits tabulated in ``data/`` for these charges: ``{Z: ReferenceValue}`` (Eh)."""
    from twoel.reference import all_references

    found = {}
    for ref in all_references():
        if "hartree_fock" in ref.quantity and ref.state in ("", "1^1S") and ref.Z in charges:
            found.setdefault(ref.Z, ref)
    return found


def _level_frame(results):
    import pandas as pd

    from twoel.analysis.sweep import result_row

    return pd.DataFrame([result_row(r) for r in results])


def with_reliability(frame, results):
    """``frame`` with a ``reliable`` column (each result's error-bar flag; None: no bar).

    Text, not a float: the ``numbers`` block of the provenance is unchanged by it.
    """
    if "reliable" not in frame.columns and len(frame) == len(results):
        frame = frame.copy()
        frame["reliable"] = _object_series([getattr(r, "reliable", None) for r in results])
    return frame


def _object_series(values):
    """A pandas object Series (so True/False/None stay as they are)."""
    import pandas as pd

    return pd.Series(list(values), dtype=object)


def _result_record(task: dict, result) -> dict:
    record = result.to_dict()
    record.pop("elapsed_seconds", None)
    return {"task": task, "result": record}


def _numbers(frames: dict) -> dict:
    """Every float of every table, by table and column (what a re-run must reproduce)."""
    out = {}
    for name, frame in frames.items():
        columns = {}
        for column in frame.columns:
            if frame[column].dtype.kind == "f":
                columns[column] = [None if (v is None or (isinstance(v, float) and math.isnan(v)))
                                   else float(v) for v in frame[column].tolist()]
        out[name] = columns
    return out


# --------------------------------------------------------------------------- index page

class _Page:
    """A tiny document model rendered both as Markdown and as HTML."""

    def __init__(self):
        self.blocks: list[tuple] = []

    def heading(self, level: int, text: str):
        self.blocks.append(("h", level, text))

    def paragraph(self, text: str):
        self.blocks.append(("p", text))

    def items(self, items):
        self.blocks.append(("ul", list(items)))

    def code(self, text: str):
        self.blocks.append(("code", text))

    def table(self, markdown: str, html: str, files: str):
        self.blocks.append(("table", markdown, html, files))

    def figure(self, stem: str, caption: str):
        self.blocks.append(("fig", stem, caption))

    def markdown(self) -> str:
        out = []
        for block in self.blocks:
            kind = block[0]
            if kind == "h":
                out.append("#" * block[1] + " " + block[2])
            elif kind == "p":
                out.append(block[1])
            elif kind == "ul":
                out.append("\n".join(f"- {item}" for item in block[1]))
            elif kind == "code":
                out.append("```bash\n" + block[1] + "\n```")
            elif kind == "table":
                out.append(block[1].rstrip() + "\n\n" + block[3])
            elif kind == "fig":
                out.append(f"![{block[2]}]({block[1]}.png)\n\n*{block[2]}* "
                           f"([PNG]({block[1]}.png), [SVG]({block[1]}.svg))")
        return "\n\n".join(out) + "\n"

    def html(self, title: str) -> str:
        import html as h

        out = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
               f"<title>{h.escape(title)}</title>",
               "<style>body{font-family:sans-serif;max-width:70em;margin:2em auto;padding:0 1em}"
               "table{border-collapse:collapse}td,th{padding:.2em .6em;border-bottom:1px solid #ccc}"
               "img{max-width:100%}</style>", "</head>", "<body>"]
        for block in self.blocks:
            kind = block[0]
            if kind == "h":
                out.append(f"<h{block[1]}>{h.escape(block[2])}</h{block[1]}>")
            elif kind == "p":
                out.append(f"<p>{h.escape(block[1])}</p>")
            elif kind == "ul":
                out.append("<ul>" + "".join(f"<li>{h.escape(i)}</li>" for i in block[1]) + "</ul>")
            elif kind == "code":
                out.append(f"<pre><code>{h.escape(block[1])}</code></pre>")
            elif kind == "table":
                out.append(block[2] + f"<p>{h.escape(block[3])}</p>")
            elif kind == "fig":
                out.append(f'<figure><img src="{h.escape(block[1])}.svg" alt="{h.escape(block[2])}">'
                           f"<figcaption>{h.escape(block[2])}</figcaption></figure>")
        out += ["</body>", "</html>"]
        return "\n".join(out) + "\n"


# --------------------------------------------------------------------------- build

#: measured 4He 1^1S ionization energy, cm-1: Kandula et al., Phys. Rev. A 84, 062512 (2011)
HE_MEASURED_IONIZATION_CM1 = "198310.66637(20)"


def _caveat() -> str:
    """Why these ionization energies are not spectroscopic values (numbers from the data)."""
    from twoel.reference import lookup
    from twoel.units import hartree_to

    text = ("Energies are nonrelativistic with an infinitely heavy nucleus, in hartree (Eh); "
            "ionization energies are E(one-electron ion) - E, in eV and cm-1 with the "
            f"{constants.CODATA_EDITION} constants. They leave out relativistic, QED and "
            "nuclear-motion corrections")
    he = lookup(2.0, "1^1S")
    if he is not None:
        limit = hartree_to(-2.0 - he.value, "cm-1")
        measured = float(HE_MEASURED_IONIZATION_CM1.split("(")[0])
        text += (f": even the exact nonrelativistic He value, {limit:.1f} cm-1 [{he.key}], is "
                 f"{limit - measured:.0f} cm-1 ({(limit - measured) / measured:.1e} relative) above the "
                 f"measured {HE_MEASURED_IONIZATION_CM1} cm-1 (Kandula et al., Phys. Rev. A 84, 062512 "
                 "(2011)), mostly from the finite nuclear mass; relativistic and QED shifts grow "
                 "quickly with Z")
    return text + ". Do not compare them with spectroscopy beyond that level."

#: the text of the ``bound`` column in the human tables when some row is not bound
NOT_BOUND = "not bound"


def _shown_frame(frame, columns: list[str]):
    """The frame and columns of the human tables (Markdown, LaTeX, HTML).

    When a row is not bound (its energy at or above the one-electron threshold -Z²/2) the
    ``bound`` column is shown, as ``yes`` / ``not bound``; otherwise the frame is as it is.
    """
    if "bound" not in frame.columns or frame["bound"].astype(bool).all():
        return frame, columns
    shown = frame.copy()
    shown["bound"] = _object_series("yes" if b else NOT_BOUND for b in frame["bound"].astype(bool))
    return shown, [*columns, "bound"] if "bound" not in columns else columns


def _write_table(folder: Path, stem: str, frame, columns, caption: str, page: _Page):
    from twoel.io import atomic_write_text
    from twoel.report.tables import render

    columns = [c for c in columns if c in frame.columns]
    atomic_write_text(folder / "tables" / f"{stem}.csv", render(frame, "csv"))
    atomic_write_text(folder / "tables" / f"{stem}.json", render(frame, "json"))
    frame, columns = _shown_frame(frame, columns)
    atomic_write_text(folder / "tables" / f"{stem}.md", render(frame, "markdown", columns=columns))
    atomic_write_text(folder / "tables" / f"{stem}.tex",
                      render(frame, "latex", caption=caption, columns=columns, label=f"tab:{stem}"))
    page.paragraph(f"Table: {caption}")
    page.table(render(frame, "markdown", columns=columns), render(frame, "html", columns=columns),
               f"Files: tables/{stem}.md, .csv (every column at full precision, and *_concise text "
               "columns with the digits the uncertainty supports), .tex, .json.")
    return [f"tables/{stem}.{ext}" for ext in ("md", "csv", "json", "tex")]


def _write_figure(folder: Path, stem: str, fig, caption: str, page: _Page):
    from twoel.report.plots import save_figure

    save_figure(fig, folder / "figures" / stem)
    page.figure(f"figures/{stem}", caption)
    return [f"figures/{stem}.png", f"figures/{stem}.svg"]


def _bib_entries(keys) -> str:
    """The entries of ``data/references.bib`` for ``keys`` (all of them if a key is unknown)."""
    from twoel.reference import read_data_text

    try:
        text = read_data_text("references.bib")
    except InputError:
        return ""
    chunks = [c for c in text.split("\n@") if c.strip()]
    entries = []
    for chunk in chunks:
        body = chunk if chunk.startswith("@") else "@" + chunk
        head = body.split("{", 1)
        if len(head) == 2 and head[1].split(",", 1)[0].strip() in keys:
            entries.append(body.strip())
    return "\n\n".join(entries) + "\n"


def _solve_sections(sections: dict, jobs, progress) -> tuple[list, dict]:
    """Solve every task of every section (a task asked for by two sections is solved once).

    Returns the results in task order and the results by section.
    """
    from twoel.analysis.sweep import solve_many

    flat = [(name, task) for name, tasks in sections.items() for task in tasks]
    unique: dict[str, dict] = {}
    for _name, task in flat:
        unique.setdefault(json.dumps(task, sort_keys=True), task)
    solved = dict(zip(unique, solve_many(list(unique.values()), jobs=jobs, progress=progress,
                                         description="report")))
    results = [solved[json.dumps(task, sort_keys=True)] for _name, task in flat]
    by_section: dict[str, list] = {}
    for (name, _task), result in zip(flat, results):
        by_section.setdefault(name, []).append(result)
    return results, by_section


def _series_section(folder: Path, section: dict, results: list, page: _Page):
    """Series table, residual figure and (given two HF limits) correlation figure.

    Returns the frame, the files written and the HF limits cited.
    """
    from twoel.analysis.sweep import series_frame
    from twoel.report import plots

    frame = with_reliability(series_frame(section["Z"], {}, results=results), results)
    page.heading(2, "Isoelectronic sequence")
    files = _write_table(folder, "series", frame, SERIES_COLUMNS,
                         f"{frame['state'].iloc[0]} energies along the sequence, family "
                         f"{frame['family'].iloc[0]}, size {frame['size'].iloc[0]}", page)
    with_ref = frame.dropna(subset=["reference_hartree"])
    if len(with_ref):
        fig = plots.residual_figure(with_ref["Z"], with_ref["difference_hartree"])
        files += _write_figure(folder, "residuals", fig,
                               "Distance of the variational energies from the published values", page)
    hf_refs = []
    hf = _hartree_fock_limits(list(frame["Z"]))
    if len(hf) >= 2:
        rows = frame[frame["Z"].isin(list(hf))]
        refs = rows["reference_hartree"]
        hf_refs.extend(hf[z] for z in rows["Z"])
        fig = plots.correlation_figure(rows["Z"], rows["energy_hartree"], [hf[z].value for z in rows["Z"]],
                                       reference_hartree=None if refs.isna().any() else refs)
        files += _write_figure(folder, "correlation", fig,
                               "Correlation energy: computed and published energies minus the "
                               "Hartree-Fock limits of data/hartree_fock_limits.csv", page)
    return frame, files, hf_refs


def _convergence_section(folder: Path, section: dict, results: list, page: _Page):
    """Convergence table and figure; returns the frame, the files written and a note."""
    from twoel.analysis.sweep import convergence_frame
    from twoel.report import plots

    frame = with_reliability(convergence_frame(section["Z"], section["sizes"], {}, results=results),
                              results)
    page.heading(2, "Convergence with the basis")
    files = _write_table(folder, "convergence", frame, CONVERGENCE_COLUMNS,
                         f"{frame['ion'].iloc[0]} {frame['state'].iloc[0]}: energy against "
                         f"the size parameter of family {frame['family'].iloc[0]}", page)
    extrapolated = frame["extrapolated_hartree"].dropna()
    ref = frame["reference_hartree"].iloc[0]
    fig = plots.convergence_figure(frame["n_terms"], frame["energy_hartree"],
                                   reference_hartree=None if ref is None or math.isnan(ref) else ref,
                                   extrapolated_hartree=extrapolated.iloc[-1] if len(extrapolated) else None)
    files += _write_figure(folder, "convergence", fig,
                           "Increments, error against the reference and distance to the "
                           "geometric (Aitken) limit estimate, against the number of terms", page)
    note = ("The extrapolated values are Aitken estimates from three successive sizes; "
            "they are a guide, not an error bar.")
    return frame, files, note


def _levels_section(folder: Path, results: list, page: _Page):
    """Levels table and diagram; returns the frame and the files written."""
    from twoel.report import plots

    frame = with_reliability(_level_frame(results), results)
    page.heading(2, "Computed levels")
    files = _write_table(folder, "levels", frame, LEVEL_COLUMNS,
                         f"Computed levels of {frame['ion'].iloc[0]}", page)
    first = results[0]
    thresholds = {f"one-electron threshold -Z²/2 = {first.threshold_hartree:g} Eh": first.threshold_hartree}
    fig = plots.level_diagram_figure(frame["state"], frame["energy_hartree"], thresholds)
    files += _write_figure(folder, "levels", fig, "Computed levels (Eh)", page)
    return frame, files


def _result_notes(by_section: dict, results: list) -> list[str]:
    """Notes on levels not bound, bases far from converged (> 1 mEh above the published value) and
    solver warnings."""
    notes = []
    for result in {id(r): r for r in results}.values():
        if not result.bound:
            notes.append(f"{result.ion} {result.state} (size {result.size}) is not bound in this basis: "
                         f"E = {result.energy_hartree:.6g} Eh is not below the one-electron threshold "
                         f"-Z²/2 = {result.threshold_hartree:g} Eh, so it has no ionization energy.")
    checked = by_section.get("series", []) + by_section.get("levels", [])
    for result in {id(r): r for r in checked}.values():
        if result.difference_hartree is not None and abs(result.difference_hartree) > 1e-3:
            notes.append(f"{result.ion} {result.state} (size {result.size}) is {result.difference_hartree:.1e} Eh "
                         "above the published value: this basis is far from converged for it.")
    for result in {id(r): r for r in results}.values():
        for text in result.warnings:
            notes.append(f"{result.ion} {result.state} (size {result.size}): {text}")
    return notes


def _references_section(folder: Path, cited: list, page: _Page) -> list[str]:
    """``references.bib`` and the References list of the cited values; returns the files written."""
    from twoel.io import atomic_write_text

    keys = sorted({ref.key for ref in cited})
    if not keys:
        return []
    atomic_write_text(folder / "references.bib", _bib_entries(keys))
    sources = {}
    for ref in cited:
        entry = sources.setdefault(ref.key, [ref.source, False])
        entry[1] |= "from memory" in ref.note.lower()
    page.heading(2, "References")
    page.items(f"[{key}] {src}" + (" (some values quoted from memory; see the note "
                                   "column of the tables in data/)" if memory else "")
               for key, (src, memory) in sorted(sources.items()))
    page.paragraph("BibTeX entries for these keys (cited by the .tex tables): references.bib.")
    return ["references.bib"]


def _reproduce_section(page: _Page, out: Path) -> None:
    page.heading(2, "Reproduce")
    page.paragraph("provenance.json holds the package versions, the CODATA constants, this "
                   "report's configuration, every parameter and basis definition, and every "
                   "number above. Re-run it and check every number within its own tolerance "
                   "(add --strict for bit for bit) and every recorded block with:")
    page.code(f"twoel report --from-provenance {out.as_posix()}/provenance.json --out {out.name}-rerun")


def _provenance(config: dict, sections: dict, by_section: dict, numbers: dict) -> dict:
    """The provenance record: versions, constants, configuration, every solve and every number.

    ``digests`` holds the SHA-256 of each block as written (an edit after the build shows).
    """
    from twoel.report.reproduce import block_digests, environment

    record = {
        "format": PROVENANCE_FORMAT, "format_version": PROVENANCE_VERSION,
        "generator": f"twoel {__version__} (twoel report)",
        "packages": package_versions(), "platform": platform.platform(),
        "python_implementation": sys.implementation.name,
        "environment": environment(),
        "constants": constants.provenance(),
        "config": config,
        "computations": {name: [_result_record(t, r) for t, r in zip(sections[name], by_section[name])]
                         for name in sections},
        "numbers": numbers,
    }
    from twoel.io import dumps_json

    record = json.loads(dumps_json(record))     # the record as it will be read back
    record["digests"] = block_digests(record)
    return record


def _write_sections(folder: Path, config: dict, by_section: dict, page: _Page):
    """The table and figure sections present in the configuration, in report order.

    Returns the frames by section, the files written, the notes and the HF limits cited.
    """
    frames, files, notes, hf_refs = {}, [], [], []
    if "series" in by_section:
        frames["series"], written, hf_refs = _series_section(folder, config["series"],
                                                             by_section["series"], page)
        files += written
    if "convergence" in by_section:
        frames["convergence"], written, note = _convergence_section(
            folder, config["convergence"], by_section["convergence"], page)
        files += written
        notes.append(note)
    if "levels" in by_section:
        frames["levels"], written = _levels_section(folder, by_section["levels"], page)
        files += written
    return frames, files, notes, hf_refs


def build_report(config: dict, out, *, overwrite: bool = False, html: bool = False,
                 jobs: int | None = 1, progress=None) -> ReportResult:
    """Compute and write a report folder.

    Parameters
    ----------
    config : dict
        Report configuration (see :data:`DEMO_CONFIG`; validated by :func:`normalize_config`).
    out : path
        The folder to create.
    overwrite : bool
        Replace an existing folder (otherwise :class:`InputError`).
    html : bool
        Also write ``index.html``.
    jobs : int
        Worker processes for the solves (1: serial, 0: one per core); the numbers are the same.
    progress : callable, optional
        ``progress(done, total)`` after each solve (see :func:`twoel.analysis.sweep.solve_many`).

    Returns
    -------
    ReportResult
    """
    from twoel.io import atomic_directory, atomic_write_text, dumps_json

    from twoel.io import check_replaceable

    config = normalize_config(config)
    out = Path(out)
    if out.exists() and not overwrite:
        raise InputError(f"{str(out)!r} exists; refusing to overwrite it (use --overwrite)")
    check_replaceable(out, overwrite)       # before any solve, not after minutes of work
    sections = report_tasks(config)
    check_tasks(sections)
    results, by_section = _solve_sections(sections, jobs, progress)

    page = _Page()
    page.heading(1, config["title"])
    if config["scenario"]:
        page.paragraph(config["scenario"])
    page.paragraph(_caveat())
    with atomic_directory(out, overwrite=overwrite) as folder:
        (folder / "tables").mkdir()
        (folder / "figures").mkdir()
        frames, files, notes, hf_refs = _write_sections(folder, config, by_section, page)
        notes += _result_notes(by_section, results)
        files += _references_section(folder, [r.reference for r in results if r.reference is not None]
                                     + hf_refs, page)
        if notes:
            page.heading(2, "Notes")
            page.items(dict.fromkeys(notes))
        _reproduce_section(page, out)
        numbers = _numbers(frames)
        atomic_write_text(folder / "provenance.json",
                          dumps_json(_provenance(config, sections, by_section, numbers)) + "\n")
        files.append("provenance.json")
        atomic_write_text(folder / "index.md", page.markdown())
        files.append("index.md")
        if html:
            atomic_write_text(folder / "index.html", page.html(config["title"]))
            files.append("index.html")
    return ReportResult(out, tuple(files), numbers, notes=tuple(dict.fromkeys(notes)))


def read_provenance(path) -> dict:
    """Load and check a report provenance file."""
    from twoel.io import read_input_text, shown_path

    path = Path(path)
    try:
        data = json.loads(read_input_text(path, "provenance file"))
    except (ValueError, RecursionError) as exc:
        if isinstance(exc, InputError):
            raise
        detail = "nested too deeply" if isinstance(exc, RecursionError) else str(exc)[:200]
        raise InputError(f"{shown_path(path)} is not valid JSON: {detail}") from None
    if not isinstance(data, dict) or data.get("format") != PROVENANCE_FORMAT:
        raise InputError(f"{str(path)!r} is not a twoel report provenance file")
    if data.get("format_version") != PROVENANCE_VERSION:
        raise UnsupportedFormat(f"provenance format version {data.get('format_version')!r} is not "
                                f"supported (this twoel reads version {PROVENANCE_VERSION})")
    from twoel.report.reproduce import check_structure

    check_structure(data, repr(str(path)))
    return data


class UnsupportedFormat(InputError):
    """A provenance file of another format version."""


def compare_numbers(old: dict, new: dict) -> list[str]:
    """Differences between two ``numbers`` records (empty list: identical bit for bit)."""
    from twoel.report.reproduce import bit_differences

    return bit_differences(old, new)


def rebuild_from_provenance(path, out, *, overwrite: bool = False, html: bool = False,
                            jobs: int | None = 1, progress=None, mode: str = "tolerance") -> ReportResult:
    """Re-run the report recorded in a provenance file and check every block of the record.

    Parameters
    ----------
    mode : {"tolerance", "strict"}
        ``"tolerance"``: each number within its own tolerance (rules in
        :mod:`twoel.report.reproduce`); ``"strict"``: every number bit for bit.

    The returned :class:`ReportResult` has ``reproduction`` from
    :func:`twoel.report.reproduce.check_reproduction`: ``{"reproduced", "mode", "identical",
    "compared", "differences", "package_changes", "beyond", "largest", "computations",
    "constants", "digests", "environment", "verdict"}``.
    """
    from twoel.report.reproduce import MODES, check_reproduction

    if mode not in MODES:
        raise InputError(f"reproduction mode must be one of {', '.join(MODES)}, got {mode!r}")
    data = read_provenance(path)
    result = build_report(data["config"], out, overwrite=overwrite, html=html, jobs=jobs,
                          progress=progress)
    rerun = json.loads((Path(result.path) / "provenance.json").read_text(encoding="utf-8"))
    reproduction = check_reproduction(data, rerun, mode,
                                      expected_tasks=report_tasks(normalize_config(data["config"])),
                                      packages_now=package_versions())
    return ReportResult(result.path, result.files, result.numbers, reproduction, result.notes)
