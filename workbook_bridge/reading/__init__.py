"""Reading a saved book: its package checked, its sheets read with the fast reader (python-calamine).

The grids it hands over are plain values (`twistshare.engine.intake.SheetGrid`); everything
that reads meaning into them lives in the intake.
"""

from ._open import MAX_TABLE_ROWS, OpenBook, open_book
from ._sheet_extras import SheetExtras, scan_sheet_xml, sheet_extras

__all__ = ["MAX_TABLE_ROWS", "OpenBook", "open_book", "SheetExtras", "scan_sheet_xml", "sheet_extras"]
