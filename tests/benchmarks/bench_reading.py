"""Benchmark of reading a beam schedule, side by side in one run (not a timed test).

    python tests/benchmarks/bench_reading.py [--beams 100000] [--rounds 3] [--baseline DIR]

Figures, CPU time of a fresh process per round, best of the rounds, µs per beam:
- ``load_schedule`` of a seeded synthetic file (plain numbers, SI), whole;
- its parts, each timed alone: finding the [[beam]] tables, parsing them with rtoml
  chunk by chunk, validating each table with pydantic, reading each model into a Beam;
- the rtoml parse as the reference every reader pays: ``load / parse`` is the figure
  that says how much the project adds, and it moves less with the machine's load.

``--baseline DIR`` times a second copy of the code in the same rounds, alternating with
this one: DIR holds a ``clausewise`` package (e.g. ``git archive`` of an older commit
with ``api`` copied to ``DIR/clausewise`` and core, provisions, plugins inside it).
"""

from __future__ import annotations

import argparse
import gc
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path


def cpu(fn):
    gc.collect()
    start = time.process_time()
    result = fn()
    return time.process_time() - start, result


def measure(path: str) -> dict[str, float]:
    """CPU seconds of the load and of its parts, in this process."""
    from clausewise.beamfile import load_schedule, loading
    from clausewise.beamfile.models import BeamModel
    from clausewise.beamfile.reader import _BeamReader
    from clausewise.provisions import UnitSystem

    text = Path(path).read_text(encoding="utf-8")
    figures: dict[str, float] = {}
    figures["load_schedule"], schedule = cpu(lambda: load_schedule(path))
    gc.disable()  # as load_schedule does
    try:
        figures["find [[beam]] tables"], pieces = cpu(lambda: loading._beam_chunks(text, path))
        head, chunks = pieces
        figures["parse (rtoml, chunks)"], raws = cpu(
            lambda: [raw for chunk in chunks for raw in chunk])
        figures["validate (pydantic)"], models = cpu(
            lambda: [BeamModel.model_validate(raw) for raw in raws])
        system = UnitSystem(head.get("project", {}).get("units", "SI"))
        figures["read (_BeamReader)"], beams = cpu(
            lambda: [_BeamReader(model, system).read() for model in models])
    finally:
        gc.enable()
    assert len(schedule.entries) == len(raws) == sum(b is not None for b in beams)
    figures["beams"] = len(raws)
    return figures


def synthetic_file(beams: int, seed: int) -> str:
    path = Path(tempfile.gettempdir()) / f"clausewise-bench-{beams}-{seed}.toml"
    if not path.exists():
        subprocess.run([sys.executable, "-m", "clausewise.synthetic", "--beams", str(beams),
                        "--seed", str(seed), "--out", str(path)], check=True)
    return str(path)


def worker(path: str, code: str | None) -> dict[str, float]:
    """One round in a fresh process, with ``code`` (a folder) first on the path if given."""
    env = dict(os.environ)
    if code:
        env["PYTHONPATH"] = code + os.pathsep + env.get("PYTHONPATH", "")
    out = subprocess.run([sys.executable, __file__, "--worker", path], env=env, check=True,
                         capture_output=True, text=True, cwd=tempfile.gettempdir()).stdout
    return json.loads(out.splitlines()[-1])


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--beams", type=int, default=100_000)
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--rounds", type=int, default=3)
    parser.add_argument("--file", help="a schedule to read instead of a synthetic one")
    parser.add_argument("--baseline", help="a folder holding an older clausewise package")
    parser.add_argument("--worker", help=argparse.SUPPRESS)
    args = parser.parse_args()
    if args.worker:
        print(json.dumps(measure(args.worker)))
        return 0
    path = args.file or synthetic_file(args.beams, args.seed)
    codes = {"this": None} if not args.baseline else {"before": args.baseline, "this": None}
    best: dict[str, dict[str, float]] = {name: {} for name in codes}
    for _ in range(args.rounds):
        for name, code in codes.items():
            for key, value in worker(path, code).items():
                best[name][key] = min(best[name].get(key, value), value)
    count = best["this"].pop("beams")
    for name in codes:
        best[name].pop("beams", None)
    print(f"{path}: {count:.0f} beams, best of {args.rounds} rounds, CPU µs per beam")
    header = "".join(f"{name:>12}" for name in codes)
    print(f"{'':24}{header}" + ("   this/before" if args.baseline else ""))
    for key in best["this"]:
        row = "".join(f"{best[name][key] / count * 1e6:12.2f}" for name in codes)
        ratio = f"{best['this'][key] / best['before'][key]:14.2f}" if args.baseline else ""
        print(f"{key:24}{row}{ratio}")
    for name in codes:
        figures = best[name]
        print(f"{name}: load_schedule {figures['load_schedule']:.2f} s for {count:.0f} beams, "
              f"{figures['load_schedule'] / figures['parse (rtoml, chunks)']:.1f} x the parse")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
