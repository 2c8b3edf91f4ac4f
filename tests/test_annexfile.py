"""Parameter files: an annex without code, validated against its base and layered over it."""

import importlib.util
from pathlib import Path

import pytest

from clausewise.annexfile import AnnexError, load_annex
from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    ClausewiseError,
    Continuity,
    FloorLayout,
    Layer,
    Registry,
    Shape,
    assess,
)

ROOT = Path(__file__).resolve().parents[1]
ANNEXES = ROOT / "fixtures" / "annexes"
FIRM_FILE = ANNEXES / "quarrendon-house-rules.toml"
ANNEX_FILE = ANNEXES / "lornholm-na-2023.toml"
ACI, EN = "aci318-19", "en1992-1-1:2004"

RECT = Beam("rectangle", Shape.RECTANGLE, Bending.SAGGING, 300.0, 600.0, 28.0, 420.0,
            (Layer(3100.0, 540.0),), actions=Actions(dead=100e6, live=60e6))
TEE = Beam("block in flange", Shape.TEE, Bending.SAGGING, 300.0, 600.0, 30.0, 500.0,
           (Layer(1800.0, 540.0),), flange_thickness=120.0, flange_width=1500.0,
           layout=FloorLayout(8000.0, Continuity.INTERIOR, clear_left=2400.0,
                              clear_right=2400.0), actions=Actions(dead=150e6, live=80e6))


@pytest.fixture
def registry():
    registry = Registry(only=frozenset({ACI, EN}))
    registry.load_entry_points()
    return registry


def base(registry, edition_id):
    if edition_id not in registry.ids():
        pytest.skip(f"edition {edition_id} is not installed")


def test_firm_file_supplies_exactly_what_it_sets(registry):
    base(registry, ACI)
    record = load_annex(FIRM_FILE, registry)
    a = assess(RECT, record.info.id, registry=registry)
    suppliers = a.suppliers()
    assert {n for n, s in suppliers.items() if s == "quarrendon-beams:2025"} == {
        "min_net_tensile_strain", "live_factor"}
    assert suppliers["phi_tension"] == ACI and suppliers["dead_factor"] == ACI
    strain = next(p for p in a.parameters if p.name == "min_net_tensile_strain")
    assert strain.clause.ref == "QFB 4.2"
    assert FIRM_FILE.name in strain.clause.title
    assert a.stack[-1].source == f"parameter file {FIRM_FILE}"
    assert a.stack[-1].version.startswith("sha256:")
    assert record.info.forms == ("SI", "inch-pound")  # the base's forms carry over


def test_firm_file_changes_the_verdict_and_the_demand(registry):
    base(registry, ACI)
    load_annex(FIRM_FILE, registry)
    firm = assess(RECT, "quarrendon-beams:2025", registry=registry)
    code = assess(RECT, ACI, registry=registry)
    # ACI 318-19 22.2.2.4.1 and Table 22.2.2.4.3 (β1 = 0.85 at 28 MPa), εcu = 0.003, from
    # memory: a = As fy/(0.85 f'c b), c = a/β1, εt = 0.003 (d - c)/c
    c = 3100.0 * 420.0 / (0.85 * 28.0 * 300.0) / 0.85
    eps_t = 0.003 * (540.0 - c) / c
    strain = {a.edition_id: next(k for k in a.checks if k.name == "net tensile strain")
              for a in (firm, code)}
    assert strain[ACI].value == pytest.approx(eps_t, rel=1e-9) and strain[ACI].passed
    assert strain["quarrendon-beams:2025"].limit == 0.005
    assert not strain["quarrendon-beams:2025"].passed
    # ACI 318-19 5.3.1 (from memory) with the file's live factor: max(1.4D, 1.2D + 1.7L)
    assert firm.demand.value == pytest.approx(max(1.4 * 100e6, 1.2 * 100e6 + 1.7 * 60e6))
    assert code.demand.value == pytest.approx(max(1.4 * 100e6, 1.2 * 100e6 + 1.6 * 60e6))


