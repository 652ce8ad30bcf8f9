"""One check over every vocabulary data file.

``pathsieve vocab check`` (and :func:`check_vocab`) validates the whole
vocabulary folder (``ontology/`` in the source tree, ``PATHSIEVE_VOCAB`` or
``--vocab`` elsewhere):

* ``pathsieve.obo`` - syntax, pronto parse, ids, is_a, synonyms, ICD-O-3
  behaviour (:func:`pathsieve.ontology.check_ontology`), plus: every term has
  a name, and no term is isolated (neither is_a nor children);
* ``schemes/*.yaml`` - each scheme (:func:`pathsieve.schemes.check_scheme`),
  plus: the ``scheme:`` name equals the file name, label keys are column-safe
  identifiers, no YAML key is written twice;
* ``lexicon/abbreviations.tsv`` - rows, concept ids, contexts, plus: every
  ABBREVIATION synonym of the ontology has a row for its concept (the rule
  the file states: the dictionary is the authority on every short form it
  lists, so a synonym whose short form it gives other senses only would be
  silently ignored by the matcher);
* ``lexicon/triggers.tsv``, ``lexicon/section_headers.yaml`` (no YAML key
  written twice either), ``lexicon/values.yaml`` and
  ``lexicon/common_words.txt`` - each by its own checker.

Every problem is one ``"file:line: message"`` string (``"file: message"``
when no line applies, e.g. a missing file).  The lexicons that do not depend
on the ontology are checked even when the ontology is broken; schemes and
abbreviations wait until it is sound.

>>> check_vocab()
[]
"""

from __future__ import annotations

import importlib
import re
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import yaml

from .ontology import Ontology, check_ontology, load_ontology, scan_obo
from .records import SECTION_KINDS
from .schemes import KNOWN_VALUES, check_scheme
from .vocab import file_digest, vocab_dir

__all__ = [
    "ABBREVIATIONS_FILE",
    "LEXICON_CHECKS",
    "RESERVED_COLUMNS",
    "VocabReport",
    "check_vocab",
    "vocab_report",
]

#: (lexicon file name, module, checker function name); a checker takes the path and
#: returns "file:line: message" problems.
LEXICON_CHECKS: tuple[tuple[str, str, str], ...] = (
    ("section_headers.yaml", "sections", "check_headers"),
    ("triggers.tsv", "assertion", "check_triggers"),
    ("values.yaml", "values.lexicon", "check_value_lexicon"),
    ("common_words.txt", "matcher", "check_common_words"),
)
#: Checked apart from LEXICON_CHECKS: against the ontology and the scheme names.
ABBREVIATIONS_FILE = "abbreviations.tsv"

#: Columns every label table has besides the label and value keys (the export
#: contract); a label key spelled like one of them would overwrite it.
RESERVED_COLUMNS: tuple[str, ...] = ("case_id", "part", "status", "error", "primary_label", "flags")
_LABEL_KEY_RE = re.compile(r"[a-z][a-z0-9_]*\Z")
# libyaml's parser where PyYAML was built with it (line marks are the same)
_YAML_LOADER: Any = getattr(yaml, "CSafeLoader", yaml.SafeLoader)
_SYNONYM_TEXT_RE = re.compile(r'^"((?:[^"\\]|\\.)*)"\s+\S+\s+ABBREVIATION\b')


@dataclass
class VocabReport:
    """What :func:`vocab_report` found: problems, and what was checked."""

    folder: Path
    problems: list[str] = field(default_factory=list)
    terms: int = 0
    schemes: list[str] = field(default_factory=list)
    lexicons: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)

    @property
    def ok(self) -> bool:
        return not self.problems

    def summary(self) -> str:
        """One line for the command line.

        ``vocab ok: 695 terms, 6 schemes (breast, ...), 5 lexicons in DIR`` or
        ``vocab check: 2 problem(s) in DIR``.
        """
        if self.problems:
            return f"vocab check: {len(self.problems)} problem(s) in {self.folder}"
        schemes = f"{len(self.schemes)} schemes ({', '.join(self.schemes)})"
        return (
            f"vocab ok: {self.terms} terms, {schemes}, {len(self.lexicons)} lexicons "
            f"in {self.folder}"
        )


