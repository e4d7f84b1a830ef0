"""A part's duty from its table columns: torque, or power at a speed, a service factor, the
length and the twist limits, each with the cell it came from."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from twistshare.engine.core import torque_from_power

from ._cellrefs import CellRefs
from ._columns import NumericColumn, read_numeric
from ._grid import SheetGrid, cell_ref
from ._problems import Problem, Severity
from ._tables import TableSpot

__all__ = ["DutyColumns", "read_duty", "DUTY_KEYS"]

DUTY_KEYS = ("length", "torque", "power", "speed", "service_factor", "twist_limit_angle",
             "twist_limit_per_length")


@dataclass
class DutyColumns:
    """The duty of P parts, SI; ``torque`` has the service factor applied. NaN: not given."""

    torque: np.ndarray
    length: np.ndarray
    twist_limit_angle: np.ndarray
    twist_limit_per_length: np.ndarray
    source: list[str]  # "torque", "power" or "none"
    bad: np.ndarray
    cells: CellRefs
    speed: np.ndarray | None = None  # rad/s, as given (the whirl check uses it with a torque too)


def read_duty(grid: SheetGrid, spot: TableSpot, rows: list[int], ids: list[str], who,
              error: np.ndarray, findings: list[Problem], header_seen: set) -> DutyColumns:
    """Read the duty columns of the parts table; ``error`` marks parts already refused."""
    n = len(rows)
    cells = CellRefs(grid.name, rows)
    cols: dict[str, NumericColumn | None] = {}
    bad = np.zeros(n, bool)
    for key in DUTY_KEYS:
        col = spot.column(key)
        cols[key] = None if col is None else read_numeric(grid, col, rows, who, findings, spot.header_row,
                                                          header_seen)
        if col is not None:
            bad |= cols[key].bad
            cells.column((key,), col.index)
    refused = error | bad

    def vals(key: str) -> np.ndarray:
        nc = cols.get(key)
        return np.full(n, np.nan) if nc is None else nc.values

    def at(key: str, i: int) -> str | None:
        c = spot.column(key)
        return cell_ref(rows[i], c.index) if c else None

    length = vals("length")
    missing_length = np.isnan(length) & ~refused
    for i in np.flatnonzero(missing_length):
        findings.append(Problem(Severity.ERROR, grid.name, at("length", i),
                                f"part {ids[i]}: length is missing; expected a length such as '450 mm'",
                                part=ids[i], code="missing"))
    bad |= missing_length
    sf = vals("service_factor")
    sf = np.where(np.isnan(sf), 1.0, sf)
    torque = vals("torque")
    power, speed = vals("power"), vals("speed")
    from_power = np.asarray(torque_from_power(power, speed, sf), dtype=float)
    has_t = ~np.isnan(torque)
    has_p = ~has_t & ~(np.isnan(power) & np.isnan(speed))
    t_out = np.where(has_t, torque * sf, np.where(has_p, from_power, np.nan))
    source = np.where(has_t, "torque", np.where(has_p, "power", "none")).tolist()
    with np.errstate(invalid="ignore"):
        disagree = has_t & ~np.isnan(power) & np.isfinite(from_power) & (
            np.abs(from_power - t_out) > 0.01 * np.abs(t_out))
    for i in np.flatnonzero(disagree):
        findings.append(Problem(
            Severity.WARNING, grid.name, at("torque", i), f"part {ids[i]}: torque and "
            f"power at speed are both given and disagree ({t_out[i]:.6g} N·m against "
            f"{from_power[i]:.6g} N·m); the torque is used", part=ids[i], code="duty-disagrees"))
    for i in np.flatnonzero(has_p & ~np.isfinite(from_power) & ~refused):
        miss = "power" if math.isnan(power[i]) and not math.isnan(speed[i]) else "speed"
        why = "is missing" if math.isnan(vals(miss)[i]) else "must be above zero"
        findings.append(Problem(
            Severity.ERROR, grid.name, at(miss, i),
            f"part {ids[i]}: the duty is a power at a speed but the {miss} {why}", part=ids[i], code="missing"))
        bad[i] = True
    no_duty = ~has_t & ~has_p & ~refused
    for i in np.flatnonzero(no_duty):
        findings.append(Problem(
            Severity.ERROR, grid.name, at("torque", i) or at("power", i),
            f"part {ids[i]}: no duty: give a torque, or a power and a speed", part=ids[i], code="missing"))
    bad |= no_duty
    return DutyColumns(t_out, length, vals("twist_limit_angle"), vals("twist_limit_per_length"), source, bad, cells,
                       speed)