def test_annex_file_changes_resistance_and_limits_by_hand(registry, edition_with):
    base(registry, EN)
    load_annex(ANNEX_FILE, registry)
    annex = assess(TEE, "xl-na:2023", registry=registry)
    recommended = assess(TEE, EN, registry=registry)
    # EN 1992-1-1 3.1.6(1), 3.1.7(3), 3.2.7, Table 2.1N (from memory): block in the flange,
    # x = As fyd/(η αcc fck/γc b λ), M_Rd = As fyd (d - λx/2), λ = 0.8, η = 1
    fyd = 500.0 / 1.15

    def hand(alpha_cc):
        x = 1800.0 * fyd / (alpha_cc * 30.0 / 1.5 * 1500.0 * 0.8)
        return 1800.0 * fyd * (540.0 - 0.8 * x / 2)

    assert recommended.design_resistance.value == pytest.approx(hand(1.0), rel=1e-9)
    assert annex.design_resistance.value == pytest.approx(hand(0.85), rel=1e-9)
    limits = {a.edition_id: {c.symbol: c.limit for c in a.checks} for a in (annex, recommended)}
    # 5.5(4) by default only where moments are redistributed: with δ = 1 neither applies it
    assert "xu/d" not in limits["xl-na:2023"] and "xu/d" not in limits[EN]
    # where it is applied with δ = 1 (neutral_axis_limit = always), the file's k1 acts:
    # εcu2 = 0.0035, xu/d ≤ (1 - k1)/(k2_scale (0.6 + 0.0014/εcu2))
    always = {e: assess(TEE, edition_with(e, registry=registry, name=f"xx-always-{i}",
                                          neutral_axis_limit="always"), registry=registry)
              for i, e in enumerate(("xl-na:2023", EN))}
    assert check_of(always["xl-na:2023"], "xu/d").limit == pytest.approx((1 - 0.4) / 1.25,
                                                                          rel=1e-12)
    assert check_of(always[EN], "xu/d").limit == pytest.approx((1 - 0.44) / 1.25, rel=1e-12)
    # 9.2.1.1(3): As,max = ratio × Ac, Ac = 1500 × 120 + 300 × 480 mm² (T with its flange)
    area = 1500.0 * 120.0 + 300.0 * 480.0
    assert limits["xl-na:2023"]["As + As'"] == pytest.approx(0.035 * area, rel=1e-12)
    assert limits[EN]["As + As'"] == pytest.approx(0.04 * area, rel=1e-12)


