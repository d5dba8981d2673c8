"""Regenerate the SymPy-derived kernel modules: ``python -m twoel.integrals.generate``."""

from __future__ import annotations

from pathlib import Path

from .symbolic import kinetic_source, zero_power_source
from .symbolic_states import generated_source

KINETIC_PATH = Path(__file__).with_name("_kinetic.py")
ZERO_POWER_PATH = Path(__file__).with_name("_exponential.py")
STATE_TERMS_PATH = Path(__file__).with_name("_state_terms.py")


def main() -> None:
    for path, source in ((KINETIC_PATH, kinetic_source), (ZERO_POWER_PATH, zero_power_source),
                         (STATE_TERMS_PATH, generated_source)):
        path.write_text(source())
        print(f"wrote {path}")


if __name__ == "__main__":
    main()
