"""One check over every vocabulary data file.

``pathsieve vocab check`` (and :func:`check_vocab`) validates the ontology, every
scheme and every lexicon (abbreviations, assertion triggers, section headers,
value words); each problem names its file and line.
"""

from __future__ import annotations

import importlib
from collections.abc import Callable
from pathlib import Path

from .ontology import check_ontology, load_ontology
from .schemes import check_scheme
from .vocab import lexicon_path, ontology_path, schemes_dir

__all__ = ["LEXICON_CHECKS", "check_vocab"]

#: (lexicon file name, module, checker function name); a checker takes the path and
#: returns "file:line: message" problems.
LEXICON_CHECKS: tuple[tuple[str, str, str], ...] = (
    ("section_headers.yaml", "sections", "check_headers"),
    ("triggers.tsv", "assertion", "check_triggers"),
    ("values.yaml", "values.lexicon", "check_value_lexicon"),
    ("abbreviations.tsv", "abbreviations", "check_abbreviations"),
    ("common_words.txt", "matcher", "check_common_words"),
)


def check_vocab() -> list[str]:
    """Check all vocabulary files; return problems (empty when everything is sound)."""
    problems = check_ontology(ontology_path())
    if problems:
        return problems  # schemes and lexicons are checked against a sound ontology only
    onto = load_ontology()
    for scheme in sorted(Path(schemes_dir()).glob("*.yaml")):
        problems += check_scheme(scheme, onto)
    for filename, module_name, func_name in LEXICON_CHECKS:
        module = importlib.import_module(f"pathsieve.{module_name}")
        checker: Callable[..., list[str]] = getattr(module, func_name)
        problems += checker(lexicon_path(filename))
    return problems
