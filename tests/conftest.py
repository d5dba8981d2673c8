"""Shared test configuration: no display for plots, warnings of twoel visible but not fatal."""

import os

os.environ.setdefault("MPLBACKEND", "Agg")
