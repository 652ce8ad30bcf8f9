"""No regular expression of the pipeline backtracks catastrophically.

The value readers and the sectioner have their own adversarial tests
(``tests/values/test_adversarial.py``, ``tests/sections/test_robustness.py``).
This umbrella test covers every other pattern: it finds every compiled pattern
reachable from pathsieve's modules and from a built pipeline (module globals,
objects, closures of the pipeline components: normalisation, tokenizer,
abbreviations, assertion triggers and breaks, matcher, section and part
patterns), scans each over adversarial strings from every position, then
labels long adversarial reports end to end.  It all runs in a subprocess with a
hard timeout, so a pattern that explodes fails the test instead of hanging it.
"""

from __future__ import annotations

import subprocess
import sys
import textwrap

import pytest

SCRIPT = textwrap.dedent(
    r"""
    import importlib, pkgutil, re, sys, types
    import pathsieve
    from pathsieve import Labeler
    from pathsieve.sections import default_lexicon

    lab = Labeler("colorectal")
    pats, seen = {}, set()

    def ours(obj):
        return (getattr(type(obj), "__module__", "") or "").startswith("pathsieve")

    def walk(obj, depth=0):
        if id(obj) in seen or depth > 10:
            return
        seen.add(id(obj))
        if isinstance(obj, re.Pattern):
            pats.setdefault((obj.pattern, obj.flags), obj)
        elif isinstance(obj, (str, bytes, int, float, bool, type(None), types.ModuleType)):
            return
        elif isinstance(obj, dict):
            for v in list(obj.values())[:5000]:
                walk(v, depth + 1)
        elif isinstance(obj, (list, tuple, set, frozenset)):
            for v in list(obj)[:5000]:
                walk(v, depth + 1)
        elif isinstance(obj, types.FunctionType):
            if (obj.__module__ or "").startswith("pathsieve"):
                for cell in obj.__closure__ or ():
                    try:
                        walk(cell.cell_contents, depth + 1)
                    except ValueError:
                        pass
        elif ours(obj):
            names = list(getattr(obj, "__dict__", {}))
            for cls in type(obj).__mro__:
                names += [s for s in getattr(cls, "__slots__", ()) if isinstance(s, str)]
            for n in names:
                if hasattr(obj, n):
                    walk(getattr(obj, n), depth + 1)

    skip = ("pathsieve.cli", "pathsieve.__main__", "pathsieve.values")
    for info in pkgutil.walk_packages(pathsieve.__path__, "pathsieve."):
        if info.name.startswith(skip):
            continue
        for value in vars(importlib.import_module(info.name)).values():
            walk(value)
    for name in lab.nlp.pipe_names:
        walk(lab.nlp.get_pipe(name))
    walk(lab)
    walk(default_lexicon())
    assert len(pats) >= 50, len(pats)

    UNITS = [
        "a", " ", "\n", "\r\n", "\r", "\t", "-", "-\n", "- \n ", ".", ". ", ",", ", ", ":",
        ": ", ";", "(", "( ", ")", "((", "))", "[", "{", "*", "**", "_", "/", "+", "1", "12 ",
        "1.", "A.", "A. ", "A)", "(A) ", "aB", "aaaB", "ABCd", "AB ", "ab-", "a-b-", "IM ",
        "(IM) ", "intestinal metaplasia (IM) ", "no ", "not ", "no evidence of ", "negative for ",
        "cannot exclude ", "history of ", "? ", "consistent with ", "suspicious for ",
        "carcinoma ", "adenoma, ", "DIAGNOSIS: ", "DIAGNOSIS\n", "Gross Description:\n",
        "Part A: ", "Specimen 1 - ", "Comment: ", "\u00e9", "\u0301", "\u202e", "\x00", "\u00a0",
        "ﬁ", "😀", "  ", "\n\n", "\n- ", "\n* ", "x" * 30 + " ",
    ]
    def repeat(unit, n):
        return (unit * (n // len(unit) + 1))[:n]

    # exponential backtracking shows within a few dozen characters: every pattern, from
    # every position, over 400 characters of each unit
    mixed = "".join(UNITS)
    texts = [repeat(u, 400) for u in UNITS] + [repeat(mixed, 400)]
    for p in pats.values():
        for t in texts:
            for m in p.finditer(t):
                assert m.end() >= m.start()
    # polynomial blow-ups need length: the whole pipeline over 60,000 characters of
    # each unit, and of runs that end a line after a header, a part label or a trigger
    n = 60_000
    big = [repeat(u, n) for u in UNITS[::2]] + [repeat(mixed, n)]
    for head in ("GROSS", "DIAGNOSIS:", "A.", "Part 1:", "Comment", "no", "(", "IM"):
        for run in (" ", "\t", " \t", "-", "."):
            big.append(head + run * n + "\nReceived in formalin.\n")
    rows, _ = lab.label_records([(f"c{i}", t, "") for i, t in enumerate(big)], evidence=True)
    assert len(rows) == len(big)
    crashed = [r["error"] for r in rows if "while labelling" in (r["error"] or "")]
    assert not crashed, crashed
    print(len(pats), len(texts), len(big))
    """
)


def test_every_pattern_and_the_pipeline_finish_on_adversarial_text() -> None:
    proc = subprocess.run(
        [sys.executable, "-c", SCRIPT],
        capture_output=True,
        text=True,
        timeout=90,
        check=False,
    )
    assert proc.returncode == 0, proc.stderr[-3000:]
    n_patterns, n_texts, n_big = (int(x) for x in proc.stdout.split())
    assert n_patterns >= 50 and n_texts > 70 and n_big > 70


HEADER_RUN = textwrap.dedent(
    r"""
    from pathsieve.sections import find_sections

    for run in (" ", "\t", " \t"):
        text = "GROSS" + run * 200_000 + "\nReceived in formalin.\n"
        assert find_sections(text)[-1].end == len(text)
    print("ok")
    """
)


def test_header_then_white_space_to_line_end() -> None:
    # 200,000 blanks after "GROSS": quadratic takes hours, linear a few milliseconds
    try:
        proc = subprocess.run(
            [sys.executable, "-c", HEADER_RUN], capture_output=True, text=True, timeout=5
        )
    except subprocess.TimeoutExpired:
        pytest.fail("find_sections did not finish in 5 s")
    assert proc.returncode == 0 and proc.stdout.strip() == "ok", proc.stderr[-2000:]
