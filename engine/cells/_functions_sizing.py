"""The sizing cell functions: solve a dimension, round it up to stock, restore a machined shaft.

Arguments are read by the intake's rules (the same fields and words as a parts table's sizing
columns); the physics is the core's `solve_dimension`, `round_up_to_stock` and `restore_sleeve`.
The parameters carry no type hints on purpose (xlwings reads a hint as a converter).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
from twistshare.engine.core import (
    OuterLayers,
    SizedDimension,
    SizingStatus,
    StockStatus,
    restore_sleeve,
    round_up_to_stock,
    solve_dimension,
)
from twistshare.engine.intake import LAYER_FIELDS, field_by_key, header_factor
from twistshare.engine.intake._sizing_input import parse_stock_list, slot_refusal
from twistshare.engine.intake._wording import SIZING_STATUS_WORDS, STOCK_STATUS_WORDS
from twistshare.engine.intake._words import (
    OUTER_LAYERS_CHOICES,
    SIZE_CHOICES,
    error_value_text,
    outer_layers_from_text,
    size_request_from_text,
)
from twistshare.engine.units import split_header

from ._arguments import WARNING_SIGN, CellError, flatten, is_empty, read_field, result_factor, single_value
from ._blocks import read_block, read_materials_block
from ._functions import _LAYERS, _LENGTH, _MATERIALS, _TORQUE_ARG, _TWIST_LIMIT, _TWIST_PER_LENGTH, _duty, _title
from ._registry import Argument, cell_function
from ._spill import merge, rate_block, spill_parts

__all__ = ["TWS_SIZE_FOR", "TWS_STOCK_SIZE", "TWS_RESTORE_SLEEVE"]

_LAYER = {f.key: f for f in LAYER_FIELDS}
_TARGET = field_by_key("target_reserve")
_STOCK = field_by_key("stock")

_SIZE_ARG = Argument("size", "Dimension to size: 'layer 2 outer diameter', 'layer 2 wall' or 'core bore' "
                     "('outer diameter' or 'wall' alone: the outermost layer)")
_TARGET_ARG = Argument("target_reserve", "Target reserve factor, governing limit / torque, at least 1 "
                       "(optional, default 1)")
_OUTER_ARG = Argument("outer_layers", "'move' (default: the layers outside keep their walls and move "
                      "out) or 'fixed' (only the outermost layer can then be sized)")
_LENGTH_RESULT = Argument("result_unit", "Unit of the result (default mm)", unit="length: mm, m, in")


def _request(size: Any, target_reserve: Any, outer_layers: Any) -> tuple[SizedDimension, int, float, OuterLayers]:
    """The dimension, its layer slot (-1 outermost), the target and the outer layers, by the intake's words."""
    text = single_value(size, "size")
    if is_empty(text):
        raise CellError("size", f"cell is empty; expected {SIZE_CHOICES}")
    if error_value_text(text) is not None:
        raise CellError("size", f"cell holds the error {error_value_text(text)}")
    got = size_request_from_text(text)
    if got is None:
        raise CellError("size", f"{text!r} is not a dimension twistshare sizes; expected {SIZE_CHOICES}")
    target = 1.0 if is_empty(target_reserve) else read_field(target_reserve, _TARGET, "target reserve factor")
    outer = OuterLayers.MOVE
    word = single_value(outer_layers, "outer layers")
    if not is_empty(word):
        outer = outer_layers_from_text(word)
        if outer is None:
            raise CellError("outer layers", f"expected {OUTER_LAYERS_CHOICES}, got {word!r}")
    return got[0], got[1], target, outer


