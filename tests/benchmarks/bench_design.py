"""Benchmark of design mode (not a timed test).

    python tests/benchmarks/bench_design.py [--beams 10000] [--skip-cli]

Figures:
- the design demo under every built-in edition from the command line, wall and CPU
  time of the child process (target < 2 s wall);
- ``design_many`` on synthetic beams (bars removed) under two editions, CPU time
  (target < 60 s for 10 000 beams x 2 editions);
- candidates (beams assessed by the searches) per design and µs per candidate.
"""

from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import time
from dataclasses import replace
from pathlib import Path

from clausewise.provisions.design import design_many
from clausewise.synthetic import synthetic_beams

EDITIONS = ("aci318-19", "en1992-1-1:2004")
BUILT_IN = "aci318-19,aci318-14,aci318-11,en1992-1-1:2004,csa-a23.3:19,as3600:2018,is456:2000"
DEMO = Path(__file__).parents[2] / "fixtures" / "demo" / "orrin-vale-depot-design.toml"


def command_line() -> None:
    env = {**os.environ, "CLAUSEWISE_EDITIONS": BUILT_IN}
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    subprocess.run([sys.executable, "-m", "clausewise.cli", "design", str(DEMO),
                    "--format", "csv"], env=env, check=True, stdout=subprocess.DEVNULL)
    wall = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    print(f"design demo x 7 built-in editions, command line: {wall:.2f} s wall, "
          f"{cpu:.2f} s CPU")


def schedule(count: int) -> None:
    beams = [replace(b, tension=(), compression=()) for b in synthetic_beams(count, seed=11)]
    total_cpu, total_candidates, designed = 0.0, 0, 0
    for edition in EDITIONS:
        start = time.process_time()
        designs = design_many(beams, edition)
        spent = time.process_time() - start
        candidates = sum(d.candidates for d in designs)
        ok = sum(d.passed for d in designs)
        total_cpu += spent
        total_candidates += candidates
        designed += ok
        print(f"{edition}: {count} beams in {spent:.2f} s CPU, {candidates / count:.0f} "
              f"candidates per design, {1e6 * spent / candidates:.1f} µs per candidate, "
              f"{ok} with passing bars")
    print(f"{count} beams x {len(EDITIONS)} editions: {total_cpu:.2f} s CPU, "
          f"{1e6 * total_cpu / total_candidates:.1f} µs per candidate, "
          f"{designed}/{count * len(EDITIONS)} designed")


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--beams", type=int, default=10_000)
    parser.add_argument("--skip-cli", action="store_true")
    args = parser.parse_args()
    if not args.skip_cli:
        command_line()
    schedule(args.beams)


if __name__ == "__main__":
    main()
