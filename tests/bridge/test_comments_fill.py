"""The library's values written into the blank materials cells they filled
(workbook_bridge/sheets/_comments.py, `fill_library_values`).

Each filled cell is written in its column's own unit (pint's factors: 1 GPa = 1e9 Pa); a cell
whose column is gone, has no unit for a dimensioned value, names a unit that cannot be read, or
cannot take a value in the file is skipped, and the cells after it are still written.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import pytest
from twistshare.engine.intake import Column, FilledCell, field_by_key
from twistshare.workbook_bridge.ooxml import OoxmlError
from twistshare.workbook_bridge.sheets._comments import fill_library_values


@dataclass
class _Spot:
    columns: dict[str, Column]

    def column(self, key: str) -> Column | None:
        return self.columns.get(key)


@dataclass
class _Materials:
    filled: list[FilledCell]
    spot: _Spot | None


@dataclass
class _Result:
    materials: _Materials | None


@dataclass
class _Writer:
    refuse: set[str] = field(default_factory=set)
    written: dict[str, float] = field(default_factory=dict)

    def fill_cells(self, sheet: str, cells: dict) -> None:
        for ref, cell in cells.items():
            if ref in self.refuse:
                raise OoxmlError(f"{sheet}!{ref} is not empty")
            self.written[ref] = cell.value


def _column(key: str, index: int, unit: str | None) -> Column:
    header = f"{key} [{unit}]" if unit else key
    return Column(field_by_key(key), index, header, unit)


def _filled(cell: str, key: str, value_si: float) -> FilledCell:
    return FilledCell("Materials", cell, "AISI 1045 hot rolled", key, value_si, "library")


def test_every_usable_cell_is_written_in_its_columns_unit_after_the_skipped_ones():
    spot = _Spot({"shear_modulus": _column("shear_modulus", 1, "GPa"),
                  "youngs_modulus": _column("youngs_modulus", 2, None),        # a stress with no unit
                  "yield_strength": _column("yield_strength", 3, "furlong"),   # a unit that is no stress
                  "poisson_ratio": _column("poisson_ratio", 4, None),          # a pure number needs none
                  "ultimate_strength": _column("ultimate_strength", 5, "MPa")})
    filled = [_filled("K2", "density", 7850.0),             # its column is not in the table
              _filled("C2", "youngs_modulus", 207e9),
              _filled("D2", "yield_strength", 310e6),
              _filled("F2", "ultimate_strength", 565e6),    # the file refuses this cell
              _filled("B2", "shear_modulus", 79.3e9),
              _filled("E2", "poisson_ratio", 0.292)]
    writer = _Writer(refuse={"F2"})
    fill_library_values(writer, _Result(_Materials(filled, spot)))
    assert writer.written == {"B2": pytest.approx(79.3), "E2": pytest.approx(0.292)}


def test_nothing_to_fill():
    writer = _Writer()
    for result in (_Result(None), _Result(_Materials([], _Spot({}))),
                   _Result(_Materials([_filled("B2", "shear_modulus", 79.3e9)], None))):
        fill_library_values(writer, result)
    assert writer.written == {}
