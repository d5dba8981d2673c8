"""Figures: valid PNG/SVG files of sensible size, labelled axes with units, no display needed."""

import os
import subprocess
import sys
import xml.etree.ElementTree as ET

import numpy as np
import pytest

from twoel.errors import InputError
from twoel.report import plots

PNG_MAGIC = b"\x89PNG\r\n\x1a\n"


def _check_files(paths):
    png, svg = paths
    data = png.read_bytes()
    assert data[:8] == PNG_MAGIC and 5_000 < len(data) < 2_000_000
    width, height = int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")
    assert width >= 600 and height >= 400
    root = ET.parse(svg).getroot()
    assert root.tag.endswith("svg") and 5_000 < svg.stat().st_size < 5_000_000


def _labelled(fig, *needles):
    labels = plots.axis_labels(fig)
    # every axes has a y label; stacked panels share the x label of the bottom one
    assert labels and all(y for _x, y in labels) and labels[-1][0]
    text = " ".join(x + " " + y for x, y in labels)
    for needle in needles:
        assert needle in text, (needle, text)


def _radial_density(r, zeta):
    # screened 1s^2: rho = 2 zeta^3/pi exp(-2 zeta r); D = 4 pi r^2 rho integrates to 2 (exact)
    return 8 * zeta**3 * r**2 * np.exp(-2 * zeta * r)


def test_every_figure_kind(tmp_path):
    r = np.linspace(0, 6, 300)
    figures = {
        "convergence": (plots.convergence_figure([1, 3, 7, 13], [-2.8477, -2.8912, -2.9034, -2.90364],
                                                 reference_hartree=-2.903724377034,
                                                 extrapolated_hartree=-2.90370,
                                                 error_bar_hartree=[1e-2, 1e-3, 1e-4, 1e-5]),
                        ("basis size", "E_\\mathrm{h}")),
        "residuals": (plots.residual_figure([1, 2, 3], [1.2e-5, 1.0e-5, -1e-9]), ("Z", "E_\\mathrm{h}")),
        "correlation": (plots.correlation_figure([1, 2, 3], [-0.5277, -2.9037, -7.2799],
                                                 [-0.4879, -2.8617, -7.2364]), ("Z", "m$E_\\mathrm{h}$")),
        "density": (plots.radial_density_figure(r, _radial_density(r, 1.6875), _radial_density(r, 1.7)),
                    ("bohr", "bohr$^{-1}$")),
        "pair": (plots.pair_distribution_figure(r, r**2 * np.exp(-2 * r), r**2 * np.exp(-2.1 * r)),
                 ("r_{12}", "Coulomb hole")),
        "levels": (plots.level_diagram_figure(["1^1S", "2^3S", "2^1S"], [-2.9037, -2.1752, -2.1460],
                                              {"He+ 1s": -2.0}), ("state", "E_\\mathrm{h}")),
    }
    for name, (fig, needles) in figures.items():
        _labelled(fig, *needles)
        _check_files(plots.save_figure(fig, tmp_path / name))
    assert len(list(tmp_path.iterdir())) == 12
    assert len(figures["pair"][0].axes) == 2


def test_rendering_is_repeatable():
    fig = plots.residual_figure([1, 2, 3], [1e-5, 2e-5, 3e-5])
    assert plots.figure_bytes(fig, "svg") == plots.figure_bytes(fig, "svg")
    assert plots.figure_bytes(fig, "png") == plots.figure_bytes(fig, "png")


def test_bad_arrays_are_input_errors():
    with pytest.raises(InputError, match="entries"):
        plots.residual_figure([1, 2], [1.0])
    with pytest.raises(InputError, match="empty"):
        plots.residual_figure([], [])
    with pytest.raises(InputError, match="labels"):
        plots.level_diagram_figure(["a"], [1.0, 2.0])
    with pytest.raises(InputError, match="format"):
        plots.figure_bytes(plots.residual_figure([1], [1e-3]), "jpg")


def test_plotting_needs_no_display(tmp_path):
    env = {k: v for k, v in os.environ.items() if k not in ("DISPLAY", "MPLBACKEND", "WAYLAND_DISPLAY")}
    code = ("import sys; from twoel.report import plots; "
            f"plots.save_figure(plots.residual_figure([1, 2], [1e-5, 2e-5]), {str(tmp_path / 'x')!r}); "
            "assert 'matplotlib.pyplot' not in sys.modules; print('ok')")
    done = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True, timeout=120)
    assert done.returncode == 0 and done.stdout.strip() == "ok", done.stderr
    assert (tmp_path / "x.png").read_bytes()[:8] == PNG_MAGIC
