"""One solver for one section and for a batch: scalar and batch results agree."""

import math

import numpy as np
import pytest

from clausewise.core import (
    BilinearHardening,
    ElasticPlastic,
    ParabolaRectangle,
    RectangularBlock,
    Section,
    SectionArrays,
    SectionError,
    SteelLayer,
    solve,
    solve_arrays,
    stack_laws,
)

SCALARS = ("c", "zone_depth", "concrete_force", "concrete_depth", "overhang_force",
           "overhang_depth", "web_force", "web_depth", "nominal_moment", "net_tensile_strain",
           "extreme_tension_depth", "effective_depth", "c_over_dt", "c_over_d")
LAYER_FIELDS = ("strain", "stress", "force", "displaced_concrete_stress")


def close(x, y, rel=1e-9):
    if math.isnan(x) or math.isnan(y):
        return math.isnan(x) and math.isnan(y)
    return x == pytest.approx(y, rel=rel, abs=1e-300)


def assert_same(single, row):
    for name in SCALARS:
        assert close(getattr(single, name), getattr(row, name)), name
    for a, b in zip(single.layers, row.layers, strict=True):
        for name in LAYER_FIELDS:
            assert close(getattr(a, name), getattr(b, name)), name
        assert (a.yielded, a.within_strain_limit) == (b.yielded, b.within_strain_limit)
    assert single.status == row.status
    assert single.block_in_flange == row.block_in_flange
    assert single.block_case == row.block_case
    assert single.zone_reaches == row.zone_reaches
    assert single.residual <= 1e-12 and row.residual <= 1e-12


def random_tees(rng, n):
    bw = rng.uniform(150.0, 500.0, n)
    bf = bw + rng.choice([0.0, 1.0], n) * rng.uniform(0.0, 2500.0, n)  # some rectangles
    h = rng.uniform(300.0, 1200.0, n)
    hf = rng.uniform(0.08, 0.4, n) * h
    d = h - rng.uniform(35.0, 90.0, n)
    # light to heavily over-reinforced: blocks in the flange, in the web, elastic steel
    area = np.exp(rng.uniform(np.log(0.0008), np.log(0.12), n)) * bw * d
    return bf, bw, hf, h, d, area


def test_from_profile_batch_with_array_laws_matches_scalar_solves():
    rng = np.random.default_rng(20240601)
    n = 80
    bf, bw, hf, h, d, area = random_tees(rng, n)
    fy = rng.uniform(250.0, 600.0, n)
    es = rng.uniform(190_000.0, 210_000.0, n)
    stress = rng.uniform(15.0, 80.0, n)
    beta = rng.uniform(0.65, 1.0, n)
    eps_cu = rng.uniform(0.0025, 0.0035, n)
    batch = SectionArrays.from_profile(
        thicknesses=[hf, h - hf], widths=[bf, bw], labels=("flange", "web"),
        areas=[area], depths=[d], steel=[ElasticPlastic(modulus=es, yield_stress=fy)])
    result = solve_arrays(batch, RectangularBlock(stress, beta, eps_cu))
    assert result.size == n
    kinds = {(bool(result.block_in_flange[i]), bool(result.layer_yielded[i, 0]))
             for i in range(n)}
    assert kinds == {(True, True), (False, True), (False, False)}  # the batch is mixed
    for i in range(n):
        section = Section.flanged(bf[i], bw[i], hf[i], h[i],
                                  [SteelLayer(area[i], d[i], ElasticPlastic(es[i], fy[i]))])
        single = solve(section, RectangularBlock(stress[i], beta[i], eps_cu[i]))
        assert_same(single, result.row(i))


