"""The speed table of issue 12, every row measured side by side in one run (not a test).

    python tests/benchmarks/bench_speed.py [--beams 100000] [--audited 100] [--repeat 3]
                                           [--cli]

Rows, µs per beam-edition unless stated, the best of ``--repeat`` runs of CPU time of
this process (the machine is shared, so the minimum is the honest figure):
- ``assess`` audited, edition by id and as an Edition object (7 built-in editions);
- ``assess_many``: one kind of beam (a design search), the mixed synthetic schedule, both
  under the 7 built-in editions, the mixed schedule under aci318-19 alone, and 1 000
  beams of the mixed schedule (the per-call fixed cost);
- ``assess_columns`` (arrays, no beam objects) under aci318-19;
- references written here, numpy only: the closed form for yielding steel in T beams,
  and a 60-step bisection of general strain compatibility with three steel layers;
- with ``--cli``: ``clausewise batch`` on a written schedule, in one process and in as
  many as it chooses (one per processor on Linux), wall time and the peak memory of its
  largest process (slow: it writes and reads a 100 000-beam file);
- start-up of ``clausewise --help`` against the bare imports of its libraries.
"""

from __future__ import annotations

import argparse
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from bench_batch import closed_form, design_columns, design_search, startup

from clausewise.provisions import assess, default_registry
from clausewise.provisions.batch import assess_columns, assess_many
from clausewise.synthetic import synthetic_beams

BUILT_IN = ("aci318-11", "aci318-14", "aci318-19", "as3600:2018", "csa-a23.3:19",
            "en1992-1-1:2004", "is456:2000")


def best(repeat: int, fn, *args, **kwargs) -> float:
    """The least CPU seconds of ``repeat`` calls."""
    times = []
    for _ in range(repeat):
        start = time.process_time()
        fn(*args, **kwargs)
        times.append(time.process_time() - start)
    return min(times)


def bisection_reference(count: int, seed: int = 7) -> float:
    """General strain compatibility on arrays, with no rules around it: rectangular block
    (0.85 f'c over 0.80 c), elastic-plastic steel in three layers, 60 bisection steps on
    the neutral-axis depth. CPU seconds for ``count`` sections."""
    rng = np.random.default_rng(seed)
    b = rng.choice([250.0, 300.0, 350.0, 400.0], count)
    d = rng.uniform(400.0, 740.0, count)
    depths = np.column_stack([np.full(count, 55.0), d - 50.0, d])
    areas = np.column_stack([rng.uniform(400.0, 1200.0, count),
                             *(0.5 * rng.uniform(0.004, 0.018, count) * b * d
                               for _ in range(2))])
    fc, fy, es, ecu = rng.uniform(25.0, 45.0, count), 420.0, 200_000.0, 0.003
    start = time.process_time()
    lo, hi = np.full(count, 1e-6), d.copy()
    for _ in range(60):
        c = 0.5 * (lo + hi)
        a = 0.80 * c
        strain = ecu * (c[:, None] - depths) / c[:, None]
        stress = np.clip(es * strain, -fy, fy) - np.where(depths < a[:, None], 0.85 * fc[:, None],
                                                          0.0)
        net = 0.85 * fc * b * a + np.sum(areas * stress, axis=1)
        positive = net > 0
        hi = np.where(positive, c, hi)
        lo = np.where(positive, lo, c)
    _ = 0.85 * fc * b * a * (0.5 * a) + np.sum(areas * stress * depths, axis=1)
    return time.process_time() - start


