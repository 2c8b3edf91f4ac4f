"""A large schedule is parsed a chunk of [[beam]] tables at a time: the result must be the
schedule the whole file gives, and a file that cannot be cut exactly is read whole.

The reference here is the standard library's TOML reader over the whole text (tomllib).
"""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

from clausewise.beamfile import InputError, loading, parse_schedule
from clausewise.synthetic import schedule_document, synthetic_beams


def whole(text: str, source: str = "big.toml"):
    """The schedule of the text parsed in one piece by tomllib."""
    return loading._schedule(tomllib.loads(text), source, Path(source).parent)


def schedule_text(count: int, seed: int = 5) -> str:
    import tomli_w

    return tomli_w.dumps(schedule_document(synthetic_beams(count, seed)))


@pytest.fixture
def small_chunks(monkeypatch):
    monkeypatch.setattr(loading, "CHUNK", 7)


def test_chunked_parse_gives_the_schedule_of_the_whole_file(small_chunks):
    text = schedule_text(40)
    assert loading._beam_chunks(text, "big.toml") is not None  # 40 beams > 7: cut in six
    chunked = parse_schedule(text, "big.toml")
    assert len(chunked.entries) == 40
    assert chunked == whole(text)


def test_bad_beams_keep_their_numbers_across_chunks(small_chunks):
    text = schedule_text(30).replace('web_width = 300.0', 'web_width = "300 MPa"')
    chunked = parse_schedule(text, "big.toml")
    assert chunked.problems and chunked.problems == whole(text).problems
    assert max(p.index for p in chunked.problems) > 7  # numbered in the file, not the chunk


def test_a_table_after_the_beams_reads_the_file_whole(small_chunks):
    text = schedule_text(20) + '\n[run]\neditions = ["aci318-19"]\n'
    assert parse_schedule(text, "big.toml").project.editions == ("aci318-19",)


def test_a_beam_table_line_inside_a_string_reads_the_file_whole(small_chunks):
    text = schedule_text(20)
    cut = -1
    for _ in range(8):  # before the eighth beam, so the line in the string starts a chunk
        cut = text.index("[[beam]]", cut + 1)
    text = text[:cut] + 'notes_of_the_engineer = """\n[[beam]]\n"""\n' + text[cut:]
    _, chunks = loading._beam_chunks(text, "big.toml")
    with pytest.raises(loading._NotChunked):
        list(chunks)
    # not a field of a beam: the same problem as the whole file gives, and nothing lost
    chunked = parse_schedule(text, "big.toml")
    assert chunked == whole(text)
    assert len(chunked.entries) + len({p.beam for p in chunked.problems}) == 20


def test_a_syntax_error_late_in_a_large_file_is_the_whole_file_error(small_chunks):
    text = schedule_text(20)
    broken = text[: text.rindex("[[beam]]")] + "[[beam]]\nid = \n"
    with pytest.raises(InputError, match="not a valid TOML file") as chunked:
        parse_schedule(broken, "big.toml")
    with pytest.raises(InputError) as plain:
        loading._schedule(loading._toml_loads(broken, "big.toml"), "big.toml", Path("."))
    assert str(chunked.value) == str(plain.value)
