"""Tests of twistshare.engine.units: the spellings engineers type, read right or refused.

Each accepted spelling is checked twice, against two outside references:

* pint (the general-purpose reference library) converting a canonical spelling that pint
  reads correctly on its own, e.g. ``foot * force_pound`` for ``lbf-ft``;
* the exact defining constants of NIST Special Publication 811 (2008), Appendix B:
  1 in = 0.0254 m, 1 ft = 0.3048 m, 1 lb = 0.45359237 kg, 1 lbf = 4.4482216152605 N,
  1 kgf = 9.80665 N, 1 hp = 550 ft·lbf/s, metric horsepower = 75 kgf·m/s,
  1° = π/180 rad, 1 rev = 2π rad.
"""

from __future__ import annotations

import math
import pickle

import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from twistshare.engine import units
from twistshare.engine.units import (
    KINDS,
    UnitProblem,
    display_unit,
    parse_value,
    registry,
    si_factor,
    split_header,
    unit_system,
)

# NIST SP 811 (2008), Appendix B: exact definitions.
INCH = 0.0254
FOOT = 0.3048
POUND_MASS = 0.45359237
LBF = 4.4482216152605
KGF = 9.80665
HP = 550 * FOOT * LBF
METRIC_HP = 75 * KGF
DEGREE = math.pi / 180
REV = 2 * math.pi
MINUTE = 60.0

# pint, as an independent reference: a fresh default registry, not the project's.
REFERENCE = pint.UnitRegistry()

SI_OF_KIND = {
    "length": "m",
    "stress": "Pa",
    "torque": "N*m",
    "power": "W",
    "speed": "rad/s",
    "angle": "rad",
    "angle_per_length": "rad/m",
    "density": "kg/m**3",
    "dimensionless": "dimensionless",
}

