"""LibreOffice Calc as a second spreadsheet host for the cell functions, and headless recalculation.

- `setup_profile` puts the ``TWS_...`` functions into a LibreOffice user profile: Basic wrappers
  in its Standard library and a Python bridge in its Scripts folder, both generated from the one
  list of functions (`_specs._function_specs`); ``undo=True`` takes out exactly that.
- `recalculate` recomputes every formula of a book in headless LibreOffice on a private profile
  and writes a copy whose formula cells hold the new values; the book is never touched.
- `export_pdf` prints a book's visible sheets to a PDF with LibreOffice's own converter.
- `computed_values` gives the values of chosen cells after such a recalculation (for the
  values-only copy), and which cells could not be computed.

Users reach these through the ``twistshare`` command: ``twistshare calc-setup [--profile DIR]
[--undo]`` and ``twistshare recalc BOOK`` (`twistshare.workbook_bridge.commands`).
"""

from importlib import import_module
from typing import Any

# Where each public name lives. Loaded on first use: LibreOffice's Python imports this package
# on the way to the small `_runtime` module and should not pay for the rest.
_PUBLIC = {
    "setup_profile": "_setup", "recalculate": "_recalc", "computed_values": "_recalc",
    "default_profile": "_profile", "SetupReport": "_profile", "RecalcReport": "_recalc",
    "ComputedValues": "_recalc", "BookRefused": "_errors", "CalcHostError": "_errors",
    "LibreOfficeMissing": "_errors", "LibreOfficeTimeout": "_errors", "LibreOfficeFailed": "_errors",
    "ProfileRefused": "_errors", "DEFAULT_TIMEOUT": "_recalc", "export_pdf": "_pdf", "PDF_TIMEOUT": "_pdf",
    "find_soffice": "_office",
}

__all__ = list(_PUBLIC)


def __getattr__(name: str) -> Any:
    if name not in _PUBLIC:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(import_module(f"{__name__}.{_PUBLIC[name]}"), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted([*globals(), *_PUBLIC])
