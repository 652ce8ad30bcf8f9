"""The value vocabulary file (ontology/lexicon/values.yaml) and its checker."""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

from pathsieve.errors import VocabError
from pathsieve.values import check_value_lexicon, extract_values, load_value_lexicon
from pathsieve.values.lexicon import SCHEMA, VALUE_LEXICON_FILE
from pathsieve.vocab import lexicon_path

SHIPPED = lexicon_path(VALUE_LEXICON_FILE)


def test_shipped_lexicon_is_sound() -> None:
    assert check_value_lexicon(SHIPPED) == []


def test_shipped_lexicon_has_every_list_of_the_schema() -> None:
    lex = load_value_lexicon(SHIPPED)
    for family, lists in SCHEMA.items():
        for name in lists:
            assert lex.families[family][name], f"{family}.{name} is empty"


def test_no_python_source_holds_a_vocabulary_list() -> None:
    # vocabulary lives in the data file: no reader spells out a list of words of its own
    src = Path(__file__).resolve().parents[2] / "src" / "pathsieve" / "values"
    # (normalised output values such as "positive" are the contract, not words to match)
    words = re.compile(r"lymph|estrogen|gleason|nottingham|margin|tumou?r|centimet|twenty|invasion")
    for path in src.glob("*.py"):
        if path.name == "lexicon.py":
            continue  # the schema names families and lists ("gleason:"), not words to match
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, (ast.List, ast.Tuple, ast.Set)):
                items = node.elts
            elif isinstance(node, ast.Dict):
                items = [k for k in node.keys if k is not None]
            else:
                continue
            for item in items:
                if isinstance(item, ast.Constant) and isinstance(item.value, str):
                    if "_" in item.value:
                        continue  # identifiers (value keys, flags), not words to match
                    assert not words.search(item.value), (path.name, item.lineno, item.value)


def _write(tmp_path: Path, text: str) -> Path:
    p = tmp_path / "values.yaml"
    p.write_text(text, encoding="utf-8")
    return p


def _shipped_text() -> str:
    return SHIPPED.read_text(encoding="utf-8")


def _line_of(text: str, needle: str) -> int:
    return text[: text.index(needle)].count("\n") + 1


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (
            lambda t: t.replace("  names: [marsh,", "  names: [Marsh,", 1),
            "must be written in lower case",
        ),
        (
            lambda t: t.replace("  names: [marsh,", "  names: [marsh, marsh,", 1),
            "duplicate entry 'marsh'",
        ),
        (lambda t: t.replace("marsh:\n", "marshes:\n", 1), "unknown family 'marshes'"),
        (
            lambda t: t.replace("  kind_words: [type, grade,", "  kind_wordz: [type, grade,", 1),
            "unknown list 'kind_wordz'",
        ),
        (lambda t: t.replace("version: 1", "version: 2", 1), "version must be 1"),
        (lambda t: t.replace("zero: 0, one: 1,", "zero: 0, one: one,", 1), "is not a whole number"),
        (
            lambda t: t.replace('{O: "0", I: "1", l: "1"}', '{O: "0", II: "1", l: "1"}', 1),
            "must be one non-digit character",
        ),
        (lambda t: t.replace("  names: [marsh,", '  names: ["", marsh,', 1), "empty entry"),
    ],
)
def test_broken_lexicon_problems_name_file_and_line(tmp_path: Path, edit, message: str) -> None:  # type: ignore[no-untyped-def]
    original = _shipped_text()
    broken = edit(original)
    assert broken != original
    path = _write(tmp_path, broken)
    problems = check_value_lexicon(path)
    assert problems, "the checker found nothing"
    hit = [p for p in problems if message in p]
    assert hit, problems
    assert re.match(rf"{re.escape(str(path))}:\d+: ", hit[0])
    with pytest.raises(VocabError) as e:
        load_value_lexicon(path)
    assert str(path) in str(e.value) and e.value.line is not None


def test_line_number_points_at_the_bad_entry(tmp_path: Path) -> None:
    broken = _shipped_text().replace("  names: [marsh,", "  names: [Marsh,", 1)
    path = _write(tmp_path, broken)
    (problem,) = check_value_lexicon(path)
    assert problem.startswith(f"{path}:{_line_of(broken, '  names: [Marsh,')}: ")


def test_missing_list_and_missing_family_are_reported(tmp_path: Path) -> None:
    text = _shipped_text()
    start = text.index("\nlvi:\n")
    path = _write(tmp_path, text[:start] + "\n")
    assert any("missing family 'lvi'" in p for p in check_value_lexicon(path))
    text2 = re.sub(r"\n  close: \[close\]", "", text, count=1)
    path2 = _write(tmp_path, text2)
    assert any("missing list 'close'" in p for p in check_value_lexicon(path2))


def test_yaml_syntax_error_names_the_line(tmp_path: Path) -> None:
    path = _write(tmp_path, "version: 1\nmarsh:\n  names: [marsh\n  kind_words: [type]\n")
    (problem,) = check_value_lexicon(path)
    assert "YAML syntax error" in problem
    assert re.match(rf"{re.escape(str(path))}:\d+: ", problem)


def test_duplicate_keys_are_reported(tmp_path: Path) -> None:
    text = _shipped_text().replace("version: 1\n", "version: 1\nversion: 1\n", 1)
    problems = check_value_lexicon(_write(tmp_path, text))
    assert any("duplicate key 'version'" in p for p in problems)


def test_missing_file_is_a_problem_not_a_crash(tmp_path: Path) -> None:
    problems = check_value_lexicon(tmp_path / "nope.yaml")
    assert problems and "cannot read" in problems[0]


def test_yaml_booleans_stay_words() -> None:
    # "no" and "yes" are YAML 1.1 booleans; the loader keeps the words as written
    lex = load_value_lexicon(SHIPPED)
    assert "no" in lex.phrases("margins", "no_words")
    assert "yes" in lex.phrases("margins", "yes_words")


def test_an_edited_lexicon_changes_what_is_read(tmp_path: Path) -> None:
    text = _shipped_text().replace("  close: [close]", "  close: [close, narrow]", 1)
    lex = load_value_lexicon(_write(tmp_path, text))
    sample = "Margins are narrow."
    assert extract_values(sample, [(0, len(sample), "diagnosis", "")]) == []
    (v,) = extract_values(sample, [(0, len(sample), "diagnosis", "")], lexicon=lex)
    assert v.value == "negative" and v.detail["close"] is True
