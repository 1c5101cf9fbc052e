"""Run every benchmark module (tests/benchmarks/bench_*.py) and print one table.

Usage: python tests/benchmarks/run.py [name-substring ...]

Each module exposes ``run(report)``; ``report(name, seconds, true_digits,
ratio_vs_peer=None, note="")`` records one row.  Speed is reported as a ratio
against the plain lattice-sum peer (tests/benchmarks/peer.py) run in the same
process, never as an absolute timed test.
"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent


def main(argv: list[str]) -> int:
    sys.path.insert(0, str(HERE))
    rows = []

    def report(name, seconds, true_digits, ratio_vs_peer=None, note=""):
        rows.append((name, seconds, true_digits, ratio_vs_peer, note))
        ratio = "" if ratio_vs_peer is None else f"{ratio_vs_peer:8.1f}x"
        digits = "" if true_digits is None else f"{true_digits:5.1f}"
        print(f"{name:<44} {seconds:9.3f} s {digits:>6} {ratio:>10}  {note}", flush=True)

    print(f"{'benchmark':<44} {'time':>11} {'digits':>6} {'vs peer':>10}")
    for path in sorted(HERE.glob("bench_*.py")):
        if argv and not any(word in path.stem for word in argv):
            continue
        spec = importlib.util.spec_from_file_location(path.stem, path)
        module = importlib.util.module_from_spec(spec)
        spec.loader.exec_module(module)
        print(f"-- {path.stem}")
        module.run(report)
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
