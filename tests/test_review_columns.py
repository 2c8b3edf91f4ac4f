"""A report piped or redirected reads at the width the user asked for with ``COLUMNS``
(``COLUMNS=80 clausewise compare F | less``), not at the file width."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from clausewise.cli import main

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo"


@pytest.mark.parametrize("command", [
    ["compare", str(DEMO / "quellmoor-library.toml")],
    ["check", str(DEMO / "quellmoor-library.toml"), "--edition", "aci318-19"],
    ["design", str(DEMO / "orrin-vale-depot-design.toml")],
])
def test_columns_from_the_environment_bound_a_piped_report(command, monkeypatch, capsys):
    monkeypatch.setenv("COLUMNS", "80")
    main(command)
    lines = capsys.readouterr().out.splitlines()
    assert lines, "the report is empty"
    assert max(len(line) for line in lines) <= 80


@pytest.mark.parametrize("edition", ["en1992-1-1:2004", "aci318-19", "csa-a23.3:19"])
def test_no_word_of_a_check_name_is_cut_at_80_columns(edition, monkeypatch, capsys):
    """A check's name wraps between words ("minimum tension / reinforcement"), never
    inside one ("reinforcemen / t")."""
    import json

    demo = str(DEMO / "quellmoor-library.toml")
    main(["check", demo, "--edition", edition, "--format", "json"])
    records = json.loads(capsys.readouterr().out)["results"]
    words = {w for r in records for c in r["checks"] for w in c["name"].split()
             if w.isalpha()}
    monkeypatch.setenv("COLUMNS", "80")
    main(["check", demo, "--edition", edition])
    tokens: set[str] = set()
    in_table = False
    for line in capsys.readouterr().out.splitlines():
        if line.split()[:2] == ["check", "value"]:
            in_table = True
        elif in_table and not line.strip():
            in_table = False
        elif in_table:
            tokens.update(line.split())
    cut = {t for t in tokens - words for w in words if len(t) >= 3 and w.startswith(t)}
    assert tokens & words, "no checks table found"
    assert cut == set()


def test_a_check_at_its_limit_reads_1_000_and_numbers_keep_their_units(monkeypatch, capsys):
    """Demo B6 meets its clear distance between tension layers exactly (the demo's 25 mm
    gap equals IS 456:2000 26.3.2's larger-bar-diameter minimum, from memory): its
    utilisation is shown as 1.000 like every other, to three decimals, and at 80 columns
    no number is parted from its unit."""
    monkeypatch.setenv("COLUMNS", "80")
    main(["check", str(DEMO / "quellmoor-library.toml"), "--edition", "is456:2000"])
    out = capsys.readouterr().out
    summary = [line.split() for line in out.splitlines() if line.split()[:1] == ["B6"]]
    assert summary and summary[0][3] == "1.000"
    lines = out.splitlines()
    for above, below in zip(lines, lines[1:], strict=False):
        starts = below.split()[:1]
        if starts and starts[0] in ("mm", "mm²", "kN·m", "in", "in²", "kip·ft"):
            pytest.fail(f"a unit left its number:\n{above}\n{below}")


@pytest.mark.parametrize("edition", ["en1992-1-1:2004", "is456:2000", "aci318-19"])
def test_explain_at_80_columns_keeps_every_supplier_whole(edition, monkeypatch, capsys):
    """The audit trail's "supplied by" column names an edition id, which is never cut
    ("en1992-1-1:2 / 004" was): each row's supplier is a whole id of the stack, and no
    line is wider than the screen."""
    monkeypatch.setenv("COLUMNS", "80")
    assert main(["explain", str(DEMO / "quellmoor-library.toml"), "B3",
                 "--edition", edition]) in (0, 1)
    lines = capsys.readouterr().out.splitlines()
    assert max(len(line) for line in lines) <= 80
    fragments = [line for line in lines if line.split()
                 and len(line.split()[-1]) >= 4 and edition.startswith(line.split()[-1])
                 and line.split()[-1] != edition]
    assert fragments == []
    assert sum(line.rstrip().endswith(edition) for line in lines) >= 5


@pytest.mark.parametrize("command", [["editions"],
                                     ["editions", "--parameters", "as3600:2018"],
                                     ["editions", "--parameters", "en1992-1-1:2004"]])
def test_the_listings_read_at_80_columns_without_cut_words(command, monkeypatch, capsys):
    """At 80 columns the editions listing cut titles into "structu / ral concret / e"
    and parameter meanings into "defaul / t": where the columns cannot all keep their
    words, each row becomes a block, and every parameter name, edition id and title
    word is whole."""
    import json

    main([*command, "--format", "json"])
    data = json.loads(capsys.readouterr().out)
    monkeypatch.setenv("COLUMNS", "80")
    main(command)
    out = capsys.readouterr().out
    lines = out.splitlines()
    assert max(len(line) for line in lines) <= 80
    tokens = set(out.split())
    text = json.dumps(data, ensure_ascii=False)
    words = {w for w in re.findall(r"[A-Za-z_]{4,}", text)}
    cut = {t for t in tokens if len(t) >= 4 and t.isalpha() and t not in words
           and any(w.startswith(t) for w in words)}
    assert cut == set()


def test_a_local_edition_s_clause_references_are_whole_at_80_columns(monkeypatch, capsys):
    """Under a parameter-file annex every check cites its base ("en1992-1-1:2004
    9.2.1.1(1)"); at 80 columns that was cut to "en1992-1-1:2004 9.". Each reference is
    now a whole token of the checks table."""
    import json

    annex = DEMO.parent / "annexes" / "lornholm-na-2023.toml"
    demo = str(DEMO / "quellmoor-library.toml")
    args = ["check", demo, "--annex", str(annex), "--edition", "xl-na:2023"]
    main([*args, "--format", "json"])
    refs = {c["clause"]["ref"] for r in json.loads(capsys.readouterr().out)["results"]
            for c in r["checks"]}
    monkeypatch.setenv("COLUMNS", "80")
    main(args)
    out = capsys.readouterr().out
    assert max(len(line) for line in out.splitlines()) <= 80
    tokens = set(out.split())
    whole = {ref for ref in refs if all(part in tokens for part in ref.split())}
    assert whole == refs
    assert "en1992-1-1:2004" in tokens
