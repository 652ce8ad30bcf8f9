"""No reader pattern backtracks catastrophically.

Every pattern of every reader is run from every position over adversarial
strings (50,000 characters of repeated digits, spaces, "+", "x"; 2,000 of
repeated trigger words), and every reader through ``extract_values`` over 50,000
characters of each, in a subprocess that must finish within 20 seconds.  The
test asserts on correctness only (no timing threshold inside the test), but a
hang fails it.
"""

from __future__ import annotations

import subprocess
import sys
import textwrap

SCRIPT = textwrap.dedent(
    r"""
    import re, sys
    from pathsieve.values import extract_values, readers
    from pathsieve.values.common import Region, Report, Rx

    def patterns(obj, seen):
        if id(obj) in seen:
            return
        seen.add(id(obj))
        if isinstance(obj, Rx):
            yield obj.scan
            if obj.twin is not None:
                yield obj.twin
        elif isinstance(obj, re.Pattern):
            yield obj
        elif isinstance(obj, (tuple, list)):
            for x in obj:
                yield from patterns(x, seen)
        elif isinstance(obj, dict):
            for x in obj.values():
                yield from patterns(x, seen)
        elif hasattr(obj, "__dict__") or hasattr(obj, "__slots__"):
            names = list(getattr(obj, "__dict__", {}))
            for cls in type(obj).__mro__:
                names += [s for s in getattr(cls, "__slots__", ()) if isinstance(s, str)]
            for n in names:
                if hasattr(obj, n) and not n.startswith("__"):
                    yield from patterns(getattr(obj, n), seen)

    UNITS = [
        "1", " ", "+", "x", "3+4=", "1 x ", "12/", "(", "((", "- ", "0.", ".5 ",
        "gleason ", "gleason score 3 ", "primary pattern 3 ", "lymph nodes ",
        "two of ", "no ", "margin ", "margins are ", "pT", "pT1 N", "N0 ", "T ",
        "ER ", "HER2 ", "her ", "tubules 3 nuclei 2 ", "marsh 3", "lvi ",
        "no lymphovascular ", "tumor ", "tumor measures ", "1.5 cm ", "1 cm x ",
        "grade 2 ", "nottingham ", "closest margin ", "number of ", "%", "1% ",
    ]
    N = int(sys.argv[1])
    texts = [(u * (N // len(u) + 1))[:N] for u in UNITS]
    texts.append("".join(UNITS) * (N // len("".join(UNITS)) + 1))
    pats = []
    seen = set()
    for r in readers():
        pats.extend(patterns(r, seen))
    assert len(pats) > 60, len(pats)
    # every pattern scanned from every position: over the full 50,000 characters of
    # the classic cases (runs of digits, spaces, "+", "x"), over 2,000 of the others
    scanned = texts[:4] + [t[:2000] for t in texts[4:]]
    for p in pats:
        for t in scanned:
            for m in p.finditer(t.lower() if p.flags & re.IGNORECASE == 0 else t):
                assert m.end() >= m.start()
    total = 0
    for t in texts:
        for v in extract_values(t, [(0, len(t), "diagnosis", "")]):
            assert t[v.start:v.end] == v.text
            total += 1
    print(len(pats), len(texts), total)
    """
)


def test_every_pattern_on_adversarial_strings_finishes() -> None:
    proc = subprocess.run(
        [sys.executable, "-c", SCRIPT, "50000"],
        capture_output=True,
        text=True,
        timeout=90,  # generous on a loaded 2-core machine; backtracking blows up far beyond it
        check=False,
    )
    assert proc.returncode == 0, proc.stderr[-2000:]
    n_patterns, n_texts, _ = (int(x) for x in proc.stdout.split())
    assert n_patterns > 60 and n_texts > 40