@pytest.mark.parametrize("build", [Section.flanged, Section.hogging])
def test_stacked_batch_with_parabola_and_hardening_matches_scalar_solves(build):
    rng = np.random.default_rng(7)
    n = 60
    bf, bw, hf, h, d, area = random_tees(rng, n)
    sections, laws = [], []
    for i in range(n):
        steel = BilinearHardening(modulus=200_000.0, yield_stress=rng.uniform(400.0, 550.0),
                                  hardening_modulus=rng.uniform(0.0, 3000.0),
                                  strain_limit=rng.uniform(0.02, 0.07))
        layers = [SteelLayer(rng.uniform(0.05, 0.5) * area[i], rng.uniform(30.0, 80.0), steel),
                  SteelLayer(area[i], d[i], steel)]
        sections.append(build(bf[i], bw[i], hf[i], h[i], layers))
        peak = rng.uniform(0.0018, 0.0025)
        laws.append(ParabolaRectangle(peak_stress=rng.uniform(10.0, 55.0), strain_at_peak=peak,
                                      ultimate_strain=rng.uniform(max(peak, 0.0026), 0.0035),
                                      exponent=rng.uniform(1.4, 2.0)))
    result = solve_arrays(SectionArrays.stack(sections), stack_laws(laws))
    assert set(result.status.tolist()) == {0, 2}  # some light rows pass the strain limit
    for i in range(n):
        assert_same(solve(sections[i], laws[i]), result.row(i))


def test_batch_results_do_not_depend_on_row_order():
    rng = np.random.default_rng(3)
    n = 50
    bf, bw, hf, h, d, area = random_tees(rng, n)
    steel = ElasticPlastic(200_000.0, 500.0)
    law = RectangularBlock(0.85 * 30.0, 0.8, 0.003)

    def batch(order):
        return SectionArrays.from_profile([hf[order], (h - hf)[order]], [bf[order], bw[order]],
                                          ("flange", "web"), [area[order]], [d[order]], [steel])

    order = rng.permutation(n)
    straight = solve_arrays(batch(np.arange(n)), law)
    shuffled = solve_arrays(batch(order), law)
    np.testing.assert_allclose(shuffled.c, straight.c[order], rtol=1e-12)
    np.testing.assert_allclose(shuffled.nominal_moment, straight.nominal_moment[order],
                               rtol=1e-12)


def test_stacking_sagging_with_hogging_keeps_each_rows_strip_labels():
    # a batch stores one label per strip column; sections whose strips mean different
    # things must be refused, or each row must still report its own strips
    steel = ElasticPlastic(200_000.0, 420.0)
    law = RectangularBlock(0.85 * 28.0, 0.85, 0.003)
    layers = [SteelLayer(1500.0, 540.0, steel)]
    hogging = Section.hogging(800.0, 300.0, 100.0, 600.0, layers)
    sagging = Section.flanged(800.0, 300.0, 100.0, 600.0, layers)
    try:
        batch = SectionArrays.stack([hogging, sagging])
    except SectionError as error:
        assert "label" in str(error)
        return
    result = solve_arrays(batch, law)
    for i, section in enumerate([hogging, sagging]):
        assert_same(solve(section, law), result.row(i))


@pytest.mark.parametrize("law", [ElasticPlastic(200_000.0, 420.0),
                                 BilinearHardening(200_000.0, 500.0, 1_000.0, 0.045)])
def test_a_shared_steel_law_in_one_call_equals_one_law_per_layer(law):
    """Layers sharing one law are taken in one call in a small batch and layer by layer in
    a large one (or when each layer has its own law object): the same numbers, bit for
    bit, since the arithmetic is elementwise either way."""
    rng = np.random.default_rng(3)
    n = 600  # larger than the one-call threshold; its first rows are solved apart too
    d = rng.uniform(400.0, 700.0, n)
    profile = dict(thicknesses=[np.full(n, 120.0), d + 60.0 - 120.0],
                   widths=[rng.uniform(800.0, 2000.0, n), np.full(n, 300.0)],
                   labels=("flange", "web"),
                   areas=[rng.uniform(800.0, 4000.0, n), np.full(n, 600.0), np.full(n, 400.0)],
                   depths=[d, d - 50.0, np.full(n, 50.0)])
    block = RectangularBlock(0.85 * 30.0, 0.85, 0.003)
    shared = solve_arrays(SectionArrays.from_profile(**profile, steel=[law] * 3), block)
    separate = solve_arrays(SectionArrays.from_profile(
        **profile, steel=[law, stack_laws([law]), stack_laws([law])]), block)
    small = solve_arrays(SectionArrays.from_profile(
        **{k: [v[:8] for v in vs] if k != "labels" else vs for k, vs in profile.items()},
        steel=[law] * 3), block)
    for name in ("c", "nominal_moment", "layer_stress", "layer_strain"):
        assert np.array_equal(getattr(shared, name), getattr(separate, name)), name
        assert np.array_equal(getattr(small, name), getattr(shared, name)[:8]), name


