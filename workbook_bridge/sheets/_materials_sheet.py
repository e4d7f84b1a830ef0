"""The materials sheet: the materials as used, book rows completed from the library."""

from __future__ import annotations

from twistshare.engine.intake import RULE_FORMULAS, Display, MaterialSet

from ._cells import Styled
from ._cells import finite_or_none as _num

__all__ = ["materials_rows", "MATERIALS_SHEET"]

MATERIALS_SHEET = "Twistshare materials"


def materials_rows(materials: MaterialSet, display: Display) -> list[list]:
    """The materials as used: book rows completed from the library, filled values marked."""
    su, sf = display.unit("stress")
    header = ["Material", "From", "G [GPa]", f"Allowable shear [{su}]", "Allowable rule", f"Yield strength [{su}]",
              f"Ultimate strength [{su}]", "Factor of safety", "Keyway", "Problem"]
    rows: list[list] = [[Styled(h, "header") for h in header]]
    filled = {(f.material.lower(), f.field) for f in materials.filled}
    for m in materials.by_name.values():
        def v(x: float, field: str, scale: float) -> object:
            val = _num(x / scale) if x is not None else None
            if (m.name.lower(), field) in filled and val is not None:
                return Styled(val, "filled")
            return val
        if m.problem:  # nothing derived from unusable inputs is shown as if it were used
            rows.append([m.name, m.origin, None, None, RULE_FORMULAS.get(m.rule, str(m.rule)), None, None, None,
                         "yes" if m.keyway else "no", m.problem])
            continue
        rows.append([m.name, m.origin, v(m.shear_modulus, "shear_modulus", 1e9), _num(m.allowable_shear / sf),
                     RULE_FORMULAS.get(m.rule, str(m.rule)), v(m.yield_strength, "yield_strength", sf),
                     v(m.ultimate_strength, "ultimate_strength", sf), _num(m.factor_of_safety),
                     "yes" if m.keyway else "no", m.problem])
    return rows


