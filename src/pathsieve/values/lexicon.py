"""The value-reader vocabulary (``ontology/lexicon/values.yaml``): loading and checking.

The file is a mapping of *families* (``gleason``, ``margins`` ...) to named lists
of phrases or word -> value maps.  Which families and lists exist, and what kind
each list is, is fixed here (:data:`SCHEMA`); the words themselves live only in
the data file.

>>> lex = load_value_lexicon()
>>> "gleason" in lex.phrases("gleason", "names")
True
>>> lex.int_map("numbers", "units")["two"]
2
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any

import yaml

from ..errors import VocabError
from ..vocab import lexicon_path

__all__ = [
    "SCHEMA",
    "VALUE_LEXICON_FILE",
    "ValueLexicon",
    "check_value_lexicon",
    "default_value_lexicon",
    "load_value_lexicon",
]

VALUE_LEXICON_FILE = "values.yaml"

# Kinds of list: "phrases" (lower case, matched case-insensitively), "abbreviations"
# (matched as written), "int_map" (word -> non-negative int), "str_map"
# (phrase -> canonical word), "char_map" (one OCR character -> one digit).
PHRASES = "phrases"
ABBREVIATIONS = "abbreviations"
INT_MAP = "int_map"
STR_MAP = "str_map"
CHAR_MAP = "char_map"


def _lists(*names: str, **kinds: str) -> dict[str, str]:
    out = {n: (ABBREVIATIONS if n.endswith("_abbreviations") else PHRASES) for n in names}
    out.update(kinds)
    return out


#: family -> list name -> kind.  Every family and list is required.
SCHEMA: dict[str, dict[str, str]] = {
    "numbers": _lists(
        "less_than",
        "greater_than",
        units=INT_MAP,
        teens=INT_MAP,
        tens=INT_MAP,
        single=INT_MAP,
        roman=INT_MAP,
    ),
    "units": _lists("cm", "mm", "dimension_separators"),
    "gleason": _lists(
        "names",
        "name_abbreviations",
        "kind_words",
        "total_words",
        "primary",
        "secondary",
        "tertiary",
        "field_words",
        "synoptic_total",
        "unnamed_heads",
        "main_words",
    ),
    "grade_group": _lists("names", "name_abbreviations", "ambiguous_names", "context"),
    "marsh": _lists("names", "kind_words", "filler_words"),
    "nottingham": _lists(
        "names",
        "name_abbreviations",
        "grade_words",
        "score_words",
        "generic_headings",
        "context",
        "bare_grade_words",
        "bare_grade_requires",
        "bare_grade_exclusions",
        "tubules",
        "nuclei",
        "mitoses",
    ),
    "receptors": _lists(
        "er_names",
        "er_abbreviations",
        "pr_names",
        "pr_abbreviations",
        "both_names",
        "both_abbreviations",
        "positive",
        "negative",
        "low_positive",
        "allred",
        "stop_names",
        "detail_lines",
        intensity=STR_MAP,
    ),
    "her2": _lists(
        "names",
        "name_abbreviations",
        "positive",
        "negative",
        "equivocal",
        "ihc_names",
        "ihc_abbreviations",
        "ish_names",
        "ish_abbreviations",
        "amplified",
        "not_amplified",
        "ratio_words",
        "score_words",
        "stop_names",
        "stop_abbreviations",
        "detail_lines",
    ),
    "tnm": _lists(
        "t_headings",
        "table_headings",
        "n_headings",
        "m_headings",
        "stage_headings",
        "clinical_words",
        ocr_digits=CHAR_MAP,
    ),
    "nodes": _lists(
        "node_words",
        "node_abbreviations",
        "positive",
        "examined",
        "negative_findings",
        "negative_after",
        "finding_nouns",
        "negative_adjectives",
        "count_qualifiers",
        "count_heads",
    ),
    "margins": _lists(
        "names",
        "involvement_names",
        "yes_words",
        "no_words",
        "negative",
        "positive",
        "close",
        "finding_nouns",
        "negative_adjectives",
        "positive_adjectives",
        "tumor_nouns",
        "at_margin",
        "negators",
        "closest",
        "distance_words",
    ),
    "size": _lists(
        "headings",
        "field_headings",
        "field_exclusions",
        "tumor_nouns",
        "measure_words",
        "approx_words",
        "after_exclusions",
        "noun_exclusions",
        "gap_stopwords",
        "preceding_exclusions",
    ),
    "lvi": _lists(
        "names",
        "name_abbreviations",
        "partial_names",
        "present",
        "absent",
        "absent_prefixes",
        "present_prefixes",
        "coordinated",
    ),
}

_INT_TAG = "tag:yaml.org,2002:int"


@dataclass(frozen=True, eq=False)
class ValueLexicon:
    """The loaded vocabulary: ``families[family][list]`` is a tuple or a dict."""

    path: str
    families: dict[str, dict[str, Any]] = field(repr=False)

    def phrases(self, family: str, name: str) -> tuple[str, ...]:
        value = self.families[family][name]
        if not isinstance(value, tuple):
            raise TypeError(f"{family}.{name} is a map, not a list")
        return value

    def int_map(self, family: str, name: str) -> dict[str, int]:
        value = self.families[family][name]
        if not isinstance(value, dict):
            raise TypeError(f"{family}.{name} is a list, not a map")
        return value

    def str_map(self, family: str, name: str) -> dict[str, str]:
        value = self.families[family][name]
        if not isinstance(value, dict):
            raise TypeError(f"{family}.{name} is a list, not a map")
        return value


# -- reading with line numbers ---------------------------------------------------------
Problem = tuple[int | None, str]


def _line(node: yaml.Node) -> int:
    return node.start_mark.line + 1


def _mapping_items(
    node: yaml.MappingNode, where: str, problems: list[Problem]
) -> list[tuple[str, yaml.Node, yaml.Node]]:
    """(key, key node, value node) with duplicate and non-scalar keys reported."""
    seen: dict[str, int] = {}
    out: list[tuple[str, yaml.Node, yaml.Node]] = []
    for knode, vnode in node.value:
        if not isinstance(knode, yaml.ScalarNode):
            problems.append((_line(knode), f"{where}: keys must be plain words"))
            continue
        key = str(knode.value)
        if key in seen:
            problems.append(
                (_line(knode), f"{where}: duplicate key {key!r} (first on line {seen[key]})")
            )
            continue
        seen[key] = _line(knode)
        out.append((key, knode, vnode))
    return out


_SPACE_RUN = re.compile(r"\s+")


def _norm(phrase: str) -> str:
    return _SPACE_RUN.sub(" ", phrase.strip())


def _read_list(
    node: yaml.Node, kind: str, where: str, problems: list[Problem]
) -> tuple[str, ...] | None:
    if not isinstance(node, yaml.SequenceNode):
        problems.append((_line(node), f"{where}: expected a list of words, e.g. [a, b]"))
        return None
    out: list[str] = []
    seen: dict[str, int] = {}
    for item in node.value:
        if not isinstance(item, yaml.ScalarNode):
            problems.append((_line(item), f"{where}: each entry must be a word or phrase"))
            continue
        # The raw scalar text is used, so YAML 1.1 booleans ("no", "yes") stay words.
        text = _norm(str(item.value))
        if not text:
            problems.append((_line(item), f"{where}: empty entry; remove it"))
            continue
        if kind == PHRASES and text != text.lower():
            problems.append(
                (
                    _line(item),
                    f"{where}: {text!r} must be written in lower case (matching ignores case)",
                )
            )
        key = text.lower() if kind == PHRASES else text
        if key in seen:
            problems.append(
                (_line(item), f"{where}: duplicate entry {text!r} (first on line {seen[key]})")
            )
            continue
        seen[key] = _line(item)
        out.append(key)
    if not out and not any(p[0] == _line(node) for p in problems):
        problems.append((_line(node), f"{where}: the list is empty; add at least one entry"))
    return tuple(out)


def _read_map(
    node: yaml.Node, kind: str, where: str, problems: list[Problem]
) -> dict[str, Any] | None:
    if not isinstance(node, yaml.MappingNode):
        problems.append((_line(node), f"{where}: expected a mapping, e.g. {{word: value}}"))
        return None
    out: dict[str, Any] = {}
    for key, knode, vnode in _mapping_items(node, where, problems):
        key = _norm(key)
        if not isinstance(vnode, yaml.ScalarNode):
            problems.append((_line(vnode), f"{where}.{key}: the value must be a single scalar"))
            continue
        raw = str(vnode.value).strip()
        if kind == INT_MAP:
            if key != key.lower():
                problems.append((_line(knode), f"{where}: {key!r} must be written in lower case"))
            if vnode.tag != _INT_TAG or not raw.isdigit():
                problems.append(
                    (_line(vnode), f"{where}.{key}: {raw!r} is not a whole number >= 0")
                )
                continue
            out[key.lower()] = int(raw)
        elif kind == STR_MAP:
            if key != key.lower():
                problems.append((_line(knode), f"{where}: {key!r} must be written in lower case"))
            if not raw:
                problems.append((_line(vnode), f"{where}.{key}: empty value"))
                continue
            out[key.lower()] = raw
        else:  # CHAR_MAP
            if len(key) != 1 or key.isdigit():
                problems.append((_line(knode), f"{where}: {key!r} must be one non-digit character"))
                continue
            if len(raw) != 1 or not raw.isdigit():
                problems.append((_line(vnode), f"{where}.{key}: {raw!r} must be one digit"))
                continue
            out[key] = raw
    if not out and not problems:
        problems.append((_line(node), f"{where}: the mapping is empty"))
    return out


def _parse(path: Path) -> tuple[dict[str, dict[str, Any]], list[Problem]]:
    problems: list[Problem] = []
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        return {}, [(None, f"cannot read the value lexicon ({exc.strerror}); check the path")]
    except UnicodeDecodeError as exc:
        return {}, [(None, f"not UTF-8 text ({exc.reason}); save the file as UTF-8")]
    try:
        root = yaml.compose(text)
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line = mark.line + 1 if mark is not None else None
        return {}, [
            (line, f"YAML syntax error: {exc.problem or exc}; fix the indentation or quoting")
        ]
    if root is None or not isinstance(root, yaml.MappingNode):
        line = _line(root) if root is not None else 1
        return {}, [(line, "the file must be a mapping of families (gleason:, margins: ...)")]
    families: dict[str, dict[str, Any]] = {}
    top = _mapping_items(root, "top level", problems)
    present = {k for k, _, _ in top}
    for key, knode, vnode in top:
        if key == "version":
            if not (isinstance(vnode, yaml.ScalarNode) and str(vnode.value).strip() == "1"):
                problems.append((_line(vnode), "version must be 1"))
            continue
        if key not in SCHEMA:
            known = ", ".join(sorted(SCHEMA))
            problems.append((_line(knode), f"unknown family {key!r}; known families: {known}"))
            continue
        if not isinstance(vnode, yaml.MappingNode):
            problems.append((_line(vnode), f"{key}: expected a mapping of list names to lists"))
            continue
        lists: dict[str, Any] = {}
        seen_names = set()
        for name, nknode, lnode in _mapping_items(vnode, key, problems):
            kind = SCHEMA[key].get(name)
            if kind is None:
                known = ", ".join(sorted(SCHEMA[key]))
                problems.append(
                    (_line(nknode), f"{key}: unknown list {name!r}; expected one of: {known}")
                )
                continue
            seen_names.add(name)
            where = f"{key}.{name}"
            if kind in (PHRASES, ABBREVIATIONS):
                value: Any = _read_list(lnode, kind, where, problems)
            else:
                value = _read_map(lnode, kind, where, problems)
            if value is not None:
                lists[name] = value
        for name in sorted(set(SCHEMA[key]) - seen_names):
            problems.append(
                (_line(knode), f"{key}: missing list {name!r}; add it (it may not be empty)")
            )
        families[key] = lists
    if "version" not in present:
        problems.append((1, "missing 'version: 1' at the top level"))
    for fam in sorted(set(SCHEMA) - present):
        problems.append((None, f"missing family {fam!r}; add it with all its lists"))
    return families, problems


def _format(path: Path, problems: list[Problem]) -> list[str]:
    return [
        f"{path}:{line}: {msg}" if line is not None else f"{path}: {msg}" for line, msg in problems
    ]


def check_value_lexicon(path: str | Path) -> list[str]:
    """Problems in a value lexicon as ``"file:line: message"`` strings ([] when sound).

    >>> check_value_lexicon(lexicon_path(VALUE_LEXICON_FILE))
    []
    """
    p = Path(path)
    _, problems = _parse(p)
    return _format(p, problems)


def load_value_lexicon(path: str | Path | None = None) -> ValueLexicon:
    """Load and check a value lexicon; a broken file raises :class:`VocabError` (file:line)."""
    p = Path(path) if path is not None else lexicon_path(VALUE_LEXICON_FILE)
    families, problems = _parse(p)
    if problems:
        line, msg = problems[0]
        more = (
            f" (and {len(problems) - 1} more problem(s); run 'pathsieve vocab check')"
            if len(problems) > 1
            else ""
        )
        raise VocabError(msg + more, path=p, line=line)
    return ValueLexicon(str(p), families)


@lru_cache(maxsize=8)
def _cached(path: str, mtime_ns: int) -> ValueLexicon:
    return load_value_lexicon(path)


def default_value_lexicon() -> ValueLexicon:
    """The shipped lexicon (``PATHSIEVE_VOCAB`` may point elsewhere), loaded once per change."""
    path = lexicon_path(VALUE_LEXICON_FILE)
    try:
        mtime = path.stat().st_mtime_ns
    except OSError as exc:
        raise VocabError(
            f"value lexicon not found ({exc.strerror}); set PATHSIEVE_VOCAB to the ontology folder",
            path=path,
        ) from exc
    return _cached(str(path), mtime)