def _slots(block, dimension: SizedDimension, layer: int, outer: OuterLayers) -> tuple[np.ndarray, list[str | None]]:
    """Each part's slot, and a problem where the part has no such layer (the table's rule)."""
    present = block.parts.present
    count = np.count_nonzero(present, axis=1)
    slot = np.where(layer < 0, count - 1, layer) if dimension != SizedDimension.BORE else np.zeros_like(count)
    problems: list[str | None] = [None] * block.n_parts
    for i in range(block.n_parts):
        if count[i] == 0:
            continue  # the block's own problem says why
        why = slot_refusal(dimension, slot[i], count[i], outer)
        if why == "size-layer":
            problems[i] = f"size: the part has {count[i]} layer(s)"
        elif why == "size-fixed":
            problems[i] = (f"size: with the outer layers fixed only the outermost layer (layer {count[i]}) "
                           "can be sized; say 'move' or size that layer")
    return np.maximum(slot, 0), problems


def _solve(layers, torque, size, target_reserve, length, twist_limit, twist_limit_per_length, outer_layers,
           materials):
    dimension, layer, target, outer = _request(size, target_reserve, outer_layers)
    block = read_block(layers, materials, True)
    duty, extra = _duty(block, torque, length, twist_limit, twist_limit_per_length, torque_required=True)
    _rating, problems = rate_block(block, duty, extra)
    slot, slot_problems = _slots(block, dimension, layer, outer)
    problems = merge(problems, slot_problems)
    found = solve_dimension(block.stack(), duty, dimension=dimension, layer=slot, outer_layers=outer,
                            target_reserve=target)
    return block, duty, dimension, slot, target, outer, found, problems


def _size_cells(found, problems: list[str | None], factor: float) -> list[Any]:
    out: list[Any] = []
    for i, status in enumerate(found.status.tolist()):
        if problems[i] is None and status in (SizingStatus.SOLVED, SizingStatus.HOLDS_AT_LEAST):
            out.append(float(found.size[i] / factor))
        else:
            problems[i] = problems[i] or f"sizing: {SIZING_STATUS_WORDS[SizingStatus(status)]}"
            out.append(f"{WARNING_SIGN} {problems[i]}")
    return out


@cell_function(
    "Size one dimension of a part (a layer's outer diameter or wall, or the core's bore) so that its "
    "governing limit is the torque times the target reserve factor",
    _LAYERS, _TORQUE_ARG, _SIZE_ARG, _TARGET_ARG, _LENGTH, _TWIST_LIMIT, _TWIST_PER_LENGTH, _OUTER_ARG,
    _LENGTH_RESULT, _MATERIALS,
    returns="the solved size (within 0.001 mm, on the safe side), in result_unit",
    shape="one per part",
)
def TWS_SIZE_FOR(layers, torque, size, target_reserve=None, length=None, twist_limit=None,
                 twist_limit_per_length=None, outer_layers=None, result_unit=None, materials=None):
    """The dimension at which the governing limit equals ``|T| * target``, as the Size column solves it.

    Parameters
    ----------
    layers : list of lists
        The layer block; the named dimension's present value is only a starting point.
    torque : str, torque
    size : str
        ``"layer 2 outer diameter"``, ``"layer 2 wall"``, ``"core bore"``.
    target_reserve : number, 1, optional
        At least 1; default 1.
    length, twist_limit, twist_limit_per_length : str, optional
        Twist limits take part in the sizing as in a rating.
    outer_layers : str, optional
        ``"move"`` (default) or ``"fixed"``.
    result_unit : str, optional
        A length unit; default mm.
    materials : list of lists, optional

    Returns
    -------
    float, list of lists or str
        The size per part, or a ``⚠`` message (no size holds, the part has no such layer...).
    """
    factor = result_factor("mm" if is_empty(result_unit) else result_unit, "length")
    block, _duty_arrays, _dim, _slot, _t, _o, found, problems = _solve(
        layers, torque, size, target_reserve, length, twist_limit, twist_limit_per_length, outer_layers, materials)
    return spill_parts(block, _size_cells(found, problems, factor), [None] * block.n_parts,
                       _title("size", result_unit or "mm", "length"))


