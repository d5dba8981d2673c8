"""Fuzz the readers of user files: check rows (CSV, JSON), report configurations (TOML, JSON)
and report provenance files (``report --from-provenance``).

Each file is written into the example's temporary folder and read through the command line
(in-process); a file good enough to start a computation is stopped where building a basis would
begin.  Property: exit 0, 1 or 2, no traceback, an error of one line, nothing written outside.
The row parsers are also fuzzed directly (many more inputs per second): they return rows or raise
one :class:`~twoel.errors.InputError` line.
"""

from __future__ import annotations

import datetime
import json
import math

import pytest
from hypothesis import given, strategies as st

from fuzz_helpers import (ReachedSolving, assert_clean_outcome, count, fast, sandbox, slow,
                          stop_before_solving)
from twoel.checking.rows import parse_csv_text, parse_json_text
from twoel.errors import TwoelError

BIG = "1" + "0" * 399
COLUMNS = ["Z", "state", "energy", "unit", "label", "z", "Energy", "UNIT", "junk", "", " Z ", "ï»¿Z"]
CELLS = st.one_of(
    st.sampled_from(["2", "He", "1", "-2.9033", "-2.9033D+00", "hartree", "Eh", "eV", "cm-1", "MEh",
                     "1^1S", "2^3S", "nan", "inf", "-inf", "-1e300", "1e999", BIG, "-" + BIG, "",
                     '"', '""', '"a,b"', "=cmd|x", "\x00", "\udcff", "😀", "x" * 70_000, "١٢", "0x1p3"]),
    st.text(max_size=20), st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-10**410, 10**410).map(str))


@st.composite
def csv_texts(draw):
    sep = draw(st.sampled_from([",", ";", "\t", "|"]))
    end = draw(st.sampled_from(["\n", "\r", "\r\n", "\n\r", "\x0b", "\u2028"]))
    header = draw(st.lists(st.sampled_from(COLUMNS), max_size=7))
    rows = draw(st.lists(st.lists(CELLS, max_size=8), max_size=6))
    lines = [sep.join(header)] + [sep.join(r) for r in rows]
    if draw(st.booleans()):
        lines.insert(draw(st.integers(0, len(lines))), draw(st.sampled_from(["# comment", "", "   ", "#"])))
    return draw(st.sampled_from(["", "\ufeff"])) + end.join(lines) + draw(st.sampled_from(["", end]))


JSON_LEAVES = st.one_of(st.none(), st.booleans(), st.integers(-10**410, 10**410),
                        st.floats(allow_nan=True, allow_infinity=True), CELLS)
JSON_VALUES = st.recursive(JSON_LEAVES, lambda inner: st.one_of(
    st.lists(inner, max_size=4), st.dictionaries(st.sampled_from(COLUMNS + ["rows", "data"]), inner, max_size=5)),
    max_leaves=20)


@st.composite
def json_texts(draw):
    kind = draw(st.integers(0, 4))
    if kind == 0:      # deep nesting, as text (no Python object could hold it)
        depth = draw(st.sampled_from([30, 1000, 100_000]))
        opener = draw(st.sampled_from(["[", '{"a":', '[{"Z":']))
        return opener * depth + draw(st.sampled_from(["", "1", "]" * depth]))
    if kind == 1:      # a cut or garbled document
        text = json.dumps(draw(JSON_VALUES))
        cut = draw(st.integers(0, len(text)))
        return text[:cut] + draw(st.sampled_from(["", "}", "]", ",", "\x00", "NaN", "'"]))
    rows = draw(st.lists(st.dictionaries(st.sampled_from(COLUMNS), JSON_VALUES, max_size=6), max_size=5))
    doc = rows if kind < 4 else {"rows": rows, draw(st.sampled_from(["junk", "data"])): draw(JSON_VALUES)}
    return json.dumps(doc, allow_nan=True)


def _raw_rows(draw_text, suffix: str):
    return st.one_of(draw_text.map(lambda t: t.encode("utf-8", "surrogatepass")),
                     st.binary(max_size=400),
                     draw_text.map(lambda t: t.encode("utf-16", "surrogatepass")),
                     draw_text.map(lambda t: t.encode("latin-1", "replace")))


def _assert_parsed_or_refused(parse, text):
    try:
        rows = parse(text, "fuzz")
    except TwoelError as exc:
        message = str(exc)
        assert "\n" not in message and len(message) < 4000, message[:300]
        return
    for row in rows.rows:
        assert isinstance(row.energy, float) and math.isfinite(row.Z) and row.Z > 0


@fast(200)
@given(text=csv_texts())
def test_csv_parser_returns_rows_or_one_line(text):
    count("csv texts (parser)")
    _assert_parsed_or_refused(parse_csv_text, text)


@fast(150)
@given(text=json_texts())
def test_json_parser_returns_rows_or_one_line(text):
    count("json texts (parser)")
    _assert_parsed_or_refused(parse_json_text, text)


