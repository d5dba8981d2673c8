"""Edges that present results: tables (text formats) and, later, plots and report folders."""
