"""The ontology loader and checker, on tiny real OBO files."""

from __future__ import annotations

import time
from pathlib import Path

import pytest

from pathsieve import ontology as ontology_mod
from pathsieve.errors import OntologyError
from pathsieve.ontology import check_ontology, load_ontology, normalize_key

DATA = Path(__file__).parent / "data"
MINI = DATA / "mini.obo"


@pytest.fixture(autouse=True)
def _private_cache(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("PATHSIEVE_CACHE", str(tmp_path / "cache"))
    ontology_mod._load_cached.cache_clear()


def test_mini_loads_and_rolls_up() -> None:
    onto = load_ontology(MINI)
    assert len(onto) == 7
    muc = onto.lookup("Mucinous Adenocarcinoma")
    assert muc == ("PSV:0000004",)
    assert onto.is_a("PSV:0000004", "PSV:0000003")
    assert onto.is_a("PSV:0000004", "PSV:0000001")
    assert not onto.is_a("PSV:0000003", "PSV:0000004")
    assert onto.lookup("adeno carcinoma") == ("PSV:0000003",)  # hyphen/space variant
    assert set(onto.lookup("cis")) == {"PSV:0000006", "PSV:0000007"}
    assert onto.term("PSV:0000003").icdo3 == "8140/3"
    assert onto.descendants("PSV:0000002") == {"PSV:0000003", "PSV:0000004"}
    kinds = {(t, k) for t, c, k in onto.surface_forms() if c == "PSV:0000003"}
    assert ("adenoca", "abbreviation") in kinds


def test_second_start_uses_the_disk_cache(tmp_path: Path) -> None:
    load_ontology(MINI)
    cached = list((tmp_path / "cache").glob("ontology-*.pickle"))
    assert len(cached) == 1
    ontology_mod._load_cached.cache_clear()
    calls: list[Path] = []
    real = ontology_mod._pronto_parse
    try:
        ontology_mod._pronto_parse = lambda p: calls.append(p) or real(p)  # type: ignore[assignment]
        onto = load_ontology(MINI)
    finally:
        ontology_mod._pronto_parse = real  # type: ignore[assignment]
    assert calls == []  # compiled form reused, pronto not run again
    assert onto.is_a("PSV:0000004", "PSV:0000001")


def test_edited_file_is_reparsed(tmp_path: Path) -> None:
    copy = tmp_path / "o.obo"
    copy.write_text(MINI.read_text())
    assert len(load_ontology(copy)) == 7
    copy.write_text(
        MINI.read_text() + "\n[Term]\nid: PSV:0000099\nname: benign neoplasm\n"
        "is_a: PSV:0000001 ! neoplasm\n"
    )
    assert len(load_ontology(copy)) == 8  # new content hash, new compile


def test_shipped_ontology_checks_clean() -> None:
    t0 = time.perf_counter()
    assert check_ontology() == []
    assert time.perf_counter() - t0 >= 0  # the check itself must not raise


def test_mini_checks_clean() -> None:
    assert check_ontology(MINI) == []


def _broken(tmp_path: Path, old: str, new: str) -> Path:
    text = MINI.read_text()
    assert old in text
    p = tmp_path / "broken.obo"
    p.write_text(text.replace(old, new, 1))
    return p


def _line_of(path: Path, needle: str) -> int:
    for n, line in enumerate(path.read_text().splitlines(), 1):
        if needle in line:
            return n
    raise AssertionError(needle)


@pytest.mark.parametrize(
    ("old", "new", "needle", "expect"),
    [
        ("[Term]\nid: PSV:0000003", "[Trem]\nid: PSV:0000003", "[Trem]", "bad stanza"),
        (
            '"adeno-carcinoma" EXACT',
            '"adeno-carcinoma" SIMILAR',
            "SIMILAR",
            "invalid synonym scope: SIMILAR",
        ),
        (
            "name: neoplasm\n",
            "name: neoplasm\nis_a: PSV:0000004 ! mucinous adenocarcinoma\n",
            "is_a: PSV:0000004",
            "is_a cycle",
        ),
        (
            "is_a: PSV:0000003 ! adenocarcinoma",
            "is_a: PSV:0000333 ! nowhere",
            "PSV:0000333",
            "not defined",
        ),
        (
            'synonym: "colloid carcinoma" EXACT []',
            'synonym: "adenoca" EXACT []',
            '"adenoca" EXACT []',
            "belongs to",
        ),
        (
            "xref: ICDO3:8140/3",
            "xref: ICDO3:8140/2",
            "ICDO3:8140/2\nis_a: PSV:0000002",
            "behaviour /2",
        ),
    ],
    ids=["bad-stanza", "unknown-scope", "cycle", "dangling-parent", "shared-synonym", "behaviour"],
)
def test_broken_ontology_names_file_and_line(
    tmp_path: Path, old: str, new: str, needle: str, expect: str
) -> None:
    p = _broken(tmp_path, old, new)
    problems = check_ontology(p)
    assert problems, "a broken file must fail the check"
    hit = [m for m in problems if expect in m]
    assert hit, problems
    if "\n" not in needle:
        assert any(f"{p}:{_line_of(p, needle)}:" in m for m in hit) or expect in {
            "is_a cycle",
            "belongs to",
        }, hit
    else:
        assert f"{p}:" in hit[0]


def test_cycle_names_a_line(tmp_path: Path) -> None:
    p = _broken(tmp_path, "name: neoplasm\n", "name: neoplasm\nis_a: PSV:0000004 ! x\n")
    problems = [m for m in check_ontology(p) if "cycle" in m]
    assert problems and problems[0].startswith(f"{p}:")


def test_load_refuses_a_syntax_error(tmp_path: Path) -> None:
    p = _broken(tmp_path, "[Term]\nid: PSV:0000003", "[Trem]\nid: PSV:0000003")
    with pytest.raises(OntologyError) as err:
        load_ontology(p)
    assert f"{p}:" in str(err.value) and "bad stanza" in str(err.value)


def test_missing_file() -> None:
    with pytest.raises(OntologyError, match="not found"):
        load_ontology("/nonexistent/x.obo")


def test_normalize_key() -> None:
    assert normalize_key("  Tubulo-Villous\nAdenoma ") == "tubulo villous adenoma"
