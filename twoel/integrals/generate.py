"""Regenerate the SymPy-derived kernel modules: ``python -m twoel.integrals.generate``."""

from __future__ import annotations

from pathlib import Path

from .symbolic import kinetic_source, zero_power_source

KINETIC_PATH = Path(__file__).with_name("_kinetic.py")
ZERO_POWER_PATH = Path(__file__).with_name("_exponential.py")


def main() -> None:
    KINETIC_PATH.write_text(kinetic_source())
    print(f"wrote {KINETIC_PATH}")
    ZERO_POWER_PATH.write_text(zero_power_source())
    print(f"wrote {ZERO_POWER_PATH}")


if __name__ == "__main__":
    main()
