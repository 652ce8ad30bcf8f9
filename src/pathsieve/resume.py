"""Resumable, atomic outputs: per-chunk part files and a manifest beside the output.

A night-long ``pathsieve label`` run writes each labelled chunk to its own part
file, ``<output>.parts/000000.csv``, ``000001.csv``... (and the evidence to
``<evidence>.parts/``), each written to a temporary name and renamed when
complete.  After every chunk a small manifest, ``<output>.manifest.json``, is
replaced atomically: it records what the run is (input fingerprint, scheme,
options, pathsieve version) and, per completed chunk, its row counts and the
byte size of its part files.

Only when every chunk is done are the parts joined into ``<output>.partial``,
renamed to ``<output>``, and the parts and manifest removed.  So a run killed at
any moment (``kill -9`` included) leaves either the previous output or the
complete new one, never a table that looks complete but is not; and
``--resume`` continues from the last completed chunk: the same input read
again, the chunks already on disk skipped, the rest labelled and appended.
The joined output is byte for byte the output of an uninterrupted run.

A second run on the same output while one is going is refused (a lock file).

>>> store_paths("labels.csv")
(PosixPath('labels.csv.manifest.json'), PosixPath('labels.csv.parts'))
"""

from __future__ import annotations

import json
import os
import shutil
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pandas as pd

from .errors import ConfigError
from .export import EVIDENCE_PHI_NOTICE
from .io import OUTPUT_SUFFIXES, TableWriter

__all__ = [
    "MANIFEST_FORMAT",
    "ChunkStore",
    "check_output",
    "input_fingerprint",
    "notice_path",
    "store_paths",
]

MANIFEST_FORMAT = "pathsieve-run/1"
_PART = "{:06d}"


def _warn(message: str) -> None:
    print(f"pathsieve: {message}", file=sys.stderr)


def store_paths(output: str | Path) -> tuple[Path, Path]:
    """The manifest and the part folder of ``output``."""
    out = Path(output)
    return out.with_name(out.name + ".manifest.json"), out.with_name(out.name + ".parts")


def notice_path(evidence: str | Path) -> Path:
    """The PHI notice written beside an evidence table that holds report text."""
    ev = Path(evidence)
    return ev.with_name(ev.name + ".PHI.txt")


def check_output(path: str | Path, what: str = "output") -> Path:
    """Refuse an output path that cannot be written, before anything is written."""
    out = Path(path)
    if out.suffix.lower() not in OUTPUT_SUFFIXES:
        raise ConfigError(f"{what} {out} must end in {', '.join(OUTPUT_SUFFIXES)}")
    if out.is_dir():
        raise ConfigError(f"{what} {out} is a folder; name a file")
    parent = out.parent
    if not parent.is_dir():
        raise ConfigError(f"{what} folder {parent} does not exist; create it first")
    if not os.access(parent, os.W_OK):
        raise ConfigError(f"{what} folder {parent} is not writable")
    return out


def input_fingerprint(path: str | Path) -> dict[str, Any]:
    """What identifies an input between a run and its resumption: path, size, mtime."""
    p = Path(path).resolve()
    if p.is_dir():
        files = sorted(f for f in p.iterdir() if f.suffix.lower() == ".txt" and f.is_file())
        stats = [f.stat() for f in files]
        return {
            "path": str(p),
            "files": len(files),
            "size": sum(s.st_size for s in stats),
            "mtime_ns": max((s.st_mtime_ns for s in stats), default=0),
        }
    st = p.stat()
    return {"path": str(p), "size": st.st_size, "mtime_ns": st.st_mtime_ns}


def _write_json(path: Path, data: dict[str, Any]) -> None:
    tmp = path.with_name(path.name + ".partial")
    with open(tmp, "w", encoding="utf-8") as fh:
        json.dump(data, fh, indent=1, sort_keys=True)
        fh.write("\n")
        fh.flush()
        os.fsync(fh.fileno())  # the manifest must never claim a chunk the disk lost
    tmp.replace(path)


