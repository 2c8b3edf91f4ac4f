"""Writing a file whole or not at all."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path


def _mode_for(path: Path) -> int:
    """The permissions a plain new file would get (the temporary one is private), or those
    of the file being replaced."""
    if path.exists():
        return path.stat().st_mode & 0o7777
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def write_atomic(path: Path, data: str | bytes) -> None:
    """Write a file whole or not at all: a temporary file in the same folder, then
    ``os.replace``, so a reader never sees half a file and an old file survives a failure.
    A path that is a link is written through: the file it points to is replaced, the link
    stays."""
    path = Path(os.path.realpath(path))
    raw = data.encode() if isinstance(data, str) else data
    try:
        fd, temporary = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    except OSError as exc:  # said of the file asked for, not of a temporary name
        raise OSError(exc.errno, f"cannot write {path}: {exc.strerror or exc}") from None
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(raw)
            os.fchmod(handle.fileno(), _mode_for(path))
        os.replace(temporary, path)
    except BaseException:
        os.unlink(temporary)
        raise


