"""The pathsieve ontology: an OBO 1.4 file parsed with pronto, compiled once.

Parsing an OBO file with pronto takes a while, so the parsed ontology is
compiled into plain records and cached on disk, keyed by the file's content
hash: a second start loads the compiled form and never re-parses.

>>> onto = load_ontology()
>>> onto.is_a(onto.lookup("mucinous adenocarcinoma")[0], onto.lookup("adenocarcinoma")[0])
True
"""

from __future__ import annotations

import pickle
import re
import unicodedata
import warnings
from collections.abc import Iterable, Iterator
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path

from .errors import OntologyError
from .vocab import cache_dir, file_digest, ontology_path

__all__ = [
    "BEHAVIOUR_SUBSETS",
    "Ontology",
    "Synonym",
    "Term",
    "check_ontology",
    "load_ontology",
    "normalize_key",
    "scan_obo",
]

#: ICD-O-3 behaviour digit -> the subset that must be an ancestor-or-self of the coded class.
BEHAVIOUR_SUBSETS: dict[str, str] = {
    "0": "behaviour_benign",
    "1": "behaviour_uncertain",
    "2": "behaviour_in_situ",
    "3": "behaviour_malignant",
}
SHARED_SYNONYM = "PSV:shared_synonym"
_CACHE_VERSION = 3

_SPACE_RE = re.compile(r"[\s\-_‐-―]+")


def normalize_key(text: str) -> str:
    """Normalise a term or synonym for lookup: casefold, NFKC, hyphens -> space.

    >>> normalize_key("High-Grade  Dysplasia")
    'high grade dysplasia'
    """
    text = unicodedata.normalize("NFKC", text).casefold()
    return _SPACE_RE.sub(" ", text).strip()


@dataclass(frozen=True, slots=True)
class Synonym:
    text: str
    scope: str  # EXACT | RELATED | NARROW | BROAD
    type: str = ""  # "ABBREVIATION" or ""


@dataclass(frozen=True, slots=True)
class Term:
    id: str
    label: str
    parents: tuple[str, ...] = ()
    synonyms: tuple[Synonym, ...] = ()
    xrefs: tuple[str, ...] = ()
    subsets: tuple[str, ...] = ()
    shared: tuple[str, ...] = ()
    definition: str = ""
    line: int = 0

    @property
    def icdo3(self) -> str | None:
        """The ICD-O-3 morphology code ("8140/3"), if the term has one."""
        for x in self.xrefs:
            if x.startswith("ICDO3:"):
                return x[6:]
        return None

    @property
    def behaviour(self) -> str | None:
        code = self.icdo3
        return code.rsplit("/", 1)[1] if code and "/" in code else None


