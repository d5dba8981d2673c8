"""Regenerate the SymPy-derived kernel modules: ``python -m twoel.integrals.generate``."""

from __future__ import annotations

from pathlib import Path

from twoel.integrals.symbolic import kinetic_source, zero_power_source
from twoel.integrals.symbolic_states import generated_source

KINETIC_PATH = Path(__file__).parent / "generated" / "kinetic_terms.py"
ZERO_POWER_PATH = Path(__file__).parent / "generated" / "zero_power_kernels.py"
STATE_TERMS_PATH = Path(__file__).parent / "generated" / "state_terms.py"


def main() -> None:
    for path, source in ((KINETIC_PATH, kinetic_source), (ZERO_POWER_PATH, zero_power_source),
                         (STATE_TERMS_PATH, generated_source)):
        path.write_text(source())
        print(f"wrote {path}")


if __name__ == "__main__":
    main()