def _run_file(run_cli, name: str, data: bytes, *argv):
    with sandbox() as work, stop_before_solving():
        (work / name).write_bytes(data)
        try:
            code, out, err = run_cli(*argv)
        except ReachedSolving:
            count("(files stopped where solving starts)")
            return
    assert_clean_outcome(code, out, err)


def _check_file(run_cli, suffix, data, extra):
    count(f"check --file {suffix} files")
    _run_file(run_cli, "rows" + suffix, data, "check", "--file", "rows" + suffix, *extra)


EXTRA = st.sampled_from([[], ["--json"], ["--format", "csv"], ["--out", "out.txt"]])


@fast(120)
@given(data=_raw_rows(csv_texts(), ".csv"), suffix=st.sampled_from([".csv", ".txt", ""]), extra=EXTRA)
def test_check_reads_any_csv_file(run_cli, data, suffix, extra):
    _check_file(run_cli, suffix, data, extra)


@fast(120)
@given(data=_raw_rows(json_texts(), ".json"), suffix=st.sampled_from([".json", ""]), extra=EXTRA)
def test_check_reads_any_json_file(run_cli, data, suffix, extra):
    _check_file(run_cli, suffix, data, extra)


# --- report configurations ---------------------------------------------------------------------

CONFIG_LEAVES = st.one_of(
    st.none(), st.booleans(), st.integers(-10**410, 10**410), st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from(["1:6", "1:10000000", "He,Li", "2", "0", "-1", "1^1S", "2^3P", "9^9Z", "hylleraas",
                     "exponential", "nope", "no", "../x", "a/b", ".hidden", "", "x" * 5000, BIG]),
    st.dates(), st.datetimes(), st.times(), st.text(max_size=12))
CONFIG_KEYS = ["name", "title", "scenario", "series", "convergence", "levels", "Z", "state", "family",
               "size", "sizes", "parameters", "optimize", "options", "states", "alpha", "exponents", "junk"]
CONFIG_VALUES = st.recursive(CONFIG_LEAVES, lambda inner: st.one_of(
    st.lists(inner, max_size=5), st.dictionaries(st.sampled_from(CONFIG_KEYS), inner, max_size=5)), max_leaves=25)
SECTIONS = {
    "series": st.fixed_dictionaries({"Z": st.sampled_from(["1:3", [1, 2], 2, "He"])},
                                    optional={"size": st.one_of(st.integers(-3, 30), CONFIG_VALUES),
                                              "family": CONFIG_LEAVES, "state": CONFIG_LEAVES,
                                              "optimize": CONFIG_LEAVES, "parameters": CONFIG_VALUES,
                                              "options": CONFIG_VALUES, "junk": CONFIG_LEAVES}),
    "convergence": st.fixed_dictionaries({"Z": CONFIG_LEAVES, "sizes": st.one_of(
        st.lists(st.integers(-2, 40), max_size=6), CONFIG_VALUES)},
        optional={"family": CONFIG_LEAVES, "optimize": CONFIG_LEAVES, "options": CONFIG_VALUES}),
    "levels": st.fixed_dictionaries({"Z": CONFIG_LEAVES, "states": st.one_of(
        st.lists(st.one_of(CONFIG_LEAVES, st.dictionaries(st.sampled_from(["state", "size", "x"]),
                                                          CONFIG_LEAVES, max_size=3)), max_size=4),
        CONFIG_VALUES)}, optional={"family": CONFIG_LEAVES, "parameters": CONFIG_VALUES}),
}
CONFIGS = st.fixed_dictionaries({}, optional={
    "name": CONFIG_LEAVES, "title": CONFIG_LEAVES, "scenario": CONFIG_LEAVES, "junk": CONFIG_VALUES,
    "series": st.one_of(SECTIONS["series"], CONFIG_VALUES),
    "convergence": st.one_of(SECTIONS["convergence"], CONFIG_VALUES),
    "levels": st.one_of(SECTIONS["levels"], CONFIG_VALUES)})


def _toml_value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return "nan" if math.isnan(value) else ("inf" if value > 0 else "-inf") if math.isinf(value) else repr(value)
    if isinstance(value, (int, datetime.date, datetime.time)):
        return value.isoformat() if not isinstance(value, int) else str(value)
    if isinstance(value, str):
        return json.dumps(value)
    if isinstance(value, list):
        return "[" + ", ".join(_toml_value(v) for v in value if v is not None) + "]"
    if isinstance(value, dict):
        return "{" + ", ".join(f"{json.dumps(k)} = {_toml_value(v)}" for k, v in value.items()
                               if v is not None) + "}"
    return '""'


def to_toml(config: dict) -> str:
    """A small TOML writer for the generated configurations (None values are left out)."""
    return "".join(f"{json.dumps(k)} = {_toml_value(v)}\n" for k, v in config.items() if v is not None)


