"""The members of a package copied into a new zip: the same names, times and attributes, each
left out, replaced or copied as it is (the writer and the un-rating both write through this)."""

from __future__ import annotations

import shutil
import zipfile
import zlib
from collections.abc import Collection, Mapping

from ._errors import PackageRefused
from ._package import Package

__all__ = ["copy_members"]

_CHUNK = 1024 * 1024


def _zip_info_like(src: zipfile.ZipInfo) -> zipfile.ZipInfo:
    """A fresh ZipInfo with the source member's metadata (name, time, attributes, method)."""
    info = zipfile.ZipInfo(src.filename, src.date_time)
    info.compress_type = src.compress_type
    info.comment = src.comment
    info.create_system = src.create_system
    info.external_attr = src.external_attr
    info.internal_attr = src.internal_attr
    info.extra = _strip_zip64(src.extra)
    return info


def _strip_zip64(extra: bytes) -> bytes:
    """Drop the zip64 extra block (zipfile writes its own); keep every other block."""
    out, i = b"", 0
    while i + 4 <= len(extra):
        tag = int.from_bytes(extra[i:i + 2], "little")
        size = int.from_bytes(extra[i + 2:i + 4], "little")
        if tag != 0x0001:
            out += extra[i:i + 4 + size]
        i += 4 + size
    return out


def _set_level(info: zipfile.ZipInfo, level: int) -> zipfile.ZipInfo:
    # Python 3.13 names it compress_level; earlier versions only have the private slot.
    setattr(info, "compress_level" if hasattr(zipfile.ZipInfo, "compress_level") else "_compresslevel", level)
    return info


def copy_members(pkg: Package, zout: zipfile.ZipFile, level: int, *, drop: Collection[str] = (),
                 replace: Mapping[str, bytes] | None = None) -> None:
    """Every member of `pkg` into `zout` in its order: those in `drop` left out, those in `replace`
    written with the bytes given, the rest copied as they are (streamed, compression `level`).

    Raises
    ------
    PackageRefused
        A member to copy is corrupt.
    """
    replace = replace or {}
    for name in pkg.names:
        if name in drop:
            continue
        src = pkg.infos[name]
        info = _set_level(_zip_info_like(src), level)
        if name in replace:
            zout.writestr(info, replace[name])
            continue
        try:
            with pkg.open_stream(name) as fin, zout.open(info, "w", force_zip64=src.file_size > (1 << 30)) as fout:
                shutil.copyfileobj(fin, fout, _CHUNK)
        except (zipfile.BadZipFile, zlib.error, EOFError) as exc:
            raise PackageRefused(pkg.path, f"zip member {name!r} is corrupt ({exc})") from None