@dataclass
class Ontology:
    """A compiled ontology: terms, ancestors and a normalised surface index."""

    path: str
    digest: str
    terms: dict[str, Term]
    _ancestors: dict[str, frozenset[str]] = field(default_factory=dict, repr=False)
    _index: dict[str, tuple[str, ...]] = field(default_factory=dict, repr=False)
    _children: dict[str, tuple[str, ...]] = field(default_factory=dict, repr=False)

    def __post_init__(self) -> None:
        if not self._ancestors:
            self._ancestors = _closure(self.terms)
        if not self._index:
            index: dict[str, list[str]] = {}
            for text, cid, _kind in self.surface_forms():
                ids = index.setdefault(normalize_key(text), [])
                if cid not in ids:
                    ids.append(cid)
            self._index = {k: tuple(v) for k, v in index.items()}
        if not self._children:
            children: dict[str, list[str]] = {}
            for t in self.terms.values():
                for p in t.parents:
                    children.setdefault(p, []).append(t.id)
            self._children = {k: tuple(v) for k, v in children.items()}

    def __contains__(self, cid: object) -> bool:
        return cid in self.terms

    def __len__(self) -> int:
        return len(self.terms)

    def term(self, cid: str) -> Term:
        try:
            return self.terms[cid]
        except KeyError:
            raise OntologyError(f"unknown concept id {cid!r}", path=self.path) from None

    def label(self, cid: str) -> str:
        return self.term(cid).label

    def ancestors(self, cid: str) -> frozenset[str]:
        """All is_a ancestors of ``cid``, not including itself."""
        return self._ancestors.get(cid, frozenset())

    def is_a(self, cid: str, ancestor: str) -> bool:
        """Reflexive is_a test."""
        return cid == ancestor or ancestor in self._ancestors.get(cid, ())

    def descendants(self, cid: str) -> frozenset[str]:
        """All is_a descendants of ``cid``, not including itself."""
        out: set[str] = set()
        stack = list(self._children.get(cid, ()))
        while stack:
            c = stack.pop()
            if c not in out:
                out.add(c)
                stack.extend(self._children.get(c, ()))
        return frozenset(out)

    def lookup(self, text: str) -> tuple[str, ...]:
        """Concept ids whose name or synonym equals ``text`` after normalisation."""
        return self._index.get(normalize_key(text), ())

    def surface_forms(self) -> Iterator[tuple[str, str, str]]:
        """(surface text, concept id, kind) for every name and synonym.

        kind is one of "name", "exact", "related", "narrow", "broad", "abbreviation".
        """
        for t in self.terms.values():
            yield t.label, t.id, "name"
            for s in t.synonyms:
                kind = "abbreviation" if s.type == "ABBREVIATION" else s.scope.lower()
                yield s.text, t.id, kind


def _closure(terms: dict[str, Term]) -> dict[str, frozenset[str]]:
    memo: dict[str, frozenset[str]] = {}

    def visit(cid: str, trail: frozenset[str]) -> frozenset[str]:
        if cid in memo:
            return memo[cid]
        out: set[str] = set()
        term = terms.get(cid)
        for p in term.parents if term else ():
            if p in trail:  # a cycle; reported by check_ontology, never loops here
                continue
            out.add(p)
            out |= visit(p, trail | {p})
        memo[cid] = frozenset(out)
        return memo[cid]

    for cid in terms:
        visit(cid, frozenset({cid}))
    return memo


# --------------------------------------------------------------------------- scanning

_STANZA_RE = re.compile(r"^\[(\w+)\]\s*$")
_TAG_RE = re.compile(r"^([A-Za-z_][\w-]*):\s?(.*)$")
_SYNONYM_RE = re.compile(
    r'^"((?:[^"\\]|\\.)*)"\s+(\S+)(?:\s+([A-Za-z_][\w:-]*))?\s*\[.*\]\s*(?:\{.*\})?$'
)
_SCOPES = frozenset({"EXACT", "RELATED", "NARROW", "BROAD"})
_KNOWN_STANZAS = frozenset({"Term", "Typedef", "Instance"})


@dataclass
class _Stanza:
    kind: str
    line: int
    tags: list[tuple[str, str, int]] = field(default_factory=list)

    def first(self, tag: str) -> str | None:
        for t, v, _ in self.tags:
            if t == tag:
                return v
        return None

    def all(self, tag: str) -> list[tuple[str, int]]:
        return [(v, ln) for t, v, ln in self.tags if t == tag]


