"""Criterion and AllowableRule: the codes are part of the contract and must not move."""

from twistshare.engine.core import AllowableRule, Criterion


def test_criterion_codes_are_fixed():
    """Results store these codes as int8; later criteria append, never renumber."""
    assert [(c.name, int(c)) for c in Criterion] == [
        ("NONE", 0),
        ("LAYER_STRESS", 1),
        ("TWIST_ANGLE", 2),
        ("TWIST_PER_LENGTH", 3),
        ("COMBINED_STRESS", 4),
        ("WHIRL", 5),
        ("TORSIONAL_BUCKLING", 6),
        ("INTERFACE_SLIP", 7),
        ("BOND_SHEAR", 8),
        ("FIT_STRESS", 9),
    ]


def test_allowable_rule_codes_are_fixed():
    """Workbooks map rule names to these codes."""
    assert [(r.name, int(r)) for r in AllowableRule] == [
        ("GIVEN", 0),
        ("MAX_SHEAR", 1),
        ("DISTORTION_ENERGY", 2),
        ("SHAFTING_CODE", 3),
    ]