# (spelling as typed, kind, canonical spelling pint reads right, exact SI factor)
ACCEPTED = [
    # torque
    ("N·m", "torque", "newton*meter", 1.0),
    ("N⋅m", "torque", "newton*meter", 1.0),
    ("N m", "torque", "newton*meter", 1.0),
    ("N*m", "torque", "newton*meter", 1.0),
    ("N.m", "torque", "newton*meter", 1.0),
    ("N×m", "torque", "newton*meter", 1.0),
    ("N-m", "torque", "newton*meter", 1.0),
    ("Nm", "torque", "newton*meter", 1.0),
    ("kN·m", "torque", "kilonewton*meter", 1e3),
    ("kN m", "torque", "kilonewton*meter", 1e3),
    ("kN-m", "torque", "kilonewton*meter", 1e3),
    ("kNm", "torque", "kilonewton*meter", 1e3),
    ("KN·m", "torque", "kilonewton*meter", 1e3),
    ("MNm", "torque", "meganewton*meter", 1e6),
    ("daN·m", "torque", "decanewton*meter", 10.0),
    ("daNm", "torque", "decanewton*meter", 10.0),
    ("N·mm", "torque", "newton*millimeter", 1e-3),
    ("Nmm", "torque", "newton*millimeter", 1e-3),
    ("Ncm", "torque", "newton*centimeter", 1e-2),
    ("lbf·in", "torque", "force_pound*inch", LBF * INCH),
    ("lbf in", "torque", "force_pound*inch", LBF * INCH),
    ("lbf-in", "torque", "force_pound*inch", LBF * INCH),
    ("in-lbf", "torque", "force_pound*inch", LBF * INCH),
    ("lbf·ft", "torque", "force_pound*foot", LBF * FOOT),
    ("lbf·ft.", "torque", "force_pound*foot", LBF * FOOT),
    ("lbf-ft", "torque", "foot*force_pound", LBF * FOOT),
    ("ft-lbf", "torque", "foot*force_pound", LBF * FOOT),
    ("ft·lbf", "torque", "foot*force_pound", LBF * FOOT),
    ("kip·in", "torque", "kip*inch", 1000 * LBF * INCH),
    ("kip-ft", "torque", "kip*foot", 1000 * LBF * FOOT),
    ("kgf·m", "torque", "kilogram_force*meter", KGF),
    ("[N·m]", "torque", "newton*meter", 1.0),
    # length
    ("m", "length", "meter", 1.0),
    ("mm", "length", "millimeter", 1e-3),
    ("MM", "length", "millimeter", 1e-3),
    ("cm", "length", "centimeter", 1e-2),
    ("µm", "length", "micrometer", 1e-6),  # U+00B5 micro sign
    ("μm", "length", "micrometer", 1e-6),  # U+03BC Greek mu
    ("um", "length", "micrometer", 1e-6),
    ("in", "length", "inch", INCH),
    ("inch", "length", "inch", INCH),
    ("inches", "length", "inch", INCH),
    ("in.", "length", "inch", INCH),  # an abbreviation's full stop
    ("ft", "length", "foot", FOOT),
    ("thou", "length", "inch/1000", INCH / 1000),
    ("(mm)", "length", "millimeter", 1e-3),
    # stress and moduli
    ("Pa", "stress", "pascal", 1.0),
    ("kPa", "stress", "kilopascal", 1e3),
    ("MPa", "stress", "megapascal", 1e6),
    ("Mpa", "stress", "megapascal", 1e6),
    ("MPA", "stress", "megapascal", 1e6),
    ("mpa", "stress", "megapascal", 1e6),
    ("GPa", "stress", "gigapascal", 1e9),
    ("N/mm²", "stress", "newton/millimeter**2", 1e6),
    ("N/mm2", "stress", "newton/millimeter**2", 1e6),
    ("N/mm^2", "stress", "newton/millimeter**2", 1e6),
    ("N / mm²", "stress", "newton/millimeter**2", 1e6),
    ("N/(mm^2)", "stress", "newton/millimeter**2", 1e6),
    ("kN/mm²", "stress", "kilonewton/millimeter**2", 1e9),
    ("psi", "stress", "force_pound/inch**2", LBF / INCH**2),
    ("PSI", "stress", "force_pound/inch**2", LBF / INCH**2),
    ("lbf/in²", "stress", "force_pound/inch**2", LBF / INCH**2),
    ("lbf/in2", "stress", "force_pound/inch**2", LBF / INCH**2),
    ("ksi", "stress", "kip/inch**2", 1e3 * LBF / INCH**2),
    ("Msi", "stress", "1e6*force_pound/inch**2", 1e6 * LBF / INCH**2),
    ("kgf/mm²", "stress", "kilogram_force/millimeter**2", KGF * 1e6),
    # power
    ("W", "power", "watt", 1.0),
    ("kW", "power", "kilowatt", 1e3),
    ("KW", "power", "kilowatt", 1e3),
    ("MW", "power", "megawatt", 1e6),
    ("hp", "power", "foot*force_pound/second*550", HP),
    ("HP", "power", "foot*force_pound/second*550", HP),
    ("PS", "power", "75*kilogram_force*meter/second", METRIC_HP),
    ("N·m/s", "power", "newton*meter/second", 1.0),
    # rotational speed
    ("rpm", "speed", "revolution/minute", REV / MINUTE),
    ("RPM", "speed", "revolution/minute", REV / MINUTE),
    ("r/min", "speed", "revolution/minute", REV / MINUTE),
    ("rev/min", "speed", "revolution/minute", REV / MINUTE),
    ("rev per min", "speed", "revolution/minute", REV / MINUTE),
    ("U/min", "speed", "revolution/minute", REV / MINUTE),
    ("rps", "speed", "revolution/second", REV),
    ("r/s", "speed", "revolution/second", REV),
    ("rev/s", "speed", "revolution/second", REV),
    ("rad/s", "speed", "radian/second", 1.0),
    ("deg/s", "speed", "degree/second", DEGREE),
    ("°/s", "speed", "degree/second", DEGREE),
    # angle
    ("°", "angle", "degree", DEGREE),
    ("º", "angle", "degree", DEGREE),  # masculine ordinal, typed for ° on some keyboards
    ("deg", "angle", "degree", DEGREE),
    ("degrees", "angle", "degree", DEGREE),
    ("rad", "angle", "radian", 1.0),
    ("mrad", "angle", "milliradian", 1e-3),
    ("arcmin", "angle", "degree/60", DEGREE / 60),
    ("rev", "angle", "revolution", REV),
    # twist per length
    ("deg/m", "angle_per_length", "degree/meter", DEGREE),
    ("°/m", "angle_per_length", "degree/meter", DEGREE),
    ("° / m", "angle_per_length", "degree/meter", DEGREE),
    ("rad/m", "angle_per_length", "radian/meter", 1.0),
    ("°/ft", "angle_per_length", "degree/foot", DEGREE / FOOT),
    ("deg/in", "angle_per_length", "degree/inch", DEGREE / INCH),
    # density
    ("kg/m³", "density", "kilogram/meter**3", 1.0),
    ("kg/m3", "density", "kilogram/meter**3", 1.0),
    ("g/cm³", "density", "gram/centimeter**3", 1e3),
    ("t/m³", "density", "metric_ton/meter**3", 1e3),
    ("lb/in³", "density", "pound/inch**3", POUND_MASS / INCH**3),
    ("lb/ft³", "density", "pound/foot**3", POUND_MASS / FOOT**3),
    # plain numbers
    ("", "dimensionless", "dimensionless", 1.0),
    ("-", "dimensionless", "dimensionless", 1.0),
    ("1", "dimensionless", "dimensionless", 1.0),
    ("%", "dimensionless", "percent", 0.01),
]


