"""Label schemes: named sets of labels defined by ontology classes.

A scheme is a YAML data file (``ontology/schemes/<name>.yaml``) that maps every
binary label key to ontology classes (descendants included unless excluded),
declares the value labels it emits, a severity order (to pick a primary label)
and implications (e.g. Marsh 3a implies villous atrophy).  Users copy a file,
edit it, and pass its path wherever a scheme name is accepted.

>>> s = load_scheme("prostate")
>>> s.label_keys[0], "gleason_score" in s.value_keys
('adenocarcinoma', True)
"""

from __future__ import annotations

import contextlib
import re
from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from functools import lru_cache
from pathlib import Path
from typing import Any, Literal

import yaml
from pydantic import BaseModel, ConfigDict, Field, ValidationError, model_validator

from .errors import ConfigError, SchemeError
from .ontology import Ontology, load_ontology
from .records import CERTAINTY_SCORE, Value
from .values import VALUE_KEYS
from .vocab import file_digest, schemes_dir

__all__ = [
    "KNOWN_VALUES",
    "Implication",
    "LabelDef",
    "Scheme",
    "category_core",
    "check_scheme",
    "list_schemes",
    "load_scheme",
]

#: Value labels pathsieve can read (the contract of LABELS.md): what the readers emit.
KNOWN_VALUES: tuple[str, ...] = VALUE_KEYS


class _LabelModel(BaseModel):
    model_config = ConfigDict(extra="forbid")
    description: str = ""
    classes: list[str] = Field(min_length=1)
    exclude: list[str] = Field(default_factory=list)


class _When(BaseModel):
    model_config = ConfigDict(extra="forbid", populate_by_name=True)
    concept: str | None = None
    value: str | None = None
    in_: list[str] | None = Field(default=None, alias="in")
    site: str | None = None

    @model_validator(mode="after")
    def _one_kind(self) -> _When:
        if (self.concept is None) == (self.value is None):
            raise ValueError("'when' needs exactly one of 'concept' or 'value'")
        if self.value is not None and not self.in_:
            raise ValueError("'when: {value: ...}' needs an 'in' list")
        if self.site is not None and self.concept is None:
            raise ValueError("'when: {site: ...}' goes with 'concept'")
        return self


class _Then(BaseModel):
    model_config = ConfigDict(extra="forbid")
    label: str
    state: Literal["present", "likely", "uncertain", "unlikely", "absent"]


class _ImplicationModel(BaseModel):
    model_config = ConfigDict(extra="forbid")
    when: _When
    unless: list[str] = Field(default_factory=list)
    then: _Then


class _SchemeModel(BaseModel):
    model_config = ConfigDict(extra="forbid")
    scheme: str
    title: str = ""
    source: str = ""
    organ: str = ""
    labels: dict[str, _LabelModel] = Field(min_length=1)
    values: list[str] = Field(default_factory=list)
    severity: list[str] = Field(default_factory=list)
    implications: list[_ImplicationModel] = Field(default_factory=list)
    categories: dict[str, list[str]] = Field(default_factory=dict)


#: A T/N/M category's core, between its prefix ("yp") and its suffixes ("(m)", "(sn)").
_CATEGORY = re.compile(
    r"^(?P<pre>[a-z]*)(?P<core>(?P<main>[TNM](?:is|X|\d))(?:mi|[a-d]\d?)?)(?P<suf>.*)$"
)
_STAGING_KEYS = {"pt": "T", "pn": "N", "pm": "M"}


def category_core(value: str) -> tuple[str, str] | None:
    """The core of a staging value and its bare category, or None if unreadable.

    >>> category_core("ypT2a(m)"), category_core("pN0(i+)"), category_core("cM0")
    (('T2a', 'T2'), ('N0', 'N0'), ('M0', 'M0'))
    >>> category_core("pT1b2"), category_core("pT1mi"), category_core("3+4=7")
    (('T1b2', 'T1'), ('T1mi', 'T1'), None)
    """
    m = _CATEGORY.match(str(value))
    return (m["core"], m["main"]) if m else None


@dataclass(frozen=True, slots=True)
class LabelDef:
    key: str
    description: str
    classes: tuple[str, ...]
    exclude: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class Implication:
    """``when`` a concept (or a value in a set) is found in a part, ``then`` set a label."""

    then_label: str
    then_state: str
    concept: str | None = None
    value_key: str | None = None
    value_in: tuple[str, ...] = ()
    unless: tuple[str, ...] = ()
    #: the concept counts only in a part that also names this site (or a narrower one)
    site: str | None = None


