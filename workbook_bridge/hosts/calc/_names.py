"""The names the Calc host puts into a LibreOffice profile, and the commands it tells users to run."""

from __future__ import annotations

__all__ = ["BASIC_MODULE", "BRIDGE_FILE", "BRIDGE_FUNCTION", "MANIFEST_FILE", "ENGINE_ENV", "SETUP_COMMAND",
           "UNDO_COMMAND", "RECALC_COMMAND"]

# The Basic module holding the wrappers; it must live in the Standard library, the only one
# Calc searches when it imports a workbook's formulas.
BASIC_MODULE = "TwistshareCells"
# The Python module in the profile's Scripts/python folder, and the one function Basic calls.
BRIDGE_FILE = "twistshare_calc.py"
BRIDGE_FUNCTION = "call"
# What setup wrote and created, so that undo removes exactly that (in the profile's user folder).
MANIFEST_FILE = "twistshare-calc-host.json"
# "auto" (default), "in-process" or "helper": how the bridge reaches the engine.
ENGINE_ENV = "TWISTSHARE_CALC_ENGINE"

# What users are told to run: the `twistshare` command's subcommands (commands/_calc.py).
SETUP_COMMAND = "twistshare calc-setup"
UNDO_COMMAND = "twistshare calc-setup --undo"
RECALC_COMMAND = "twistshare recalc"