class TestAcceptedSpellings:
    """Every accepted spelling has the intended dimension and SI factor."""

    @pytest.mark.parametrize("spelling, kind, canonical, exact", ACCEPTED)
    def test_factor_matches_pint_reference(self, spelling, kind, canonical, exact):
        # pint reference: the canonical spelling converted by a fresh pint registry.
        expected = REFERENCE.Quantity(canonical).to(SI_OF_KIND[kind]).magnitude
        assert si_factor(spelling, kind) == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("spelling, kind, canonical, exact", ACCEPTED)
    def test_factor_matches_exact_constants(self, spelling, kind, canonical, exact):
        # NIST SP 811 Appendix B exact definitions (see module docstring).
        assert si_factor(spelling, kind) == pytest.approx(exact, rel=1e-12)

    @pytest.mark.parametrize("spelling, kind, canonical, exact", ACCEPTED)
    def test_canonical_has_dimension_of_kind(self, spelling, kind, canonical, exact):
        # Guards the table itself: the reference spelling really is of that kind.
        got = REFERENCE.Quantity(canonical).dimensionality
        assert got == REFERENCE.Quantity(1.0, SI_OF_KIND[kind]).dimensionality

    def test_pint_reads_the_one_word_torques_wrongly(self):
        # Why the alias table exists: pint alone reads 'Nm' as number·metre (BRIEF §5).
        assert REFERENCE.parse_units("Nm").dimensionality != REFERENCE.parse_units("N*m").dimensionality

    def test_lbf_definition_in_pint_matches_nist(self):
        assert REFERENCE.Quantity(1, "lbf").to("N").magnitude == pytest.approx(LBF, rel=1e-14)


