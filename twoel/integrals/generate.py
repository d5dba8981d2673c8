"""Regenerate the SymPy-derived kernel modules: ``python -m twoel.integrals.generate``."""

from __future__ import annotations

from pathlib import Path

from .symbolic import kinetic_source
from .symbolic_states import generated_source

KINETIC_PATH = Path(__file__).with_name("_kinetic.py")
STATE_TERMS_PATH = Path(__file__).with_name("_state_terms.py")


def main() -> None:
    KINETIC_PATH.write_text(kinetic_source())
    print(f"wrote {KINETIC_PATH}")
    STATE_TERMS_PATH.write_text(generated_source())
    print(f"wrote {STATE_TERMS_PATH}")


if __name__ == "__main__":
    main()