def _stock_list(stock: Any) -> list[float]:
    """A stock list: one cell (``"60; 63; 65"``, each size with the unit or the list with one), or a
    range of cells, optionally headed by ``Stock sizes [mm]``."""
    cells = [c for c in (flatten(stock) if isinstance(stock, (list, tuple)) else [stock]) if not is_empty(c)]
    if not cells:
        raise CellError("stock", "cell is empty; expected stock sizes such as '60; 63; 65 mm'")
    unit = None
    if isinstance(cells[0], str) and "[" in cells[0] and len(cells) > 1:
        unit = split_header(cells[0])[1]
        cells = cells[1:]
    factor = None
    if unit is not None:
        factor, issue = header_factor(_STOCK, unit, "stock")
        if issue:
            raise CellError("stock", issue)
    sizes: list[float] = []
    for cell in cells:
        if error_value_text(cell) is not None:
            raise CellError("stock", f"cell holds the error {error_value_text(cell)}")
        got, problem = parse_stock_list(cell, _STOCK, unit, factor,
                                        "no unit: write it with its unit, e.g. '60; 63; 65 mm'")
        if problem is not None:
            raise CellError("stock", problem)
        sizes += got
    if any(b <= a for a, b in zip(sizes, sizes[1:])):
        raise CellError("stock", "stock sizes must be listed ascending, each once")
    return sizes


@cell_function(
    "Round a sized dimension up to stock: the first stock size (smallest diameter or wall, largest bore) "
    "that holds the target reserve factor, re-rated",
    _LAYERS, _TORQUE_ARG, _SIZE_ARG,
    Argument("stock", "Stock sizes ascending: one cell '60; 63; 65 mm' (';' or ',' between sizes, the "
             "point for decimals) or a range of cells", unit="length: mm, m, in"),
    _TARGET_ARG, _LENGTH, _TWIST_LIMIT, _TWIST_PER_LENGTH, _OUTER_ARG, _LENGTH_RESULT, _MATERIALS,
    returns="the stock size chosen, in result_unit",
    shape="one per part",
)
def TWS_STOCK_SIZE(layers, torque, size, stock, target_reserve=None, length=None, twist_limit=None,
                   twist_limit_per_length=None, outer_layers=None, result_unit=None, materials=None):
    """The stock size a parts table's ``Stock sizes`` column chooses: solve, then round to stock.

    Parameters are those of `TWS_SIZE_FOR`, with ``stock`` the list of stock sizes (outer
    diameters, walls or bores, as ``size`` says).

    Returns
    -------
    float, list of lists or str
    """
    factor = result_factor("mm" if is_empty(result_unit) else result_unit, "length")
    sizes = np.array(_stock_list(stock))
    block, duty, dimension, slot, target, outer, found, problems = _solve(
        layers, torque, size, target_reserve, length, twist_limit, twist_limit_per_length, outer_layers, materials)
    got = round_up_to_stock(block.stack(), duty, found.size, sizes, dimension=dimension, layer=slot,
                            outer_layers=outer, target_reserve=target)
    values: list[Any] = []
    for i, status in enumerate(got.status.tolist()):
        if problems[i] is None and status == StockStatus.FOUND:
            values.append(float(got.size[i] / factor))
        else:
            values.append(f"{WARNING_SIGN} {problems[i] or 'stock: ' + STOCK_STATUS_WORDS[StockStatus(status)]}")
    return spill_parts(block, values, [None] * block.n_parts, _title("stock size", result_unit or "mm", "length"))


def _material(name: Any, materials, where: str) -> tuple[float, float]:
    """G and allowable of a material name (the materials block, then the library)."""
    name = single_value(name, where)
    if is_empty(name) or not isinstance(name, str):
        raise CellError(where, f"expected a material name, got {name!r}")
    found, why = materials.lookup(name, need_allowable=True)
    if found is None:
        raise CellError(where, why or "unknown material")
    if found.warnings:
        raise CellError(where, found.warnings[0])
    return found.shear_modulus, found.allowable_shear


