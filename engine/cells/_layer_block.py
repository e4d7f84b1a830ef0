"""A block of layers passed to a cell function, read into a `LayerStack` and row bookkeeping.

Three shapes, told apart by the header row (optional) and the column count:

* **one row per layer** (columns: material or G, outer D, inner D, allowable, optional Kt;
  innermost layer first). Without a ``Part`` column the block is one part; with one (header
  needed) the rows are grouped into parts by it, optionally ordered by a ``Layer`` column.
* **one row per part**: the layer columns repeat, once per layer (``Layer 1 outer diameter
  [mm]``, ``Layer 2 ...``), or, without a header, groups of five columns per layer.

Columns are read whole: a column of plain numbers under a header unit is one numpy
multiplication, other cells are parsed once per distinct text. A cell that cannot be read
becomes a message for its part; other parts are still rated.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import Any

import numpy as np
from numpy.typing import NDArray

from twistshare.engine.core import LayerStack
from twistshare.engine.units import UnitProblem, excel_error_text, parse_value, split_header, unit_system

from ._materials_block import MaterialsBlock, header_key
from ._values import CellError, looks_numeric

__all__ = ["LayerBlock", "read_layers", "LAYER_FIELDS"]

LAYER_FIELDS = ("material", "outer", "inner", "allowable", "kt")

_LABEL = MappingProxyType(
    {
        "material": "material or G",
        "outer": "outer diameter",
        "inner": "inner diameter",
        "allowable": "allowable",
        "kt": "Kt",
        "part": "part",
        "layer": "layer",
    }
)

_HEADER_NAMES: Mapping[str, str] = MappingProxyType(
    {
        **dict.fromkeys(["part", "part number", "part no", "part no.", "part id"], "part"),
        **dict.fromkeys(["layer", "layer no", "layer no.", "layer number"], "layer"),
        **dict.fromkeys(["material", "material or g", "g or material", "material/g", "g",
                         "shear modulus", "modulus"], "material"),
        **dict.fromkeys(["outer diameter", "outer dia", "outer dia.", "outer d", "od", "do",
                         "d outer", "outside diameter"], "outer"),
        **dict.fromkeys(["inner diameter", "inner dia", "inner dia.", "inner d", "id", "di",
                         "d inner", "inside diameter", "bore"], "inner"),
        **dict.fromkeys(["allowable", "allowable shear", "allowable shear stress",
                         "allowable stress", "tau allow", "τ allow"], "allowable"),
        **dict.fromkeys(["kt", "stress concentration", "stress concentration factor"], "kt"),
    }
)
_LAYER_PREFIX = re.compile(r"^layer\s*(\d+)\s*[:\-]?\s*", re.IGNORECASE)

# Magnitudes outside these bounds are almost always a unit slip (79 000 with GPa declared,
# 52 with m declared). A cell cannot carry a warning beside its number, so the cell functions
# refuse them; common practice for shaft work, deliberately wide.
_PLAUSIBLE: Mapping[str, tuple[float, float, str, float]] = MappingProxyType(
    {
        "material": (1e7, 1e12, "GPa", 1e9),       # shear modulus 0.01 GPa .. 1000 GPa
        "outer": (1e-5, 10.0, "mm", 1e-3),         # 0.01 mm .. 10 m
        "inner": (0.0, 10.0, "mm", 1e-3),
        "allowable": (1e4, 1e10, "MPa", 1e6),      # 0.01 MPa .. 10 000 MPa
    }
)
_WHAT = MappingProxyType(
    {"material": "shear modulus", "outer": "diameter", "inner": "diameter",
     "allowable": "allowable shear stress"}
)
_KIND = MappingProxyType(
    {"material": "stress", "outer": "length", "inner": "length", "allowable": "stress",
     "kt": "dimensionless"}
)


@dataclass(frozen=True)
class LayerBlock:
    """A layer block read for the engine.

    Attributes
    ----------
    stack : LayerStack
        ``(P, L)``, SI. Parts with a problem have no layers present.
    per_row_layers : bool
        True: one row per layer; False: one row per part.
    multi_part : bool
        More than one part can be in the block (a Part column, or one row per part).
    n_rows : int
        Data rows (the header excluded): the length of a spilled result.
    has_header : bool
    row_part : (n_rows,) int array
        Part index of each data row; -1 for an empty row.
    row_slot : (n_rows,) int array
        Layer slot of each data row (one row per layer); -1 otherwise.
    part_labels : tuple of str
        How messages name each part ("" for a single part).
    part_problem : tuple of (str or None)
        The first problem found in each part, worded for the cell.
    layer_rows : (P, L) int array
        Data row (1-based) of each layer, for messages; 0 where absent.
    system : str
        ``"SI"`` or ``"US"``, from the diameter unit, for wording values in messages.
    """

    stack: LayerStack
    per_row_layers: bool
    multi_part: bool
    n_rows: int
    has_header: bool
    row_part: NDArray[np.intp]
    row_slot: NDArray[np.intp]
    part_labels: tuple[str, ...]
    part_problem: tuple[str | None, ...]
    layer_rows: NDArray[np.intp]
    system: str

    @property
    def n_parts(self) -> int:
        """Number of parts."""
        return self.stack.n_parts

    def layer_label(self, part: int, slot: int) -> str:
        """``"layer 2 (row 3)"``, with the part when the block holds several."""
        row = int(self.layer_rows[part, slot])
        where = f"layer {slot + 1}"
        if self.per_row_layers and row:
            where += f" (row {row})"
        if self.multi_part:
            where = f"{self.part_labels[part]}, {where}"
        return where


def _is_blank(value: Any) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _is_header_row(row: list[Any]) -> bool:
    cells = [c for c in row if not _is_blank(c)]
    if not cells or not all(isinstance(c, str) and not looks_numeric(c) for c in cells):
        return False
    if any(excel_error_text(c) for c in cells):
        return False
    for cell in cells:
        name, unit = split_header(cell)
        if unit is not None or header_key(_LAYER_PREFIX.sub("", name)) in _HEADER_NAMES:
            return True
    return False


@dataclass(frozen=True)
class _Column:
    field: str
    index: int
    unit: str | None
    group: int        # layer group (one row per part); 0 for one row per layer


def _columns_from_header(header: list[Any]) -> list[_Column]:
    columns: list[_Column] = []
    seen: dict[str, int] = {}
    for index, cell in enumerate(header):
        if _is_blank(cell):
            continue
        name, unit = split_header(cell)
        prefix = _LAYER_PREFIX.match(name)
        key = header_key(_LAYER_PREFIX.sub("", name))
        field = _HEADER_NAMES.get(key)
        if field is None:
            if not key:  # a unit with no name: by position
                field = LAYER_FIELDS[index % 5] if index < 5 else None
            if field is None:
                raise CellError(
                    f"header {cell.strip()!r}",
                    "expected Part, Layer, Material (or G), Outer diameter, Inner diameter, "
                    "Allowable or Kt",
                )
        if prefix is not None:
            group = int(prefix.group(1)) - 1
        else:
            group = seen.get(field, 0)
        seen[field] = seen.get(field, 0) + 1
        columns.append(_Column(field, index, unit, group))
    return columns


def _positional_columns(width: int) -> list[_Column]:
    if width in (3, 4, 5):
        return [_Column(f, i, None, 0) for i, f in enumerate(LAYER_FIELDS[:width])]
    if width >= 10 and width % 5 == 0:
        return [_Column(LAYER_FIELDS[i % 5], i, None, i // 5) for i in range(width)]
    raise CellError(
        "layers",
        f"expected 3 to 5 columns (material or G, outer diameter, inner diameter, allowable, "
        f"Kt), or 5 per layer on one row; got {width} columns. Add a header row to name them",
    )


# (G, allowable or NaN, problem, label for the message, why the material gives no allowable)
_MaterialCell = tuple[float, float, str | None, str, str | None]


class _Reader:
    """Parses one column of cells at a time, memoising repeated texts."""

    def __init__(self, materials: MaterialsBlock) -> None:
        self.materials = materials
        self.material_cache: dict[str, Any] = {}

    def numbers(self, cells: Any, field: str, unit: str | None,
                rows: Any) -> tuple[NDArray[np.float64], dict[int, str]]:
        """SI values of a column and the problems by position."""
        kind = _KIND[field]
        n = len(cells)
        errors: dict[int, str] = {}
        if n and _all_plain_numbers(cells):
            values = np.array(cells, dtype=float)
            if unit is not None or kind == "dimensionless":
                try:
                    factor = parse_value(1.0, kind, unit)
                except UnitProblem as problem:
                    raise CellError(f"{_LABEL[field]}, header", str(problem)) from None
                values *= factor
                bad = ~np.isfinite(values)
                for i in np.flatnonzero(bad):
                    errors[int(i)] = self._message(field, rows[i], cells[i], unit)
                return values, errors
        values = np.empty(n)
        memo: dict[Any, tuple[float, str | None]] = {}
        for i, cell in enumerate(cells):
            key = (type(cell), cell) if isinstance(cell, (str, float, int)) else None
            if key is not None and key in memo:
                value, problem = memo[key]
            else:
                value, problem = self._one(cell, field, unit)
                if key is not None:
                    memo[key] = (value, problem)
            values[i] = value
            if problem is not None:
                errors[i] = f"{_LABEL[field]}, {rows[i]}: {problem}"
        return values, errors

    def _message(self, field: str, row: str, cell: Any, unit: str | None) -> str:
        return f"{_LABEL[field]}, {row}: {self._one(cell, field, unit)[1]}"

    def _one(self, cell: Any, field: str, unit: str | None) -> tuple[float, str | None]:
        if _is_blank(cell):
            if field == "inner":
                return 0.0, None            # an empty bore is a solid layer
            if field == "kt":
                return 1.0, None
            if field == "allowable":
                return math.nan, None       # may come from the material
        if field == "inner" and type(cell) in (int, float) and cell == 0:
            return 0.0, None                # zero needs no unit
        try:
            return parse_value(cell, _KIND[field], unit), None
        except UnitProblem as problem:
            return math.nan, str(problem)

    def material_column(self, cells: Any, unit: str | None, rows: Any
                        ) -> tuple[NDArray[np.float64], NDArray[np.float64], dict[int, str],
                                   dict[int, str]]:
        """Per row: shear modulus, the allowable its material implies (NaN if none), problems,
        and why a material gives no allowable (for rows that need one and give none)."""
        n = len(cells)
        allowable = np.full(n, math.nan)
        errors: dict[int, str] = {}
        why: dict[int, str] = {}
        if n and unit is not None and _all_plain_numbers(cells):
            modulus, errors = self.numbers(cells, "material", unit, rows)
            return modulus, allowable, errors, why
        if n and set(map(type, cells)) == {str}:
            # Text only (material names, "79 GPa"): read each distinct text once.
            distinct = {text: i for i, text in enumerate(dict.fromkeys(cells))}
            table = [self._material_cell(text, unit) for text in distinct]
            inverse = np.fromiter(map(distinct.__getitem__, cells), np.intp, n)
            modulus = np.array([t[0] for t in table], dtype=float)[inverse]
            allowable = np.array([t[1] for t in table], dtype=float)[inverse]
            noted = [i for i, t in enumerate(table) if t[2] is not None or t[4] is not None]
            if noted:
                for i in np.flatnonzero(np.isin(inverse, noted)).tolist():
                    _, _, problem, label, reason = table[inverse[i]]
                    if problem is not None:
                        errors[i] = _worded(label, rows[i], problem)
                    if reason is not None:
                        why[i] = reason
            return modulus, allowable, errors, why
        memo: dict[Any, _MaterialCell] = {}
        found_all = []
        for cell in cells:
            # Texts are memoised by value; numbers by type too, so 1 and True stay apart.
            key = cell if cell.__class__ is str else (type(cell), cell) if isinstance(
                cell, (float, int)) else None
            found = memo.get(key) if key is not None else None
            if found is None:
                found = self._material_cell(cell, unit)
                if key is not None:
                    memo[key] = found
            found_all.append(found)
        modulus = np.array([f[0] for f in found_all], dtype=float)
        allowable = np.array([f[1] for f in found_all], dtype=float)
        for i, (_, _, problem, label, reason) in enumerate(found_all):
            if problem is not None:
                errors[i] = _worded(label, rows[i], problem)
            if reason is not None:
                why[i] = reason
        return modulus, allowable, errors, why

    def _material_cell(self, cell: Any, unit: str | None) -> _MaterialCell:
        """(G, allowable from the material or NaN, problem, label, why no allowable)."""
        is_name = isinstance(cell, str) and not excel_error_text(cell) and not (
            looks_numeric(cell) and (unit is not None or _has_unit(cell)))
        if is_name and cell.strip():
            material, material_allowable, problem, reason = self.materials.lookup(
                cell, self.material_cache)
            if problem is None and material is not None and not material.shear_modulus > 0:
                problem = f"material {material.name!r} has no shear modulus"
            if problem is not None or material is None:
                # The problem names the material itself; the row is enough beside it.
                return math.nan, math.nan, problem, "", None
            return material.shear_modulus, material_allowable, None, "", reason
        value, problem = self._one(cell, "material", unit)
        if problem is not None and _is_blank(cell):
            problem = "cell is empty; expected a material name or a shear modulus G"
        return value, math.nan, problem, _LABEL["material"], None


def _worded(label: str, row: str, problem: str) -> str:
    return f"{label}, {row}: {problem}" if label else f"{row}: {problem}"


def _all_plain_numbers(cells: Any) -> bool:
    return set(map(type, cells)) <= {float, int}


class _Labels:
    """Row labels for messages, worded only when a message needs one (blocks can be long)."""

    def __init__(self, word: Callable[[int], str]) -> None:
        self._word = word

    def __getitem__(self, index: int) -> str:
        return self._word(int(index))


def _has_unit(text: str) -> bool:
    return bool(re.match(r"\s*[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?\s*\S", text))


def _plausibility(field: str, values: NDArray[np.float64], rows: Any,
                  errors: dict[int, str]) -> None:
    low, high, unit, factor = _PLAUSIBLE[field]
    with np.errstate(invalid="ignore"):
        bad = np.isfinite(values) & (values > 0) & ((values < low) | (values > high))
    for i in np.flatnonzero(bad):
        i = int(i)
        if i not in errors:
            errors[i] = (
                f"{_LABEL[field]}, {rows[i]}: {values[i] / factor:g} {unit} is not a plausible "
                f"{_WHAT[field]} (expected {low / factor:g} to {high / factor:g} {unit}); "
                "check the unit"
            )


def _part_key(value: Any) -> str:
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


def read_layers(layers: Any, materials: MaterialsBlock, need_allowable: bool = True) -> LayerBlock:
    """Read a layer block argument.

    Parameters
    ----------
    layers : list of lists
        As xlwings passes a range with ``ndim=2``; a 1-D list is one row.
    materials : MaterialsBlock
        The user's materials (may be empty); the built-in library is searched after it.
    need_allowable : bool
        False for results that do not depend on the allowable (share, stress, twist): the
        allowable column may then be missing and is not read.

    Returns
    -------
    LayerBlock

    Raises
    ------
    CellError
        When the block as a whole cannot be read (no rows, an unknown header, a wrong
        column count, a header unit of the wrong kind). Problems of single cells are kept
        per part instead.
    """
    if not isinstance(layers, (list, tuple)):
        raise CellError("layers", "expected a block of cells, one row per layer")
    row_types = set(map(type, layers))
    if row_types <= {list, tuple}:
        rows = layers                    # the usual list of lists: no copy
    elif row_types.isdisjoint({list, tuple}):
        rows = [list(layers)]            # a 1-D list: one row
    else:
        rows = [r if isinstance(r, (list, tuple)) else [r] for r in layers]
    widths = set(map(len, rows))
    width = max(widths, default=0)
    if len(widths) > 1:
        rows = [list(r) + [None] * (width - len(r)) for r in rows]
    has_header = bool(rows) and _is_header_row(rows[0])
    if not has_header:
        # A selection wider than the block: empty columns on the right say nothing.
        while width > 5 and all(_is_blank(r[width - 1]) for r in rows):
            width -= 1
    columns = _columns_from_header(rows[0]) if has_header else _positional_columns(width)
    data = rows[1:] if has_header else rows
    if not data:
        raise CellError("layers", "the block has no layer rows")
    fields = {c.field for c in columns}
    groups = sorted({c.group for c in columns})
    per_row_layers = len(groups) == 1
    for needed in ("material", "outer") + (("allowable",) if need_allowable else ()):
        if needed not in fields:
            raise CellError("layers", f"no {_LABEL[needed]} column")
    if not per_row_layers and ("layer" in fields):
        raise CellError("layers", "a Layer column belongs to a block with one row per layer")
    by_key: dict[tuple[str, int], _Column] = {}
    for column in columns:
        if (column.field, column.group) in by_key:
            raise CellError("layers", f"two {_LABEL[column.field]} columns for layer "
                            f"{column.group + 1}")
        by_key[(column.field, column.group)] = column
    outer_unit = next((c.unit for c in columns if c.field == "outer" and c.unit), None)
    try:
        system = unit_system(outer_unit) if outer_unit else "SI"
    except UnitProblem as problem:
        raise CellError("outer diameter, header", str(problem)) from None

    n_rows = len(data)
    blank_row = np.ones(n_rows, bool)
    by_column = list(zip(*data))     # one tuple of cells per column
    value_columns = [by_column[c.index] for c in columns if c.field not in ("part", "layer")]
    # One column of plain numbers means no row is blank: the common case, checked first.
    if any(_all_plain_numbers(cells) for cells in value_columns):
        blank_row[:] = False
    else:
        for cells in value_columns:
            blank_row &= np.fromiter((_is_blank(v) for v in cells), bool, n_rows)
    first = 2 if has_header else 1
    if per_row_layers:
        return _per_row_layers(by_column, by_key, blank_row, materials, has_header, system,
                               first, need_allowable)
    return _per_row_parts(data, by_column, by_key, groups, blank_row, materials, has_header,
                          system, first, n_rows, need_allowable)


def _read_group(by_column: list[tuple[Any, ...]], by_key: dict[tuple[str, int], _Column],
                group: int,
                take: list[int], reader: _Reader, labels: Any, need_allowable: bool
                ) -> tuple[dict[str, NDArray[np.float64]], dict[int, str]]:
    """Values of one layer group over the rows `take`; problems by position in `take`."""
    errors: dict[int, str] = {}
    values: dict[str, NDArray[np.float64]] = {}
    every_row = len(take) == len(by_column[0])
    cells: dict[str, Any] = {}
    for f in LAYER_FIELDS:
        column = by_key.get((f, group))
        if column is None:
            cells[f] = [None] * len(take)
        else:
            all_cells = by_column[column.index]
            cells[f] = all_cells if every_row else [all_cells[r] for r in take]
    material = by_key[("material", group)] if ("material", group) in by_key else None
    modulus, material_allowable, found, no_allowable = reader.material_column(
        cells["material"], material.unit if material else None, labels)
    errors.update(found)
    values["material"] = modulus
    for f in ("outer", "inner", "allowable", "kt"):
        if f == "allowable" and not need_allowable:
            # Not used by the result asked for; a placeholder keeps the core's checks of
            # the geometry and moduli, and nothing derived from it is returned.
            values[f] = np.ones(len(take))
            continue
        column = by_key.get((f, group))
        got, found = reader.numbers(cells[f], f, column.unit if column else None, labels)
        for i, message in found.items():
            errors.setdefault(i, message)
        values[f] = got
    if need_allowable:
        missing = np.isnan(values["allowable"])
        values["allowable"] = np.where(missing, material_allowable, values["allowable"])
        for i in np.flatnonzero(np.isnan(values["allowable"])):
            i = int(i)
            if i in errors:
                continue
            if i in no_allowable:
                errors[i] = f"{labels[i]}: {no_allowable[i]}"
            else:
                errors[i] = (f"allowable, {labels[i]}: cell is empty and the material gives "
                             "none; give the allowable shear stress (e.g. from TWS_ALLOWABLE)")
    for f in ("material", "outer", "inner") + (("allowable",) if need_allowable else ()):
        _plausibility(f, values[f], labels, errors)
    return values, errors


def _per_row_layers(by_column: list[tuple[Any, ...]], by_key: dict[tuple[str, int], _Column],
                    blank_row: NDArray[np.bool_], materials: MaterialsBlock, has_header: bool,
                    system: str, first: int, need_allowable: bool) -> LayerBlock:
    reader = _Reader(materials)
    n_rows = len(by_column[0])
    take = np.flatnonzero(~blank_row).tolist()
    if not take:
        raise CellError("layers", "the block has no layer rows")
    part_column = by_key.get(("part", 0))
    layer_column = by_key.get(("layer", 0))
    row_part = np.full(n_rows, -1, dtype=np.intp)
    row_slot = np.full(n_rows, -1, dtype=np.intp)
    part_ids: list[str] = []
    part_index: dict[str, int] = {}
    pre_errors: dict[int, str] = {}
    current = None
    parts_of_take: list[int] = []
    if part_column is None:
        part_ids.append("")
        parts_of_take = [0] * len(take)
    part_cells: Any = []
    if part_column is not None:
        all_parts = by_column[part_column.index]
        part_cells = all_parts if len(take) == n_rows else [all_parts[r] for r in take]
    if part_cells and set(map(type, part_cells)) == {str}:
        keys = list(map(str.strip, part_cells))
        if all(keys):
            part_index = {k: i for i, k in enumerate(dict.fromkeys(keys))}
            part_ids = list(part_index)
            parts_of_take = list(map(part_index.__getitem__, keys))
            part_cells = []   # done: every row names its part
    for r, cell in zip(take, part_cells):
        if cell.__class__ is str and cell.strip():
            key = cell.strip()
        elif not _is_blank(cell):
            key = _part_key(cell)
        elif current is not None:
            key = current     # an empty part cell continues the part above
        else:
            key = f"row {r + first}"
            pre_errors[r] = f"part, row {r + first}: cell is empty; expected a part id"
        current = key
        index = part_index.get(key)
        if index is None:
            index = part_index[key] = len(part_ids)
            part_ids.append(key)
        parts_of_take.append(index)
    row_part[take] = parts_of_take
    n_parts = len(part_ids)
    labels = _Labels(lambda i: f"row {take[i] + first}"
                     + (f" (part {part_ids[row_part[take[i]]]})" if part_column else ""))
    values, errors = _read_group(by_column, by_key, 0, take, reader, labels, need_allowable)
    position = {r: i for i, r in enumerate(take)} if pre_errors else {}
    for r, message in pre_errors.items():
        errors.setdefault(position[r], message)

    # Slots: the Layer column's number, else the order of rows within the part.
    counts = np.zeros(n_parts, dtype=np.intp)
    take_array = np.asarray(take, dtype=np.intp)
    if layer_column is None:
        parts_of = row_part[take_array]
        order = np.argsort(parts_of, kind="stable")
        sorted_parts = parts_of[order]
        starts = np.searchsorted(sorted_parts, sorted_parts, side="left")
        slots = np.empty_like(parts_of)
        slots[order] = np.arange(parts_of.size) - starts
        row_slot[take_array] = slots
        counts = np.bincount(parts_of, minlength=n_parts)
    for i, r in enumerate(take if layer_column is not None else ()):
        p = row_part[r]
        if layer_column is not None:
            cell = by_column[layer_column.index][r]
            try:
                number = parse_value(cell, "dimensionless")
            except UnitProblem as problem:
                errors.setdefault(i, f"layer, {labels[i]}: {problem}")
                number = counts[p] + 1
            if not (float(number).is_integer() and 1 <= number <= 10_000):
                errors.setdefault(i, f"layer, {labels[i]}: expected a layer number 1, 2, ... "
                                     f"(1 = innermost), got {cell!r}")
                number = counts[p] + 1
            row_slot[r] = int(number) - 1
            counts[p] = max(counts[p], int(number))
    n_layers = int(counts.max()) if n_parts else 0

    shape = (n_parts, max(n_layers, 1))
    arrays = {f: np.full(shape, math.nan) for f in LAYER_FIELDS}
    present = np.zeros(shape, bool)
    layer_rows = np.zeros(shape, dtype=np.intp)
    part_problem: list[str | None] = [None] * n_parts
    parts_of = row_part[take_array]
    slots_of = row_slot[take_array]
    for f in LAYER_FIELDS:
        arrays[f][parts_of, slots_of] = values[f]
    # A repeated layer number within a part is a problem of that part.
    flat = parts_of * shape[1] + slots_of
    order = np.argsort(flat, kind="stable")
    repeated = np.flatnonzero(np.diff(flat[order]) == 0)
    for j in repeated:
        i = int(order[j + 1])
        errors.setdefault(i, f"layer, {labels[i]}: layer {slots_of[i] + 1} appears twice "
                             "in this part")
    present[parts_of, slots_of] = True
    layer_rows[parts_of, slots_of] = take_array + first
    for i in sorted(errors):
        p = int(parts_of[i])
        if part_problem[p] is None:
            part_problem[p] = errors[i]
    _order_problems(arrays["outer"], present, part_problem, layer_rows, per_row=True,
                    labels=[f"part {k}" for k in part_ids] if part_column else None)
    for p, problem in enumerate(part_problem):
        if problem is not None:
            present[p] = False
    stack = LayerStack(
        outer_diameter=arrays["outer"], inner_diameter=arrays["inner"],
        shear_modulus=arrays["material"], allowable_shear=arrays["allowable"],
        stress_concentration=arrays["kt"], present=present,
    )
    return LayerBlock(
        stack=stack, per_row_layers=True, multi_part=part_column is not None, n_rows=n_rows,
        has_header=has_header, row_part=row_part, row_slot=row_slot,
        part_labels=tuple(f"part {k}" for k in part_ids), part_problem=tuple(part_problem),
        layer_rows=layer_rows, system=system,
    )


def _order_problems(outer: NDArray[np.float64], present: NDArray[np.bool_],
                    part_problem: list[str | None], layer_rows: NDArray[np.intp], per_row: bool,
                    labels: Any) -> None:
    """Layers must be listed innermost first: say so plainly rather than as an overlap."""
    if outer.shape[1] < 2:
        return
    with np.errstate(invalid="ignore"):
        shrinking = present[:, 1:] & present[:, :-1] & (outer[:, 1:] < outer[:, :-1])
    for p in np.flatnonzero(shrinking.any(axis=1)):
        p = int(p)
        if part_problem[p] is not None:
            continue
        slot = int(np.flatnonzero(shrinking[p])[0]) + 1
        where = f"row {layer_rows[p, slot]}" if per_row else f"layer {slot + 1}"
        prefix = f"{labels[p]}, " if labels else ""
        part_problem[p] = (
            f"{prefix}{where}: outer diameter is smaller than the layer before it; list the "
            "layers innermost first"
        )


def _per_row_parts(data: list[list[Any]], by_column: list[tuple[Any, ...]],
                   by_key: dict[tuple[str, int], _Column], groups: list[int],
                   blank_row: NDArray[np.bool_], materials: MaterialsBlock, has_header: bool,
                   system: str, first: int, n_rows: int, need_allowable: bool) -> LayerBlock:
    reader = _Reader(materials)
    n_groups = len(groups)
    part_column = by_key.get(("part", 0))
    take = list(range(n_rows))
    def row_label(r: int) -> str:
        if part_column is not None and not _is_blank(data[r][part_column.index]):
            return f"part {_part_key(data[r][part_column.index])}"
        return f"row {r + first}"

    labels_by_row = _Labels(row_label)
    shape = (n_rows, n_groups)
    arrays = {f: np.full(shape, math.nan) for f in LAYER_FIELDS}
    present = np.zeros(shape, bool)
    part_problem: list[str | None] = [None] * n_rows
    for slot, group in enumerate(groups):
        # A layer group left empty on a row is an absent layer, not a problem.
        group_cells = [c.index for (f, g), c in by_key.items() if g == group and f != "part"]
        filled = [r for r in take if not all(_is_blank(data[r][i]) for i in group_cells)]
        if not filled:
            continue
        labels = _Labels(lambda i, filled=filled, slot=slot:
                         f"{labels_by_row[filled[i]]}, layer {slot + 1}")
        values, errors = _read_group(by_column, by_key, group, filled, reader, labels,
                                     need_allowable)
        idx = np.asarray(filled, dtype=np.intp)
        for f in LAYER_FIELDS:
            arrays[f][idx, slot] = values[f]
        present[idx, slot] = True
        for i, message in sorted(errors.items()):
            r = filled[i]
            if part_problem[r] is None:
                part_problem[r] = message
    row_part = np.arange(n_rows, dtype=np.intp)
    for r in take:
        if blank_row[r]:
            row_part[r] = -1
    layer_rows = np.where(present, np.arange(n_rows)[:, None] + first, 0)
    _order_problems(arrays["outer"], present, part_problem, layer_rows, per_row=False,
                    labels=labels_by_row)
    for p, problem in enumerate(part_problem):
        if problem is not None:
            present[p] = False
    stack = LayerStack(
        outer_diameter=arrays["outer"], inner_diameter=arrays["inner"],
        shear_modulus=arrays["material"], allowable_shear=arrays["allowable"],
        stress_concentration=arrays["kt"], present=present,
    )
    return LayerBlock(
        stack=stack, per_row_layers=False, multi_part=n_rows > 1, n_rows=n_rows,
        has_header=has_header, row_part=row_part, row_slot=np.full(n_rows, -1, dtype=np.intp),
        part_labels=tuple(labels_by_row[r] for r in range(n_rows)),
        part_problem=tuple(part_problem),
        layer_rows=layer_rows, system=system,
    )