# (spelling, kind, words the message must contain)
REFUSED = [
    ("lb-in", "torque", "lb is a pound of mass"),
    ("lb-in", "torque", "write 'lbf·in'"),
    ("lb·in", "torque", "lbf·in"),
    ("lb in", "torque", "lbf·in"),
    ("lb-ft", "torque", "lbf·ft"),
    ("lbs-ft", "torque", "lbf·ft"),
    ("in-lb", "torque", "lbf·in"),
    ("ft-lb", "torque", "lbf·ft"),
    ("ft lbs", "torque", "lbf·ft"),
    ("lb/in²", "stress", "write 'psi'"),
    ("lb/in2", "stress", "psi"),
    ("lb·ft/s", "power", "hp"),
    ("J", "torque", "energy"),
    ("kJ", "torque", "force × length"),
    ("N", "torque", "a force"),
    ("N/m", "torque", "expected a torque"),
    ("Nm", "length", "a torque"),
    ("kNm", "length", "a torque"),
    ("GPa", "length", "expected a length, got 'GPa' (a pressure"),
    ("mm", "stress", "expected a stress or modulus, got 'mm' (a length)"),
    ("t", "length", "a mass"),
    ("lb", "length", "a mass"),
    ("mil", "length", "write 'thou' or 'in'"),
    ("mils", "length", "thou"),
    ("mil", "angle", "angular mil"),
    ("mPa", "stress", "write 'MPa'"),
    ('"', "length", "write 'in'"),
    ("in..", "length", "not a unit"),
    ("Hz", "speed", "write 'rpm', 'rev/s' or 'rad/s'"),
    ("1/min", "speed", "revolutions or radians"),
    ("1/s", "speed", "revolutions or radians"),
    ("min⁻¹", "speed", "revolutions or radians"),
    ("r", "speed", "'r' alone is not a unit"),
    ("r", "angle", "'r' alone is not a unit"),
    ("rad", "speed", "an angle"),
    ("%", "angle", "write the angle unit"),
    ("", "angle", "write the angle unit"),
    ("deg", "dimensionless", "an angle"),
    ("pi", "dimensionless", "not a plain-number unit"),
    ("mm/mm", "dimensionless", "not a plain-number unit"),
    ("1/m", "angle_per_length", "angle over a length"),
    ("°", "angle_per_length", "an angle"),
    ("kg/m²", "density", "expected a density"),
    ("W/m*K", "stress", "one unit after the slash"),
    ("N/mm/mm", "stress", "more than one '/'"),
    ("Nm2", "torque", "ambiguous"),
    ("mm5", "length", "exponent 5"),
    ("2*3 mm", "length", "not a unit"),
    ("mm + in", "length", "not a unit"),
    ("foo", "length", "'foo' is not a unit I know"),
    ("__class__", "length", "not a unit I know"),
    ("", "length", "expected a length"),
    ("°C", "angle", "expected an angle"),
    ("kN·m·rad", "torque", "expected a torque"),
    ("N*", "torque", "incomplete"),
    ("/min", "speed", "not a unit"),
]


class TestRefusedSpellings:
    """Every refused spelling raises UnitProblem with a message saying what was wrong."""

    @pytest.mark.parametrize("spelling, kind, words", REFUSED)
    def test_refused_with_message(self, spelling, kind, words):
        with pytest.raises(UnitProblem) as caught:
            si_factor(spelling, kind)
        assert words in str(caught.value)
        assert caught.value.kind == kind
        assert caught.value.text == spelling

    def test_refusal_is_repeatable_from_cache(self):
        for _ in range(3):
            with pytest.raises(UnitProblem, match="lbf·in"):
                si_factor("lb-in", "torque")

    def test_lb_is_a_mass_in_a_density(self):
        # NIST SP 811: the avoirdupois pound is a unit of mass.
        assert si_factor("lb/in³", "density") == pytest.approx(POUND_MASS / INCH**3, rel=1e-12)

    def test_non_text_unit(self):
        with pytest.raises(UnitProblem, match="not a unit text"):
            si_factor(5, "length")  # type: ignore[arg-type]

    def test_unknown_kind_is_a_programming_error(self):
        with pytest.raises(ValueError, match="kind must be one of"):
            si_factor("mm", "lenght")


