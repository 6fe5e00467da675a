"""Citations point at published sources, never at notes outside the repository (their
section or formula numbers, such as a "§2" or an "F13", mean nothing to a reader here)."""

import re
import subprocess

from tests.paths import ROOT

OUTSIDE_NUMBERING = re.compile(r"REFERENCES|§|\bF\d{1,2}\b")
PLACES = ("hydro", "app", "tests", "bench", "docs")
DOCUMENTS = ("README.md", "DEVELOPERS.md")


def test_no_citation_points_outside_the_repository():
    listed = subprocess.run(
        ["git", "ls-files", *PLACES, *DOCUMENTS], cwd=ROOT, capture_output=True, text=True
    )
    files = [ROOT / name for name in listed.stdout.split() if name.endswith((".py", ".md"))]
    if not files:  # not a git checkout: read the tree instead
        files = [p for d in PLACES for p in (ROOT / d).rglob("*") if p.suffix in (".py", ".md")]
        files += [ROOT / name for name in DOCUMENTS]
    this = ROOT / "tests" / "test_citations.py"
    found = [
        f"{path.relative_to(ROOT)}:{n}: {line.strip()}"
        for path in files if path != this and path.exists()
        for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), start=1)
        if OUTSIDE_NUMBERING.search(line)
    ]
    assert not found, "cite the original publication instead:\n" + "\n".join(found)
