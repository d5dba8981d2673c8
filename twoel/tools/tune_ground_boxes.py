"""Old name of the box tuner (developer tool; kept so that documented commands keep working).

**Not part of the runtime package API**: nothing in twoel imports :mod:`twoel.tools`.
Everything lives in :mod:`twoel.tools.tune_boxes`; the options are the same::

    python -m twoel.tools.tune_ground_boxes --Z 1:10 --state 1^1S --size 120 --out data/exponential_boxes.json
"""

from __future__ import annotations

import sys

from twoel.tools.tune_boxes import main, read_sets, tune, write_sets  # noqa: F401

if __name__ == "__main__":
    sys.exit(main())
