"""The public surface of twistshare.engine.core: the contract's names and the docstring examples."""

import doctest
import importlib
import inspect

import pytest
import twistshare.engine.core as core

CONTRACT = [
    "Criterion", "AllowableRule", "LayerFlag", "PartFlag", "LayerStack", "Duty", "Rating", "rate",
    "polar_moment", "shear_modulus_from_elastic", "allowable_shear", "torque_from_power",
    "shear_stress_at", "stress_profile", "Material", "material_library", "find_material",
]

MODULES = ["_allowables", "_capacity", "_compatibility", "_criteria", "_demand", "_diagnoses",
           "_governing", "_materials", "_rating", "_restoring", "_section", "_sizing", "_stock"]


def test_contract_names_exported():
    """DEVELOPERS.md, Engine core API: every listed name is public."""
    assert set(CONTRACT) <= set(core.__all__)


def test_all_resolves_without_duplicates():
    assert len(core.__all__) == len(set(core.__all__))
    for name in core.__all__:
        assert getattr(core, name) is not None


def test_rate_signature():
    parameters = inspect.signature(core.rate).parameters
    assert list(parameters) == ["stack", "duty", "inputs", "contact_abs_tol", "contact_rel_tol"]
    assert parameters["inputs"].kind is inspect.Parameter.KEYWORD_ONLY
    assert parameters["contact_abs_tol"].default == 1e-5
    assert parameters["contact_rel_tol"].default == 2e-4
    assert parameters["contact_abs_tol"].kind is inspect.Parameter.KEYWORD_ONLY


def test_rating_fields_match_contract():
    names = [f for f in core.Rating.__dataclass_fields__]
    for name in ("gj", "share", "layer_torque", "stress_outer", "stress_inner", "capacity",
                 "utilisation", "layer_flags", "interface_gap", "sum_gj", "twist_per_length",
                 "twist_angle", "twist_capacity", "governing_capacity", "governing_criterion",
                 "governing_layer", "margin", "reserve_factor", "part_flags", "valid", "criterion_capacity"):
        assert name in names


@pytest.mark.parametrize("module", ["__init__", *MODULES])
def test_docstring_examples(module):
    """Each documented example runs and prints what its docstring says."""
    name = "twistshare.engine.core" + ("" if module == "__init__" else "." + module)
    result = doctest.testmod(importlib.import_module(name), optionflags=doctest.ELLIPSIS)
    assert result.failed == 0
