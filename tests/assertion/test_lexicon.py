"""The trigger lexicon: the shipped file checks clean; broken files name file and line."""

from __future__ import annotations

from pathlib import Path

import pytest

from pathsieve.assertion import (
    AXIS_OF,
    CONTROL_CATEGORIES,
    AssertionEngine,
    check_triggers,
    default_triggers_path,
    parse_triggers,
)
from pathsieve.errors import VocabError

HEADER = "# phrase\tcategory\tdirection\tscope\tapplies\n"
GOOD = "no\tabsent\tforward\t-\nbut\tterminate\t-\t-\t*\n"


def write(tmp_path: Path, body: str, name: str = "triggers.tsv") -> Path:
    path = tmp_path / name
    path.write_text(HEADER + body, encoding="utf-8")
    return path


def test_shipped_lexicon_is_clean() -> None:
    assert check_triggers(default_triggers_path()) == []


def test_shipped_lexicon_covers_every_category() -> None:
    rows, _ = parse_triggers(default_triggers_path())
    assert {r.category for r in rows} == set(AXIS_OF) | set(CONTROL_CATEGORIES)


def test_shipped_lexicon_has_the_contract_wording() -> None:
    # the typical wording of each grade in the label contract (LABELS.md) is in the file
    rows, _ = parse_triggers(default_triggers_path())
    grade = {r.phrase: r.category for r in rows if r.axis == "certainty"}
    for phrase, category in [
        ("consistent with", "likely"),
        ("compatible with", "likely"),
        ("favor", "likely"),
        ("most likely", "likely"),
        ("suspicious for", "uncertain"),
        ("cannot exclude", "uncertain"),
        ("possible", "uncertain"),
        ("?", "uncertain"),
        ("cannot rule out", "uncertain"),
        ("unlikely", "unlikely"),
        ("not favored", "unlikely"),
        ("doubt", "unlikely"),
        ("negative for", "absent"),
        ("no", "absent"),
        ("without", "absent"),
        ("free of", "absent"),
        ("absent", "absent"),
    ]:
        assert grade.get(phrase) == category, phrase


@pytest.mark.parametrize(
    ("body", "line", "message"),
    [
        ("no\tabsent\tforward\t-\nnever\tnegated\tforward\t-\n", 3, "unknown category 'negated'"),
        ("no\tabsent\tforwards\t-\n", 2, "bad direction 'forwards'"),
        ("no\tabsent\t-\t-\n", 2, "bad direction '-'"),
        ("no\tabsent\tforward\tfive\n", 2, "bad scope 'five'"),
        ("no\tabsent\tforward\t-\nNo\tabsent\tforward\t3\n", 3, "duplicate trigger 'No'"),
        ("no\tabsent\tforward\t-\nno\tlikely\tforward\t-\n", 3, "conflicting trigger 'no'"),
        ("no absent forward -\n", 2, "expected 2 to 5 tab-separated columns"),
        ("no\tabsent\tforward\t-\t*\tx\n", 2, "expected 2 to 5 tab-separated columns"),
        ("but\tterminate\t-\t-\tnegation\n", 2, "bad applies 'negation'"),
        ("no change\tpseudo\tforward\t-\n", 2, "pseudo rows take no direction or scope"),
        ("no\tabsent\tforward\t-\t*\n", 2, "only for terminate rows"),
        ("no\tabsent\tforward\t-\n\tabsent\tforward\t-\n", 3, "empty trigger phrase"),
        ("e. g.\tabbreviation\t-\t-\n", 2, "abbreviation must be one word"),
    ],
)
def test_broken_lexicon(tmp_path: Path, body: str, line: int, message: str) -> None:
    path = write(tmp_path, body)
    problems = check_triggers(path)
    assert problems, "the broken file should not check clean"
    assert any(p.startswith(f"{path}:{line}: ") and message in p for p in problems), problems
    with pytest.raises(VocabError) as info:
        AssertionEngine.load(path)
    err = info.value
    assert err.path == str(path)
    assert err.line == int(problems[0].split(":")[1])
    assert str(path) in str(err) and f":{err.line}:" in str(err)


def test_every_problem_is_reported(tmp_path: Path) -> None:
    path = write(tmp_path, "no\tabsent\tsideways\t-\nnone\tnegated\tboth\t1\nok\tlikely\tboth\t2\n")
    problems = check_triggers(path)
    assert [p.split(":")[1] for p in problems] == ["2", "3"]
    with pytest.raises(VocabError, match=r"and 1 more; run `pathsieve vocab check`"):
        AssertionEngine.load(path)


def test_missing_lexicon(tmp_path: Path) -> None:
    missing = tmp_path / "nowhere.tsv"
    with pytest.raises(VocabError, match="not found") as info:
        AssertionEngine.load(missing)
    assert info.value.path == str(missing)
    assert check_triggers(missing)[0].startswith(f"{missing}: cannot read")


def test_lexicon_without_triggers(tmp_path: Path) -> None:
    path = write(tmp_path, "but\tterminate\t-\t-\t*\n")
    assert check_triggers(path) == [f"{path}:1: no assertion triggers in the lexicon"]


def test_a_users_copy_is_used(tmp_path: Path) -> None:
    path = write(tmp_path, GOOD + "nil\tabsent\tforward\t2\n")
    engine = AssertionEngine.load(path)
    text = "Nil significant [malignancy]".replace("[", "").replace("]", "")
    start = text.index("malignancy")
    (a,) = engine.assess(text, [(start, start + len("malignancy"))])
    assert a.certainty == "absent" and a.triggers[0].text == "Nil"
    # the shipped lexicon does not know "nil"
    assert AssertionEngine.load().assess(text, [(start, start + 10)])[0].certainty == "present"


def test_terminate_applies_to_named_categories(tmp_path: Path) -> None:
    body = GOOD + "history of\thistorical\tforward\t-\nnow\tterminate\t-\t-\thistorical\n"
    engine = AssertionEngine.load(write(tmp_path, body))
    text = "history of polyps, now no adenoma"
    s = text.index("adenoma")
    (a,) = engine.assess(text, [(s, s + 7)])
    # "now" cuts the historical scope, not the negation
    assert (a.certainty, a.temporality) == ("absent", "current")


def test_load_is_cached_per_path_and_version(tmp_path: Path) -> None:
    path = write(tmp_path, GOOD)
    first = AssertionEngine.load(path)
    assert AssertionEngine.load(path) is first
    assert AssertionEngine.load() is AssertionEngine.load(default_triggers_path())
    path.write_text(HEADER + GOOD + "without\tabsent\tforward\t-\n", encoding="utf-8")
    second = AssertionEngine.load(path)
    assert second is not first
    assert any(t.phrase == "without" for t in second.triggers)


def test_documented_examples_run() -> None:
    import doctest

    import pathsieve.assertion

    result = doctest.testmod(pathsieve.assertion)
    assert result.attempted >= 5
    assert result.failed == 0
