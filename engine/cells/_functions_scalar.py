"""The worksheet functions of single cells: the torque a drive puts through, an allowable by rule.

Both read their arguments by the intake's fields (plausible ranges included) and decide an
allowable exactly as a materials table's row is decided (`intake._allowable_rule.allowable_of`).
"""

from __future__ import annotations

import math

from twistshare.engine.core import AllowableRule, torque_from_power
from twistshare.engine.intake import field_by_key
from twistshare.engine.intake._allowable_rule import allowable_of

from ._arguments import CellError, is_empty, read_field, read_flag, read_rule, result_factor
from ._functions import _result
from ._registry import Argument, cell_function

__all__ = ["TWS_TORQUE_FROM_POWER", "TWS_ALLOWABLE"]


@cell_function(
    "Torque a drive puts through the shaft: T = SF·P/ω",
    Argument("power", "Power transmitted, e.g. '15 kW' or '20 hp'", unit="power: kW, W, hp"),
    Argument("speed", "Shaft speed, e.g. '1450 rpm'", unit="rotational speed: rpm, r/min, rad/s"),
    Argument("service_factor", "Service factor on the demand (optional, default 1)"),
    _result("N·m", "torque", "N·m, kN·m, lbf·in, lbf·ft"),
    returns="the torque, in result_unit",
    shape="one value",
)
def TWS_TORQUE_FROM_POWER(power, speed, service_factor=None, result_unit=None):
    """Torque from power and speed, ``T = SF P / ω``.

    Parameters
    ----------
    power : str, power
        ``"15 kW"``, ``"20 hp"``.
    speed : str, rotational speed
        ``"1450 rpm"``; ``Hz`` is refused (revolutions or radians?).
    service_factor : number, 1, optional
        Default 1.
    result_unit : str, optional
        A torque unit; default N·m.

    Returns
    -------
    float or str
    """
    factor = result_factor(result_unit, "torque")
    watts = read_field(power, field_by_key("power"), "power")
    omega = read_field(speed, field_by_key("speed"), "speed")
    service = 1.0 if is_empty(service_factor) else read_field(service_factor, field_by_key("service_factor"),
                                                                "service factor")
    return float(torque_from_power(watts, omega, service)) / factor


@cell_function(
    "Allowable shear stress from strength: max shear (Tresca), distortion energy (von Mises) "
    "or shafting code",
    Argument("rule", "'max shear' (0.5·Sy/FS), 'distortion energy' (Sy/(√3·FS)) or "
             "'shafting code' (min(0.30·Sy, 0.18·Su), ×0.75 with a keyway)"),
    Argument("yield_strength", "Tensile yield strength Sy, e.g. '310 MPa'",
             unit="stress: MPa, N/mm², psi, ksi"),
    Argument("ultimate_strength", "Ultimate tensile strength Su (shafting code only)",
             unit="stress: MPa, N/mm², psi, ksi"),
    Argument("factor_of_safety", "Factor of safety FS, at least 1 (max shear and distortion "
             "energy only)"),
    Argument("keyway", "TRUE or yes where a keyway is cut (shafting code only)"),
    _result("MPa", "stress", "MPa, N/mm², psi, ksi"),
    returns="the allowable shear stress, in result_unit",
    shape="one value",
)
def TWS_ALLOWABLE(rule, yield_strength, ultimate_strength=None, factor_of_safety=None,
                  keyway=None, result_unit=None):
    """Allowable shear stress from strength by rule, decided as a materials table's row is.

    Parameters
    ----------
    rule : str
        ``"max shear"`` (Tresca, 0.5 Sy/FS), ``"distortion energy"`` (von Mises,
        Sy/(√3 FS)) or ``"shafting code"`` (min(0.30 Sy, 0.18 Su), ×0.75 with a keyway).
    yield_strength : str, stress
    ultimate_strength : str, stress, optional
        Needed by the shafting code rule; refused below the yield strength (check both).
    factor_of_safety : number, 1, optional
        Needed by the two theories, at least 1; refused with the shafting code rule, which
        embeds its own allowance (it would be ignored).
    keyway : bool or yes/no, optional
        Shafting code rule only; refused with the theories (use Kt there).
    result_unit : str, optional
        A stress unit; default MPa.

    Returns
    -------
    float or str
    """
    factor = result_factor(result_unit, "stress")
    chosen = read_rule(rule, "rule")
    if chosen == AllowableRule.GIVEN:
        raise CellError("rule", "'given' means the allowable is typed directly; nothing to compute")
    sy = read_field(yield_strength, field_by_key("yield_strength"), "yield strength")
    su = math.nan if is_empty(ultimate_strength) else read_field(
        ultimate_strength, field_by_key("ultimate_strength"), "ultimate strength")
    fs = math.nan if is_empty(factor_of_safety) else read_field(
        factor_of_safety, field_by_key("factor_of_safety"), "factor of safety")
    decision = allowable_of(None, chosen, math.nan, sy, su, fs, read_flag(keyway, "keyway"))
    # Notes as well as a missing input refuse: a cell cannot show a number and a warning together.
    if decision.missing is not None:
        raise CellError("", decision.missing)
    doubts = [note for note in decision.notes if not note.assumed]
    if doubts:
        raise CellError("", doubts[0].message)
    return decision.allowable / factor
