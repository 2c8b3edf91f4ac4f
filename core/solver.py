"""Neutral-axis depth by strain compatibility and force equilibrium.

The extreme compression fibre is at the concrete law's ultimate strain; every
steel layer takes the stress its own law gives at its strain, yielded or not.
Net compression grows with the neutral-axis depth ``c`` (the laws are monotone)
except where a uniform block's edge passes a bar and the concrete that bar
displaces switches on; the bracket is cut before such a step when a root lies
below it, so the shallowest equilibrium is the one returned and is unique in the
bracket between a vanishing ``c`` and the depth of the deepest layer. That bracket
is first split at the balanced depth (the deepest steel at its yield strain), where
the usual beam's net force turns from linear to curved, and the root is polished
by regula falsi with the Illinois modification (bisection when the secant leaves
the bracket) until the force residual is below ``rtol`` of the total force;
converged sections leave the working set.

One implementation serves a single section and a batch: ``solve`` wraps
``solve_arrays`` on a batch of one.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, fields
from typing import NamedTuple

import numpy as np
from numpy.typing import NDArray

from clausewise.core.errors import SectionError
from clausewise.core.laws import (
    BilinearHardening,
    ConcreteLaw,
    ElasticPlastic,
    PiecewiseLinear,
    SteelLaw,
    joined_laws,
    law_size,
    take_laws,
    take_rows,
)
from clausewise.core.section import Section, SectionArrays

Array = NDArray[np.float64]

OK = 0
NOT_BRACKETED = 1
STRAIN_LIMIT = 2
NOT_CONVERGED = 3

STATUS_TEXT = {
    OK: "equilibrium found with the extreme fibre at the ultimate concrete strain",
    NOT_BRACKETED: "no equilibrium: the steel cannot balance the concrete at any depth",
    STRAIN_LIMIT: "no equilibrium within the laws' limits: a steel layer passes its strain "
    "limit before the concrete reaches its ultimate strain",
    NOT_CONVERGED: "equilibrium iteration did not converge",
}


class _Forces(NamedTuple):  # made at every trial depth: a tuple is quick to make
    net: Array
    scale: Array
    strain: Array
    stress: Array
    displaced: Array
    strip_force: Array
    strip_moment: Array


_ELEMENTWISE = (ElasticPlastic, BilinearHardening, PiecewiseLinear)

SIDE_BY_SIDE = 64
"""Up to this many sections, trial depths that do not depend on one another are evaluated
in one call on the sections repeated side by side: numpy's fixed cost per call is then
paid once, and outweighs the work of the extra trials (a single section: three bracket
trials for the cost of about one)."""


@dataclass(frozen=True)
class _Columns:
    """The sections of a batch layer by layer and strip by strip: arrays of shape (m, N)
    and (k, N), each layer or strip one contiguous row, so that a sum over the layers is
    a sum of rows. In the (N, m) layout of :class:`SectionArrays`, rows of a few numbers,
    numpy spent 5 to 20 times longer per number on the sums and clips here."""

    depths: Array
    areas: Array
    widths: Array
    tops: Array  # strip edges nearer the compression face
    bottoms: Array
    steel: tuple[SteelLaw, ...]
    size: int

    @classmethod
    def of(cls, sec: SectionArrays) -> _Columns:
        edges = np.ascontiguousarray(sec.edges.T)
        return cls(np.ascontiguousarray(sec.depths.T), np.ascontiguousarray(sec.areas.T),
                   np.ascontiguousarray(sec.widths.T), edges[:-1], edges[1:], sec.steel,
                   sec.size)

    def take(self, rows: NDArray[np.int_]) -> _Columns:
        """The sections at the given indices; a law shared by layers stays shared."""
        return _Columns(self.depths[:, rows], self.areas[:, rows], self.widths[:, rows],
                        self.tops[:, rows], self.bottoms[:, rows],
                        take_laws(self.steel, rows, self.size), rows.size)


def _steel_stress(cols: _Columns, strain: Array) -> Array:
    """Stress of every layer. Layers that share one of the core's elementwise laws (the
    usual case: one steel for the whole section) take it in one call, its parameters of
    shape (N,) broadcasting over the layers; otherwise layer by layer."""
    first = cols.steel[0]
    if type(first) in _ELEMENTWISE and all(law is first for law in cols.steel):
        return first.stress(strain)
    return np.stack([law.stress(strain[j]) for j, law in enumerate(cols.steel)])


def _forces(cols: _Columns, concrete: ConcreteLaw, c: Array) -> _Forces:
    strain = np.asarray(concrete.ultimate_strain, dtype=float) * (c - cols.depths) / c
    stress = _steel_stress(cols, strain)
    displaced = concrete.stress_at(c, cols.depths)
    force_per_width, moment_per_width = concrete.strip_resultants(c, cols.tops, cols.bottoms)
    strip_force = cols.widths * force_per_width
    strip_moment = cols.widths * moment_per_width
    concrete_force = np.add.reduce(strip_force, axis=0)
    net = concrete_force + np.add.reduce(cols.areas * (stress - displaced), axis=0)
    scale = concrete_force + np.add.reduce(cols.areas * np.abs(stress), axis=0)
    return _Forces(net, scale, strain, stress, displaced, strip_force, strip_moment)


def _net(cols: _Columns, concrete: ConcreteLaw, c: Array) -> tuple[Array, Array]:
    f = _forces(cols, concrete, c)
    return f.net, f.scale


def find_neutral_axis(sec: SectionArrays, concrete: ConcreteLaw, *, rtol: float = 1e-12,
                      max_iter: int = 200) -> tuple[Array, NDArray[np.int_], NDArray[np.int_]]:
    """Neutral-axis depth ``c`` (NaN where none exists), a status code and the
    iteration count for every section of the batch.

    Converged sections drop out of the working set, so a batch costs about the
    average iteration count rather than the worst one.
    """
    return _neutral_axis(_Columns.of(sec), concrete, rtol, max_iter)[:3]


def _neutral_axis(sec: _Columns, concrete: ConcreteLaw, rtol: float, max_iter: int
                  ) -> tuple[Array, NDArray[np.int_], NDArray[np.int_], _Forces | None]:
    """As :func:`find_neutral_axis`, and the forces at the depths found when one trial
    gave them for the whole batch at once (always so for a single section): the caller
    need not work them out again."""
    n = sec.size
    if law_size(concrete) not in (1, n):
        raise SectionError(f"concrete law has parameters for {law_size(concrete)} sections "
                           f"but the batch has {n}")
    deepest = sec.depths.max(axis=0)
    lo = deepest * 1e-9
    hi = _before_first_step(sec, concrete, lo, deepest) if hasattr(
        concrete, "stress_steps") else deepest
    # The bracket is the split and whichever end lies across the root from it; the ends
    # are asked only where needed, so the split costs no evaluation of its own.
    split = _balanced_depth(sec, concrete, deepest, lo, hi)
    if n <= SIDE_BY_SIDE:
        f_split, f_lo, f_hi = _nets_side_by_side(sec, concrete, (split, lo, hi))
        below = f_split > 0  # the root lies below the split
        fa, fb = np.where(below, f_lo, f_split), np.where(below, f_split, f_hi)
    else:
        f_split = _net_of_rows(sec, concrete, split, None)
        below = f_split > 0
        fa, fb = f_split.copy(), f_split.copy()
        for end, f_end, rows in ((lo, fa, np.flatnonzero(below)),
                                 (hi, fb, np.flatnonzero(~below))):
            if rows.size:
                f_end[rows] = _net_of_rows(sec, concrete, end, rows)
    a, b = np.where(below, lo, split), np.where(below, split, hi)
    bracketed = (fa < 0) & (fb > 0)
    c = np.full(n, np.nan)
    iterations = np.zeros(n, dtype=int)
    status: NDArray[np.int_] = np.where(bracketed, NOT_CONVERGED, NOT_BRACKETED)
    exact = f_split == 0  # the split is the root itself
    if exact.any():
        c[exact], status[exact] = split[exact], OK

    rows = np.flatnonzero(bracketed)  # the working set, as indices into the batch
    if rows.size == n:  # every section: the bracket's arrays are the working set's own
        work, law = sec, concrete
    else:
        work, law = sec.take(rows), take_rows(concrete, rows, n)
        a, fa, b, fb = a[rows], fa[rows], b[rows], fb[rows]  # N(a) < 0 < N(b)
    moved_a = moved_b = np.zeros(rows.size, dtype=bool)  # which end the last step moved
    done = np.zeros(rows.size, dtype=bool)
    final, shrink = None, False
    # Each step costs a few microseconds of numpy overhead per call whatever the batch
    # size, so the bookkeeping is done in place and only on the steps where sections
    # converge: for one section it was as costly as the forces themselves.
    for step in range(1, max_iter + 1 if rows.size else 1):
        width = b - a
        secant = a - fa * width / (fb - fa)  # fb > 0 > fa: never a division by zero
        x = 0.5 * (a + b)  # bisection where the secant is not strictly inside (or NaN)
        np.copyto(x, secant, where=(secant > a) & (secant < b))
        trial = _forces(work, law, x)
        fx = trial.net
        converged = (np.abs(fx) <= rtol * trial.scale) | (width <= 4e-16 * b)
        if converged.any():
            converged &= ~done
            if rows.size == n and converged.all():  # every section, none taken out before
                final = trial
            hit = rows[converged]
            c[hit], status[hit], iterations[hit] = x[converged], OK, step
            done |= converged
            if done.all():
                break
            shrink = bool(4 * np.count_nonzero(done) >= done.size)
        negative = fx < 0
        positive = ~negative
        # Illinois: halve the stale end's value when the same end moves twice running
        np.multiply(fb, 0.5, out=fb, where=negative & moved_a)
        np.multiply(fa, 0.5, out=fa, where=positive & moved_b)
        np.copyto(a, x, where=negative)
        np.copyto(fa, fx, where=negative)
        np.copyto(b, x, where=positive)
        np.copyto(fb, fx, where=positive)
        moved_a, moved_b = negative, positive
        if shrink:  # a quarter or more converged: the working set shrinks
            shrink = False
            keep = np.flatnonzero(~done)
            rows, a, fa, b, fb = rows[keep], a[keep], fa[keep], b[keep], fb[keep]
            moved_a, moved_b = moved_a[keep], moved_b[keep]
            work, law = work.take(keep), take_rows(law, keep, done.size)
            done = done[keep]
    unfinished = rows[~done]
    c[unfinished] = 0.5 * (a + b)[~done]
    iterations[unfinished] = max_iter
    return c, status, iterations, final


def _balanced_depth(sec: _Columns, concrete: ConcreteLaw, deepest: Array, lo: Array,
                    hi: Array) -> Array:
    """Where to split the bracket first: the depth at which the deepest steel is at its
    law's yield strain as the extreme fibre reaches the ultimate strain (the balanced
    depth). Below it that steel has yielded and, in the usual beam, net compression is
    linear in ``c``, so the first secant step from the split lands on the root. The middle
    of the bracket where the split is not strictly inside it."""
    eps_cu = np.asarray(concrete.ultimate_strain, dtype=float)
    eps_y = np.asarray(sec.steel[0].yield_strain, dtype=float)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        split = deepest * (eps_cu / (eps_cu + eps_y))
    middle = 0.5 * (lo + hi)
    np.copyto(middle, split, where=(split > lo) & (split < hi))
    return middle


def _nets_side_by_side(sec: _Columns, concrete: ConcreteLaw, depths: Sequence[Array]
                       ) -> list[Array]:
    """Net force of every section at each of several trial depths, in one evaluation of
    the sections repeated side by side: the same numbers as one evaluation per depth."""
    n, count = sec.size, len(depths)
    rows = np.tile(np.arange(n), count)
    net = _net(sec.take(rows), take_rows(concrete, rows, n), np.concatenate(depths))[0]
    return [net[i * n:(i + 1) * n] for i in range(count)]


def _net_of_rows(sec: _Columns, concrete: ConcreteLaw, c: Array,
                 rows: NDArray[np.int_] | None) -> Array:
    """Net force at depths ``c`` of the sections at ``rows`` (None: every section)."""
    if rows is None or rows.size == sec.size:
        return _net(sec, concrete, c)[0]
    return _net(sec.take(rows), take_rows(concrete, rows, sec.size), c[rows])[0]


def _before_first_step(sec: _Columns, concrete: ConcreteLaw, lo: Array,
                       hi: Array) -> Array:
    """Keep the shallowest equilibrium where more than one exists.

    With a uniform block, the concrete a bar displaces switches on as the block edge
    passes the bar, so net compression steps down there and a second equilibrium
    can appear deeper. Ending the bracket just before the first step at which net
    compression is already positive leaves exactly one root: the shallowest.
    """
    steps = concrete.stress_steps(sec.depths) * (1.0 - 1e-12)  # type: ignore[attr-defined]
    hi = hi.copy()
    if sec.size <= SIDE_BY_SIDE:  # every edge that lies in a bracket, in one evaluation
        layers = np.flatnonzero(((steps > lo) & (steps < hi)).any(axis=1)).tolist()
        nets = _nets_side_by_side(sec, concrete, [steps[j] for j in layers]) if layers else []
        for j, net in zip(layers, nets, strict=True):
            edge = steps[j]
            positive = (edge > lo) & (edge < hi) & (net > 0)
            hi[positive] = edge[positive]
        return hi
    for edge in steps:  # one row per layer
        rows = np.flatnonzero((edge > lo) & (edge < hi))
        if rows.size == 0:
            continue
        positive = rows[_net_of_rows(sec, concrete, edge, rows) > 0]
        hi[positive] = edge[positive]
    return hi


@dataclass(frozen=True)
class LayerResponse:
    """One steel layer at the ultimate state (compression positive)."""

    depth: float
    area: float
    strain: float
    stress: float
    force: float  # net of the concrete it displaces
    displaced_concrete_stress: float
    yielded: bool
    within_strain_limit: bool


@dataclass(frozen=True)
class Response:
    """A solved section. Forces in N, moments in N·mm, lengths in mm, compression positive."""

    c: float
    zone_depth: float
    zone_reaches: str
    block_in_flange: bool
    block_case: str
    layers: tuple[LayerResponse, ...]
    concrete_force: float
    concrete_depth: float
    overhang_force: float
    overhang_depth: float
    web_force: float
    web_depth: float
    nominal_moment: float
    net_tensile_strain: float
    extreme_tension_depth: float
    effective_depth: float
    c_over_dt: float
    c_over_d: float
    residual: float
    iterations: int
    status: int
    message: str

    @property
    def equilibrium(self) -> bool:
        return self.status == OK


def _centroid(moment: Array, force: Array) -> Array:
    """Depth of a resultant: its moment over its force, NaN where there is no force."""
    return np.divide(moment, force, out=np.full(np.shape(force), np.nan), where=force > 0)


@dataclass(frozen=True)
class ResponseArrays:
    """The same quantities as ``Response`` for a batch, as arrays of shape (N,) — or
    (N, m) for the per-layer ``layer_*`` fields."""

    c: Array
    zone_depth: Array
    zone_strip: NDArray[np.int_]
    labels: tuple[str, ...]
    depths: Array
    areas: Array
    layer_strain: Array
    layer_stress: Array
    layer_force: Array
    layer_displaced_stress: Array
    layer_yielded: NDArray[np.bool_]
    layer_within_limit: NDArray[np.bool_]
    concrete_force: Array
    concrete_depth: Array
    overhang_force: Array
    overhang_depth: Array
    web_force: Array
    web_depth: Array
    nominal_moment: Array
    net_tensile_strain: Array
    extreme_tension_depth: Array
    effective_depth: Array
    c_over_dt: Array
    c_over_d: Array
    residual: Array
    iterations: NDArray[np.int_]
    status: NDArray[np.int_]

    @property
    def size(self) -> int:
        return int(self.c.shape[0])

    @property
    def equilibrium(self) -> NDArray[np.bool_]:
        return self.status == OK

    def rows(self, part: slice) -> ResponseArrays:
        """The sections of a run of rows, as a batch of their own (views, not copies)."""
        return ResponseArrays(**{name: getattr(self, name) if name == "labels"
                                 else getattr(self, name)[part] for name in _RESPONSE_FIELDS})

    @property
    def block_in_flange(self) -> NDArray[np.bool_]:
        return (self.zone_strip == 0) & (self.labels[0] == "flange")

    def _case_names(self) -> NDArray[np.object_]:
        """The block case of a zone ending in each strip, in words."""
        if len(self.labels) == 1:
            return np.array(["rectangular section"], dtype=object)
        return np.array([f"block inside the {self.labels[0]}"]
                        + [f"block enters the {label}" for label in self.labels[1:]],
                        dtype=object)

    @property
    def block_cases(self) -> NDArray[np.object_]:
        """Where the compression zone ends, in words, for every section of the batch."""
        return self._case_names()[self.zone_strip]

    def block_case(self, i: int) -> str:
        return str(self._case_names()[int(self.zone_strip[i])])

    def row(self, i: int) -> Response:
        layers = tuple(
            LayerResponse(
                depth=float(self.depths[i, j]), area=float(self.areas[i, j]),
                strain=float(self.layer_strain[i, j]), stress=float(self.layer_stress[i, j]),
                force=float(self.layer_force[i, j]),
                displaced_concrete_stress=float(self.layer_displaced_stress[i, j]),
                yielded=bool(self.layer_yielded[i, j]),
                within_strain_limit=bool(self.layer_within_limit[i, j]),
            )
            for j in range(self.depths.shape[1])
        )
        status = int(self.status[i])
        return Response(
            c=float(self.c[i]), zone_depth=float(self.zone_depth[i]),
            zone_reaches=self.labels[int(self.zone_strip[i])],
            block_in_flange=bool(self.block_in_flange[i]), block_case=self.block_case(i),
            layers=layers,
            concrete_force=float(self.concrete_force[i]),
            concrete_depth=float(self.concrete_depth[i]),
            overhang_force=float(self.overhang_force[i]),
            overhang_depth=float(self.overhang_depth[i]),
            web_force=float(self.web_force[i]), web_depth=float(self.web_depth[i]),
            nominal_moment=float(self.nominal_moment[i]),
            net_tensile_strain=float(self.net_tensile_strain[i]),
            extreme_tension_depth=float(self.extreme_tension_depth[i]),
            effective_depth=float(self.effective_depth[i]),
            c_over_dt=float(self.c_over_dt[i]), c_over_d=float(self.c_over_d[i]),
            residual=float(self.residual[i]), iterations=int(self.iterations[i]),
            status=status, message=STATUS_TEXT[status],
        )


_RESPONSE_FIELDS = tuple(f.name for f in fields(ResponseArrays))


def solve_arrays(sec: SectionArrays, concrete: ConcreteLaw, *, rtol: float = 1e-12,
                 max_iter: int = 200) -> ResponseArrays:
    """Solve every section of the batch under one concrete law (whose parameters may be
    arrays of shape (N,))."""
    cols = _Columns.of(sec)
    c, status, iterations, final = _neutral_axis(cols, concrete, rtol, max_iter)
    c_eval = np.where(np.isfinite(c), c, cols.depths.max(axis=0))
    f = final if final is not None else _forces(cols, concrete, c_eval)

    strain_limit, yield_strain = np.empty(cols.areas.shape), np.empty(cols.areas.shape)
    for j, law in enumerate(cols.steel):  # a float or one value per section (assignment broadcasts)
        strain_limit[j], yield_strain[j] = law.strain_limit, law.yield_strain
    within = np.abs(f.strain) <= strain_limit
    status = np.where((status == OK) & ~np.all(within, axis=0), STRAIN_LIMIT, status)

    layer_force = cols.areas * (f.stress - f.displaced)
    web_share = cols.widths.min(axis=0) / cols.widths  # 1 in the web's strip
    web_force = np.add.reduce(web_share * f.strip_force, axis=0)
    web_moment = np.add.reduce(web_share * f.strip_moment, axis=0)
    concrete_force = np.add.reduce(f.strip_force, axis=0)
    concrete_moment = np.add.reduce(f.strip_moment, axis=0)
    overhang_force = concrete_force - web_force  # exactly 0 where the web carries it all
    overhang_moment = concrete_moment - web_moment

    nominal_moment = -(concrete_moment + np.add.reduce(layer_force * cols.depths, axis=0))
    deepest = np.argmax(cols.depths, axis=0)
    rows = np.arange(sec.size)
    dt = cols.depths[deepest, rows]
    in_tension = f.strain < 0
    tension_area = np.add.reduce(np.where(in_tension, cols.areas, 0.0), axis=0)
    with np.errstate(invalid="ignore", divide="ignore"):
        d_eff = np.add.reduce(np.where(in_tension, cols.areas * cols.depths, 0.0),
                              axis=0) / tension_area
    zone = concrete.zone_depth(c_eval)
    zone_strip = np.minimum(np.add.reduce(cols.tops[1:] < zone * (1 - 1e-12), axis=0),
                            len(sec.labels) - 1)

    invalid = status == NOT_BRACKETED
    any_invalid = bool(invalid.any())

    def valid(values: Array) -> Array:
        return np.where(invalid, np.nan, values) if any_invalid else values

    return ResponseArrays(
        c=valid(c_eval), zone_depth=valid(zone), zone_strip=zone_strip, labels=sec.labels,
        depths=sec.depths, areas=sec.areas,  # the layer fields (N, m), as the section's
        layer_strain=f.strain.T, layer_stress=f.stress.T, layer_force=layer_force.T,
        layer_displaced_stress=f.displaced.T,
        layer_yielded=(np.abs(f.strain) >= yield_strain * (1 - 1e-12)).T,
        layer_within_limit=within.T,
        concrete_force=valid(concrete_force),
        concrete_depth=valid(_centroid(concrete_moment, concrete_force)),
        overhang_force=valid(overhang_force),
        overhang_depth=valid(_centroid(overhang_moment, overhang_force)),
        web_force=valid(web_force), web_depth=valid(_centroid(web_moment, web_force)),
        nominal_moment=valid(nominal_moment),
        net_tensile_strain=valid(-f.strain[deepest, rows]),
        extreme_tension_depth=dt,
        effective_depth=d_eff,
        c_over_dt=valid(c_eval / dt),
        c_over_d=valid(c_eval / d_eff),
        residual=valid(np.abs(f.net) / f.scale),
        iterations=iterations,
        status=status,
    )


def solve_together(batches: Sequence[tuple[SectionArrays, ConcreteLaw]], *,
                   rtol: float = 1e-12) -> list[ResponseArrays]:
    """Solve several batches, in one call for each set that can stand side by side: the
    same strips and layer count, laws of one kind shared by the same layers. Each section
    is solved on its own numbers whatever its neighbours, so the results are those of a
    call per batch; for many small batches (a schedule of many kinds of beam) the fixed
    cost of a call, most of a small batch's time, is paid once per set."""
    results: dict[int, ResponseArrays] = {}
    sets: dict[tuple[object, ...], list[int]] = {}
    for i, (sec, law) in enumerate(batches):
        key = (sec.labels, _sharing(sec.steel), type(law), *map(type, sec.steel))
        sets.setdefault(key, []).append(i)
    for members in sets.values():
        joined = _side_by_side([batches[i] for i in members]) if len(members) > 1 else None
        if joined is None:
            for i in members:
                results[i] = solve_arrays(*batches[i], rtol=rtol)
            continue
        whole, start = solve_arrays(*joined, rtol=rtol), 0
        for i in members:
            size = batches[i][0].size
            results[i], start = whole.rows(slice(start, start + size)), start + size
    return [results[i] for i in range(len(batches))]