class TestParseValue:
    """Cell values: a number and an optional unit, or a clear refusal."""

    @pytest.mark.parametrize(
        "cell, kind, default, expected",
        [
            ("52 mm", "length", None, 0.052),
            ("52mm", "length", None, 0.052),
            ("  52   mm ", "length", None, 0.052),
            ("52 mm", "length", "in", 0.052),  # the cell's own unit overrides the header's
            ("52", "length", "mm", 0.052),
            (52, "length", "mm", 0.052),
            (52.0, "length", "mm", 0.052),
            (2, "length", "in", 2 * INCH),
            ("1.5e3 N·m", "torque", None, 1500.0),
            ("1.5E3 N·m", "torque", None, 1500.0),
            ("-250 lbf·ft", "torque", None, -250 * LBF * FOOT),
            ("+.5 in", "length", None, 0.5 * INCH),
            ("5.", "length", "mm", 0.005),
            ("1450 rpm", "speed", None, 1450 * REV / MINUTE),
            ("1450 r/min", "speed", None, 1450 * REV / MINUTE),
            ("5°", "angle", None, 5 * DEGREE),
            ("0.25 °/m", "angle_per_length", None, 0.25 * DEGREE),
            ("79.3 GPa", "stress", None, 79.3e9),
            ("7850 kg/m³", "density", None, 7850.0),
            (1.2, "dimensionless", None, 1.2),
            ("1.2", "dimensionless", None, 1.2),
            ("15 %", "dimensionless", None, 0.15),
            (3, "dimensionless", None, 3.0),
        ],
    )
    def test_reads(self, cell, kind, default, expected):
        assert parse_value(cell, kind, default) == pytest.approx(expected, rel=1e-12)

    def test_numpy_scalars(self):
        np = pytest.importorskip("numpy")
        assert parse_value(np.float64(2.0), "length", "in") == pytest.approx(2 * INCH)
        assert parse_value(np.int64(3), "length", "mm") == pytest.approx(0.003)
        with pytest.raises(UnitProblem, match="yes/no"):
            parse_value(np.bool_(True), "length", "mm")

    @pytest.mark.parametrize(
        "cell, kind, default, words",
        [
            ("12,5 mm", "length", None, "a decimal comma"),
            ("12,5 mm", "length", None, "write a decimal point"),
            ("0,5", "length", "mm", "decimal comma"),
            ("1,200 N·m", "torque", None, "thousands separator or a decimal comma"),
            ("1,200,000 N·m", "torque", None, "thousands separator"),
            ("1 200 N·m", "torque", None, "digits separated by spaces"),
            ("2*3 mm", "length", None, "not a unit"),
            ("2 * 3", "length", "mm", "not a unit"),
            ("3+4 mm", "length", None, "not a unit"),
            ("52 GPa", "length", None, "expected a length, got 'GPa' (a pressure"),
            ("52 lb-in", "torque", None, "lbf·in"),
            ("52", "length", None, "no unit"),
            (52, "length", None, "e.g. '52 mm'"),
            (52, "angle", None, "no unit"),
            ("abc", "length", "mm", "not a number with a unit"),
            ("nan", "length", "mm", "not a number"),
            ("inf mm", "length", None, "not a number"),
            (float("nan"), "length", "mm", "not a finite number"),
            (float("inf"), "length", "mm", "not a finite number"),
            (True, "length", "mm", "got 'TRUE' (a yes/no value)"),
            (None, "length", "mm", "cell is empty; expected a length"),
            ("", "length", "mm", "cell is empty"),
            ("   ", "torque", "N·m", "cell is empty; expected a torque"),
            ("=A1*2", "length", "mm", "not a number"),
            ([1, 2], "length", "mm", "a list, not a number"),
            ("52", "length", "furlong-ish", "not a unit"),
        ],
    )
    def test_refuses(self, cell, kind, default, words):
        with pytest.raises(UnitProblem) as caught:
            parse_value(cell, kind, default)
        assert words in str(caught.value)

    def test_date_refused(self):
        import datetime

        with pytest.raises(UnitProblem, match="a date or time"):
            parse_value(datetime.datetime(2024, 5, 1), "length", "mm")

    @pytest.mark.parametrize(
        "error", ["#N/A", "#VALUE!", "#REF!", "#DIV/0!", "#NUM!", "#NAME?", "#NULL!", "#SPILL!",
                  "#CALC!", "#n/a", "ERR:502", "Err:522"]
    )
    def test_excel_error_text(self, error):
        # Excel's error values and LibreOffice Calc's Err:nnn codes (common practice: the
        # values each program shows in a cell), read by the one list below every front end.
        with pytest.raises(UnitProblem) as caught:
            parse_value(error, "length", "mm")
        assert str(caught.value) == f"cell holds the error {error.upper()}"

    def test_hash_word_that_no_spreadsheet_shows_is_not_an_error(self):
        with pytest.raises(UnitProblem, match="not a number"):
            parse_value("#FOO", "length", "mm")

    def test_hash_text_that_is_not_an_error(self):
        with pytest.raises(UnitProblem, match="not a number"):
            parse_value("#5", "length", "mm")


