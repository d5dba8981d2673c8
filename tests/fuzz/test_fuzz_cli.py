"""Fuzz the argument parser and input checks of every subcommand.

Random argument lists are drawn from the real option names of each subcommand (read from the
parser itself) and hostile values: huge, negative, NaN and infinite numbers, 400-digit integers,
unicode, empty and very long strings, undecodable bytes (as Python sees them in ``sys.argv``)
and values that look like options.  A run that passes every check is stopped where building a
basis would begin (:func:`conftest.stop_before_solving`).
"""

from __future__ import annotations

import argparse

import pytest
from hypothesis import given, strategies as st

from fuzz_helpers import (ReachedSolving, assert_clean_outcome, count, fast, sandbox, slow,
                          stop_before_solving)
from twoel.cli import build_parser

#: options that are documented to print tracebacks (not part of the property)
EXCLUDED = {"--debug"}


def _commands() -> dict[str, list[str]]:
    parser = build_parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    return {name: sorted({o for action in p._actions for o in action.option_strings} - EXCLUDED)
            for name, p in sub.choices.items()}


COMMANDS = _commands()
BIG = "1" + "0" * 399

#: values that get past a parser sometimes (so the later checks are reached too)
PLAUSIBLE = ["2", "1", "0", "0.5", "He", "H", "Li", "1^1S", "2^3S", "2^1P", "2 3S", "3^1D",
             "hylleraas", "exponential", "hydrogenic", "screened", "1:3", "0,1,2", "4:14:2",
             "0,0,0;0,0,1", "alpha=1.5", "beta=0.5", "float64", "extended", "json", "csv", "table",
             "markdown", "latex", "hartree", "eV", "cm-1", "fast", "default", "u", "me", "4He",
             "-2.9033", "-2.9033D+00", "r", "stu", "energy_hartree", "out.json", "sub/out.json"]
#: values meant to break something
HOSTILE = ["", " ", "-1", "-0", "+5", "-1e300", "1e300", "1e-300", "nan", "NaN", "-nan", "inf", "-inf",
           "Infinity", "1e999", "0x10", "1_000", "٣", "²", "Ⅻ", BIG, "-" + BIG, "9" * 5000, "0" * 400 + "1",
           "1e-6", "1.5", "3.0", "119", "118", "1000000000", "1000000001", "2**64", "__import__('os')",
           "-", "--", "---", "-Z", "--Z", "--size=-1", "--json", "-h", "=", "a=", "=1", "x=nan", "x=1e999",
           ";", ",", ":", "1:", ":1", "1::", "0:0:0", "1:100000000", "1,2,3," * 2000, "\t", "\n", "\r\n",
           "ü" * 100, "😀", "\u202e", "\ufeff2", "\udcff", "x\udcffy.json", "x" * 100_000, "." , "..",
           "../..", "con", "out\\x", "~", "$HOME", "%s%s", "{}", "[]", "null", "true", "1^", "^", "10^10S",
           "99^1S", "1^1Q", "0^1S", "1^0S", "2^3P_1"]
TEXT = st.text(st.characters(exclude_characters="\x00/", exclude_categories=("Cs",)), max_size=40)
NUMBERS = st.one_of(st.integers(-10**420, 10**420).map(str),
                    st.floats(allow_nan=True, allow_infinity=True).map(repr),
                    st.floats(allow_nan=True, allow_infinity=True).map(lambda x: f"{x:.3e}"))
VALUES = st.one_of(st.sampled_from(PLAUSIBLE), st.sampled_from(HOSTILE), NUMBERS, TEXT)


@st.composite
def argv(draw):
    command = draw(st.sampled_from(sorted(COMMANDS)))
    options = COMMANDS[command]
    tokens = [command]
    for _ in range(draw(st.integers(0, 7))):
        kind = draw(st.integers(0, 9))
        option = draw(st.sampled_from(options))
        if kind <= 6:
            tokens += [option, draw(VALUES)]
        elif kind == 7:
            tokens.append(f"{option}={draw(VALUES)}")
        elif kind == 8:
            tokens.append(option)
        else:
            tokens.append(draw(VALUES))
    return tokens




def _run_one(run_cli, tokens):
    count("cli argument lists")
    with sandbox(), stop_before_solving():
        try:
            code, out, err = run_cli(*tokens)
            reached = False
        except ReachedSolving:
            count("(cli lists stopped where solving starts)")
            return
    assert_clean_outcome(code, out, err, reached)


@fast(250)
@given(tokens=argv())
def test_every_argument_list_ends_cleanly(run_cli, tokens):
    _run_one(run_cli, tokens)


@pytest.mark.slow
@slow(2000)
@given(tokens=argv())
def test_every_argument_list_ends_cleanly_long(run_cli, tokens):
    _run_one(run_cli, tokens)


@fast(30)
@given(command=st.sampled_from(sorted(COMMANDS)), value=st.one_of(st.sampled_from(HOSTILE), NUMBERS))
def test_every_option_takes_any_hostile_value(run_cli, command, value):
    for option in COMMANDS[command]:
        _run_one(run_cli, [command, option, value])