def _side_by_side(batches: Sequence[tuple[SectionArrays, ConcreteLaw]]
                  ) -> tuple[SectionArrays, ConcreteLaw] | None:
    """Batches as one, or None where their laws cannot be joined."""
    sections = [sec for sec, _ in batches]
    sizes = [sec.size for sec in sections]
    concrete = joined_laws([law for _, law in batches], sizes)
    pattern = _sharing(sections[0].steel)
    steel = {j: joined_laws([sec.steel[j] for sec in sections], sizes) for j in set(pattern)}
    if concrete is None or any(law is None for law in steel.values()):
        return None
    whole = SectionArrays(
        np.concatenate([sec.edges for sec in sections]),
        np.concatenate([sec.widths for sec in sections]),
        np.concatenate([sec.areas for sec in sections]),
        np.concatenate([sec.depths for sec in sections]),
        tuple(steel[j] for j in pattern), sections[0].labels,  # type: ignore[misc]
        validate=False)  # each batch was checked when it was made
    return whole, concrete


def _sharing(laws: tuple[SteelLaw, ...]) -> tuple[int, ...]:
    """Which layers share a law: for each layer, the first layer with the same law."""
    return tuple(next(j for j, other in enumerate(laws) if other is law) for law in laws)


def solve(section: Section, concrete: ConcreteLaw, *, rtol: float = 1e-12) -> Response:
    """Solve one section (a batch of one, so single and batch results are the same code)."""
    return solve_arrays(section.to_arrays(), concrete, rtol=rtol).row(0)
