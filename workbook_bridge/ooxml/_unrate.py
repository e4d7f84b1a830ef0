"""Take twistshare's own work back out of a rated copy, as its ownership record lists it.

The result is the package as it was before the rating, with every later edit of the user's kept:
our members are left out, the members we changed get their old bytes back (each must still be
exactly as we wrote it), our link and marks are taken out of the user's worksheets (which may
have been edited since), and every other member is copied with identical bytes and zip metadata.
Where the package no longer matches its record (saved again by a spreadsheet program, which
rewrites every part), nothing is written and the reason says what to do instead.
"""

from __future__ import annotations

import hashlib
import os
import zipfile
import zlib
from dataclasses import dataclass

from ._atomic import atomic_file
from ._errors import PackageRefused
from ._ownership import undo_sheet_change
from ._package import Limits, Package
from ._record import OwnershipRecord, is_record, parse_record, sha256
from ._safety import read_package_info
from ._unrate_resaved import plan_resaved
from ._xmltext import decode_xml
from ._zipcopy import copy_members

__all__ = ["find_record", "read_record", "strip_ours", "StripReport", "RESAVED_ADVICE"]

RESAVED_ADVICE = ("rate the book you rated first (after --in-place, its backup BOOK.xlsx.bak-...) with your "
                  "corrections, or delete the sheets named 'Twistshare ...' and twistshare's comments and rate again")


@dataclass(frozen=True)
class StripReport:
    """What ``strip_ours`` took out and kept.

    Attributes
    ----------
    sheets : tuple of str
        Our sheets taken out.
    comments, marks : int
        Our comments and marked cells taken out.
    kept_cells : tuple of str
        Cells we had filled that the user changed since: their content was kept.
    edited : tuple of str
        The user's worksheets we had touched that were edited since the rating (edits kept).
    removed, restored, copied : int
        Members left out, given their old bytes back or cleaned of our edits, copied unchanged.
    resaved : bool
        The copy had been saved again by a spreadsheet program: our work was found by the names,
        cells and texts the record gives (``_unrate_resaved``), not undone byte for byte.
    """

    sheets: tuple[str, ...]
    comments: int
    marks: int
    kept_cells: tuple[str, ...]
    edited: tuple[str, ...]
    removed: int
    restored: int
    copied: int
    resaved: bool = False


def find_record(pkg: Package) -> tuple[str, OwnershipRecord] | None:
    """The package's ownership record (member name, record), or None where it has none.

    Raises
    ------
    PackageRefused
        More than one record, or one that cannot be read.
    """
    # Related from the workbook part as written; a program that saves the book again may move the
    # relationship (LibreOffice relates it from the package root), so every custom XML item is looked at.
    found = [name for name in pkg.names
             if name.lower().startswith("customxml/") and name.lower().endswith(".xml")
             and "/_rels/" not in name.lower() and is_record(pkg.head(name, 400))]
    if not found:
        return None
    if len(found) > 1:
        raise PackageRefused(pkg.path, f"the book holds {len(found)} twistshare ownership records "
                                       f"({', '.join(found)}); it cannot tell which is current: {RESAVED_ADVICE}")
    try:
        return found[0], parse_record(pkg.read(found[0]))
    except (ValueError, zipfile.BadZipFile) as exc:
        raise PackageRefused(pkg.path, f"twistshare's ownership record {found[0]} cannot be read ({exc}): "
                                       f"{RESAVED_ADVICE}") from None


def read_record(path: str | os.PathLike, limits: Limits | None = None) -> OwnershipRecord | None:
    """The ownership record of a workbook file, or None (see ``find_record``)."""
    pkg = Package(path, limits)
    try:
        read_package_info(pkg)  # the checks every book gets
        found = find_record(pkg)
        return found[1] if found else None
    finally:
        pkg.close()


class _Stale(PackageRefused):
    """The package no longer matches its record byte for byte (the fallback may still apply)."""


def _stale(pkg: Package, detail: str) -> PackageRefused:
    return _Stale(pkg.path, f"this rated copy no longer matches twistshare's record of what it added "
                                    f"({detail}); it was probably saved again by a spreadsheet program, which "
                                    f"rewrites every part, so twistshare cannot tell its own sheets, comments and "
                                    f"marks from yours exactly and does not re-rate it: {RESAVED_ADVICE}")


