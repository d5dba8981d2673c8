"""``python -m twoel`` runs the command line."""

import sys

from twoel.cli import main

sys.exit(main())
