"""The README's promises: the job, the caution, and the two commands CI runs."""

from __future__ import annotations

import re
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
README = (ROOT / "README.md").read_text(encoding="utf-8")
CI = (ROOT / ".ci" / "run").read_text(encoding="utf-8")


def commands() -> list[str]:
    return re.findall(r"```\n(python3 -m venv .+?)\n```", README)


def test_readme_opens_with_the_job_then_the_caution_then_two_commands():
    body = README.split("\n", 2)[2]
    first_paragraph = body.split("\n\n")[0]
    assert "flexural strength" in first_paragraph and "flanged beams" in first_paragraph
    assert "licensed engineer" in README and "engineer of record govern" in README
    assert len(commands()) == 2
    assert README.index("Caution") < README.index(commands()[0])


def test_ci_runs_the_readme_commands():
    demo, tests = commands()
    for command in (demo, tests):
        for step in command.split(" && ")[2:]:  # past creating and activating the venv
            assert step in CI, f"{step!r} is in the README but not in .ci/run"


def test_the_readme_beam_file_loads_and_checks():
    from clausewise.beamfile import parse_schedule
    from clausewise.provisions import assess

    (example,) = re.findall(r"```toml\n(\[project\].*?)```", README, re.S)
    schedule = parse_schedule(example, "README.md")
    assert not schedule.problems and len(schedule.entries) == 1
    beam = schedule.entries[0].beam
    # 4 x 25 mm bars: 4 π 25²/4 = 1963.5 mm² (common practice, no source)
    assert beam.tension_area == 4 * 3.141592653589793 * 25.0**2 / 4
    assert assess(beam, "en1992-1-1:2004").status in ("pass", "fail")