def scan_obo(path: Path) -> tuple[list[_Stanza], list[str]]:
    """A line-level scan of an OBO file: stanzas with line numbers, and syntax problems.

    pronto does the real parse; this scan exists so every problem can name its line.
    """
    problems: list[str] = []
    stanzas: list[_Stanza] = []
    current: _Stanza | None = None
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except (OSError, UnicodeDecodeError) as exc:
        return [], [f"{path}: cannot read ontology file ({exc}); check the path and encoding"]
    for n, raw in enumerate(lines, 1):
        line = raw.strip()
        if not line or line.startswith("!"):
            continue
        m = _STANZA_RE.match(line)
        if m:
            if m.group(1) not in _KNOWN_STANZAS:
                problems.append(
                    f"{path}:{n}: bad stanza [{m.group(1)}]; use [Term], [Typedef] or [Instance]"
                )
            current = _Stanza(m.group(1), n)
            stanzas.append(current)
            continue
        if line.startswith("["):
            problems.append(f"{path}:{n}: bad stanza header {line!r}; write e.g. [Term]")
            continue
        m = _TAG_RE.match(line)
        if not m:
            problems.append(f"{path}:{n}: not a 'tag: value' line: {line[:60]!r}")
            continue
        tag, value = m.group(1), _strip_comment(m.group(2))
        if current is None:
            continue  # header tags
        current.tags.append((tag, value, n))
        if tag == "synonym" and current.kind == "Term":
            sm = _SYNONYM_RE.match(value)
            if not sm:
                problems.append(
                    f'{path}:{n}: malformed synonym; write synonym: "text" EXACT [] '
                    "(scope EXACT, RELATED, NARROW or BROAD)"
                )
            elif sm.group(2) not in _SCOPES:
                problems.append(
                    f"{path}:{n}: invalid synonym scope: {sm.group(2)} "
                    "(use EXACT, RELATED, NARROW or BROAD)"
                )
    for st in stanzas:
        if st.first("id") is None:
            problems.append(f"{path}:{st.line}: [{st.kind}] stanza has no id")
    return stanzas, problems


def _strip_comment(value: str) -> str:
    # "PSV:0000010 ! neoplasm" -> "PSV:0000010"; quoted text may contain '!'
    if "!" in value and not value.startswith('"'):
        value = value.split(" !", 1)[0]
    return value.strip()


def _terms_from_scan(path: Path, stanzas: list[_Stanza]) -> dict[str, Term]:
    terms: dict[str, Term] = {}
    for st in stanzas:
        if st.kind != "Term":
            continue
        cid = st.first("id")
        if cid is None:
            continue
        syns = []
        for value, _ in st.all("synonym"):
            sm = _SYNONYM_RE.match(value)
            if sm and sm.group(2) in _SCOPES:
                syns.append(
                    Synonym(sm.group(1).replace('\\"', '"'), sm.group(2), sm.group(3) or "")
                )
        shared = []
        for value, _ in st.all("property_value"):
            pm = re.match(r'^(\S+)\s+"((?:[^"\\]|\\.)*)"', value)
            if pm and pm.group(1) == SHARED_SYNONYM:
                shared.append(pm.group(2))
        definition = st.first("def") or ""
        dm = re.match(r'^"((?:[^"\\]|\\.)*)"', definition)
        terms[cid] = Term(
            id=cid,
            label=st.first("name") or cid,
            parents=tuple(v.split()[0] for v, _ in st.all("is_a") if v),
            synonyms=tuple(syns),
            xrefs=tuple(v.split()[0] for v, _ in st.all("xref") if v),
            subsets=tuple(v for v, _ in st.all("subset")),
            shared=tuple(shared),
            definition=dm.group(1) if dm else "",
            line=st.line,
        )
    return terms


def _pronto_parse(path: Path) -> dict[str, Term]:
    """Parse with pronto (the reference OBO reader) and return compiled terms."""
    import pronto

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            onto = pronto.Ontology(str(path))
        except Exception as exc:  # pronto raises many kinds; all mean "does not parse"
            raise OntologyError(
                f"pronto could not parse the ontology: {exc}; fix the OBO syntax", path=path
            ) from exc
    stanzas, _ = scan_obo(path)
    lines = {st.first("id"): st.line for st in stanzas if st.kind == "Term"}
    terms: dict[str, Term] = {}
    for t in onto.terms():
        parents = tuple(sorted(p.id for p in t.superclasses(distance=1, with_self=False)))
        syns = tuple(
            Synonym(s.description, s.scope or "RELATED", s.type.id if s.type else "")
            for s in sorted(t.synonyms, key=lambda s: (s.description, s.scope or ""))
        )
        shared = tuple(
            sorted(
                a.literal
                for a in t.annotations
                if a.property == SHARED_SYNONYM and hasattr(a, "literal")
            )
        )
        terms[t.id] = Term(
            id=t.id,
            label=t.name or t.id,
            parents=parents,
            synonyms=syns,
            xrefs=tuple(sorted(x.id for x in t.xrefs)),
            subsets=tuple(sorted(t.subsets)),
            shared=shared,
            definition=str(t.definition or ""),
            line=lines.get(t.id, 0),
        )
    return terms


