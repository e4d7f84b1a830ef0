"""The library's carbon/epoxy tube against classical lamination theory, computed here.

Classical lamination theory (R. M. Jones, Mechanics of Composite Materials, ch. 4): reduced ply
stiffnesses Q from E1, E2, G12, ν12; each ply's Q rotated by its angle; for a balanced symmetric
laminate the in-plane shear stiffness is A66/t = mean of the rotated Q66, and the laminate's axial
modulus is 1/(t·a11) with a = A⁻¹. The ply data are those the library names in its source text.
"""

import math

import numpy as np
import pytest
from twistshare.engine.core import material_library

E1, E2, G12, NU12 = 135e9, 10e9, 5e9, 0.3  # typical standard-modulus carbon/epoxy ply (from memory)


def _q_bar(theta_deg: float) -> np.ndarray:
    nu21 = NU12 * E2 / E1
    d = 1 - NU12 * nu21
    q11, q22, q12, q66 = E1 / d, E2 / d, NU12 * E2 / d, G12
    c, s = math.cos(math.radians(theta_deg)), math.sin(math.radians(theta_deg))
    qb11 = q11 * c**4 + 2 * (q12 + 2 * q66) * s**2 * c**2 + q22 * s**4
    qb22 = q11 * s**4 + 2 * (q12 + 2 * q66) * s**2 * c**2 + q22 * c**4
    qb12 = (q11 + q22 - 4 * q66) * s**2 * c**2 + q12 * (s**4 + c**4)
    qb66 = (q11 + q22 - 2 * q12 - 2 * q66) * s**2 * c**2 + q66 * (s**4 + c**4)
    qb16 = (q11 - q12 - 2 * q66) * s * c**3 + (q12 - q22 + 2 * q66) * s**3 * c
    qb26 = (q11 - q12 - 2 * q66) * s**3 * c + (q12 - q22 + 2 * q66) * s * c**3
    return np.array([[qb11, qb12, qb16], [qb12, qb22, qb26], [qb16, qb26, qb66]])


def _laminate_per_thickness() -> np.ndarray:
    return (_q_bar(45.0) + _q_bar(-45.0)) / 2  # equal thickness of +45 and -45 plies


def _library_tube():
    return next(m for m in material_library().values() if "carbon" in m.name.lower())


def test_effective_shear_modulus_is_a66_over_t():
    a66_t = _laminate_per_thickness()[2, 2]
    # the library states G as 35.0 GPa: tolerance half a unit of its last digit, 0.05 GPa
    assert _library_tube().shear_modulus == pytest.approx(a66_t, abs=0.05e9)


def test_axial_modulus_and_poisson_ratio_of_the_laminate():
    a = np.linalg.inv(_laminate_per_thickness())
    ex, nuxy = 1 / a[0, 0], -a[0, 1] / a[0, 0]
    tube = _library_tube()
    # stated as 17.7 GPa and 0.77: half a unit of the last digit, 0.05 GPa and 0.005
    assert tube.youngs_modulus == pytest.approx(ex, abs=0.05e9)
    assert tube.poisson_ratio == pytest.approx(nuxy, abs=0.005)


def test_the_tube_is_not_isotropic():
    tube = _library_tube()
    assert not tube.isotropic
    # E/2(1+ν) would give about 5 GPa: the isotropic relation must never be used for it
    assert tube.youngs_modulus / (2 * (1 + tube.poisson_ratio)) < 0.2 * tube.shear_modulus
