"""Errors of the package layer: one base class, each also the matching builtin."""

from __future__ import annotations

from twistshare.engine.errors import TwistshareError

__all__ = ["OoxmlError", "PackageRefused", "WriteRefused"]


class OoxmlError(TwistshareError):
    """Base class of every error raised by ``twistshare.workbook_bridge.ooxml``."""


class PackageRefused(OoxmlError, ValueError):
    """The input file cannot be used safely; nothing was written.

    Parameters
    ----------
    path : str
        The file that was refused (as given).
    reason : str
        One line saying what was found and what to do instead.
    """

    def __init__(self, path: str, reason: str) -> None:
        self.path = str(path)
        self.reason = " ".join(str(reason).split())  # keep it one line
        super().__init__(f"{self.path}: {self.reason}")


class WriteRefused(OoxmlError, ValueError):
    """A write request that would lose or corrupt something (bad name, same file, ...)."""

    def __init__(self, reason: str) -> None:
        self.reason = " ".join(str(reason).split())
        super().__init__(self.reason)