def _json_default(value):
    return value.isoformat()


@st.composite
def config_files(draw):
    config = draw(CONFIGS)
    kind = draw(st.sampled_from(["json", "toml", "garbled-json", "garbled-toml", "deep"]))
    if kind == "json":
        return ".json", json.dumps(config, default=_json_default, allow_nan=True).encode("utf-8", "surrogatepass")
    if kind == "toml":
        return ".toml", to_toml(config).encode("utf-8", "surrogatepass")
    if kind == "deep":
        depth = draw(st.sampled_from([100, 5000, 200_000]))
        suffix = draw(st.sampled_from([".json", ".toml"]))
        body = "[" * depth + "]" * depth
        return suffix, (f"series = {{Z = {body}}}" if suffix == ".toml" else f'{{"series": {{"Z": {body}}}}}').encode()
    text = (json.dumps(config, default=_json_default) if kind == "garbled-json" else to_toml(config))
    cut = draw(st.integers(0, len(text)))
    return (".json" if kind == "garbled-json" else ".toml"), (text[:cut] + draw(
        st.sampled_from(["", "\x00", "\xff", "[[", "= =", '"'])) ).encode("utf-8", "surrogatepass")


def _config_run(run_cli, file):
    suffix, data = file
    count("report --config files")
    _run_file(run_cli, "config" + suffix, data, "report", "--quiet", "--config", "config" + suffix,
              "--out", "out")


@fast(150)
@given(file=config_files())
def test_report_reads_any_configuration(run_cli, file):
    _config_run(run_cli, file)


# --- report provenance files -------------------------------------------------------------------

SKELETON = {"format": "twoel-report-provenance", "format_version": 1,
            "config": {"name": "fz", "series": {"Z": [2], "size": 0}},
            "numbers": {"series": {"Z": [2.0], "energy_hartree": [-2.8]}},
            "computations": {"series": [{"task": {"Z": 2.0, "size": 0}, "result": {"energy_hartree": -2.8}}]},
            "constants": {"edition": "CODATA 2018", "values": {}}, "packages": {}, "digests": {},
            "environment": {}}
PATHS = [("format",), ("format_version",), ("config",), ("config", "name"), ("config", "series"),
         ("config", "series", "Z"), ("config", "series", "size"), ("numbers",), ("numbers", "series"),
         ("numbers", "series", "energy_hartree"), ("computations",), ("computations", "series"),
         ("constants",), ("constants", "values"), ("packages",), ("digests",), ("environment",)]


@st.composite
def provenance_files(draw):
    data = json.loads(json.dumps(SKELETON))
    for _ in range(draw(st.integers(0, 4))):
        path = draw(st.sampled_from(PATHS))
        holder = data
        for key in path[:-1]:
            holder = holder.get(key) if isinstance(holder, dict) else None
        if not isinstance(holder, dict):
            continue
        if draw(st.booleans()):
            holder.pop(path[-1], None)
        else:
            holder[path[-1]] = draw(CONFIG_VALUES)
    text = json.dumps(data, default=_json_default, allow_nan=True)
    if draw(st.integers(0, 5)) == 0:
        text = text[:draw(st.integers(0, len(text)))]
    return text.encode("utf-8", "surrogatepass")


def _provenance_run(run_cli, data, strict):
    count("report --from-provenance files")
    _run_file(run_cli, "provenance.json", data, "report", "--quiet", "--from-provenance",
              "provenance.json", "--out", "rerun", *strict)


@fast(150)
@given(data=provenance_files(), strict=st.sampled_from([[], ["--strict"]]))
def test_report_reads_any_provenance(run_cli, data, strict):
    _provenance_run(run_cli, data, strict)


# --- the longer run ----------------------------------------------------------------------------

@pytest.mark.slow
@slow(2000)
@given(text=csv_texts())
def test_csv_parser_long(text):
    count("csv texts (parser)")
    _assert_parsed_or_refused(parse_csv_text, text)


@pytest.mark.slow
@slow(2000)
@given(text=json_texts())
def test_json_parser_long(text):
    count("json texts (parser)")
    _assert_parsed_or_refused(parse_json_text, text)


@pytest.mark.slow
@slow(500)
@given(data=_raw_rows(csv_texts(), ".csv"), suffix=st.sampled_from([".csv", ".txt", ""]), extra=EXTRA)
def test_check_reads_any_csv_file_long(run_cli, data, suffix, extra):
    _check_file(run_cli, suffix, data, extra)


@pytest.mark.slow
@slow(500)
@given(file=config_files())
def test_report_reads_any_configuration_long(run_cli, file):
    _config_run(run_cli, file)


@pytest.mark.slow
@slow(500)
@given(data=provenance_files(), strict=st.sampled_from([[], ["--strict"]]))
def test_report_reads_any_provenance_long(run_cli, data, strict):
    _provenance_run(run_cli, data, strict)
