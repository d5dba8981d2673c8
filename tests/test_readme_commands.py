"""Every ``twoel ...`` example command of README.md runs as written and succeeds.

The commands are read from the ``bash`` blocks of the README (a line starting with ``twoel``, or
the ``twoel`` part of ``... && twoel ...``), split like a shell would (comments dropped) and run
through :func:`twoel.cli.main` with a temporary folder as the current folder: input files named
by the README are taken from the repository, and every file or folder a command writes lands in
the temporary folder.  Commands measured above ~10 s on 2 cores are marked slow (``-m slow``).
"""

from __future__ import annotations

import os
import re
import shlex
from pathlib import Path

import pytest

from twoel.cli import main

REPO = Path(__file__).resolve().parents[1]
README = REPO / "README.md"
#: options whose value is a file the command reads
INPUT_OPTIONS = ("--config", "--file", "--from-provenance")
#: options whose value is a path the command writes
OUTPUT_OPTIONS = ("--out", "--output")
#: README commands measured above ~10 s (OPENBLAS_NUM_THREADS=1, 2 busy cores): wall seconds
SLOW = {
    "twoel properties --Z 2 --state 2^3S --json": 17,
    "twoel properties --Z 2": 50,  # nested bases for the uncertainties
    "twoel spectrum --Z 2 --state 1^1S": 12,  # named twice in the README: 12 s and 19 s
    "twoel spectrum --Z 2 --state 2^3S --details": 15,
    "twoel spectrum --Z Li --isotope 6 --json": 19,
    "twoel energy --Z 2 --family exponential --size 800 --precision extended --digits 20": 44,
    "twoel energy --Z 2 --family exponential --size 2263 --precision extended": 300,
}


def readme_commands() -> list[tuple[int, list[str]]]:
    """``(block number, words)`` for every ``twoel`` command in the README's bash blocks."""
    commands = []
    blocks = re.findall(r"```bash\n(.*?)```", README.read_text(encoding="utf-8"), flags=re.S)
    for number, block in enumerate(blocks):
        for line in block.splitlines():
            for part in line.split("&&"):
                words = shlex.split(part, comments=True)
                if words[:1] == ["twoel"]:
                    commands.append((number, words))
    return commands


COMMANDS = readme_commands()


def _text(words: list[str]) -> str:
    return " ".join(words)


def _arguments(command: list[str], tmp_path: Path) -> list[str]:
    """The command's arguments with README input files taken from the repository and absolute
    output paths moved into ``tmp_path`` (relative ones land there already: it is the cwd)."""
    words = list(command[1:])
    for i in range(1, len(words)):
        option, value = words[i - 1], words[i]
        if option in INPUT_OPTIONS and (REPO / value).exists():
            words[i] = str(REPO / value)
        elif option in OUTPUT_OPTIONS and os.path.isabs(value):
            words[i] = str(tmp_path / Path(value).name)
    return words


def _needs_earlier_output(words: list[str]) -> bool:
    return any(option in INPUT_OPTIONS and not (REPO / value).exists()
               for option, value in zip(words, words[1:]))


def _run(command: list[str], tmp_path: Path) -> None:
    code = main(_arguments(command, tmp_path))
    assert code == 0, f"{_text(command)!r} exited with {code}"


def _params():
    for index, (block, command) in enumerate(COMMANDS):
        marks = [pytest.mark.slow] if _text(command) in SLOW else []
        yield pytest.param(index, block, command, marks=marks, id=_text(command)[6:70])


def test_readme_has_commands_and_the_slow_list_is_current():
    assert len(COMMANDS) >= 20
    assert set(SLOW) <= {_text(command) for _, command in COMMANDS}, "SLOW names a command the README no longer has"


@pytest.mark.parametrize(("index", "block", "command"), list(_params()))
def test_readme_command_runs(index, block, command, tmp_path, monkeypatch, capsys):
    """The command exits with status 0 and writes nothing into the repository.  A command that
    reads a file made by an earlier command of its block (a report's provenance.json) runs
    after those earlier commands, as a reader following the README would."""
    monkeypatch.chdir(tmp_path)
    before = sorted(p.name for p in REPO.iterdir()), sorted(p.name for p in (REPO / "reports").iterdir())
    if _needs_earlier_output(command):
        for earlier_block, earlier in COMMANDS[:index]:
            if earlier_block == block:
                _run(earlier, tmp_path)
    _run(command, tmp_path)
    captured = capsys.readouterr()
    assert captured.out.strip(), f"{_text(command)!r} printed nothing"
    after = sorted(p.name for p in REPO.iterdir()), sorted(p.name for p in (REPO / "reports").iterdir())
    assert after == before, f"{_text(command)!r} wrote into the repository"
