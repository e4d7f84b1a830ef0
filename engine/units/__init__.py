"""The one shared unit registry and the unit spellings engineers type.

Everything that turns a cell or a header into an SI float goes through here, so a spelling is
taught once and read the same way by the cell functions and the workbook bridge.

pint reads several everyday spellings wrongly or fails oddly (``Nm`` is number·metre, ``kNm``
kilonumber·metre, ``lb`` a pound of *mass*, ``mil`` an angular mil, ``N-m`` raises a bare
``TypeError``, ``r/min`` and ``N/mm2`` are undefined). So unit text never reaches pint's
expression parser: it is normalised and tokenised here (names, integer exponents, ``*``, ``/``),
each name is mapped through the tables in `_spellings` or looked up in pint by name, and the unit is
built by multiplying those names. The dimension is then checked for the kind asked for.

Decisions (every one has a test in ``tests/engine/test_units.py``):

* ``Nm``, ``kNm``, ``MNm``, ``daNm``, ``Nmm``, ``Ncm`` are read as newton × metre (etc.): in
  engineering usage these are always torque. In a column of another kind they are refused as
  "a torque".
* A hyphen, a space, ``*``, ``.``, ``·``, ``⋅`` or ``×`` between unit names is a product:
  ``N-m``, ``kN-m``, ``lbf-ft``, ``ft-lbf``, ``N.m``, ``N m``.
* ``lb`` (``lbs``, ``pound``) is a pound of mass. It is fine in a density (``lb/in³``); in a
  torque, stress or power it is refused with advice (``lb-in`` → write ``lbf·in``;
  ``lb/in²`` → write ``psi``). ``in-lb`` and ``ft-lb`` likewise.
* ``mil`` is refused (a thousandth of an inch, slang for a millimetre, and pint's angular mil);
  ``mPa`` is refused (a millipascal; almost always a mistyped ``MPa``). ``Mpa``, ``MPA``,
  ``mpa`` are read as megapascal, ``KN`` as kilonewton, ``KW`` as kilowatt, ``HP`` as hp.
* A rotational speed must count turns or radians: ``rpm``, ``r/min``, ``rev/min``,
  ``U/min``, ``rps``, ``rev/s``, ``rad/s``, ``deg/s``. ``Hz``, ``1/s``, ``1/min`` are refused
  (they do not say whether they count revolutions or radians: a 2π trap).
* A torque must be written as force × length: ``J`` and other energy units are refused.
* An angle must be an angle unit (``°``, ``deg``, ``rad``, ``arcmin``, ``rev``): pint calls angles
  dimensionless, so a plain number or ``%`` is not accepted as an angle, and an angle is not
  accepted as a plain number.
* At most one ``/`` with one unit after it (``kg/m³``, ``N/mm²``, ``°/m``); ``W/m*K`` is refused
  rather than guessed.
* In a cell value, a comma is refused: ``12,5 mm`` (decimal comma) and ``1,200 N·m`` (a
  thousands separator, or a decimal comma in many locales) could each mean two numbers.
"""

from __future__ import annotations

from ._factors import si_factor, si_offset, unit_system
from ._kinds import KINDS, UnitProblem, describe_kind, display_unit, registry
from ._values import ERROR_VALUES, error_value_text, parse_value, split_header

__all__ = [
    "KINDS",
    "UnitProblem",
    "registry",
    "si_factor",
    "parse_value",
    "si_offset",
    "split_header",
    "unit_system",
    "display_unit",
    "describe_kind",
    "ERROR_VALUES",
    "error_value_text",
]
