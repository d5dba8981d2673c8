"""The fuzz suite prints how many generated inputs it ran (by kind) at the end of the session."""


def pytest_terminal_summary(terminalreporter):
    from fuzz_helpers import COUNTS

    if COUNTS:
        parts = ", ".join(f"{kind}: {n}" for kind, n in sorted(COUNTS.items()))
        total = sum(n for kind, n in COUNTS.items() if not kind.startswith("("))
        terminalreporter.write_line(f"fuzz inputs run: {total} ({parts})")
