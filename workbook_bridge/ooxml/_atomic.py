"""Writing a file atomically: a temporary file beside it, flushed to disk, then renamed into place.

Nothing is left behind on failure, and a reader never sees half a file under the output's name.
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager, suppress
from pathlib import Path
from typing import BinaryIO

__all__ = ["atomic_file"]


@contextmanager
def atomic_file(out: str | os.PathLike, mode: int) -> Iterator[BinaryIO]:
    """A binary file to write `out` through; on success it replaces `out`, with permissions `mode`.

    Parameters
    ----------
    out : path
        The file to write; its folder must exist.
    mode : int
        The permission bits the finished file gets.
    """
    out = Path(out)
    fd, tmp = tempfile.mkstemp(prefix="." + out.name + ".", suffix=".partial", dir=out.parent)
    try:
        with os.fdopen(fd, "wb") as raw:
            yield raw
            raw.flush()
            os.fsync(raw.fileno())
        os.chmod(tmp, mode & 0o7777)
        os.replace(tmp, out)
    except BaseException:
        with suppress(FileNotFoundError):
            os.unlink(tmp)
        raise
