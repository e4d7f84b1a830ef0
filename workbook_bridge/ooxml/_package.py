"""Bounded, checked access to the members of an OOXML zip package.

Every size is checked against the archive's declared sizes before anything is inflated, and no
member is ever inflated past its declared size (zipfile stops there and the CRC check fails).
"""

from __future__ import annotations

import os
import zipfile
import zlib
from dataclasses import dataclass

from ._errors import PackageRefused
from ._xmltext import prolog_declares_doctype

__all__ = ["Limits", "Package", "XML_SUFFIXES"]

XML_SUFFIXES = (".xml", ".rels", ".vml")
_OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_MIB = 1024 * 1024
_HEAD = 16 * 1024


@dataclass(frozen=True)
class Limits:
    """Caps applied to a package before anything is inflated (declared sizes).

    Attributes
    ----------
    max_total_uncompressed : int, bytes
        Sum of the members' declared uncompressed sizes.
    max_ratio : float
        Largest declared compression ratio for a member bigger than ``ratio_floor``.
    ratio_floor : int, bytes
        Members smaller than this are not ratio-checked (small XML parts compress well).
    max_members : int
        Number of zip members.
    max_part_parsed : int, bytes
        Largest part the package layer reads whole (workbook list, relationships, styles, ...).
    """

    max_total_uncompressed: int = 2 * 1024 * _MIB
    max_ratio: float = 200.0
    ratio_floor: int = 10 * _MIB
    max_members: int = 20_000
    max_part_parsed: int = 256 * _MIB

    def __post_init__(self) -> None:
        for field in ("max_total_uncompressed", "max_ratio", "ratio_floor", "max_members", "max_part_parsed"):
            if not getattr(self, field) > 0:
                raise ValueError(f"Limits.{field} must be > 0: {getattr(self, field)!r}")


def _ole2_reason(path: str) -> str:
    """Tell an encrypted OOXML book from an old binary workbook (both are OLE2 compound files)."""
    needles = ("EncryptionInfo".encode("utf-16-le"), "EncryptedPackage".encode("utf-16-le"))
    tail = b""
    with open(path, "rb") as fh:
        while True:
            chunk = fh.read(4 * _MIB)
            if not chunk:
                break
            window = tail + chunk
            if any(n in window for n in needles):
                return ("password-protected (encrypted) workbook: open it, remove the password "
                        "(File > Info > Protect) and save it again as .xlsx")
            tail = window[-64:]
    return ("old binary .xls workbook (OLE2 compound file), not .xlsx: open it and save it as "
            "an .xlsx (or .xlsm) workbook")


