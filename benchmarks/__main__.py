"""Run every benchmark, or those named: ``python -m benchmarks motions history``."""

from __future__ import annotations

import importlib
import pkgutil
import sys
from pathlib import Path


def main(argv: list[str] | None = None) -> int:
    names = sys.argv[1:] if argv is None else argv
    here = Path(__file__).parent
    found = sorted(m.name[len("bench_"):] for m in pkgutil.iter_modules([str(here)])
                   if m.name.startswith("bench_"))
    chosen = names or found
    unknown = [n for n in chosen if n not in found]
    if unknown:
        print(f"unknown benchmark(s) {', '.join(unknown)}: choose from {', '.join(found)}", file=sys.stderr)
        return 2
    for name in chosen:
        print(f"== benchmark {name}", flush=True)
        importlib.import_module(f"benchmarks.bench_{name}").main()
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