class _Lock:
    """An exclusive lock on a file (advisory; on platforms without fcntl, none)."""

    def __init__(self, path: Path) -> None:
        self.path = path
        self._fh: Any = None

    def acquire(self) -> bool:
        try:
            import fcntl
        except ImportError:  # pragma: no cover - not on POSIX
            return True
        self._fh = open(self.path, "a")  # noqa: SIM115
        try:
            fcntl.flock(self._fh, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:
            self._fh.close()
            self._fh = None
            return False
        return True

    def release(self) -> None:
        if self._fh is not None:
            self._fh.close()
            self._fh = None


class ChunkStore:
    """The part files and manifest of one labelling run (see the module docstring).

    ``identity`` is everything that must match for ``resume`` to continue a
    run (input fingerprint, scheme and its digests, options, chunk size);
    ``schema``/``evidence_schema`` fix Parquet column types.  Chunk summaries
    are plain dicts, kept in the manifest so a resumed run reports whole-run
    totals.
    """

    def __init__(
        self,
        output: str | Path,
        evidence: str | Path | None,
        *,
        identity: dict[str, Any],
        resume: bool = False,
        schema: Any = None,
        evidence_schema: Any = None,
        evidence_has_text: bool = True,
        warn: Callable[[str], None] = _warn,
    ) -> None:
        self.output = check_output(output)
        self.evidence = check_output(evidence, "evidence") if evidence is not None else None
        if self.evidence is not None and self.evidence.resolve() == self.output.resolve():
            raise ConfigError("--evidence must name a different file from -o")
        self.identity = identity
        self.schema = schema
        self.evidence_schema = evidence_schema
        self.evidence_has_text = evidence_has_text
        self.manifest, self.parts = store_paths(self.output)
        self.ev_parts = store_paths(self.evidence)[1] if self.evidence is not None else None
        self.chunks: list[dict[str, Any]] = []
        self._lock = _Lock(self.parts / ".lock")
        self._warn = warn
        created: list[Path] = []
        try:
            for d, target in ((self.parts, self.output), (self.ev_parts, self.evidence)):
                if d is not None and not d.is_dir():
                    try:
                        d.mkdir()
                    except OSError as exc:
                        raise ConfigError(
                            f"cannot write {target}: {exc.strerror or exc}; check the path"
                        ) from exc
                    created.append(d)
            if not self._lock.acquire():
                raise ConfigError(
                    f"another pathsieve run is writing {self.output} (lock {self._lock.path}); "
                    "wait for it to finish or choose another output"
                )
            self._open(resume)
        except OSError as exc:
            self._lock.release()
            for d in created:
                shutil.rmtree(d, ignore_errors=True)
            raise ConfigError(
                f"cannot write {self.output}: {exc.strerror or exc}; check the path"
            ) from exc
        except BaseException:
            self._lock.release()
            for d in created:
                shutil.rmtree(d, ignore_errors=True)
            raise

    # ------------------------------------------------------------ starting or resuming

    def _open(self, resume: bool) -> None:
        old = self._read_manifest()
        if resume and old is not None:
            self._check_same_run(old)
            self.chunks = list(old["chunks"])
            self._check_parts()
        else:
            if resume:
                self._warn(f"nothing to resume for {self.output}; starting from the beginning")
            elif old is not None and old.get("chunks"):
                self._warn(
                    f"an interrupted run's {len(old['chunks'])} finished chunk(s) for "
                    f"{self.output} were discarded (pass --resume to continue such a run)"
                )
            self.chunks = []
        self._clear_parts(keep=len(self.chunks))
        self._save()

    def _read_manifest(self) -> dict[str, Any] | None:
        if not self.manifest.exists():
            return None
        try:
            data = json.loads(self.manifest.read_text(encoding="utf-8"))
        except (OSError, ValueError) as exc:
            raise ConfigError(
                f"the run manifest {self.manifest} is unreadable ({exc}); delete it and "
                f"{self.parts} and run again without --resume"
            ) from exc
        if not isinstance(data, dict) or data.get("format") != MANIFEST_FORMAT:
            raise ConfigError(
                f"{self.manifest} is not a pathsieve run manifest; delete it or choose another output"
            )
        return data

    def _check_same_run(self, old: dict[str, Any]) -> None:
        before, now = old.get("identity", {}), self.identity
        changed = sorted(k for k in set(before) | set(now) if before.get(k) != now.get(k))
        if changed:
            raise ConfigError(
                f"--resume: {self.manifest} was written by a different run "
                f"({', '.join(changed)} changed); run again without --resume to start over"
            )

    def _check_parts(self) -> None:
        for i, chunk in enumerate(self.chunks):
            for folder, key in ((self.parts, "label_bytes"), (self.ev_parts, "evidence_bytes")):
                if folder is None:
                    continue
                part = self._part(folder, i)
                if not part.is_file() or part.stat().st_size != chunk[key]:
                    raise ConfigError(
                        f"--resume: part {part} is missing or damaged; "
                        "run again without --resume to start over"
                    )

    def _clear_parts(self, *, keep: int) -> None:
        """Remove part files beyond the ``keep`` completed chunks (and half-written ones)."""
        for folder in (self.parts, self.ev_parts):
            if folder is None:
                continue
            for f in folder.iterdir():
                if f.name == ".lock":
                    continue
                stem = f.name.split(".", 1)[0]
                if not (stem.isdigit() and int(stem) < keep and not f.name.endswith(".partial")):
                    f.unlink()

    def _save(self) -> None:
        _write_json(
            self.manifest,
            {
                "format": MANIFEST_FORMAT,
                "identity": self.identity,
                "output": str(self.output),
                "evidence": str(self.evidence) if self.evidence is not None else None,
                "chunks": self.chunks,
            },
        )

    def _part(self, folder: Path, index: int) -> Path:
        suffix = self.output.suffix if folder == self.parts else self.evidence_suffix
        return folder / (_PART.format(index) + suffix.lower())

    @property
    def evidence_suffix(self) -> str:
        return self.evidence.suffix if self.evidence is not None else ""

    @property
    def done(self) -> int:
        """Chunks already completed (and skipped when resuming)."""
        return len(self.chunks)

    # ------------------------------------------------------------ writing

    def add(
        self, labels: pd.DataFrame, evidence: pd.DataFrame | None, summary: dict[str, Any]
    ) -> None:
        """Write the next chunk's part files, then record it in the manifest."""
        index = len(self.chunks)
        try:
            label_bytes = self._write_part(self.parts, index, labels, self.schema)
            ev_bytes = 0
            if self.ev_parts is not None and evidence is not None:
                ev_bytes = self._write_part(self.ev_parts, index, evidence, self.evidence_schema)
            self.chunks.append({**summary, "label_bytes": label_bytes, "evidence_bytes": ev_bytes})
            self._save()
        except OSError as exc:
            raise ConfigError(f"cannot write {self.output}: {exc.strerror or exc}") from exc

    def _write_part(self, folder: Path, index: int, df: pd.DataFrame, schema: Any) -> int:
        part = self._part(folder, index)
        with TableWriter(part, schema=schema) as writer:
            writer.write(df)
        return part.stat().st_size

    def finish(self, empty_labels: pd.DataFrame, empty_evidence: pd.DataFrame | None) -> None:
        """Join the parts into the outputs (atomically), then remove parts and manifest."""
        try:
            if self.evidence is not None and self.ev_parts is not None:
                notice = notice_path(self.evidence)
                if self.evidence_has_text:
                    notice.write_text(
                        f"{self.evidence.name}: {EVIDENCE_PHI_NOTICE}\n", encoding="utf-8"
                    )
                else:
                    notice.unlink(missing_ok=True)
                self._join(self.ev_parts, self.evidence, empty_evidence, self.evidence_schema)
            self._join(self.parts, self.output, empty_labels, self.schema)
            self.manifest.unlink(missing_ok=True)
            for folder in (self.parts, self.ev_parts):
                if folder is not None:
                    shutil.rmtree(folder, ignore_errors=True)
        except OSError as exc:
            raise ConfigError(f"cannot write {self.output}: {exc.strerror or exc}") from exc
        finally:
            self._lock.release()

    def close(self, *, keep: bool = True) -> None:
        """Stop without finishing: parts and manifest stay for ``--resume``
        (``keep=False``: removed, as if the run had never started)."""
        if not keep:
            self.manifest.unlink(missing_ok=True)
            for folder in (self.parts, self.ev_parts):
                if folder is not None:
                    shutil.rmtree(folder, ignore_errors=True)
        self._lock.release()

    def _join(self, folder: Path, final: Path, empty: pd.DataFrame | None, schema: Any) -> None:
        parts = [self._part(folder, i) for i in range(len(self.chunks))]
        tmp = final.with_name(final.name + ".partial")
        suffix = final.suffix.lower()
        if not parts:
            with TableWriter(final, schema=schema) as writer:
                writer.write(empty if empty is not None else pd.DataFrame())
            return
        if suffix == ".parquet":
            import pyarrow.parquet as pq

            writer = pq.ParquetWriter(tmp, pq.read_schema(parts[0]))
            try:
                for p in parts:
                    pf = pq.ParquetFile(p)
                    for g in range(pf.num_row_groups):
                        writer.write_table(pf.read_row_group(g))
            finally:
                writer.close()
        else:
            with open(tmp, "wb") as out:
                for i, p in enumerate(parts):
                    with open(p, "rb") as fh:
                        if i and suffix == ".csv":
                            fh.readline()  # each part repeats the header line
                        shutil.copyfileobj(fh, out, 1 << 20)
        tmp.replace(final)
