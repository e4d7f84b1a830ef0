"""``twistshare demo``: write the sample books into a folder, keeping anything there."""

from __future__ import annotations

import filecmp
import os
import tempfile
from pathlib import Path

from twistshare.engine.errors import BookUnusable

from ._output import EXIT_OK, check_output_place, fail, keep_previous, say

__all__ = ["run_demo"]


def run_demo(directory: Path) -> int:
    """Write the sample books into `directory`, keeping any different file already there."""
    from twistshare.sample_books import write_all

    if directory.exists() and not directory.is_dir():
        return fail(f"cannot write the sample books into {directory}: it is a file, not a folder; "
                    "name a folder (it is made if it does not exist)")
    try:
        directory.mkdir(parents=True, exist_ok=True)
        check_output_place(directory / "x.xlsx")
        with tempfile.TemporaryDirectory(dir=directory, prefix=".twistshare-demo-") as tmp:
            for made in write_all(Path(tmp)):
                dest = directory / made.name
                if dest.exists() and not filecmp.cmp(made, dest, shallow=False):
                    say(f"twistshare: kept the file that was at {dest} as {keep_previous(dest, False)}")
                os.replace(made, dest)
                print(dest)
    except (OSError, BookUnusable) as exc:
        return fail(str(exc))
    return EXIT_OK