def check_vocab(
    vocab: str | Path | None = None, *, schemes: Sequence[str | Path] = ()
) -> list[str]:
    """Check all vocabulary files; return problems (empty when everything is sound).

    ``vocab`` is the vocabulary folder (default: ``PATHSIEVE_VOCAB``, else the
    source tree's ``ontology/``); ``schemes`` are further scheme files (a
    user's copy kept outside the folder) checked against that vocabulary.
    """
    return vocab_report(vocab, schemes=schemes).problems


def vocab_report(
    vocab: str | Path | None = None, *, schemes: Sequence[str | Path] = ()
) -> VocabReport:
    """:func:`check_vocab` with what was checked (terms, schemes, lexicons) for the CLI."""
    root = Path(vocab) if vocab is not None else vocab_dir()
    report = VocabReport(root)
    if not root.is_dir():
        report.problems.append(
            f"{root}: vocabulary folder not found; point PATHSIEVE_VOCAB (or --vocab) at a "
            "copy of the ontology/ folder"
        )
        return report
    obo = root / "pathsieve.obo"
    lexicon = root / "lexicon"
    # schemes and the abbreviation dictionary are checked against a sound ontology only
    onto_problems = _checked_ontology(obo)
    report.problems += onto_problems
    onto: Ontology | None = None
    stanzas: list[Any] = []
    if not onto_problems:
        onto = load_ontology(obo)
        report.terms = len(onto)
        stanzas = scan_obo(obo)[0]
        report.problems += _term_problems(obo, stanzas)

    scheme_files = _scheme_files(root / "schemes", report.problems)
    extra = [Path(s) for s in schemes]
    if onto is not None:
        for path in scheme_files + extra:
            report.problems += check_scheme(path, onto)
            report.problems += _scheme_file_problems(path, in_folder=path in scheme_files)
        report.schemes = [p.stem for p in scheme_files] + [str(p) for p in extra]
        contexts = frozenset(p.stem for p in scheme_files) | frozenset(SECTION_KINDS)
        report.problems += _abbreviation_problems(
            lexicon / ABBREVIATIONS_FILE, obo, stanzas, onto, contexts
        )
        report.lexicons.append(ABBREVIATIONS_FILE)
    else:
        report.notes.append(
            "schemes and abbreviations.tsv are checked once the ontology problems are fixed"
        )

    for filename, module_name, func_name in LEXICON_CHECKS:
        module = importlib.import_module(f"pathsieve.{module_name}")
        checker: Callable[[Path], list[str]] = getattr(module, func_name)
        path = lexicon / filename
        found = checker(path)
        if not found and path.suffix == ".yaml":
            found = _duplicate_keys(path, _compose(path))
        report.problems += found
        report.lexicons.append(filename)
    return report


# --------------------------------------------------------------------------- ontology


def _checked_ontology(path: Path) -> list[str]:
    """check_ontology, skipped for content already found sound in this process.

    A check parses the file with pronto; notebooks and tests check the same
    content again and again.  Only a sound result is remembered (problems name
    the file, and a file can be copied elsewhere).
    """
    if not path.is_file():
        return [f"{path}: ontology file not found; every vocabulary folder needs pathsieve.obo"]
    digest = file_digest(path)
    if digest in _SOUND_ONTOLOGIES:
        return []
    problems = check_ontology(path)
    if not problems:
        _SOUND_ONTOLOGIES.add(digest)
    return problems


_SOUND_ONTOLOGIES: set[str] = set()


def _term_problems(path: Path, stanzas: Sequence[Any]) -> list[str]:
    """Terms with no name, and isolated terms (no is_a and no children)."""
    terms = [st for st in stanzas if st.kind == "Term" and st.first("id")]
    parents = {v.split()[0] for st in terms for v, _ in st.all("is_a") if v}
    problems = []
    for st in terms:
        cid = st.first("id")
        line = next((ln for tag, _, ln in st.tags if tag == "id"), st.line)
        if not (st.first("name") or "").strip():
            problems.append(
                f"{path}:{line}: [Term] {cid} has no name; add a 'name: ...' line "
                "(the name is the preferred label and is matched in reports)"
            )
        if not st.all("is_a") and cid not in parents:
            problems.append(
                f"{path}:{line}: [Term] {cid} is isolated (no is_a, no children); add "
                "'is_a: PARENT_ID' so it rolls up into the labels of its parent"
            )
    return problems


# --------------------------------------------------------------------------- schemes


