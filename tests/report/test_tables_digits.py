"""Tables print only the digits an uncertainty supports (GUM, JCGM 100:2008, §7.2.2), mark a
number without one, and keep the full value in the machine-readable columns.

Values: He 1^1S nonrelativistic energy, C. Schwartz, Int. J. Mod. Phys. E 15, 877 (2006);
the hartree-to-cm⁻¹ factor from CODATA (scipy.constants).
"""

import io
import json

import pandas as pd
import pytest
from scipy import constants as sc

from twoel.report.tables import render

HE = "-2.903724377034119598311159245194404"
#: hartree -> cm⁻¹ from CODATA (independent of twoel.units)
CM1_PER_HARTREE = sc.physical_constants["hartree-inverse meter relationship"][0] / 100


def _frame(bar, reliable=True):
    energy = float(HE) + 3.3e-13          # a computed energy 0.33e-12 above the published one
    ionization = -2.0 - energy
    return pd.DataFrame([{"Z": 2.0, "ion": "He", "state": "1^1S", "energy_hartree": energy,
                          "error_bar_hartree": bar, "ionization_energy_hartree": ionization,
                          "ionization_energy_cm1": ionization * CM1_PER_HARTREE,
                          "reliable": reliable}])


@pytest.mark.parametrize("fmt", ["markdown", "html"])
def test_energy_with_a_2e12_bar_shows_digits_to_1e12_and_2(fmt):
    text = render(_frame(2e-12), fmt)
    # -2.9037243770337866 rounded at 1e-12 is -2.903724377034; the bar is 2 in that digit
    assert "-2.903\u202f724\u202f377\u202f034(2)" in text
    assert "-2.903\u202f724\u202f377\u202f034\u202f" not in text      # no digit beyond 1e-12
    assert "\u2020" not in text                                       # nothing is marked


def test_latex_and_ionization_energy_inherit_the_bar():
    text = render(_frame(2e-12), "latex")
    assert r"$-2.903\,724\,377\,034(2)$" in text
    # I = -2 - E = 0.903 724 377 034(2) Eh; in cm⁻¹ the bar is 2e-12 * 219 474.63 = 4.4e-7
    assert r"$0.903\,724\,377\,034(2)$" in text
    cm1 = f"{float(_frame(2e-12)['ionization_energy_cm1'][0]):.7f}"      # 198344.574 ... to 1e-7
    integer, fraction = cm1.split(".")
    grouped = integer[:3] + r"\," + integer[3:] + "." + r"\,".join([fraction[:3], fraction[3:6], fraction[6:]])
    assert f"${grouped}(4)$" in text


def test_number_without_a_bar_is_marked_and_explained():
    md = render(_frame(None), "markdown")
    assert repr(float(HE) + 3.3e-13) == "-2.9037243770337895"
    # as computed, at most 15 decimals (decimal half-even of the repr), marked
    assert "-2.903\u202f724\u202f377\u202f033\u202f790\u2020" in md
    # the widest marked cell is the cm⁻¹ value 198 344.574 503 374 32: 17 digits
    assert "\u2020 no uncertainty" in md and "shown as computed, up to 17 significant digits" in md
    tex = render(_frame(None), "latex", caption="c")
    assert r"^{\dagger}$" in tex and r"$\dagger$ no uncertainty" in tex


def test_unreliable_bar_is_marked():
    md = render(_frame(2e-12, reliable=False), "markdown")
    assert "034(2)\u00a7" in md and "reliable: false" in md


def test_csv_and_json_keep_the_full_value():
    frame = _frame(2e-12)
    back = pd.read_csv(io.StringIO(render(frame, "csv")))
    assert back["energy_hartree"][0] == frame["energy_hartree"][0]     # bit for bit
    assert back["energy_hartree_concise"][0] == "-2.903724377034(2)"
    record = json.loads(render(frame, "json"))[0]
    assert record["energy_hartree"] == frame["energy_hartree"][0]
    assert record["ionization_energy_hartree_concise"] == "0.903724377034(2)"


def test_reference_shows_its_stated_uncertainty():
    frame = pd.DataFrame([{"reference_hartree": 6082.99, "reference_uncertainty_hartree": 0.15}])
    # H- detachment energy, Lykke et al., Phys. Rev. A 43, 6104 (1991): 6082.99(15) cm⁻¹
    assert "6083.0(2)" in render(frame, "markdown", columns=["reference_hartree"])


def test_committed_demo_report_shows_the_bars():
    # the committed demo: every level energy carries its bar in parentheses, its last digit at
    # the bar's leading digit, and lies within half a unit of that digit of the full CSV value
    import csv
    import math
    from pathlib import Path

    tables = Path(__file__).resolve().parents[2] / "reports" / "demo-isoelectronic" / "tables"
    with (tables / "levels.csv").open(encoding="utf-8") as handle:
        rows = list(csv.DictReader(handle))
    lines = (tables / "levels.md").read_text(encoding="utf-8").splitlines()
    header = [c.strip() for c in lines[0].strip("|").split("|")]
    cells = [[c.strip() for c in line.strip("|").split("|")] for line in lines[2:2 + len(rows)]]
    for row, shown in zip(rows, cells):
        bar = float(row["error_bar_hartree"])
        text = shown[header.index("E (Eh)")].replace("\u202f", "")
        value, _, digit = text.rstrip("§").partition("(")   # § marks a bar flagged unreliable
        decimals = len(value.split(".")[1])
        place = math.floor(math.log10(bar) + 1e-9)
        assert decimals in (-place, -place - 1)           # 0.96 rounds up one place
        assert 1 <= int(digit.rstrip(")")) <= 10
        assert abs(float(value) - float(row["energy_hartree"])) <= 0.5 * 10.0 ** -decimals
    series = (tables / "series.md").read_text(encoding="utf-8")
    # the hylleraas rows carry the bar of their nested ω - 2, ω - 1, ω bases: no unmarked digits
    assert "\u2020" not in series and "(" in series.splitlines()[2]
