"""The bundled demo: label the invented reports under ``examples/`` and score them.

Used by ``make demo`` (``pathsieve demo``) and by the tests that hold the
product to the hand-coded gold (binary micro-F1 and value accuracy).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

import pandas as pd

from .runner import LabelOptions, RunSummary, label_file
from .validate import ValidationResult, validate

__all__ = ["EXAMPLES", "DemoResult", "run_demo"]

EXAMPLES = Path(__file__).resolve().parents[2] / "examples"


@dataclass
class DemoResult:
    out: Path
    summaries: dict[str, RunSummary] = field(default_factory=dict)
    validations: dict[str, ValidationResult] = field(default_factory=dict)

    def pooled(self) -> tuple[float, float, int, int]:
        """(binary micro-F1, value accuracy, value n, label units) over all schemes."""
        tp = fp = fn = 0
        correct = n_values = units = 0
        for v in self.validations.values():
            for m in v.labels:
                tp, fp, fn = tp + m.tp, fp + m.fp, fn + m.fn
            for vm in v.values:
                correct, n_values = correct + vm.correct, n_values + vm.n
            units += v.n_units
        f1 = 2 * tp / (2 * tp + fp + fn) if tp + fp + fn else 1.0
        acc = correct / n_values if n_values else 1.0
        return f1, acc, n_values, units

    def label_table(self) -> str:
        lines = [f"{'scheme':<11} {'label':<30} {'sup':>4} {'P':>6} {'R':>6} {'F1':>6}"]
        for name, v in self.validations.items():
            for m in v.labels:
                lines.append(
                    f"{name:<11} {m.key:<30} {m.support:>4} {_f(m.precision)} {_f(m.recall)} {_f(m.f1)}"
                )
            for vm in v.values:
                lines.append(
                    f"{name:<11} {vm.key:<30} {vm.n:>4} {'':>6} {'':>6} acc {_f(vm.accuracy)}"
                )
        return "\n".join(lines)


def _f(x: float | None) -> str:
    return f"{x:6.3f}" if x is not None else f"{'n/a':>6}"


def run_demo(
    out: str | Path,
    *,
    examples: str | Path = EXAMPLES,
    log: Callable[[str], None] = lambda s: None,
) -> DemoResult:
    """Label every demo report with its scheme, write tables and validation reports."""
    examples, out = Path(examples), Path(out)
    (out / "inputs").mkdir(parents=True, exist_ok=True)
    reports = pd.read_csv(examples / "demo_reports.csv", dtype=str, keep_default_na=False)
    gold = pd.read_csv(examples / "demo_gold.csv", dtype=str, keep_default_na=False)
    result = DemoResult(out)
    for scheme, group in reports.groupby("scheme", sort=True):
        name = str(scheme)
        src = out / "inputs" / f"{name}.csv"
        group.to_csv(src, index=False)
        labels = out / f"{name}.labels.csv"
        evidence = out / f"{name}.evidence.jsonl"
        result.summaries[name] = label_file(src, labels, LabelOptions(name), evidence_path=evidence)
        scheme_gold = gold[gold["scheme"] == name]
        v = validate(scheme_gold, labels, scheme=name, n_boot=200, seed=0, evidence=evidence)
        (out / f"{name}.validation.md").write_text(v.to_markdown(), encoding="utf-8")
        result.validations[name] = v
        f1 = v.micro.f1
        log(
            f"{name:<11} {len(group):>4} reports  labels: {labels}  evidence: {evidence}  "
            f"micro-F1 vs gold: {f1:.3f}"
            if f1 is not None
            else f"{name}: no gold positives"
        )
    return result
