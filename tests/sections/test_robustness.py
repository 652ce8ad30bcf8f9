"""Hostile input finishes quickly; invariants hold on arbitrary text.

The adversarial inputs run in a subprocess with a hard 90 s timeout, so a
regex that backtracks catastrophically fails the test instead of hanging it.
"""

from __future__ import annotations

import itertools
import subprocess
import sys
import textwrap

from hypothesis import given, settings
from hypothesis import strategies as st

from pathsieve.parts import find_parts
from pathsieve.sections import find_sections

ADVERSARIAL = textwrap.dedent(
    """
    from pathsieve.parts import find_parts
    from pathsieve.sections import find_sections

    inputs = {
        "label-repeat": "A. " * 200_000,
        "label-lines": "A.\\n" * 30_000,
        "sequence-lines": "".join(f"{i % 99 + 1}. x\\n" for i in range(30_000)),
        "long-line": "a" * 1_000_000,
        "colons": ":" * 1_000_000,
        "colon-words": "Margins: " * 200_000,
        "key-lines": "Histologic type: x\\n" * 30_000,
        "header-lines": "DIAGNOSIS:\\n" * 30_000,
        "decoration": "*" * 500_000 + " DIAGNOSIS " + "-" * 500_000,
        "spaces": "FINAL" + " " * 1_000_000 + "DIAGNOSIS",
        "parens": "Tumor size (" * 200_000,
        "site-lines": "Colon, biopsy" + ", x" * 300_000 + ":\\n",
        "crlf": "\\r\\n" * 100_000,
        "mixed": ("PART 1 -\\nA1-A3: x\\n(B) y\\nSpecimen #2:\\n" * 10_000),
        "notes": "DIAGNOSIS:\\n" + "Comment: x\\nA. y\\nProcedure: z\\n" * 20_000,
    }
    for name, text in inputs.items():
        sections = find_sections(text)
        parts = find_parts(text, sections)
        assert sections[0].start == 0 and sections[-1].end == len(text), name
        print(name, len(sections), len(parts))
    """
)


def test_adversarial_inputs_finish_in_a_subprocess() -> None:
    done = subprocess.run(
        [sys.executable, "-c", ADVERSARIAL],
        capture_output=True,
        text=True,
        timeout=90,  # generous on a loaded 2-core machine; backtracking blows up far beyond it
        check=False,
    )
    assert done.returncode == 0, done.stderr[-2000:]
    assert len(done.stdout.splitlines()) == 15


_ALPHABET = st.sampled_from(
    [
        "A. ",
        "B) ",
        "1. ",
        "2. ",
        "Part 1: ",
        "SPECIMEN B - ",
        "DIAGNOSIS",
        "Final Diagnosis:",
        "GROSS DESCRIPTION",
        "*** ",
        "Histologic type: x",
        "Margins: free",
        "Tumor size: 2 cm",
        "Comment: ok",
        "Colon, biopsy:",
        "tubular adenoma",
        ":",
        " ",
        "\t",
        "\n",
        "\r\n",
        "é",
        "A1-A3: ",
    ]
)


@settings(max_examples=150, deadline=None)
@given(st.lists(_ALPHABET, max_size=40).map("".join))
def test_partition_invariants_on_arbitrary_reports(text: str) -> None:
    sections = find_sections(text)
    if not text:
        assert sections == []
        return
    assert sections[0].start == 0
    assert sections[-1].end == len(text)
    for a, b in itertools.pairwise(sections):
        assert a.end == b.start
    for s in sections:
        assert s.start < s.end
        assert s.start <= s.body_start <= s.end
        if s.header:
            assert s.header in text[s.start : s.body_start]
    parts = find_parts(text, sections)
    assert parts
    for a, b in itertools.pairwise(parts):
        assert a.end <= b.start
    for p in parts:
        assert 0 <= p.start <= p.header_end <= p.end <= len(text)
        assert text[p.start : p.header_end] == p.header


@settings(max_examples=100, deadline=None)
@given(st.text(max_size=300))
def test_any_unicode_text_is_partitioned(text: str) -> None:
    sections = find_sections(text)
    covered = "".join(text[s.start : s.end] for s in sections)
    assert covered == text
