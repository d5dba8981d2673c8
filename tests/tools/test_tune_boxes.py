"""The box tuner (developer tool) writes box files that the runtime loader reads back.

Check values outside the project:
* He 1^1S exact nonrelativistic energy -2.903724377034 Eh (C. Schwartz, Int. J. Mod. Phys. E 15,
  877 (2006)): any variational energy lies above it.
* -Z²: the bare-nucleus energy of two electrons, a lower bound of every two-electron energy.
"""

import dataclasses
import json
import subprocess
import sys
from pathlib import Path

import pytest

from twoel.basis import exponential_boxes as stored
from twoel.system import Ion, State
from twoel.tools import tune_boxes

HE_EXACT = -2.903724377034  # Schwartz 2006


@pytest.fixture
def data_folder(tmp_path, monkeypatch):
    """Point the loader at a temporary data folder (only box files in it)."""
    import twoel.reference

    monkeypatch.setattr(twoel.reference, "data_root", lambda: tmp_path)
    stored.stored_sets.cache_clear()
    yield tmp_path
    stored.stored_sets.cache_clear()


def test_tuner_writes_a_file_the_loader_reads_back(tmp_path):
    out = tmp_path / "exponential_boxes_test.json"
    rc = tune_boxes.main(["--Z", "2", "--size", "8", "--evaluations", "25", "--quiet",
                          "--out", str(out)])
    assert rc == 0
    sets = stored.parse_box_file(out.read_text(), out.name)      # the loader's own parser
    assert [(s.Z, s.state, s.optimized_size) for s in sets] == [(2.0, "1^1S", 8)]
    loaded = sets[0]
    assert HE_EXACT < loaded.energy_hartree < -2.0                 # variational and bound
    # the stored edges give back the stored energy (nothing lost between writer and loader)
    again = tune_boxes.box_energy(loaded.boxes, Ion(2), State.parse("1^1S"), 8)
    assert again == pytest.approx(loaded.energy_hartree, rel=1e-12)


def test_written_file_is_what_the_runtime_loads(data_folder):
    out = data_folder / "exponential_boxes.json"
    assert tune_boxes.main(["--Z", "2", "--state", "2^1P", "--size", "6", "--evaluations", "10",
                            "--quiet", "--out", str(out)]) == 0
    stored.stored_sets.cache_clear()
    box_set = stored.box_set_for(Ion(2), State.parse("2^1P"))
    assert box_set.origin == "stored" and box_set.source_file == out.name
    assert box_set.optimized_size == 6
    # a state not in the file falls back to the generic guess (the documented rule)
    assert stored.box_set_for(Ion(2), State.parse("1^1S")).origin == "generic"


def test_merge_keeps_other_sets_and_recommended_size(tmp_path):
    box_file = tmp_path / "boxes.json"
    first = tune_boxes.tune(Ion(2), State.parse("1^1S"), 6, max_evaluations=5)
    first = dataclasses.replace(first, extra={"recommended_size": 600})
    tune_boxes.write_sets(box_file, [first], "test file")
    second = tune_boxes.tune(Ion(3), State.parse("1^1S"), 6, max_evaluations=5)
    again = tune_boxes.tune(Ion(2), State.parse("1^1S"), 7, max_evaluations=5)
    tune_boxes.write_sets(box_file, [second, again])
    doc = json.loads(box_file.read_text())
    assert doc["schema"] == stored.SCHEMA and doc["description"] == "test file"
    by_z = {s["Z"]: s for s in doc["sets"]}
    assert sorted(by_z) == [2.0, 3.0]
    assert by_z[2.0]["optimized_size"] == 7 and by_z[2.0]["recommended_size"] == 600
    assert not list(tmp_path.glob(".*.tmp"))                       # atomic: no leftovers


def test_old_single_set_checkpoint_is_merged(tmp_path):
    entry = {"Z": 2.0, "state": "2^3S", "optimized_size": 10, "energy_hartree": -2.17,
             "boxes": [{"fraction": 1.0, "alpha": [1.5, 2.5], "beta": [0.2, 0.7],
                        "gamma": [0.01, 0.3]}]}
    old = tmp_path / "checkpoint.json"
    old.write_text(json.dumps(entry))
    out = tmp_path / "merged.json"
    assert tune_boxes.main(["--merge", str(old), "--out", str(out)]) == 0
    assert [(s.Z, s.state) for s in stored.parse_box_file(out.read_text())] == [(2.0, "2^3S")]


def test_old_excited_options_map_to_the_tuner():
    from twoel.tools.tune_excited_boxes import translate

    args = translate(["--Z", "2", "--state", "2^3S", "--size", "50", "--out", "best.json"])
    assert args[:8] == ["--Z", "2", "--state", "2^3S", "--size", "50", "--evaluations", "300"]
    assert "--shares" in args and args[args.index("--checkpoint") + 1] == "best.json"
    assert "--out" not in args


@pytest.mark.parametrize("argv", [["--Z", "2", "--size", "0"], ["--merge", "x.json"],
                                  ["--Z", "2", "--out", "/nonexistent-folder-twoel/x.json"]])
def test_bad_input_is_one_line_error(argv, capsys):
    assert tune_boxes.main(argv) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("error: ")


def test_runtime_package_never_imports_the_tools():
    """The solve path, the command line and the report load no module of twoel.tools."""
    code = ("import sys, twoel, twoel.cli, twoel.solver.pipeline, twoel.basis.exponential, "
            "twoel.scf.hartree_fock, twoel.scf.split_shell, twoel.report;"
            "twoel.solve(2, '1^1S', 'screened');"
            "bad = [m for m in sys.modules if m.startswith('twoel.tools')];"
            "assert not bad, bad")
    root = Path(__file__).resolve().parents[2]
    subprocess.run([sys.executable, "-c", code], check=True, cwd=root,
                   env={"PYTHONPATH": str(root), "OPENBLAS_NUM_THREADS": "1", "MPLBACKEND": "Agg"})