class TestNeverAnythingButUnitProblem:
    """Odd strings never let pint's or Python's own exceptions escape."""

    @settings(max_examples=400, deadline=None)
    @given(st.text(max_size=40), st.sampled_from(KINDS))
    def test_si_factor_any_text(self, text, kind):
        try:
            factor = si_factor(text, kind)
        except UnitProblem as problem:
            assert str(problem)
        else:
            assert math.isfinite(factor) and factor > 0

    @settings(max_examples=400, deadline=None)
    @given(
        st.text(alphabet=st.sampled_from(list("mNkMGPa/*^-. 0123456789²³⁴·°µ%()[]lbfinrpdegsWh_\"',#eE+")),
                max_size=16),
        st.sampled_from(KINDS),
    )
    def test_si_factor_unit_like_text(self, text, kind):
        try:
            si_factor(text, kind)
        except UnitProblem:
            pass

    @settings(max_examples=400, deadline=None)
    @given(
        st.one_of(st.text(max_size=30), st.integers(), st.floats(), st.none(), st.booleans()),
        st.sampled_from(KINDS),
        st.sampled_from([None, "mm", "N·m", "", "lb-in"]),
    )
    def test_parse_value_anything(self, value, kind, default):
        try:
            result = parse_value(value, kind, default)
        except UnitProblem as problem:
            assert str(problem)
        else:
            assert math.isfinite(result)

    @settings(max_examples=200, deadline=None)
    @given(st.text(max_size=30))
    def test_unit_system_any_text(self, text):
        try:
            assert unit_system(text) in ("SI", "US")
        except UnitProblem:
            pass


class TestSplitHeader:
    """Headers carry their unit in a trailing [...]."""

    @pytest.mark.parametrize(
        "header, expected",
        [
            ("Outer diameter [mm]", ("Outer diameter", "mm")),
            ("G [GPa]", ("G", "GPa")),
            ("  Torque   [ N·m ]  ", ("Torque", "N·m")),
            ("Density [kg/m³]", ("Density", "kg/m³")),
            ("Kt", ("Kt", None)),
            ("Kt [-]", ("Kt", "-")),
            ("Layer 1 [core] outer diameter [in]", ("Layer 1 [core] outer diameter", "in")),
            ("Layer (core)", ("Layer (core)", None)),
            ("Note []", ("Note", None)),
            (None, ("", None)),
            (12, ("12", None)),
        ],
    )
    def test_split(self, header, expected):
        assert split_header(header) == expected


class TestUnitSystem:
    """US customary units mark a US table; neutral units count as SI."""

    @pytest.mark.parametrize("unit", ["in", "lbf·in", "lbf-ft", "psi", "ksi", "Msi", "hp", "°/ft",
                                      "lb/in³", "ft", "lb", "oz", "slug", "gr"])
    def test_us(self, unit):
        # the avoirdupois pound, ounce and grain and the slug are US customary (NIST SP 811,
        # appendix B), each read alone as well as inside a product
        assert unit_system(unit) == "US"

    @pytest.mark.parametrize("unit", ["mm", "N·m", "Nm", "MPa", "kW", "rpm", "°", "", "kg/m³", "rad/s"])
    def test_si(self, unit):
        assert unit_system(unit) == "SI"

    def test_not_a_unit(self):
        with pytest.raises(UnitProblem, match="not a unit"):
            unit_system("foo bar baz")


