"""Bending, whirl and buckling through both front ends: a workbook's tables and the cell functions.

Outside sources, named beside each check:
- bending and torsion of a round tube, Euler-Bernoulli and Saint-Venant (e.g. Shigley's
  Mechanical Engineering Design, ch. 3, from memory): sigma = 32 M D / (pi (D^4 - d^4)),
  tau = 16 T D / (pi (D^4 - d^4));
- von Mises (distortion energy) sqrt(sigma^2 + 3 tau^2) and Tresca (maximum shear)
  sqrt(sigma^2 + 4 tau^2) for one normal and one shear stress (textbook);
- first bending critical speed of a simply supported uniform beam, omega = (pi/L)^2 sqrt(EI/m)
  (Euler-Bernoulli; Blevins, Formulas for Natural Frequency and Mode Shape, table 8-1, from memory);
- the whirl limit of 70 % of the first critical (common practice).
Demo data are invented (Marrowby Pump & Drive, BRIEF §4).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pytest
from twistshare.engine.cells import TWS_BENDING_STRESS, TWS_BUCKLING_TORQUE, TWS_COMBINED_STRESS, TWS_CRITICAL_SPEED
from twistshare.engine.core import Criterion
from twistshare.engine.intake import Severity, rate_tables
from twistshare.engine.intake._grid import SheetGrid

D, d = 0.050, 0.040           # m, an invented tube
E, G, RHO = 200e9, 80e9, 7850.0
TAU_A = 100e6                 # Pa, given allowable
MATERIALS = [
    ["Material", "G [GPa]", "E [GPa]", "Poisson ratio", "Allowable shear [MPa]", "Allowable rule",
     "Density [kg/m³]", "Yield strength [MPa]", "Factor of safety"],
    ["MPD test tube steel", 80, 200, 0.3, 100, "given", 7850, None, None],
    ["MPD test tube steel DE", 80, 200, 0.3, None, "distortion energy", 7850, 400, 2],
    ["MPD tube without E", 80, None, None, 100, "given", None, None, None],
]
TAU_DE = 400e6 / (2 * math.sqrt(3))  # Sy / (sqrt(3) FS), distortion energy (textbook)
PARTS_HEAD = ["Part", "Length [mm]", "Torque [N·m]", "Speed [rpm]", "Bending moment [N·m]",
              "Axial force [kN]", "Supports", "Layer 1 material", "Layer 1 outer diameter [mm]",
              "Layer 1 inner diameter [mm]"]


@dataclass
class _Book:
    """A book held in memory: the intake reads grids, not files."""

    sheets: dict[str, list[list[object]]]
    path: Path = Path("memory.xlsx")
    tables: dict = field(default_factory=dict)

    def find_sheet(self, name):
        return next((s for s in self.sheets if s.lower() == name.lower()), None)

    def grid(self, sheet):
        return SheetGrid(sheet, self.sheets[sheet])


def _rate(parts_rows):
    return rate_tables(_Book({"Materials": MATERIALS, "Parts": [PARTS_HEAD] + parts_rows}))


def _section_stresses(moment, torque):
    k = math.pi * (D**4 - d**4)
    return 32 * moment * D / k, 16 * torque * D / k  # Shigley ch. 3 (from memory)


def _tresca_capacity(moment):
    """Torque at which sqrt(sigma^2 + 4 tau^2) = 2 tau_a (maximum shear, textbook)."""
    sigma, _ = _section_stresses(moment, 0.0)
    tau = math.sqrt(TAU_A**2 - sigma**2 / 4)
    return tau * math.pi * (D**4 - d**4) / (16 * D)


def _critical_rpm(span):
    ei = E * math.pi / 64 * (D**4 - d**4)
    m = RHO * math.pi / 4 * (D**2 - d**2)
    return (math.pi / span) ** 2 * math.sqrt(ei / m) * 30 / math.pi  # Blevins table 8-1, pinned


LAYERS = [["Material", "Outer diameter [mm]", "Inner diameter [mm]"], ["MPD test tube steel", 50, 40]]


class TestCombinedStress:
    """A single-material tube under M and T: the workbook's capacity and the cells' stresses."""

    @pytest.mark.parametrize("moment", [0.0, 300.0, 900.0])
    def test_workbook_capacity_is_the_tresca_torque(self, moment):
        book = _rate([["MPD-T-901", 1000, 500, None, moment, None, None, "MPD test tube steel", 50, 40]])
        assert book.rated[0]
        cap = book.rating.criterion_capacity[Criterion.COMBINED_STRESS][0, 0]
        assert cap == pytest.approx(_tresca_capacity(moment), rel=1e-9)
        # With no bending the combined check is the torsion check itself.
        assert cap <= book.rating.capacity[0, 0] * (1 + 1e-12)
        if moment:
            assert book.rating.governing_criterion[0] == Criterion.COMBINED_STRESS

    def test_bending_stress_cell_matches_32MD(self):
        got = TWS_BENDING_STRESS(LAYERS, "300 N·m", materials=MATERIALS)
        sigma, _ = _section_stresses(300.0, 0.0)
        assert got[1][0] == pytest.approx(sigma / 1e6, rel=1e-9)

    @pytest.mark.parametrize("material, weight", [("MPD test tube steel", 4.0), ("MPD test tube steel DE", 3.0)])
    def test_combined_stress_cell_matches_tresca_and_von_mises(self, material, weight):
        layers = [LAYERS[0], [material, 50, 40]]
        got = TWS_COMBINED_STRESS(layers, "500 N·m", "300 N·m", materials=MATERIALS)
        sigma, tau = _section_stresses(300.0, 500.0)
        assert got[1][0] == pytest.approx(math.sqrt(sigma**2 + weight * tau**2) / 1e6, rel=1e-9)

    def test_workbook_distortion_energy_capacity(self):
        book = _rate([["MPD-T-902", 1000, 500, None, 300, None, None, "MPD test tube steel DE", 50, 40]])
        sigma, _ = _section_stresses(300.0, 0.0)
        # sqrt(sigma^2 + 3 tau^2) = sqrt(3) tau_a (von Mises, textbook)
        tau = math.sqrt(TAU_DE**2 - sigma**2 / 3)
        cap = book.rating.criterion_capacity[Criterion.COMBINED_STRESS][0, 0]
        assert cap == pytest.approx(tau * math.pi * (D**4 - d**4) / (16 * D), rel=1e-9)

    def test_axial_force_adds_to_the_bending_stress(self):
        book = _rate([["MPD-T-903", 1000, 500, None, 300, 20, None, "MPD test tube steel", 50, 40]])
        sigma = _section_stresses(300.0, 0.0)[0] + 20e3 / (math.pi / 4 * (D**2 - d**2))  # N/A
        tau = math.sqrt(TAU_A**2 - sigma**2 / 4)
        cap = book.rating.criterion_capacity[Criterion.COMBINED_STRESS][0, 0]
        assert cap == pytest.approx(tau * math.pi * (D**4 - d**4) / (16 * D), rel=1e-9)


class TestWhirl:
    """Critical speed of a simply supported tube through both paths; the 70 % gate."""

    def test_workbook_critical_speed_and_gate(self):
        span = 2.0
        crit = _critical_rpm(span)
        book = _rate([["MPD-T-911", 2000, 500, 0.5 * crit, None, None, None, "MPD test tube steel", 50, 40],
                      ["MPD-T-912", 2000, 500, 0.8 * crit, None, None, "simply supported", "MPD test tube steel",
                       50, 40]])
        assert book.rated.all()
        assert np.asarray(book.whirl.critical_speed) * 30 / math.pi == pytest.approx([crit, crit], rel=1e-9)
        assert np.asarray(book.whirl.speed_ratio) == pytest.approx([0.5, 0.8], rel=1e-9)
        capacity = book.rating.criterion_capacity[Criterion.WHIRL]
        assert capacity[0] == math.inf and capacity[1] == 0.0
        assert book.rating.governing_criterion[1] == Criterion.WHIRL
        assert book.rating.margin[1] == -1.0

    def test_cell_critical_speed(self):
        assert TWS_CRITICAL_SPEED(LAYERS, "2 m", materials=MATERIALS) == pytest.approx(_critical_rpm(2.0), rel=1e-9)

    def test_overhung_uses_its_eigenvalue(self):
        # (beta L)^2 = 3.516 for a cantilever (Blevins table 8-1, from memory)
        got = TWS_CRITICAL_SPEED(LAYERS, "1 m", "overhung", materials=MATERIALS)
        assert got == pytest.approx(_critical_rpm(1.0) * 3.516 / math.pi**2, rel=1e-9)


class TestBadInputs:
    """Problems land on their cells; the part is not rated, the others are."""

    def test_unknown_support_word(self):
        book = _rate([["MPD-T-921", 2000, 500, 1000, None, None, "wobbly", "MPD test tube steel", 50, 40],
                      ["MPD-T-922", 2000, 500, 1000, None, None, None, "MPD test tube steel", 50, 40]])
        assert list(book.rated) == [False, True]
        problem = next(p for p in book.problems if p.code == "support-word")
        assert problem.cell == "G2" and problem.severity is Severity.ERROR and "wobbly" in problem.message

    def test_moment_without_youngs_modulus(self):
        book = _rate([["MPD-T-923", 1000, 500, None, 300, None, None, "MPD tube without E", 50, 40],
                      ["MPD-T-924", 1000, 500, None, 300, None, None, "MPD test tube steel", 50, 40]])
        assert list(book.rated) == [False, True]
        problem = next(p for p in book.problems if p.part == "MPD-T-923" and p.severity is Severity.ERROR)
        assert problem.cell == "E2" and "Young's modulus" in problem.message

    def test_force_in_the_wrong_dimension(self):
        rows = [["MPD-T-925", 1000, 500, None, None, "12 N·m", None, "MPD test tube steel", 50, 40]]
        book = _rate(rows)
        assert not book.rated[0]
        problem = next(p for p in book.problems if p.cell == "F2")
        assert "force" in problem.message

    def test_implausible_moment(self):
        book = _rate([["MPD-T-926", 1000, 500, None, -5, None, None, "MPD test tube steel", 50, 40]])
        assert not book.rated[0]
        assert any(p.cell == "E2" and p.severity is Severity.ERROR for p in book.problems)

    def test_speed_without_density_notes_whirl_not_checked(self):
        book = _rate([["MPD-T-927", 1000, 500, 1000, None, None, None, "MPD tube without E", 50, 40]])
        assert book.rated[0]
        assert any(p.code == "whirl-not-checked" and p.cell == "D2" for p in book.problems)

    def test_cell_refuses_a_material_without_E(self):
        got = TWS_BENDING_STRESS([LAYERS[0], ["MPD tube without E", 50, 40]], "300 N·m", materials=MATERIALS)
        assert isinstance(got, str) and "Young's modulus" in got


class TestWoundLayer:
    """A [±45]s materials row: G from CLT, hand-derived.

    Q11 = E1/(1 - nu12 nu21), Q22 = E2/(1 - nu12 nu21), Q12 = nu12 E2/(1 - nu12 nu21), and at ±45°
    Q̄66 = (Q11 + Q22 - 2 Q12)/4; a balanced ± laminate has A66/t = Q̄66 (Jones, Mechanics of
    Composite Materials, ch. 2 and 4, from memory). The ply set is invented: E1 135, E2 10,
    G12 5 GPa, nu12 0.3, 0.125 mm.
    """

    HEAD = ["Material", "Allowable shear [MPa]", "Ply E1 [GPa]", "Ply E2 [GPa]", "Ply G12 [GPa]", "Ply nu12",
            "Ply thickness [mm]", "Layup", "Density [kg/m³]"]
    PARTS = [["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Layer 1 outer diameter [mm]",
              "Layer 1 inner diameter [mm]"], ["MPD-T-931", 1000, 100, "MPD wound wrap", 60, 56]]

    def _book(self, layup="[±45]s"):
        mats = [self.HEAD, ["MPD wound wrap", 60, 135, 10, 5, 0.3, 0.125, layup, 1550]]
        return rate_tables(_Book({"Materials": mats, "Parts": self.PARTS}))

    def test_shear_modulus_is_q66_bar(self):
        e1, e2, nu12 = 135e9, 10e9, 0.3
        nu21 = nu12 * e2 / e1
        den = 1 - nu12 * nu21
        q11, q22, q12 = e1 / den, e2 / den, nu12 * e2 / den
        book = self._book()
        assert book.rated[0]
        assert book.parts.shear_modulus[0, 0] == pytest.approx((q11 + q22 - 2 * q12) / 4, rel=1e-9)
        note = next(p for p in book.problems if p.code == "laminate")
        assert note.cell == "H2" and "classical lamination theory" in note.message

    def test_bad_layup_on_its_cell(self):
        book = self._book("[±45")
        assert not book.rated[0]
        assert any(p.cell == "H2" and p.severity is Severity.ERROR for p in book.problems)


def test_bearing_span_sets_the_whirl_span():
    """A `Bearing span` column replaces the length in omega = (pi/L)^2 sqrt(EI/m) (Blevins, from memory)."""
    head = PARTS_HEAD + ["Bearing span [mm]"]
    rows = [["MPD-T-941", 3000, 500, 1000, None, None, None, "MPD test tube steel", 50, 40, 1500],
            ["MPD-T-942", 3000, 500, 1000, None, None, None, "MPD test tube steel", 50, 40, None]]
    book = rate_tables(_Book({"Materials": MATERIALS, "Parts": [head] + rows}))
    got = np.asarray(book.whirl.critical_speed) * 30 / math.pi
    assert got == pytest.approx([_critical_rpm(1.5), _critical_rpm(3.0)], rel=1e-9)


class TestBucklingBothFrontEnds:
    """Torsional buckling of a thin tube typed into the tables and into TWS_BUCKLING_TORQUE: the
    same number, against Roark's long-tube form (Timoshenko and Gere; knock-down 0.67, NASA
    SP-8007; both from memory); a thick tube is not checked by either."""

    def test_thin_tube_same_in_table_and_cell_and_by_hand(self):
        outer, inner = 0.200, 0.196  # 6 m long: the long-tube form governs
        book = _rate([["MPD-T-941", 6000, 500, None, None, None, None, "MPD test tube steel", 200, 196],
                      ["MPD-T-942", 6000, 500, None, None, None, None, "MPD test tube steel", 50, 40]])
        assert book.rated.all()
        table = book.rating.criterion_capacity[Criterion.TORSIONAL_BUCKLING]
        cell = TWS_BUCKLING_TORQUE([LAYERS[0], ["MPD test tube steel", 200, 196]], "6 m", materials=MATERIALS)
        r, t = (outer + inner) / 4, (outer - inner) / 2
        tau = 0.67 * E / (3 * math.sqrt(2) * (1 - 0.3**2) ** 0.75) * (t / r) ** 1.5
        assert table[0] == pytest.approx(2 * math.pi * r * r * t * tau, rel=1e-9)
        assert cell == pytest.approx(table[0], rel=1e-12)
        assert table[1] == math.inf
        thick = TWS_BUCKLING_TORQUE(LAYERS, "6 m", materials=MATERIALS)
        assert isinstance(thick, str) and "not thin-walled" in thick
