"""The Calc host's errors: one base class, each also the matching builtin; the message is one line."""

from __future__ import annotations

__all__ = ["CalcHostError", "LibreOfficeMissing", "LibreOfficeTimeout", "LibreOfficeFailed", "ProfileRefused",
           "BookRefused"]


class CalcHostError(Exception):
    """Something the Calc host could not do; ``str()`` is a one-line message for the user."""


class LibreOfficeMissing(CalcHostError, FileNotFoundError):
    """LibreOffice (``soffice``), or its Python bridge (``uno``), is not installed."""


class LibreOfficeTimeout(CalcHostError, TimeoutError):
    """LibreOffice did not finish within the time limit; it was stopped.

    Attributes
    ----------
    seconds : float
        The time limit.
    """

    def __init__(self, message: str, seconds: float) -> None:
        super().__init__(message)
        self.seconds = seconds


class LibreOfficeFailed(CalcHostError, RuntimeError):
    """LibreOffice ended or answered without the values asked for."""


class ProfileRefused(CalcHostError, ValueError):
    """A profile setup or undo would touch something that is not ours; nothing was changed."""


class BookRefused(CalcHostError, ValueError):
    """The book cannot be read, or the output cannot be written there; nothing was written."""