@cell_function(
    "Restore a machined shaft: the sleeve outer diameter over the reduced core whose compound capacity "
    "equals the original's, and the change in twist stiffness (one row per candidate sleeve material)",
    Argument("outer_diameter", "Original outer diameter, e.g. '60 mm'", unit="length: mm, m, in"),
    Argument("bore", "Original bore (empty or 0: solid)", unit="length: mm, m, in"),
    Argument("material", "Material of the original shaft (a name in the materials block or the library)"),
    Argument("reduced_diameter", "Core diameter after machining, e.g. '54 mm'", unit="length: mm, m, in"),
    Argument("sleeve_material", "Sleeve material name, or a range of candidate names"),
    Argument("kt", "Stress-concentration factor Kt of the original at its surface, also applied to the "
             "core and the sleeve (optional, default 1)"),
    _LENGTH_RESULT, _MATERIALS,
    returns="one row per sleeve material: sleeve outer diameter (in result_unit) and ΣGJ restored / GJ original",
    shape="one per part",
)
def TWS_RESTORE_SLEEVE(outer_diameter, bore, material, reduced_diameter, sleeve_material, kt=None,
                       result_unit=None, materials=None):
    """Sleeve outer diameter that gives a turned-down shaft its capacity back, per candidate material.

    Returns
    -------
    list of lists, or str
        ``[[sleeve outer diameter, stiffness ratio], ...]``, one row per candidate; a candidate
        with no solution shows a ``⚠`` message in its first cell.
    """
    factor = result_factor("mm" if is_empty(result_unit) else result_unit, "length")
    mset, _ = read_materials_block(materials)
    od = read_field(outer_diameter, _LAYER["outer_diameter"], "outer diameter")
    inner = 0.0 if is_empty(bore) else read_field(bore, _LAYER["inner_diameter"], "bore")
    reduced = read_field(reduced_diameter, _LAYER["outer_diameter"], "reduced diameter")
    k = 1.0 if is_empty(kt) else read_field(kt, _LAYER["kt"], "Kt")
    if not inner < reduced < od:
        raise CellError("reduced diameter", f"{reduced / 1e-3:g} mm must lie between the bore "
                        f"{inner / 1e-3:g} mm and the outer diameter {od / 1e-3:g} mm")
    g, tau = _material(material, mset, "material")
    names = [c for c in (flatten(sleeve_material) if isinstance(sleeve_material, (list, tuple))
                         else [sleeve_material]) if not is_empty(c)]
    if not names:
        raise CellError("sleeve material", "cell is empty; expected a material name or a range of names")
    rows: list[list[Any]] = []
    picked: list[int] = []
    moduli, allowables = [], []
    for n, name in enumerate(names):
        try:
            gs, ts = _material(name, mset, f"sleeve material {name!r}" if len(names) > 1 else "sleeve material")
        except CellError as problem:
            if len(names) == 1:
                raise
            rows.append([str(problem), ""])
            continue
        rows.append([None, None])
        picked.append(n)
        moduli.append(gs)
        allowables.append(ts)
    if picked:
        got = restore_sleeve(od, inner, g, tau, reduced, np.array(moduli), np.array(allowables),
                             stress_concentration=k)
        for m, n in enumerate(picked):
            status = SizingStatus(int(got.status[0, m]))
            size = float(got.sleeve_outer_diameter[0, m])
            if status in (SizingStatus.SOLVED, SizingStatus.HOLDS_AT_LEAST) and math.isfinite(size):
                rows[n] = [size / factor, float(got.stiffness_ratio[0, m])]
            else:
                rows[n] = [f"{WARNING_SIGN} {SIZING_STATUS_WORDS[status]}", ""]
    if len(rows) == 1 and isinstance(rows[0][0], str):
        return rows[0][0]
    return rows