def test_a_file_layers_over_a_plugin_and_keeps_its_narrower_bounds(registry, tmp_path):
    base(registry, ACI)
    path = ROOT / "fixtures/local-editions/local_editions/tarnwick_beams.py"
    spec = importlib.util.spec_from_file_location("tarnwick_beams_for_test", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    assert registry.register(module).ok
    loose = write(tmp_path, "loose.toml", "tarnwick-beams:2025",
                  "min_net_tensile_strain = 0.003")
    # the code allows 0.002 to 0.01; the firm's own rule narrows it to 0.004 to 0.01
    with pytest.raises(AnnexError, match="outside 0.004 to 0.01"):
        load_annex(loose, registry)
    tight = write(tmp_path, "tight.toml", "tarnwick-beams:2025", "min_net_tensile_strain = 0.006")
    record = load_annex(tight, registry)
    a = assess(RECT, record.info.id, registry=registry)
    assert [s.id for s in a.stack] == [ACI, "tarnwick-beams:2025", "x-test:2025"]
    assert a.suppliers()["min_net_tensile_strain"] == "x-test:2025"
    assert a.suppliers()["max_tension_ratio"] == "tarnwick-beams:2025"


def write(tmp_path, name, extends, parameters, head=None):
    head = head if head is not None else (
        f'id = "x-test:2025"\ntitle = "a test file"\nyear = 2025\nextends = "{extends}"\n')
    path = tmp_path / name
    path.write_text(f"[annex]\n{head}\n[parameters]\n{parameters}\n", encoding="utf-8")
    return path


BAD = [
    ("a misspelt name", ACI, "min_net_tensile_stain = 0.005",
     ["'min_net_tensile_stain' is not a parameter of 'aci318-19'",
      "did you mean 'min_net_tensile_strain'?"]),
    # ACI 318-19 9.3.3.1 limit declared with bounds 0.002 to 0.01 by the plugin
    ("a value beyond the bounds", ACI, "min_net_tensile_strain = 0.05",
     ["min_net_tensile_strain = 0.05 is outside 0.002 to 0.01", "9.3.3.1"]),
    ("code in place of a number", ACI, "live_factor = \"__import__('os').getcwd()\"",
     ["live_factor must be a number, got \"__import__('os').getcwd()\""]),
    ("a yes/no in place of a number", ACI, "dead_factor = true",
     ["dead_factor must be a number, got True"]),
    ("not a finite number", ACI, "dead_factor = nan", ["must be a finite number"]),
    ("a unit in the value", ACI, "steel_modulus = \"200 GPa\"",
     ["steel_modulus must be a number in MPa"]),
    ("a misspelt key of a table", ACI, "live_factor = { valeu = 1.7 }",
     ["unknown key 'valeu'", "did you mean 'value'?"]),
    ("a number for a choice", EN, "concrete_model = 2",
     ["concrete_model must be a string"]),
    ("a word not among the choices", EN, 'concrete_model = "parabola"',
     ["concrete_model = 'parabola' is not one of 'rectangular', 'parabola-rectangle'",
      "did you mean 'parabola-rectangle'?"]),
]


@pytest.mark.parametrize(("case", "extends", "line", "expected"), BAD,
                         ids=[case for case, *_ in BAD])
def test_bad_parameters_are_refused_naming_file_and_parameter(registry, tmp_path, case, extends,
                                                              line, expected):
    base(registry, extends)
    path = write(tmp_path, "bad.toml", extends, line)
    with pytest.raises(AnnexError) as error:
        load_annex(path, registry)
    message = str(error.value)
    assert str(path) in message
    for part in expected:
        assert part in message
    assert isinstance(error.value, ValueError) and isinstance(error.value, ClausewiseError)
    assert "x-test:2025" not in registry.ids()


def test_every_problem_of_a_file_is_reported_at_once(registry, tmp_path):
    base(registry, ACI)
    path = write(tmp_path, "two.toml", ACI, "phi_tension = 1.5\nlive_factor = \"high\"")
    with pytest.raises(AnnexError) as error:
        load_annex(path, registry)
    assert len(error.value.problems) == 2
    assert "has 2 problems" in str(error.value)


def test_problems_of_the_head_and_of_the_parameters_come_in_one_report(registry, tmp_path):
    """A year in words and a taken id are reported with the parameters' problems: one run
    shows the author everything to fix."""
    base(registry, ACI)
    head = 'id = "aci318-19"\ntitle = "t"\nyear = "2025"\nextends = "aci318-19"\n'
    path = write(tmp_path, "all.toml", ACI, "phi_tension = 1.5\nlive_factr = 1.6", head=head)
    with pytest.raises(AnnexError) as error:
        load_annex(path, registry)
    found = "\n".join(error.value.problems)
    assert len(error.value.problems) == 5
    for part in ("year must be an integer", "cannot extend itself", "already an installed",
                 "phi_tension = 1.5 is outside", "did you mean 'live_factor'?"):
        assert part in found


BAD_HEADS = [
    ("an unknown base", 'id = "x-1"\ntitle = "t"\nyear = 2025\nextends = "aci318-99"\n',
     ["extends 'aci318-99', which is not an installed edition", "did you mean 'aci318-19'?"]),
    ("missing keys", 'id = "x-1"\n', ["needs 'title'", "needs 'year'", "needs 'extends'"]),
    ("a year in words", 'id = "x-1"\ntitle = "t"\nyear = "2025"\nextends = "aci318-19"\n',
     ["year must be an integer, got '2025'"]),
    ("an id with spaces", 'id = "My Rules"\ntitle = "t"\nyear = 2025\nextends = "aci318-19"\n',
     ["id 'My Rules' must be lower case"]),
    ("an installed id", 'id = "aci318-19"\ntitle = "t"\nyear = 2025\nextends = "aci318-19"\n',
     ["cannot extend itself"]),
    ("a misspelt key", 'id = "x-1"\ntitel = "t"\nyear = 2025\nextends = "aci318-19"\n',
     ["'titel' is not a known key (did you mean 'title'?)"]),
]


@pytest.mark.parametrize(("case", "head", "expected"), BAD_HEADS,
                         ids=[case for case, *_ in BAD_HEADS])
def test_bad_annex_tables_are_refused(registry, tmp_path, case, head, expected):
    base(registry, ACI)
    path = write(tmp_path, "head.toml", ACI, "", head=head)
    with pytest.raises(AnnexError) as error:
        load_annex(path, registry)
    for part in expected:
        assert part in str(error.value)


def test_an_id_already_installed_is_refused(registry, tmp_path):
    base(registry, ACI)
    if EN not in registry.ids():
        pytest.skip(f"edition {EN} is not installed")
    path = write(tmp_path, "taken.toml", ACI, "", head='id = "en1992-1-1:2004"\ntitle = "t"\n'
                 'year = 2025\nextends = "aci318-19"\n')
    with pytest.raises(AnnexError, match="already an installed edition"):
        load_annex(path, registry)


def test_unreadable_files_are_refused(registry, tmp_path):
    with pytest.raises(AnnexError, match="cannot be read"):
        load_annex(tmp_path / "missing.toml", registry)
    broken = tmp_path / "broken.toml"
    broken.write_text("[annex\nid = 1\n", encoding="utf-8")
    with pytest.raises(AnnexError, match=r"is not valid TOML.*line 1"):
        load_annex(broken, registry)
    stray = tmp_path / "stray.toml"
    stray.write_text("[anex]\n", encoding="utf-8")
    with pytest.raises(AnnexError, match="did you mean 'annex'"):
        load_annex(stray, registry)


def test_a_choice_parameter_takes_its_word(registry, tmp_path):
    base(registry, EN)
    path = write(tmp_path, "parabola.toml", EN, 'concrete_model = "parabola-rectangle"')
    record = load_annex(path, registry)
    a = assess(TEE, record.info.id, registry=registry)
    assert a.suppliers()["concrete_model"] == "x-test:2025"
    assert any(f.symbol == "εc2" for f in a.concrete_factors)  # the parabola's strain at peak


def check_of(assessment, symbol):
    return next(c for c in assessment.checks if c.symbol == symbol)
