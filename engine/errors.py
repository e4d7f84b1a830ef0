"""The one error hierarchy of twistshare: a base class, each error also the matching builtin.

As pint does (``DimensionalityError`` is a ``TypeError``), every error here inherits
`TwistshareError` *and* the builtin a caller would naturally catch, so ``except ValueError``
keeps working where it always did. Each error keeps what caused it as attributes.
"""

from __future__ import annotations

__all__ = ["TwistshareError", "InputRefused", "BookUnusable"]


class TwistshareError(Exception):
    """Base class of every error twistshare raises on purpose."""


class InputRefused(TwistshareError, ValueError):
    """An input value or argument that cannot be used; ``str()`` is the whole readable message."""


class BookUnusable(TwistshareError, ValueError):
    """A workbook that cannot be rated at all (exit code 2); the message is one line."""