def _streamed_sha(pkg: Package, name: str) -> str:
    digest = hashlib.sha256()
    try:
        with pkg.open_stream(name) as fh:
            for chunk in iter(lambda: fh.read(1 << 20), b""):
                digest.update(chunk)
    except (zipfile.BadZipFile, zlib.error, EOFError) as exc:
        raise PackageRefused(pkg.path, f"zip member {name!r} is corrupt ({exc})") from None
    return digest.hexdigest()


def _plan(pkg: Package, record: OwnershipRecord, record_part: str) -> tuple[set[str], dict[str, bytes], list[str], list[str]]:
    """(members to leave out, members to replace, cells kept, edited sheets); raises if stale."""
    if record.unrecoverable:
        raise PackageRefused(pkg.path, "twistshare's record of this copy says it could not note exactly how it "
                                       f"changed sheet {record.unrecoverable[0]!r}, so it cannot take its work "
                                       f"out again: {RESAVED_ADVICE}")
    drop = {record_part}
    for part in record.own_parts:
        if pkg.find(part) is not None:
            drop.add(pkg.find(part))
    for part, digest in record.added:
        name = pkg.find(part)
        if name is None:
            raise _stale(pkg, f"{part} is missing")
        if _streamed_sha(pkg, name) != digest:
            raise _stale(pkg, f"{part} was changed after twistshare wrote it")
        drop.add(name)
    replace: dict[str, bytes] = {}
    for stored in record.stored:
        name = pkg.find(stored.part)
        if name is None:
            raise _stale(pkg, f"{stored.part} is missing")
        if sha256(pkg.read(name)) != stored.after_sha:
            raise _stale(pkg, f"{stored.part} was changed after twistshare wrote it")
        replace[name] = stored.before
    kept, edited = [], []
    for change in record.worksheets:
        name = pkg.find(change.part)
        if name is None:
            raise _stale(pkg, f"sheet {change.name!r} ({change.part}) is missing")
        data = pkg.read(name)
        try:
            text = decode_xml(data, name)
        except ValueError as exc:
            raise _stale(pkg, str(exc)) from None
        undo = undo_sheet_change(text, change)
        if undo.missing:
            raise _stale(pkg, undo.missing)
        out = undo.text.encode("utf-8")
        if sha256(data) == change.after_sha:
            if sha256(out) != change.before_sha:  # our own undo must give the sheet back exactly
                raise PackageRefused(pkg.path, f"twistshare could not take its edits out of sheet {change.name!r} "
                                               f"exactly; nothing was written: {RESAVED_ADVICE}")
        else:
            edited.append(change.name)
        kept.extend(undo.kept)
        replace[name] = out
    return drop, replace, kept, edited


def strip_ours(source: str | os.PathLike, dest: str | os.PathLike, *, limits: Limits | None = None,
               fallback: bool = True) -> StripReport:
    """Write ``dest``: the rated copy ``source`` with everything of twistshare's taken out.

    A copy that no longer matches its record byte for byte (saved again by a spreadsheet
    program) is stripped by what the record names instead (``_unrate_resaved``) when
    ``fallback``; that too refuses where the copy does not look as expected.

    Raises
    ------
    PackageRefused
        The book has no ownership record, or no longer matches it (nothing is written).
    """
    pkg = Package(source, limits)
    try:
        info = read_package_info(pkg)
        found = find_record(pkg)
        if found is None:
            raise PackageRefused(pkg.path, "no twistshare ownership record in the book")
        record_part, record = found
        resaved = None
        try:
            drop, replace, kept, edited = _plan(pkg, record, record_part)
        except _Stale:
            if not fallback:
                raise
            resaved = plan_resaved(pkg, info, record, record_part)
            drop, replace, kept, edited = set(resaved.drop), resaved.replace, list(resaved.kept_cells), []
        mode = os.stat(source).st_mode
        with atomic_file(dest, mode) as raw, zipfile.ZipFile(raw, "w", allowZip64=True) as zout:
            zout.comment = pkg.zip.comment
            copy_members(pkg, zout, 1, drop=drop, replace=replace)
        copied = len(pkg.names) - len(drop) - len(replace)
    finally:
        pkg.close()
    if resaved is not None:
        return StripReport(resaved.sheets, resaved.comments, resaved.marks, tuple(kept), (), len(drop),
                           len(replace), copied, resaved=True)
    return StripReport(record.sheets, record.comment_count, record.mark_count, tuple(kept), tuple(edited),
                       len(drop), len(replace), copied)
