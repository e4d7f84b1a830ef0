"""A book held in memory (lists of cell values per sheet) for the intake's `rate_tables`."""

from __future__ import annotations

from pathlib import Path

from twistshare.engine.intake import SheetGrid, rate_tables

MATERIALS = [["Material", "G [GPa]", "Allowable shear [MPa]"], ["Core steel", 80, 120]]


class MemoryBook:
    """The `TableSource` protocol over plain lists: sheet name -> rows (row 0 is spreadsheet row 1)."""

    def __init__(self, sheets: dict[str, list[list[object]]]) -> None:
        self.sheets = sheets
        self.path = Path("memory.xlsx")
        self.tables: dict = {}

    def find_sheet(self, name: str) -> str | None:
        return next((s for s in self.sheets if s.lower() == name.lower()), None)

    def grid(self, sheet: str) -> SheetGrid:
        return SheetGrid(sheet, self.sheets[sheet])


def rate_parts(header: list[str], *rows: list[object]):
    """Rate a parts table (header + rows) with the one 'Core steel' material (G 80 GPa, 120 MPa)."""
    return rate_tables(MemoryBook({"Materials": MATERIALS, "Parts": [header, *rows]}))
