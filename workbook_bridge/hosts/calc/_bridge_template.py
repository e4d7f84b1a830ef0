# -*- coding: utf-8 -*-
"""twistshare's cell functions in LibreOffice Calc: the bridge from the Basic wrappers to the engine.

LibreOffice runs this module in its own Python (the system Python on Linux, a bundled one on
Windows and macOS), which cannot simply import the Python that twistshare is installed in. The
engine is reached in one of two ways, chosen on the first call and kept for the session:

- in-process: when LibreOffice's Python is the same build as twistshare's (same ABI tag), the
  folders twistshare is installed in are put in front of ``sys.path`` and the engine imported;
- helper: otherwise (or when that import fails), twistshare's own Python is started as a helper
  process and asked over a pipe (its standard input and output; no port is opened). It ends
  when LibreOffice ends.

Environment variable ``TWISTSHARE_CALC_ENGINE``: ``auto`` (default), ``in-process`` or ``helper``;
``TWISTSHARE_CALC_REPORT``: a file to which the way the engine was reached is appended.
Only standard-library modules are used here. Every failure comes back as a ``⚠`` text: nothing
may escape into Calc.
"""

import importlib
import json
import os
import queue
import site
import subprocess
import sys
import sysconfig
import tempfile
import threading

# Filled in by setup (the engine's Python and where twistshare is installed).
ENGINE = {}
# Filled in by setup: every cell function and its argument names, in call order.
FUNCTIONS = {}

_WARN = "\u26a0"
_START_TIMEOUT = 120.0  # seconds for the helper to import the engine
_CALL_TIMEOUT = 600.0  # seconds for one call (a block of many thousand parts)
_SCRUBBED = ("PYTHONHOME", "PYTHONPATH", "PYTHONSTARTUP", "PYTHONEXECUTABLE", "PYTHONNOUSERSITE")


class EngineUnavailable(Exception):
    """The engine could not be reached; the message says why and what to do."""


class _InProcess:
    """The engine imported into LibreOffice's own Python."""

    how = "in-process"

    def __init__(self):
        tag = sysconfig.get_config_var("SOABI")
        if tag != ENGINE.get("soabi"):
            raise EngineUnavailable(f"LibreOffice's Python ({tag}) is not twistshare's ({ENGINE.get('soabi')})")
        dirs = [d for d in ENGINE.get("site_dirs", ()) if os.path.isdir(d)]
        numpy = sys.modules.get("numpy")
        if numpy is not None and not any(str(getattr(numpy, "__file__", "")).startswith(d) for d in dirs):
            raise EngineUnavailable("another numpy is already loaded in LibreOffice's Python")
        before = list(sys.path)
        try:
            for d in dirs:
                site.addsitedir(d)
            added = [p for p in sys.path if p not in before]
            sys.path[:] = added + before
            self._runtime = importlib.import_module(ENGINE["runtime_module"]).Runtime()
        except Exception as error:
            sys.path[:] = before
            raise EngineUnavailable(f"importing the engine failed: {type(error).__name__}: {error}") from None

    def call(self, name, args):
        return self._runtime.call(name, args)


