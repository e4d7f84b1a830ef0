"""The Python bridge module LibreOffice runs (``Scripts/python/twistshare_calc.py`` in a profile).

Its code is `_bridge_template.py`, a real module of this package (so it is read, linted and
tested like the rest); setup fills in two tables: where the engine lives (`EngineLocation`) and
the cell functions with their arguments.
"""

from __future__ import annotations

import os
import site
import sys
import sysconfig
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path

from . import _helper, _runtime
from ._specs import HostFunction

__all__ = ["EngineLocation", "engine_location", "bridge_source"]

_TEMPLATE = Path(__file__).with_name("_bridge_template.py")
_ENGINE_SLOT = "ENGINE = {}\n"
_FUNCTIONS_SLOT = "FUNCTIONS = {}\n"


@dataclass(frozen=True)
class EngineLocation:
    """Where LibreOffice's bridge finds the engine.

    Parameters
    ----------
    python : str
        The Python twistshare is installed in (it runs the helper process).
    site_dirs : tuple of str
        Its folders of installed packages (put in front of LibreOffice's ``sys.path`` in-process).
    soabi : str
        Its ABI tag (``cpython-311-x86_64-linux-gnu``): in-process only when LibreOffice's matches.
    runtime_module, helper_module : str
        The modules the bridge imports in-process and runs as the helper.
    """

    python: str
    site_dirs: tuple[str, ...]
    soabi: str
    runtime_module: str = _runtime.__name__
    helper_module: str = _helper.__name__

    def as_dict(self) -> dict[str, object]:
        """Plain data, as the bridge module LibreOffice runs is given it."""
        return {"python": self.python, "site_dirs": list(self.site_dirs), "soabi": self.soabi,
                "runtime_module": self.runtime_module, "helper_module": self.helper_module}


def engine_location() -> EngineLocation:
    """The running Python as the engine's home (the one that runs setup or a recalculation)."""
    dirs: list[str] = []
    candidates = list(site.getsitepackages()) if hasattr(site, "getsitepackages") else []
    if site.ENABLE_USER_SITE:
        candidates.append(site.getusersitepackages())
    # A source checkout on PYTHONPATH (no install) is found the same way.
    candidates += [p for p in os.environ.get("PYTHONPATH", "").split(os.pathsep) if p]
    for d in candidates:
        d = os.path.abspath(d)
        if os.path.isdir(d) and d not in dirs:
            dirs.append(d)
    return EngineLocation(sys.executable, tuple(dirs), str(sysconfig.get_config_var("SOABI") or ""))


def bridge_source(specs: Iterable[HostFunction], engine: EngineLocation) -> str:
    """The text of the bridge module for these functions and this engine."""
    text = _TEMPLATE.read_text(encoding="utf-8")
    if text.count(_ENGINE_SLOT) != 1 or text.count(_FUNCTIONS_SLOT) != 1:
        raise RuntimeError(f"{_TEMPLATE.name}: the ENGINE and FUNCTIONS slots must appear once each")
    functions = {s.name: tuple(a.name for a in s.arguments) for s in specs}
    text = text.replace(_ENGINE_SLOT, f"ENGINE = {engine.as_dict()!r}\n")
    text = text.replace(_FUNCTIONS_SLOT, f"FUNCTIONS = {functions!r}\n")
    head = "# Written by twistshare's Calc setup, which rewrites it; undo removes it. Do not edit.\n"
    return head + text