@pytest.mark.parametrize("law", [RectangularBlock(0.85 * 30.0, 0.85, 0.003),
                                 ParabolaRectangle(20.0, 0.002, 0.0035)])
def test_a_large_batch_and_its_rows_in_small_batches_give_the_same_numbers(law):
    """A small batch asks its bracket's trial depths side by side in one call, a large one
    only where each is needed: the same trials, so the same numbers bit for bit, with
    compression steel (whose block edges cut the bracket) and steel yielding or not."""
    from clausewise.core.solver import SIDE_BY_SIDE

    rng = np.random.default_rng(11)
    n = 3 * SIDE_BY_SIDE + 5
    bf, bw, hf, h, d, area = random_tees(rng, n)
    steel = ElasticPlastic(200_000.0, 500.0)

    def sections(rows):
        return SectionArrays.from_profile(
            [hf[rows], (h - hf)[rows]], [bf[rows], bw[rows]], ("flange", "web"),
            [area[rows], 0.3 * area[rows]], [d[rows], np.full(rows.size, 55.0)], [steel] * 2)

    whole = solve_arrays(sections(np.arange(n)), law)
    assert len(set(whole.iterations.tolist())) > 2  # rows that converge at different steps
    for start in range(0, n, SIDE_BY_SIDE // 2):
        rows = np.arange(start, min(start + SIDE_BY_SIDE // 2, n))
        part = solve_arrays(sections(rows), law)
        for name in ("c", "nominal_moment", "layer_strain", "status", "iterations"):
            assert np.array_equal(getattr(part, name), getattr(whole, name)[rows],
                                  equal_nan=True), name


def test_balanced_section_solves_at_the_balanced_depth():
    """Tension steel of the balanced area: the deepest bar reaches fy/Es just as the
    extreme fibre reaches εcu, at c_b = d εcu / (εcu + εy), and As fy = 0.85 f'c b β1 c_b
    (the balanced section of the trade: common practice, no source)."""
    fc, b, d, fy, es, beta, eps_cu = 30.0, 300.0, 540.0, 420.0, 200_000.0, 0.836, 0.003
    c_b = d * eps_cu / (eps_cu + fy / es)
    area = 0.85 * fc * b * beta * c_b / fy
    steel = ElasticPlastic(es, fy)
    response = solve(Section.rectangle(b, d + 60.0, [SteelLayer(area, d, steel)]),
                     RectangularBlock(0.85 * fc, beta, eps_cu))
    assert response.status == 0
    assert response.c == pytest.approx(c_b, rel=1e-9)
    assert response.layers[0].strain == pytest.approx(-fy / es, rel=1e-9)
    assert response.nominal_moment == pytest.approx(area * fy * (d - beta * c_b / 2), rel=1e-9)


def test_an_exact_root_at_the_first_split_is_taken_as_found():
    """Numbers chosen so that net force is exactly zero at the split (powers of two): the
    root is the split itself, not a bracket with a zero end taken for no equilibrium."""
    steel = ElasticPlastic(modulus=1.0, yield_stress=0.5)  # yield strain 0.5
    law = RectangularBlock(stress=1.0, depth_factor=0.5, ultimate_strain=0.5)
    # split = 512 * 0.5 / (0.5 + 0.5) = 256; block 128 x 1 x 1 = 128 = 256 mm² x 0.5
    section = Section.rectangle(1.0, 600.0, [SteelLayer(256.0, 512.0, steel)])
    response = solve(section, law)
    assert response.status == 0
    assert response.c == 256.0
    assert response.nominal_moment == pytest.approx(128.0 * (512.0 - 64.0), rel=1e-12)


def _a_batch(rng, n, law, *, flanged=True, layers=2):
    """n random T (or rectangular) sections with ``layers`` steel layers of one law."""
    bf, bw, hf, h, d, area = random_tees(rng, n)
    thick, wide, labels = ([hf, h - hf], [bf, bw], ("flange", "web")) if flanged else \
        ([h], [bw], ("web",))
    areas, depths = [area, 0.3 * area, 0.2 * area][:layers], [d, d - 60.0,
                                                              np.full(n, 55.0)][:layers]
    return SectionArrays.from_profile(thick, wide, labels, areas, depths, [law] * layers)


def test_batches_solved_together_give_the_numbers_of_one_call_each(monkeypatch):
    """Batches of several layouts and laws (some joinable, some not: other strips, other
    layer counts, a law with parameters per section, another law kind) solved together:
    every field of every batch as its own call gives it, bit for bit."""
    from clausewise.core import solve_together
    from clausewise.core.solver import _RESPONSE_FIELDS

    rng = np.random.default_rng(5)
    mild = ElasticPlastic(200_000.0, 500.0)
    hard = BilinearHardening(200_000.0, 500.0, 2_000.0, 0.05)
    per_section = ElasticPlastic(200_000.0, rng.uniform(400.0, 550.0, 9))
    batches = [
        (_a_batch(rng, 7, mild), RectangularBlock(25.5, 0.85, 0.003)),
        (_a_batch(rng, 90, mild), RectangularBlock(rng.uniform(20.0, 40.0, 90), 0.8, 0.003)),
        (_a_batch(rng, 9, per_section), RectangularBlock(25.5, 0.85, 0.003)),
        (_a_batch(rng, 5, mild, flanged=False), RectangularBlock(25.5, 0.85, 0.003)),
        (_a_batch(rng, 6, mild, layers=3), RectangularBlock(25.5, 0.85, 0.003)),
        (_a_batch(rng, 4, hard), RectangularBlock(25.5, 0.85, 0.003)),
        (_a_batch(rng, 8, mild), ParabolaRectangle(20.0, 0.002, 0.0035)),
        (_a_batch(rng, 1, mild), RectangularBlock(30.0, 0.75, 0.003)),
    ]
    import clausewise.core.solver as solver

    calls = []

    def counted(sec, law, **kw):
        calls.append(sec.size)
        return solve_arrays(sec, law, **kw)

    monkeypatch.setattr(solver, "solve_arrays", counted)
    together = solve_together(batches)
    monkeypatch.undo()
    assert len(together) == len(batches)
    assert sorted(calls) == [4, 5, 6, 8, 7 + 90 + 9 + 1]  # the four T batches under one block
    for (sec, law), got in zip(batches, together, strict=True):
        alone = solve_arrays(sec, law)
        for name in _RESPONSE_FIELDS:
            a, b = getattr(alone, name), getattr(got, name)
            assert (a == b if name == "labels" else np.array_equal(a, b, equal_nan=True)), name


def test_laws_of_other_kinds_or_a_plugins_own_are_not_joined():
    from dataclasses import dataclass

    from clausewise.core.laws import joined_laws

    @dataclass(frozen=True)
    class FirmBlock(RectangularBlock):  # a plugin's law: it may hold more than parameters
        pass

    block = RectangularBlock(25.5, 0.85, 0.003)
    assert joined_laws([block, ParabolaRectangle(20.0, 0.002, 0.0035)], [1, 1]) is None
    assert joined_laws([block, FirmBlock(25.5, 0.85, 0.003)], [1, 1]) is None
    both = joined_laws([block, RectangularBlock(np.array([20.0, 30.0]), 0.85, 0.003)], [3, 2])
    assert np.array_equal(both.stress, [25.5, 25.5, 25.5, 20.0, 30.0])
    assert both.depth_factor == 0.85  # one value for every row stays one value