# --------------------------------------------------------------------------- loading


@lru_cache(maxsize=8)
def _load_cached(path_str: str, digest: str) -> Ontology:
    path = Path(path_str)
    cache_file = cache_dir() / f"ontology-v{_CACHE_VERSION}-{digest}.pickle"
    if cache_file.exists():
        try:
            with cache_file.open("rb") as fh:
                state = pickle.load(fh)
            return Ontology(path_str, digest, state["terms"], state["ancestors"], state["index"])
        except Exception:  # a stale or torn cache is rebuilt, never trusted
            pass
    stanzas, problems = scan_obo(path)
    problems = problems or _structure_problems(path, stanzas, _terms_from_scan(path, stanzas))
    if problems:
        raise OntologyError(problems[0].split(": ", 1)[-1], path=path, line=_line_of(problems[0]))
    terms = _pronto_parse(path)
    onto = Ontology(path_str, digest, terms)
    try:
        cache_file.parent.mkdir(parents=True, exist_ok=True)
        tmp = cache_file.with_suffix(f".tmp{id(onto)}")
        with tmp.open("wb") as fh:
            pickle.dump(
                {"terms": terms, "ancestors": onto._ancestors, "index": onto._index},
                fh,
                protocol=pickle.HIGHEST_PROTOCOL,
            )
        tmp.replace(cache_file)
    except OSError:
        pass  # a read-only home still works, only slower on the next start
    return onto


def _line_of(problem: str) -> int | None:
    m = re.match(r"^.*?:(\d+): ", problem)
    return int(m.group(1)) if m else None


def load_ontology(path: str | Path | None = None) -> Ontology:
    """Load (and cache) the ontology at ``path`` (default: the shipped one)."""
    p = Path(path) if path is not None else ontology_path()
    if not p.is_file():
        raise OntologyError("ontology file not found; check the path", path=p)
    return _load_cached(str(p.resolve()), file_digest(p))


# --------------------------------------------------------------------------- checking


def check_ontology(path: str | Path | None = None) -> list[str]:
    """Check an OBO file; return problems as "file:line: message" (empty when sound).

    Checks: syntax (stanzas, synonym scopes), that pronto parses it, duplicate ids,
    dangling and cyclic is_a, synonyms shared by two concepts unless both declare
    ``PSV:shared_synonym``, and that ICD-O-3 behaviour digits agree with the
    hierarchy (/3 only below a ``behaviour_malignant`` class, and so on).
    """
    p = Path(path) if path is not None else ontology_path()
    if not p.is_file():
        return [f"{p}: ontology file not found; check the path"]
    stanzas, problems = scan_obo(p)
    if problems:
        return problems
    terms = _terms_from_scan(p, stanzas)
    problems = _structure_problems(p, stanzas, terms)
    if problems:
        return problems  # pronto cannot be asked about a file with dangling or cyclic is_a
    try:
        _pronto_parse(p)
    except OntologyError as exc:
        return [str(exc)]
    problems += _synonym_problems(p, terms, stanzas)
    problems += _behaviour_problems(p, terms, stanzas)
    return problems


