"""Sheet-name rules (what a spreadsheet program accepts) and free part names."""

from __future__ import annotations

import datetime as _dt
import os
import re
from typing import Iterable

from ._errors import WriteRefused

__all__ = ["check_sheet_name", "unique_sheet_name", "free_part", "backup_path"]

_BAD = re.compile(r"[\[\]:*?/\\]")
MAX_SHEET_NAME = 31


def check_sheet_name(name: str) -> str:
    """Return ``name`` if a spreadsheet accepts it as a sheet name.

    Raises
    ------
    WriteRefused
        Empty, longer than 31 characters, holding one of []:*?/\\, starting or ending with an
        apostrophe, or the reserved name 'History'.
    """
    if not isinstance(name, str) or not name.strip():
        raise WriteRefused(f"sheet name must be non-empty text: {name!r}")
    if len(name) > MAX_SHEET_NAME:
        raise WriteRefused(f"sheet name must be at most {MAX_SHEET_NAME} characters: {name!r} has {len(name)}")
    bad = _BAD.search(name)
    if bad:
        raise WriteRefused(f"sheet name must not contain any of []:*?/\\: {name!r} holds {bad.group(0)!r}")
    if name.startswith("'") or name.endswith("'"):
        raise WriteRefused(f"sheet name must not start or end with an apostrophe: {name!r}")
    if name.casefold() == "history":
        raise WriteRefused("sheet name 'History' is reserved by spreadsheet programs")
    if re.search("[\x00-\x1f]", name):
        raise WriteRefused(f"sheet name must not hold control characters: {name!r}")
    return name


def unique_sheet_name(name: str, taken: Iterable[str]) -> str:
    """``name``, or ``name (2)``, ``name (3)`` ... (cut to fit 31 characters) if it is taken."""
    check_sheet_name(name)
    used = {t.casefold() for t in taken}
    if name.casefold() not in used:
        return name
    n = 2
    while True:
        suffix = f" ({n})"
        candidate = name[: MAX_SHEET_NAME - len(suffix)].rstrip().rstrip("'") + suffix
        if candidate.casefold() not in used:
            return candidate
        n += 1


def free_part(template: str, used_lower: set[str]) -> str:
    """First ``template.format(n)`` (n = 1, 2, ...) not in ``used_lower``; reserves it."""
    n = 1
    while template.format(n).lower() in used_lower:
        n += 1
    name = template.format(n)
    used_lower.add(name.lower())
    return name


def backup_path(path: str) -> str:
    """A free name beside ``path`` for a copy of it: ``<name>.bak-YYYYmmdd-HHMMSS[-n]``."""
    stamp = _dt.datetime.now().strftime("%Y%m%d-%H%M%S")
    name = f"{path}.bak-{stamp}"
    n = 2
    while os.path.exists(name):
        name = f"{path}.bak-{stamp}-{n}"
        n += 1
    return name