class TestDisplayUnit:
    """Result units per kind and system, each one accepted by si_factor for its kind."""

    @pytest.mark.parametrize("kind", KINDS)
    @pytest.mark.parametrize("system", ["SI", "US"])
    def test_display_unit_round_trips(self, kind, system):
        shown = display_unit(kind, system)
        assert si_factor(shown, kind) > 0
        if kind not in ("speed", "angle", "dimensionless", "expansion"):  # 1/K is both systems'
            assert unit_system(shown) == system

    def test_examples(self):
        assert display_unit("torque", "US") == "lbf·in"
        assert display_unit("length", "SI") == "mm"

    def test_bad_system(self):
        with pytest.raises(ValueError, match="'SI' or 'US'"):
            display_unit("length", "metric")


class TestRegistryAndProblem:
    """One shared registry; UnitProblem carries its data."""

    def test_one_registry(self):
        assert registry() is registry()
        assert isinstance(registry(), pint.UnitRegistry)

    def test_registry_knows_msi(self):
        assert registry().Quantity(1, "Msi").to("psi").magnitude == pytest.approx(1e6)

    def test_problem_attributes(self):
        with pytest.raises(UnitProblem) as caught:
            si_factor("GPa", "length")
        problem = caught.value
        assert isinstance(problem, ValueError)
        assert (problem.text, problem.kind, problem.reason) == ("GPa", "length", "a pressure or stress")
        assert str(problem) == "expected a length, got 'GPa' (a pressure or stress)"

    def test_problem_pickles(self):
        problem = UnitProblem("lb-in", "torque", "lb is a pound of mass", "write 'lbf·in'")
        again = pickle.loads(pickle.dumps(problem))
        assert (again.text, again.kind, again.reason, again.advice, str(again)) == (
            problem.text, problem.kind, problem.reason, problem.advice, str(problem))

    def test_kinds(self):
        assert units.KINDS == ("length", "stress", "torque", "power", "speed", "angle",
                               "angle_per_length", "density", "dimensionless", "force", "temperature",
                               "expansion")


class TestNumberUnitSplitRegressions:
    """A unit that starts with a digit after a space is parsed as a unit; one glued on is not."""

    def test_unit_starting_with_a_digit_gets_its_advice(self):
        with pytest.raises(UnitProblem) as exc:
            parse_value("1450 1/min", "speed", "rpm")
        assert "rpm" in str(exc.value)

    def test_decimal_comma_after_a_thousands_point(self):
        with pytest.raises(UnitProblem) as exc:
            parse_value("1.200,5", "length", "mm")
        assert "decimal comma" in str(exc.value)

    def test_spaced_digits_before_a_unit(self):
        with pytest.raises(UnitProblem) as exc:
            parse_value("1 200 N·m", "torque")
        assert "spaces" in str(exc.value)


class TestForceKind:
    """Force units (axial force) against pint's own definitions."""

    @pytest.mark.parametrize("text, pint_unit", [("N", "newton"), ("kN", "kilonewton"), ("lbf", "force_pound"),
                                                 ("kip", "kip"), ("MN", "meganewton")])
    def test_factor_matches_pint(self, text, pint_unit):
        import pint

        expected = pint.UnitRegistry().Quantity(1.0, pint_unit).to("newton").magnitude
        assert si_factor(text, "force") == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("text", ["lb", "N·m", "kg"])
    def test_wrong_dimension_refused(self, text):
        with pytest.raises(UnitProblem, match="expected a force"):
            si_factor(text, "force")
