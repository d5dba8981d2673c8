"""Regenerate :mod:`twoel.corrections._operator_terms`: ``python -m twoel.corrections.generate``."""

from __future__ import annotations

from pathlib import Path

from .symbolic import operator_terms_source

TERMS_PATH = Path(__file__).with_name("_operator_terms.py")


def main() -> None:
    TERMS_PATH.write_text(operator_terms_source())
    print(f"wrote {TERMS_PATH}")


if __name__ == "__main__":
    main()