@dataclass
class Scheme:
    """A loaded, checked scheme bound to an ontology."""

    name: str
    title: str
    source: str
    organ: str
    labels: dict[str, LabelDef]
    value_keys: tuple[str, ...]
    severity: tuple[str, ...]
    implications: tuple[Implication, ...]
    path: str
    ontology: Ontology = field(repr=False)
    #: the T/N/M categories the organ's staging system has, per value key ("pt": {"T2a", ...});
    #: a key not listed here is not checked
    categories: dict[str, frozenset[str]] = field(default_factory=dict)
    _memo: dict[str, tuple[str, ...]] = field(default_factory=dict, repr=False)

    @property
    def label_keys(self) -> tuple[str, ...]:
        return tuple(self.labels)

    def labels_for(self, concept_id: str) -> tuple[str, ...]:
        """The label keys a mention of ``concept_id`` counts for (ontology roll-up)."""
        hit = self._memo.get(concept_id)
        if hit is not None:
            return hit
        lineage = {concept_id} | self.ontology.ancestors(concept_id)
        keys = tuple(
            key
            for key, d in self.labels.items()
            if lineage.intersection(d.classes) and not lineage.intersection(d.exclude)
        )
        self._memo[concept_id] = keys
        return keys

    def fit_category(self, v: Value) -> Value | None:
        """``v`` as this organ's staging system has it, or None where it has no such category.

        A category the organ's system lacks is refused ("pT1c" for a prostatectomy:
        there is no pathological T1 there); a subcategory it lacks, of a category it
        has, is read as that category ("pT3b" for a colon, a subdivision some
        laboratories use, is the AJCC pT3), flagged ``subcategory_not_in_scheme``.
        Values of keys the scheme lists no categories for pass unchanged.
        """
        allowed = self.categories.get(v.key)
        if not allowed:
            return v
        m = _CATEGORY.match(str(v.value))
        if m is None or m["core"] in allowed:
            return v
        if m["main"] in allowed:
            return replace(
                v,
                value=f"{m['pre']}{m['main']}{m['suf']}",
                flags=(*v.flags, "subcategory_not_in_scheme"),
            )
        return None

    def primary(self, positive: Sequence[str]) -> str:
        """The most severe of ``positive`` label keys by the scheme's order ("" if none)."""
        pos = set(positive)
        for key in self.severity:
            if key in pos:
                return key
        return ""


def list_schemes() -> list[str]:
    """Names of the shipped schemes."""
    return sorted(p.stem for p in schemes_dir().glob("*.yaml"))


def _resolve(name_or_path: str | Path) -> Path:
    p = Path(name_or_path)
    if p.suffix in {".yaml", ".yml"} or p.exists():
        if not p.is_file():
            raise ConfigError(f"scheme file not found: {p}; check the path")
        return p
    shipped = schemes_dir() / f"{name_or_path}.yaml"
    if shipped.is_file():
        return shipped
    known = ", ".join(list_schemes()) or "none"
    raise ConfigError(
        f"unknown scheme {str(name_or_path)!r}; known schemes: {known} (or pass a YAML path)"
    )


def _yaml_lines(text: str) -> dict[tuple[str, ...], int]:
    """Map key paths of a YAML mapping to 1-based line numbers, for error messages."""
    out: dict[tuple[str, ...], int] = {}

    def walk(node: Any, trail: tuple[str, ...]) -> None:
        if isinstance(node, yaml.MappingNode):
            for k, v in node.value:
                key = (*trail, str(k.value))
                out[key] = k.start_mark.line + 1
                walk(v, key)
        elif isinstance(node, yaml.SequenceNode):
            for i, v in enumerate(node.value):
                key = (*trail, str(i))
                out[key] = v.start_mark.line + 1
                walk(v, key)

    with contextlib.suppress(yaml.YAMLError):
        walk(yaml.compose(text), ())
    return out


def _line_for(lines: dict[tuple[str, ...], int], loc: Sequence[Any]) -> int | None:
    trail = tuple(str(x) for x in loc)
    while trail:
        if trail in lines:
            return lines[trail]
        trail = trail[:-1]
    return None


def _parse(path: Path) -> tuple[_SchemeModel, dict[tuple[str, ...], int]]:
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise SchemeError(f"cannot read scheme file ({exc})", path=path) from exc
    try:
        raw = yaml.safe_load(text)
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        raise SchemeError(
            f"not valid YAML: {getattr(exc, 'problem', exc)}",
            path=path,
            line=mark.line + 1 if mark else None,
        ) from exc
    lines = _yaml_lines(text)
    try:
        model = _SchemeModel.model_validate(raw)
    except ValidationError as exc:
        err = exc.errors()[0]
        loc = ".".join(str(x) for x in err["loc"])
        raise SchemeError(
            f"{loc}: {err['msg']}; see ontology/schemes/colorectal.yaml for the format",
            path=path,
            line=_line_for(lines, err["loc"]),
        ) from exc
    return model, lines


