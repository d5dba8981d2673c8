"""Regenerate the SymPy-derived kernel modules: ``python -m twoel.integrals.generate``."""

from __future__ import annotations

from pathlib import Path

from .symbolic import kinetic_source

KINETIC_PATH = Path(__file__).with_name("_kinetic.py")


def main() -> None:
    KINETIC_PATH.write_text(kinetic_source())
    print(f"wrote {KINETIC_PATH}")


if __name__ == "__main__":
    main()