def _scheme_files(folder: Path, problems: list[str]) -> list[Path]:
    if not folder.is_dir():
        problems.append(f"{folder}: schemes folder not found; add at least one scheme file")
        return []
    found = sorted(folder.glob("*.yaml"))
    for other in sorted(folder.glob("*.yml")):
        problems.append(
            f"{other}: scheme files must end in .yaml (this one is never listed); rename it"
        )
    if not found:
        problems.append(f"{folder}: no scheme files (*.yaml); add at least one")
    return found


def _scheme_file_problems(path: Path, *, in_folder: bool) -> list[str]:
    """Checks beyond the scheme loader: file name, label keys, repeated YAML keys."""
    root = _compose(path)
    problems = _duplicate_keys(path, root)
    if not isinstance(root, yaml.MappingNode):
        return problems
    top = {str(k.value): (k, v) for k, v in root.value}
    name = top.get("scheme")
    if in_folder and name is not None and str(name[1].value) != path.stem:
        problems.append(
            f"{path}:{name[1].start_mark.line + 1}: scheme name {name[1].value!r} differs from "
            f"the file name; write 'scheme: {path.stem}' (abbreviation contexts and "
            "--scheme use the file name)"
        )
    labels = top.get("labels")
    if labels is not None and isinstance(labels[1], yaml.MappingNode):
        for knode, _ in labels[1].value:
            key = str(knode.value)
            line = knode.start_mark.line + 1
            if not _LABEL_KEY_RE.match(key):
                problems.append(
                    f"{path}:{line}: label key {key!r} must be lower case letters, digits and "
                    "underscores, starting with a letter (it becomes a column name)"
                )
            elif key in RESERVED_COLUMNS or key in KNOWN_VALUES:
                problems.append(
                    f"{path}:{line}: label key {key!r} is also the name of a fixed or value "
                    "column of the label table; choose another key"
                )
    return problems


def _compose(path: Path) -> yaml.Node | None:
    """The YAML node tree of a file, or None when it does not read or parse.

    The file's own checker reports unreadable and invalid YAML, with its line.
    """
    try:
        return yaml.compose(path.read_text(encoding="utf-8"), Loader=_YAML_LOADER)
    except (OSError, UnicodeDecodeError, yaml.YAMLError):
        return None


def _duplicate_keys(path: Path, root: yaml.Node | None) -> list[str]:
    """A YAML mapping key written twice (the YAML reader would keep only the last)."""
    problems: list[str] = []

    def walk(node: yaml.Node | None, trail: str) -> None:
        if isinstance(node, yaml.MappingNode):
            seen: dict[str, int] = {}
            for knode, vnode in node.value:
                key = str(knode.value)
                line = knode.start_mark.line + 1
                where = f"{trail}.{key}" if trail else key
                if key in seen:
                    problems.append(
                        f"{path}:{line}: key {where!r} written twice (first at line "
                        f"{seen[key]}); merge the two"
                    )
                else:
                    seen[key] = line
                walk(vnode, where)
        elif isinstance(node, yaml.SequenceNode):
            for item in node.value:
                walk(item, trail)

    walk(root, "")
    return problems


# --------------------------------------------------------------------------- abbreviations


def _abbreviation_problems(
    path: Path, obo: Path, stanzas: Sequence[Any], onto: Ontology, contexts: Iterable[str]
) -> list[str]:
    from .abbreviations import AbbreviationDictionary, check_abbreviations

    problems = check_abbreviations(path, onto, known_contexts=frozenset(contexts))
    if problems:
        return problems
    dictionary = AbbreviationDictionary.load(path)
    for st in stanzas:
        cid = st.first("id")
        if st.kind != "Term" or cid is None:
            continue
        for value, line in st.all("synonym"):
            m = _SYNONYM_TEXT_RE.match(value)
            if m is None:
                continue
            short = m.group(1).replace('\\"', '"')
            senses = dictionary.senses_for(short)
            if any(s.concept_id == cid for s in senses):
                continue
            if senses:
                why = (
                    f"{path.name} lists {short!r} only as "
                    + ", ".join(repr(s.expansion) for s in senses)
                    + ", so this synonym is never read"
                )
            else:
                why = f"{path.name} has no row for {short!r}"
            problems.append(
                f"{obo}:{line}: ABBREVIATION synonym {short!r} of {cid}: {why}; add the row "
                f"'{short}<TAB>{onto.label(cid)}<TAB>{cid}<TAB>*<TAB>yes' to {path}"
            )
    return problems
