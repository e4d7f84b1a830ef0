"""LibreOffice Calc as a second spreadsheet host for the cell functions, and headless recalculation.

- `setup_profile` puts the ``TWS_...`` functions into a LibreOffice user profile: Basic wrappers
  in its Standard library and a Python bridge in its Scripts folder, both generated from the one
  list of functions (`_specs._function_specs`); ``undo=True`` takes out exactly that.
- `recalculate` recomputes every formula of a book in headless LibreOffice on a private profile
  and writes a copy whose formula cells hold the new values; the book is never touched.
- `computed_values` gives the values of chosen cells after such a recalculation (for the
  values-only copy), and which cells could not be computed.

Run as ``python -m twistshare.workbook_bridge.calc_host setup|undo|recalc ...`` (see `main`).
"""

from ._cli import main
from ._errors import CalcHostError, LibreOfficeFailed, LibreOfficeMissing, LibreOfficeTimeout, ProfileRefused
from ._profile import SetupReport, default_profile
from ._recalc import BookRefused, ComputedValues, RecalcReport, computed_values, recalculate
from ._setup import setup_profile

__all__ = [
    "setup_profile", "recalculate", "computed_values", "main", "default_profile",
    "SetupReport", "RecalcReport", "ComputedValues",
    "CalcHostError", "LibreOfficeMissing", "LibreOfficeTimeout", "LibreOfficeFailed", "ProfileRefused",
    "BookRefused",
]