def _problems(
    path: Path, model: _SchemeModel, lines: dict[tuple[str, ...], int], onto: Ontology
) -> list[str]:
    problems: list[str] = []

    def at(*loc: Any) -> str:
        ln = _line_for(lines, loc)
        return f"{path}:{ln}" if ln else str(path)

    for key, d in model.labels.items():
        for group in ("classes", "exclude"):
            for i, cid in enumerate(getattr(d, group)):
                if cid not in onto:
                    problems.append(
                        f"{at('labels', key, group, i)}: label {key!r} names class {cid}, which "
                        "is not in the ontology; fix the id or add the term"
                    )
    for i, v in enumerate(model.values):
        if v not in KNOWN_VALUES:
            problems.append(
                f"{at('values', i)}: unknown value label {v!r}; known: {', '.join(KNOWN_VALUES)}"
            )
    keys = set(model.labels)
    for i, k in enumerate(model.severity):
        if k not in keys:
            problems.append(f"{at('severity', i)}: severity names unknown label {k!r}")
    missing = [k for k in model.labels if k not in model.severity]
    if model.severity and missing:
        problems.append(f"{at('severity')}: severity does not list {', '.join(missing)}")
    for i, imp in enumerate(model.implications):
        if imp.then.label not in keys:
            problems.append(
                f"{at('implications', i, 'then')}: implication sets unknown label {imp.then.label!r}"
            )
        for u in imp.unless:
            if u not in keys:
                problems.append(f"{at('implications', i, 'unless')}: unknown label {u!r}")
        if imp.when.concept is not None and imp.when.concept not in onto:
            problems.append(
                f"{at('implications', i, 'when')}: class {imp.when.concept} is not in the ontology"
            )
        if imp.when.site is not None and imp.when.site not in onto:
            problems.append(
                f"{at('implications', i, 'when')}: site {imp.when.site} is not in the ontology"
            )
        if imp.when.value is not None and imp.when.value not in model.values:
            problems.append(
                f"{at('implications', i, 'when')}: value {imp.when.value!r} is not among this "
                "scheme's values"
            )
    for key, cats in model.categories.items():
        letter = _STAGING_KEYS.get(key)
        if letter is None:
            problems.append(
                f"{at('categories', key)}: categories are for pt, pn and pm, not {key!r}"
            )
            continue
        if key not in model.values:
            problems.append(f"{at('categories', key)}: {key!r} is not among this scheme's values")
        seen: set[str] = set()
        for i, cat in enumerate(cats):
            core = category_core(cat)
            if core is None or core[0] != cat or not cat.startswith(letter):
                problems.append(
                    f"{at('categories', key, i)}: {cat!r} is not a bare {letter} category "
                    f"(write it as {letter}2a, {letter}X, {letter}is: no prefix, no suffix)"
                )
            elif cat in seen:
                problems.append(f"{at('categories', key, i)}: {cat!r} is listed twice")
            seen.add(cat)
    return problems


def check_scheme(name_or_path: str | Path, ontology: Ontology | None = None) -> list[str]:
    """Check a scheme file; return "file:line: message" problems (empty when sound)."""
    try:
        path = _resolve(name_or_path)
        model, lines = _parse(path)
    except (SchemeError, ConfigError) as exc:
        return [str(exc)]
    return _problems(path, model, lines, ontology or load_ontology())


def load_scheme(name_or_path: str | Path, ontology: Ontology | None = None) -> Scheme:
    """Load a shipped scheme by name, or a user's scheme file by path."""
    path = _resolve(name_or_path)
    onto = ontology or load_ontology()
    return _load(str(path.resolve()), file_digest(path), onto.path, onto.digest)


@lru_cache(maxsize=32)
def _load(path_str: str, digest: str, onto_path: str, onto_digest: str) -> Scheme:
    path = Path(path_str)
    onto = load_ontology(onto_path)
    model, lines = _parse(path)
    problems = _problems(path, model, lines, onto)
    if problems:
        first = problems[0]
        message = first.split(": ", 1)[1] if ": " in first else first
        raise SchemeError(message, path=path, line=_problem_line(first))
    labels = {
        k: LabelDef(k, d.description, tuple(d.classes), tuple(d.exclude))
        for k, d in model.labels.items()
    }
    implications = tuple(
        Implication(
            then_label=i.then.label,
            then_state=i.then.state,
            concept=i.when.concept,
            value_key=i.when.value,
            value_in=tuple(str(v) for v in (i.when.in_ or ())),
            unless=tuple(i.unless),
            site=i.when.site,
        )
        for i in model.implications
    )
    assert all(i.then_state in CERTAINTY_SCORE for i in implications)
    return Scheme(
        name=model.scheme,
        title=model.title,
        source=model.source,
        organ=model.organ,
        labels=labels,
        value_keys=tuple(model.values),
        severity=tuple(model.severity or model.labels),
        implications=implications,
        path=path_str,
        ontology=onto,
        categories={k: frozenset(v) for k, v in model.categories.items()},
    )


def _problem_line(problem: str) -> int | None:
    head = problem.split(": ", 1)[0]
    tail = head.rsplit(":", 1)
    return int(tail[1]) if len(tail) == 2 and tail[1].isdigit() else None