class _Helper:
    """The engine in twistshare's own Python, asked over a pipe."""

    how = "helper"

    def __init__(self):
        python = ENGINE.get("python", "")
        if not python or not os.path.exists(python):
            raise EngineUnavailable(f"twistshare's Python {python!r} is not there any more: run setup again")
        env = {k: v for k, v in os.environ.items() if k not in _SCRUBBED}
        options = {}
        if os.name == "nt":
            options["creationflags"] = getattr(subprocess, "CREATE_NO_WINDOW", 0)
        self._errors = tempfile.TemporaryFile()
        self._lock = threading.Lock()
        self._lines = queue.Queue()
        self._process = subprocess.Popen([python, "-m", ENGINE["helper_module"]], stdin=subprocess.PIPE,
                                         stdout=subprocess.PIPE, stderr=self._errors, env=env, **options)
        threading.Thread(target=self._read, name="twistshare-helper-reader", daemon=True).start()
        hello = self._reply(_START_TIMEOUT)
        if not hello.get("ready"):
            self.close()
            raise EngineUnavailable(f"the twistshare helper could not start: {hello.get('error')}")

    def _read(self):
        for line in self._process.stdout:
            self._lines.put(line)
        self._lines.put(None)

    def _stderr_tail(self):
        try:
            self._errors.seek(0)
            text = self._errors.read().decode("utf-8", "replace").strip().splitlines()
            return text[-1] if text else "no message"
        except OSError:
            return "no message"

    def _reply(self, timeout):
        try:
            line = self._lines.get(timeout=timeout)
        except queue.Empty:
            self.close()
            raise EngineUnavailable(f"the twistshare helper did not answer within {timeout:g} s") from None
        if line is None:
            raise EngineUnavailable(f"the twistshare helper ended: {self._stderr_tail()}")
        return json.loads(line)

    def call(self, name, args):
        message = json.dumps({"name": name, "args": args}, ensure_ascii=True, default=str).encode("ascii")
        with self._lock:
            try:
                self._process.stdin.write(message + b"\n")
                self._process.stdin.flush()
            except OSError as error:
                raise EngineUnavailable(f"the twistshare helper is gone: {error}; {self._stderr_tail()}") from None
            return self._reply(_CALL_TIMEOUT).get("value")

    def close(self):
        try:
            self._process.kill()
        except OSError:
            pass


def _connect():
    mode = os.environ.get("TWISTSHARE_CALC_ENGINE", "auto").strip().lower() or "auto"
    if mode not in ("auto", "in-process", "helper"):
        raise EngineUnavailable(f"TWISTSHARE_CALC_ENGINE={mode!r}: expected auto, in-process or helper")
    why = ""
    if mode != "helper":
        try:
            return _InProcess()
        except EngineUnavailable as error:
            if mode == "in-process":
                raise
            why = str(error)
    try:
        return _Helper()
    except EngineUnavailable as error:
        raise EngineUnavailable(f"{error}" + (f" (in-process: {why})" if why else "")) from None


# The connection to the engine, made on the first call and kept for the LibreOffice session (each
# cell is a fresh call into this module); a failure is kept too, so that a thousand cells do not
# retry a start that cannot work.
_SESSION = {}
_SESSION_LOCK = threading.Lock()


def engine():
    """The engine connection of this session (made on first use); raises EngineUnavailable."""
    with _SESSION_LOCK:
        if "failed" in _SESSION:
            raise EngineUnavailable(_SESSION["failed"])
        if "engine" not in _SESSION:
            try:
                _SESSION["engine"] = _connect()
            except EngineUnavailable as error:
                _SESSION["failed"] = str(error)
                _note(f"unavailable: {error}")
                raise
            _note(_SESSION["engine"].how)
        return _SESSION["engine"]


def _note(text):
    """Say how the engine was reached, in the file TWISTSHARE_CALC_REPORT names (a diagnostic)."""
    path = os.environ.get("TWISTSHARE_CALC_REPORT")
    if path:
        try:
            with open(path, "a", encoding="utf-8") as f:
                f.write(text + "\n")
        except OSError:
            pass


def _tuples(value):
    if isinstance(value, list):
        return tuple(_tuples(v) for v in value)
    return value


def call(name, args=()):
    """Called by the Basic wrappers: the value of cell function ``name`` for ``args``."""
    try:
        name = str(name)
        if name not in FUNCTIONS:
            return f"{_WARN} {name} is not a twistshare cell function in this setup: run setup again"
        return _tuples(engine().call(name, list(args or ())))
    except EngineUnavailable as error:
        return f"{_WARN} {name}: the twistshare engine is not reachable from LibreOffice: {error}"
    except BaseException as error:  # nothing may escape into Calc
        return f"{_WARN} {name} could not run in LibreOffice: {type(error).__name__}: {error}"


g_exportedScripts = (call,)
