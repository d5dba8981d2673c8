"""Every reference value has a source and a citation key with an entry in data/references.bib."""

import csv
import re
from pathlib import Path

DATA = Path(__file__).resolve().parents[2] / "data"


def bib_keys(text: str) -> set[str]:
    return set(re.findall(r"@\w+\s*\{\s*([^,\s]+)\s*,", text))


def test_bib_entries_are_well_formed():
    text = (DATA / "references.bib").read_text(encoding="utf-8")
    keys = re.findall(r"@\w+\s*\{\s*([^,\s]+)\s*,", text)
    assert keys and len(keys) == len(set(keys)), "duplicate BibTeX keys"
    body = re.sub(r"\\.", "", text)
    assert body.count("{") == body.count("}")
    for entry in re.split(r"\n(?=@)", text):
        if entry.startswith("@"):
            assert re.search(r"\byear\s*=", entry) and re.search(r"\bauthor\s*=", entry), entry[:40]


def test_every_key_in_data_csv_is_in_the_bib_and_every_row_has_a_source():
    keys = bib_keys((DATA / "references.bib").read_text(encoding="utf-8"))
    checked = 0
    for path in sorted(DATA.glob("*.csv")):
        with path.open(encoding="utf-8", newline="") as handle:
            reader = csv.DictReader(handle)
            if "key" not in (reader.fieldnames or []):
                continue
            for line, row in enumerate(reader, start=2):
                assert (row.get("source") or "").strip(), f"{path.name}:{line} has no source"
                key = (row.get("key") or "").strip()
                assert key, f"{path.name}:{line} has no citation key"
                for k in key.split(";"):
                    assert k.strip() in keys, f"{path.name}:{line}: key {k!r} missing from references.bib"
                checked += 1
    assert checked >= 10
