"""Rows of results as CSV or JSON Lines text, written a column at a time.

A batch writes hundreds of thousands of rows whose texts repeat (the edition, the
stack, the caution) and whose numbers are all formatted alike. A column that holds one
value for every row goes into a line template as text, the numbers are formatted by
that template, and the constant end of a line is joined on, so a row costs one C-level
``%`` instead of a Python call per field. The text is byte for byte what
``csv.writer`` (minimal quoting, ``"\\n"`` lines) and ``json.dumps`` write for the same
rows: a text that needs quoting or escaping is encoded by those very functions, and
only a text without any character they act on is written as it is. Numbers are their
``%g`` text in both; in JSON Lines that is a JSON number (``null`` where there is none,
or it is not finite, which JSON cannot hold), the value ``json.dumps`` would write for
the number that text stands for.
"""

from __future__ import annotations

import csv
import io
import json
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np


@dataclass(frozen=True)
class Numbers:
    """A column of numbers shown to ``digits`` significant figures (``%g``), blank where
    there is none (NaN)."""

    values: np.ndarray
    digits: int = 6


Column = str | Sequence[Any] | Numbers
"""One text for every row, a text per row, or numbers. A text is a ``str`` whose
``str()`` is itself (a ``StrEnum`` member is its value); anything else is written as
``str()`` of it."""


class LineFormat:
    """How one format writes a row of fields; ``lines`` writes many rows at once."""

    opening = ""
    separator = ","
    closing = "\n"
    plain_field = "%s"  # a text with no special character, as it is written
    no_number = ""  # the field of a missing number
    finite_only = False  # whether inf is a missing number too (JSON has no inf)

    def __init__(self, names: Sequence[str]) -> None:
        self.labels = [self.label(name) for name in names]

    def label(self, name: str) -> str:
        return ""

    def is_plain(self, text: str) -> bool:
        """True when ``text`` holds no character that quoting or escaping acts on."""
        raise NotImplementedError

    def quoted(self, text: str) -> str:
        """``text`` as the reference writer writes it."""
        raise NotImplementedError

    def encoded(self, text: str) -> str:
        return self.plain_field % text if self.is_plain(text) else self.quoted(text)

    def lines(self, columns: Sequence[Column], size: int) -> str:
        """``size`` rows, one field per column, as text ending in a line break."""
        if size == 0:
            return ""
        # the line template in parts: (text, True) for a placeholder, else constant text
        parts: list[tuple[str, bool]] = [(self.opening, False)]
        varying = []
        for i, (label, column) in enumerate(zip(self.labels, columns, strict=True)):
            field, values = self._field(column, size)
            if len(self.labels) == 1:
                field, values = self.alone(field, values)
            parts.append((("" if i == 0 else self.separator) + label, False))
            parts.append((field, values is not None))
            if values is not None:
                varying.append(values)
        parts.append((self.closing, False))
        if not varying:
            return "".join(text for text, _ in parts) * size
        # the constant end of the line (the stack, the caution) is joined, not formatted
        last = max(i for i, (_, placeholder) in enumerate(parts) if placeholder)
        head = "".join(text if placeholder else text.replace("%", "%%")
                       for text, placeholder in parts[: last + 1])
        tail = "".join(text for text, _ in parts[last + 1:])
        return tail.join(map(head.__mod__, zip(*varying, strict=True))) + tail

    def alone(self, field: str, values: list[Any] | None) -> tuple[str, list[Any] | None]:
        """A field that is the only one of its row."""
        return field, values

    def _field(self, column: Column, size: int) -> tuple[str, list[Any] | None]:
        """The column's field: its text when it holds one for every row, else its
        placeholder in the line template and the values it takes per row."""
        if isinstance(column, str):
            return self.encoded(column), None
        if isinstance(column, Numbers):
            return self._numbers(column, size)
        values = column if isinstance(column, list) else list(column)
        if len(values) != size:
            raise ValueError(f"a column of {len(values)} rows in a table of {size}")
        try:
            joined = "".join(values)
            texts = values
        except TypeError:  # not all texts: written as str() of each
            texts = list(map(str, values))
            joined = "".join(texts)
        if texts.count(texts[0]) == size:  # equal texts are the same text
            return self.encoded(str(texts[0])), None
        if self.is_plain(joined):
            return self.plain_field, texts
        code = {text: self.encoded(text) for text in dict.fromkeys(texts)}
        return "%s", list(map(code.__getitem__, texts))

    def _numbers(self, column: Numbers, size: int) -> tuple[str, list[Any] | None]:
        values = np.asarray(column.values, float)
        if values.shape != (size,):
            raise ValueError(f"a column of {values.shape} numbers in a table of {size}")
        spec = f"%.{column.digits}g"
        blank = ~np.isfinite(values) if self.finite_only else np.isnan(values)
        if not blank.any():  # %g text is digits, '.', '-', '+', 'e', 'inf': always plain
            if (values == values[0]).all():
                return spec % values[0], None
            return spec, values.tolist()
        if blank.all():
            return self.no_number, None
        texts = list(map(spec.__mod__, values.tolist()))
        for i in np.flatnonzero(blank).tolist():
            texts[i] = self.no_number
        return "%s", texts


_CSV_SPECIAL = ',"\r\n'


class CsvLines(LineFormat):
    """Fields as ``csv.writer(out, lineterminator="\\n")`` writes them."""

    def __init__(self, names: Sequence[str]) -> None:
        super().__init__(names)
        self._buffer = io.StringIO()
        self._writer = csv.writer(self._buffer, lineterminator="\n")

    def is_plain(self, text: str) -> bool:
        return not any(map(text.__contains__, _CSV_SPECIAL))

    def quoted(self, text: str) -> str:
        self._buffer.seek(0)
        self._buffer.truncate()
        # a second, empty field: csv.writer quotes an empty field only when it is alone
        self._writer.writerow((text, ""))
        return self._buffer.getvalue()[:-2]  # drop the "," of the empty field and "\n"

    def alone(self, field: str, values: list[Any] | None) -> tuple[str, list[Any] | None]:
        """csv.writer writes a row of one empty field as '""', not as a blank line."""
        if values is None:
            return field or '""', None
        if field == "%s":
            return field, ['""' if value == "" else value for value in values]
        return field, values  # numbers: never empty


_JSON_SPECIAL = '"\\\x7f' + "".join(map(chr, range(0x20)))  # and all beyond ASCII


class JsonLines(LineFormat):
    """Rows as ``json.dumps(dict(zip(names, row)))`` writes them, one a line."""

    opening = "{"
    separator = ", "
    closing = "}\n"
    plain_field = '"%s"'
    no_number = "null"
    finite_only = True

    def __init__(self, names: Sequence[str]) -> None:
        if len(set(names)) != len(names):
            raise ValueError(f"JSON Lines need distinct column names: {list(names)}")
        super().__init__(names)

    def label(self, name: str) -> str:
        return json.dumps(name) + ": "

    def is_plain(self, text: str) -> bool:
        return text.isascii() and not any(map(text.__contains__, _JSON_SPECIAL))

    def quoted(self, text: str) -> str:
        return json.dumps(text)