def _structure_problems(path: Path, stanzas: list[_Stanza], terms: dict[str, Term]) -> list[str]:
    problems: list[str] = []
    seen: dict[str, int] = {}
    for st in stanzas:
        cid = st.first("id")
        if st.kind != "Term" or cid is None:
            continue
        if cid in seen:
            problems.append(f"{path}:{st.line}: duplicate id {cid} (first at line {seen[cid]})")
        seen[cid] = st.line
        for parent, ln in st.all("is_a"):
            if parent.split()[0] not in terms:
                problems.append(
                    f"{path}:{ln}: {cid} is_a {parent.split()[0]}, which is not defined; "
                    "add the parent term or fix the id"
                )
    return problems + _cycle_problems(path, terms)


def _cycle_problems(path: Path, terms: dict[str, Term]) -> list[str]:
    problems = []
    colour: dict[str, int] = {}

    def dfs(cid: str, stack: list[str]) -> None:
        colour[cid] = 1
        for parent in terms[cid].parents:
            if parent not in terms:
                continue
            if colour.get(parent) == 1:
                cycle = [*stack[stack.index(parent) :], parent] if parent in stack else [parent]
                problems.append(
                    f"{path}:{terms[cid].line}: is_a cycle {' -> '.join(cycle)}; "
                    "remove one of these is_a lines"
                )
            elif colour.get(parent, 0) == 0:
                dfs(parent, [*stack, parent])
        colour[cid] = 2

    for cid in sorted(terms):
        if colour.get(cid, 0) == 0:
            dfs(cid, [cid])
    return problems


def _synonym_problems(path: Path, terms: dict[str, Term], stanzas: list[_Stanza]) -> list[str]:
    lines: dict[tuple[str, str], int] = {}
    for st in stanzas:
        cid = st.first("id")
        for value, ln in st.all("synonym"):
            sm = _SYNONYM_RE.match(value)
            if cid and sm:
                lines[(cid, normalize_key(sm.group(1)))] = ln
    owners: dict[str, list[str]] = {}
    for t in terms.values():
        forms = {normalize_key(t.label)} | {normalize_key(s.text) for s in t.synonyms}
        for f in forms:
            owners.setdefault(f, []).append(t.id)
    problems = []
    for form, ids in sorted(owners.items()):
        if len(ids) < 2:
            continue
        undeclared = [c for c in ids if form not in {normalize_key(s) for s in terms[c].shared}]
        if undeclared:
            c = undeclared[0]
            ln = lines.get((c, form), terms[c].line)
            problems.append(
                f"{path}:{ln}: synonym {form!r} belongs to {', '.join(ids)}; keep it on one "
                f'concept or declare it on each with property_value: {SHARED_SYNONYM} "{form}" '
                "xsd:string"
            )
    return problems


def _behaviour_problems(path: Path, terms: dict[str, Term], stanzas: list[_Stanza]) -> list[str]:
    ancestors = _closure(terms)
    xref_lines: dict[str, int] = {}
    for st in stanzas:
        cid = st.first("id")
        for value, ln in st.all("xref"):
            if cid and value.startswith("ICDO3:"):
                xref_lines[cid] = ln
    problems = []
    for t in terms.values():
        code = t.icdo3
        if code is None:
            continue
        if not re.fullmatch(r"\d{4}/[0-369]", code):
            problems.append(
                f"{path}:{xref_lines.get(t.id, t.line)}: ICD-O-3 code {code!r} of {t.id} is not "
                "of the form NNNN/B"
            )
            continue
        behaviour = code[-1]
        anchor = BEHAVIOUR_SUBSETS.get(behaviour)
        if anchor is None:
            continue
        chain: Iterable[str] = [t.id, *ancestors.get(t.id, ())]
        if not any(anchor in terms[c].subsets for c in chain if c in terms):
            problems.append(
                f"{path}:{xref_lines.get(t.id, t.line)}: {t.id} ({t.label}) has ICD-O-3 behaviour "
                f"/{behaviour} but no ancestor in subset {anchor}; move it under such a class "
                "or fix the code"
            )
    return problems