class Package:
    """An opened, size-checked OOXML package; read members only through this object.

    Parameters
    ----------
    path : str or os.PathLike
        The workbook file.
    limits : Limits
        Size caps.

    Raises
    ------
    PackageRefused
        Not a file, empty, not a zip, old .xls, encrypted, corrupt, a zip bomb, a member
        with a DOCTYPE (entity expansion), duplicate or encrypted members.
    """

    def __init__(self, path: str | os.PathLike, limits: Limits | None = None) -> None:
        self.path = os.fspath(path)
        self.limits = limits or Limits()
        shown = self.path
        if not os.path.exists(self.path):
            raise PackageRefused(shown, "no such file")
        if not os.path.isfile(self.path):
            raise PackageRefused(shown, "not a file (a folder or a device?)")
        self.file_size = os.path.getsize(self.path)
        if self.file_size == 0:
            raise PackageRefused(shown, "the file is empty (0 bytes)")
        with open(self.path, "rb") as fh:
            magic = fh.read(8)
        if magic == _OLE2_MAGIC:
            raise PackageRefused(shown, _ole2_reason(self.path))
        if not magic.startswith(b"PK"):
            raise PackageRefused(shown, "not an .xlsx/.xlsm workbook: the file is not a zip package "
                                        f"(it starts with {magic[:4]!r})")
        try:
            self.zip = zipfile.ZipFile(self.path, "r")
        except (zipfile.BadZipFile, zipfile.LargeZipFile, EOFError, OSError, ValueError) as exc:
            raise PackageRefused(shown, f"truncated or corrupt zip package ({exc})") from None
        try:
            self._check_directory()
            self._check_prologs()
        except BaseException:
            self.zip.close()
            raise

    # -- checks -----------------------------------------------------------------------------
    def _check_directory(self) -> None:
        lim, shown = self.limits, self.path
        infos = self.zip.infolist()
        if len(infos) > lim.max_members:
            raise PackageRefused(shown, f"zip package holds {len(infos):,} members, more than the "
                                        f"{lim.max_members:,} allowed (zip bomb?)")
        seen: dict[str, str] = {}
        total = 0
        for info in infos:
            key = info.filename.lower()
            if key in seen:
                raise PackageRefused(shown, f"zip package holds member {info.filename!r} twice")
            seen[key] = info.filename
            if info.flag_bits & 0x1:
                raise PackageRefused(shown, f"zip member {info.filename!r} is encrypted")
            if info.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
                raise PackageRefused(shown, f"zip member {info.filename!r} uses compression method "
                                            f"{info.compress_type}, not stored/deflate")
            total += info.file_size
            if info.file_size > lim.ratio_floor:
                ratio = info.file_size / max(info.compress_size, 1)
                if ratio > lim.max_ratio:
                    raise PackageRefused(shown, f"zip member {info.filename!r} declares "
                                                f"{info.file_size:,} bytes from {info.compress_size:,} "
                                                f"(ratio {ratio:,.0f}:1 > {lim.max_ratio:,.0f}:1): zip bomb?")
        if total > lim.max_total_uncompressed:
            raise PackageRefused(shown, f"zip package declares {total:,} bytes uncompressed, more than "
                                        f"{lim.max_total_uncompressed:,} allowed (zip bomb?)")
        # Overlapping members (many directory entries sharing one compressed stream) are a bomb.
        spans = sorted((i.header_offset, i.header_offset + i.compress_size, i.filename) for i in infos)
        for (_, a_end, a_name), (b_start, _, b_name) in zip(spans, spans[1:]):
            if b_start < a_end:
                raise PackageRefused(shown, f"zip members {a_name!r} and {b_name!r} overlap (zip bomb?)")
        self.total_uncompressed = total
        self.names = [i.filename for i in infos]
        self.infos = {i.filename: i for i in infos}
        self._by_lower = seen

    def _check_prologs(self) -> None:
        for name in self.names:
            if not name.lower().endswith(XML_SUFFIXES) and name != "[Content_Types].xml":
                continue
            info = self.infos[name]
            head = self._read_bounded(name, _HEAD)
            verdict = prolog_declares_doctype(head, complete=len(head) >= info.file_size)
            if verdict is None:
                head = self._read_bounded(name, 64 * _HEAD)
                verdict = prolog_declares_doctype(head, complete=len(head) >= info.file_size)
            if verdict or verdict is None:
                raise PackageRefused(self.path, f"XML part {name!r} declares a DOCTYPE/ENTITY "
                                                "(entity expansion attack?); workbooks never need one")

    # -- reading ----------------------------------------------------------------------------
    def find(self, name: str) -> str | None:
        """Actual member name of part ``name`` (part names are case-insensitive), or None."""
        return self._by_lower.get(name.lstrip("/").lower())

    def _read_bounded(self, name: str, size: int) -> bytes:
        try:
            with self.zip.open(name) as fh:
                return fh.read(size)
        except (zipfile.BadZipFile, zlib.error, EOFError, OSError) as exc:
            raise PackageRefused(self.path, f"zip member {name!r} is corrupt ({exc})") from None

    def head(self, name: str, size: int = 64 * 1024) -> bytes:
        """The first ``size`` uncompressed bytes of a member."""
        return self._read_bounded(name, size)

    def read(self, name: str) -> bytes:
        """A whole member (must be within ``Limits.max_part_parsed``); CRC checked."""
        info = self.infos[name]
        if info.file_size > self.limits.max_part_parsed:
            raise PackageRefused(self.path, f"part {name!r} declares {info.file_size:,} bytes, more "
                                            f"than the {self.limits.max_part_parsed:,} this tool reads whole")
        try:
            return self.zip.read(name)
        except (zipfile.BadZipFile, zlib.error, EOFError, OSError) as exc:
            raise PackageRefused(self.path, f"zip member {name!r} is corrupt ({exc})") from None

    def open_stream(self, name: str):
        """A file object over a member's uncompressed bytes (for copying)."""
        return self.zip.open(name)

    def close(self) -> None:
        """Close the zip file."""
        self.zip.close()
