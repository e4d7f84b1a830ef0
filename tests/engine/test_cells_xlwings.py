"""The wrapper code xlwings generates for Excel lists every cell function with its arguments.

xlwings' UDF machinery (``xlwings.udfs``) only imports on Windows: it needs the pywin32
modules ``pythoncom``, ``pywintypes`` and ``win32com.client``. These tests STUB those three
modules in ``sys.modules`` (empty stand-ins, nothing of COM runs), import xlwings' real UDF
decorators and VBA generator, load a fresh copy of our cell-function module with xlwings'
real decorators in place of the no-op ones xlwings uses off Windows, and read what xlwings
records and writes. No Excel is involved; the stubs and patches are undone afterwards.
"""

from __future__ import annotations

import importlib.util
import inspect
import io
import re
import sys
import types
from pathlib import Path

import pytest
import twistshare.engine.cells as cells
import twistshare.engine.cells.hosts.xlwings_udfs as udf_host
import xlwings

HOST_FILE = Path(udf_host.__file__)
UDF_MODULE = "twistshare.engine.cells.hosts.xlwings_udfs"


@pytest.fixture
def windows_udfs(monkeypatch):
    """xlwings.udfs imported over stubbed pywin32 modules; our functions declared with it."""
    pythoncom = types.ModuleType("pythoncom")
    pythoncom.CoInitialize = lambda: None  # xlwings.udfs starts a thread pool with it
    win32com = types.ModuleType("win32com")
    client = types.ModuleType("win32com.client")
    client.Dispatch = lambda *args, **kwargs: None
    win32com.client = client
    for name, module in {"pythoncom": pythoncom, "pywintypes": types.ModuleType("pywintypes"),
                         "win32com": win32com, "win32com.client": client}.items():
        monkeypatch.setitem(sys.modules, name, module)
    had_udfs = "xlwings.udfs" in sys.modules
    udfs = importlib.import_module("xlwings.udfs")
    monkeypatch.setattr(xlwings, "func", udfs.xlfunc, raising=False)
    monkeypatch.setattr(xlwings, "arg", udfs.xlarg, raising=False)
    monkeypatch.setattr(xlwings, "ret", udfs.xlret, raising=False)
    spec = importlib.util.spec_from_file_location(f"{UDF_MODULE}_windows", HOST_FILE)
    module = importlib.util.module_from_spec(spec)
    module.__package__ = "twistshare.engine.cells.hosts"
    spec.loader.exec_module(module)
    try:
        yield udfs, module
    finally:
        if not had_udfs:
            sys.modules.pop("xlwings.udfs", None)
            if hasattr(xlwings, "udfs"):
                delattr(xlwings, "udfs")  # plain delattr: monkeypatch would put it back


class _Workbook:
    """The one attribute of an Excel workbook the generator reads."""

    Name = "twistshare.xlam"


def _generated_vba(udfs, module) -> str:
    out = io.StringIO()
    udfs.generate_vba_wrapper(UDF_MODULE, module, out, _Workbook())
    return out.getvalue()


def test_every_function_has_a_vba_wrapper_with_its_arguments(windows_udfs):
    udfs, module = windows_udfs
    vba = _generated_vba(udfs, module)
    declared = dict(re.findall(r"^Function (TWS_\w+)\(([^)]*)\)", vba, re.MULTILINE))
    names = [spec.name for spec in cells.registry()]
    assert sorted(declared) == sorted(names)
    for name in names:
        parameters = inspect.signature(getattr(module, name)).parameters
        expected = ", ".join(
            ("Optional " if p.default is not inspect.Parameter.empty else "") + p.name
            for p in parameters.values()
        )
        assert declared[name] == expected
        assert f'XLPy.CallUDF("{UDF_MODULE}", "{name}"' in vba


def test_xlwings_records_descriptions_and_options(windows_udfs):
    _, module = windows_udfs
    listed = {f["name"]: f for f in cells.list_functions()}
    for name in listed:
        info = getattr(module, name).__xlfunc__
        assert info["category"] == "twistshare"
        assert info["ret"]["doc"] == listed[name]["description"]
        docs = {a["name"]: a["description"] for a in listed[name]["arguments"]}
        for argument in info["args"]:
            assert argument["doc"] == docs[argument["name"]]
            # Errors reach us as '#N/A' text, not as None like an empty cell.
            assert argument["options"]["err_to_str"] is True
            if argument["name"] in ("layers", "materials"):
                assert argument["options"]["ndim"] == 2


def test_windows_copy_computes_like_the_installed_one(windows_udfs):
    _, module = windows_udfs
    block = [["G [GPa]", "OD [mm]", "ID [mm]", "Allowable [MPa]"], [79.3, 40, 0, 100]]
    assert module.TWS_GOVERNING_LIMIT(block) == cells.TWS_GOVERNING_LIMIT(block)


@pytest.mark.parametrize(
    "code, error", [(-2146826246, "#N/A"), (-2146826273, "#VALUE!"), (-2146826281, "#DIV/0!")]
)
def test_com_error_codes_reach_the_function_as_their_text(code, error):
    # The integer codes the Excel COM interface uses for error cells (xlwings' own table).
    assert udf_host.com_error_text(code) == error
    shown = udf_host.TWS_TORQUE_FROM_POWER(code, "1450 rpm")
    assert shown == f"⚠ power: the cell holds the error value {error}; expected a power"


def test_host_offers_every_registered_function_under_its_name():
    for spec in cells.registry():
        hosted = getattr(udf_host, spec.name)
        assert inspect.signature(hosted) == inspect.signature(spec.function)