def cli_batch(count: int, workers: tuple[int | None, ...] = (1, None)
              ) -> list[tuple[str, float, float]]:
    """Wall seconds and peak resident MB (the largest process) of ``clausewise batch`` over
    ``count`` beams under the 7 built-in editions, rows written as CSV: once for each of
    ``workers`` (None: as many processes as the command chooses), on one written file."""
    runs = []
    with tempfile.TemporaryDirectory() as folder:
        schedule, rows = Path(folder) / "schedule.toml", Path(folder) / "rows.csv"
        subprocess.run([sys.executable, "-m", "clausewise.synthetic", "--beams", str(count),
                        "--seed", "7", "--out", str(schedule)], check=True)
        editions = [arg for e in BUILT_IN for arg in ("--edition", e)]
        for n in workers:
            chosen = [] if n is None else ["--workers", str(n)]
            code = ("import resource, sys; from clausewise.cli import main\n"
                    "try:\n    main(sys.argv[1:])\nexcept SystemExit:\n    pass\n"
                    "own = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss\n"
                    "kids = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss\n"
                    "print(max(own, kids) / 1024, file=sys.stderr)")
            start = time.perf_counter()
            done = subprocess.run([sys.executable, "-c", code, "batch", str(schedule),
                                   *editions, *chosen, "--out", str(rows)], check=False,
                                  capture_output=True, text=True)
            wall = time.perf_counter() - start
            peak = float(done.stderr.strip().splitlines()[-1])
            runs.append(("one process" if n == 1 else "processes as chosen", wall, peak))
    return runs


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--beams", type=int, default=100_000)
    parser.add_argument("--audited", type=int, default=100)
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--cli", action="store_true", help="also time clausewise batch")
    args = parser.parse_args()
    n, r = args.beams, args.repeat
    registry = default_registry()
    mixed = synthetic_beams(n, seed=7)
    one_kind = design_search(n, seed=7)
    sample = mixed[:: max(1, n // args.audited)][: args.audited]
    objects = [registry.edition(e) for e in BUILT_IN]
    pairs = len(sample) * len(BUILT_IN)
    rows: list[tuple[str, str]] = []

    def row(label: str, seconds: float, count: int, digits: int = 2) -> None:
        rows.append((label, f"{seconds / count * 1e6:.{digits}f}"))
        print(f"  {label}: {rows[-1][1]}", file=sys.stderr)

    assess(sample[0], BUILT_IN[0])  # warm: registry scan, imports
    row("assess, audited, edition by id", best(r, lambda: [
        assess(b, e) for b in sample for e in BUILT_IN]), pairs, 1)
    row("assess, audited, Edition object", best(r, lambda: [
        assess(b, e) for b in sample for e in objects]), pairs, 1)
    row("assess_many, one kind, 7 editions", best(r, assess_many, one_kind, BUILT_IN),
        n * 7)
    row("assess_many, mixed schedule, 7 editions", best(r, assess_many, mixed, BUILT_IN),
        n * 7)
    row("assess_many, mixed schedule, aci318-19", best(r, assess_many, mixed,
                                                       ["aci318-19"]), n)
    row("assess_many, 1 000 beams of the mixed schedule, 7 editions",
        best(r, assess_many, mixed[:1000], BUILT_IN), 7000)
    row("assess_columns, aci318-19", best(r, assess_columns, design_columns(n, seed=7),
                                          ["aci318-19"]), n)
    row("reference: closed form, T beams, yielding steel",
        min(closed_form(mixed) for _ in range(r)), n, 3)
    row("reference: numpy 60-step bisection, three layers",
        min(bisection_reference(n) for _ in range(r)), n, 2)
    if args.cli:
        for how, wall, peak in cli_batch(n):
            rows.append((f"clausewise batch {n} beams x 7 editions, {how}",
                         f"{wall:.1f} s wall, {peak:.0f} MB peak"))
    ours, bare = startup()
    rows.append(("start-up: clausewise --help / bare imports",
                 f"{ours * 1e3:.0f} ms / {bare * 1e3:.0f} ms = {ours / bare:.2f}"))
    width = max(len(label) for label, _ in rows)
    print(f"| {'path (N = ' + str(n) + ' unless stated)':{width}s} | µs per beam-edition |")
    print(f"|{'-' * (width + 2)}|---------------------|")
    for label, value in rows:
        print(f"| {label:{width}s} | {value} |")


if __name__ == "__main__":
    main()
