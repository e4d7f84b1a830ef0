"""Finding LibreOffice and running it headless, always ending it: on success, error and timeout.

The office runs in a session (process group) of its own, so that ending it also ends what it
started (the twistshare helper process, when the bridge uses one). It is driven by a small UNO
script (`_uno_driver.py`) run by LibreOffice's Python: that gives each cell's value and error
code directly, with the book's own macros never run, and nothing written by LibreOffice.
"""

from __future__ import annotations

import json
import os
import shutil
import signal
import subprocess
import sys
import time
import uuid
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ._errors import LibreOfficeFailed, LibreOfficeMissing, LibreOfficeTimeout

__all__ = ["Office", "find_soffice", "find_office", "run_office", "start_profile", "end_process_group",
           "office_environment", "SOFFICE_ENV"]

SOFFICE_ENV = "TWISTSHARE_SOFFICE"  # the path of soffice, where it is not on PATH
_DRIVER = Path(__file__).with_name("_uno_driver.py")
_SCRUBBED = ("PYTHONHOME", "PYTHONPATH", "PYTHONSTARTUP", "PYTHONEXECUTABLE")


@dataclass(frozen=True)
class Office:
    """An installed LibreOffice: its ``soffice`` and the Python that has its ``uno`` module."""

    soffice: str
    uno_python: str


def _default_places() -> list[str]:
    if sys.platform == "darwin":
        return ["/Applications/LibreOffice.app/Contents/MacOS/soffice",
                str(Path.home() / "Applications/LibreOffice.app/Contents/MacOS/soffice")]
    if os.name == "nt":
        return [str(Path(os.environ.get(v, "")) / "LibreOffice" / "program" / "soffice.exe")
                for v in ("ProgramFiles", "ProgramFiles(x86)") if os.environ.get(v)]
    return ["/usr/bin/soffice", "/usr/lib/libreoffice/program/soffice", "/opt/libreoffice/program/soffice"]


def find_soffice() -> str:
    """The ``soffice`` program; raises LibreOfficeMissing with a one-line message."""
    given = os.environ.get(SOFFICE_ENV)
    if given:
        if Path(given).is_file():
            return given
        raise LibreOfficeMissing(f"{SOFFICE_ENV}={given}: no such program")
    for name in ("soffice", "libreoffice"):
        found = shutil.which(name)
        if found:
            return found
    for place in _default_places():
        if Path(place).is_file():
            return place
    raise LibreOfficeMissing("LibreOffice is not installed (no soffice found on PATH); install it "
                             f"(Debian, Ubuntu: libreoffice-calc) or set {SOFFICE_ENV} to its soffice")


def _program_folders(soffice: str) -> tuple[Path, Path]:
    """Where LibreOffice keeps its own programs and Python parts: ``program/`` beside soffice,
    and ``Resources/`` beside it on macOS."""
    program = Path(os.path.realpath(soffice)).parent
    return program, program.parent / "Resources"


def _python_candidates(soffice: str) -> list[str]:
    program, resources = _program_folders(soffice)
    out = [program / "python.exe", program / "python", resources / "python"]
    names = [str(p) for p in out if p.is_file()]
    if os.name != "nt":
        names += [p for p in ("/usr/bin/python3", shutil.which("python3")) if p]
    names.append(sys.executable)
    unique: list[str] = []
    for n in names:
        if n not in unique:
            unique.append(n)
    return unique


_SYSTEM_FOLDERS = frozenset({"/bin", "/usr/bin", "/sbin", "/usr/sbin"})


def _foreign_python_dir(folder: str, keep: str | None) -> bool:
    """A PATH folder holding a Python other than LibreOffice's own (a virtual environment's, ...).

    Virtual and conda environments always count; another folder with a ``python3`` counts when
    LibreOffice's Python (`keep`) is known and is not that one. System folders never count.
    """
    path = Path(folder)
    if (path.parent / "pyvenv.cfg").is_file() or (path.parent / "conda-meta").is_dir():
        return True
    if keep is None or os.path.normpath(folder) in _SYSTEM_FOLDERS:
        return False
    for name in ("python3", "python", "python.exe"):
        candidate = path / name
        if candidate.is_file():
            return os.path.realpath(candidate) != os.path.realpath(keep)
    return False


def _clean_env(extra: dict[str, str] | None = None, *, office_python: str | None = None,
               for_office: bool = False) -> dict[str, str]:
    """The environment for LibreOffice or a Python: no PYTHONHOME and the like.

    For LibreOffice (`for_office`, or `office_python` given) also no folder on PATH that holds
    another Python: LibreOffice's embedded Python looks along PATH for its home, and a virtual
    environment's folder there (an activated venv) makes it load a foreign standard library and
    fail (every call then ends in "C++ code threw std::bad_alloc").
    """
    env = {k: v for k, v in os.environ.items() if k not in _SCRUBBED}
    if office_python is not None or for_office:
        env.pop("VIRTUAL_ENV", None)
        folders = [f for f in env.get("PATH", "").split(os.pathsep) if f]
        env["PATH"] = os.pathsep.join(f for f in folders if not _foreign_python_dir(f, office_python))
    env.update(extra or {})
    return env


def _surely_has_uno(python: str, soffice: str) -> bool:
    """The uno module lies beside this Python (LibreOffice's own, or Debian's python3-uno): no probe needed."""
    folders = _program_folders(soffice)
    program = folders[0]
    if Path(python).parent in folders:
        return (Path(python).parent / "uno.py").is_file() or (program / "uno.py").is_file()
    return python == "/usr/bin/python3" and Path("/usr/lib/python3/dist-packages/uno.py").is_file()


def _has_python_scripting(soffice: str) -> bool:
    """LibreOffice's Python script provider (``pythonscript.py``) is installed beside soffice."""
    return any((folder / "pythonscript.py").is_file() for folder in _program_folders(soffice))


def find_office() -> Office:
    """LibreOffice, its Python scripting and its UNO Python; raises LibreOfficeMissing."""
    soffice = find_soffice()
    if not _has_python_scripting(soffice):
        raise LibreOfficeMissing(f"LibreOffice's Python scripting was not found beside {soffice} (no "
                                 "pythonscript.py); install it (Debian, Ubuntu: libreoffice-script-provider-python)")
    for python in _python_candidates(soffice):
        if _surely_has_uno(python, soffice):
            return Office(soffice, python)
        try:
            probe = subprocess.run([python, "-c", "import uno"], capture_output=True, timeout=30,
                                   env=_clean_env(), stdin=subprocess.DEVNULL)
        except (OSError, subprocess.TimeoutExpired):
            continue
        if probe.returncode == 0:
            return Office(soffice, python)
    raise LibreOfficeMissing("LibreOffice's Python bridge (the uno module) was not found; install it "
                             "(Debian, Ubuntu: python3-uno and libreoffice-script-provider-python)")


def office_environment(office: Office, extra: dict[str, str] | None = None) -> dict[str, str]:
    """The environment LibreOffice is started with (see `_clean_env`)."""
    return _clean_env(extra, office_python=office.uno_python)


def profile_url(profile: Path) -> str:
    """The ``file://`` URL LibreOffice takes for a profile folder (-env:UserInstallation)."""
    return Path(profile).resolve().as_uri()


def _spawn(args: list[str], env: dict[str, str], **kwargs: Any) -> subprocess.Popen:
    if os.name == "nt":
        kwargs["creationflags"] = subprocess.CREATE_NEW_PROCESS_GROUP | getattr(subprocess, "CREATE_NO_WINDOW", 0)
    else:
        kwargs["start_new_session"] = True  # its own process group: killed as a whole
    return subprocess.Popen(args, env=env, stdin=subprocess.DEVNULL, **kwargs)


def _group_alive(pgid: int) -> bool:
    """Some process of the group is still running (zombies waiting to be reaped do not count)."""
    proc = Path("/proc")
    if proc.is_dir():
        for entry in proc.iterdir():
            if not entry.name.isdigit():
                continue
            try:
                stat = (entry / "stat").read_text()
            except OSError:
                continue
            fields = stat[stat.rfind(")") + 2:].split()
            if len(fields) > 2 and fields[2] == str(pgid) and fields[0] != "Z":
                return True
        return False
    try:
        os.killpg(pgid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


def end_process_group(process: subprocess.Popen, grace: float) -> None:
    """Wait up to `grace` seconds for the process to end, then kill it and all it started."""
    try:
        process.wait(timeout=max(grace, 0.0))
    except subprocess.TimeoutExpired:
        pass
    if os.name == "nt":
        if process.poll() is None:
            subprocess.run(["taskkill", "/F", "/T", "/PID", str(process.pid)], capture_output=True)
        process.wait(timeout=30)
        return
    # Whatever is left of the group (soffice.bin behind its launcher, a helper process) goes too;
    # again while any member still runs (one may have been starting a child as the first went).
    deadline = time.monotonic() + 10.0
    while True:
        try:
            os.killpg(process.pid, signal.SIGKILL)
        except ProcessLookupError:
            break
        try:
            process.wait(timeout=0.02)
        except subprocess.TimeoutExpired:
            pass
        if not _group_alive(process.pid) or time.monotonic() > deadline:
            break
    try:
        process.wait(timeout=10)
    except subprocess.TimeoutExpired:
        pass


def _office_args(soffice: str, profile: Path) -> list[str]:
    return [soffice, f"-env:UserInstallation={profile_url(profile)}", "--headless", "--invisible",
            "--nologo", "--norestore", "--nodefault", "--nolockcheck", "--nofirststartwizard"]


def start_profile(soffice: str, profile: Path, timeout: float = 120.0, *, office_python: str | None = None) -> None:
    """Start LibreOffice once on a new profile so that it creates it (and its Standard library).

    Until a profile has been started once, LibreOffice copies its default Standard library over
    whatever is in it; so nothing is written into a profile before this.
    """
    try:
        process = _spawn(_office_args(soffice, profile) + ["--terminate_after_init"],
                         _clean_env(office_python=office_python, for_office=True),
                         stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    except OSError as error:
        raise LibreOfficeFailed(f"could not start LibreOffice ({soffice}): {error}") from None
    try:
        process.wait(timeout=timeout)
    except subprocess.TimeoutExpired:
        raise LibreOfficeTimeout(f"LibreOffice did not create its profile in {profile} within {timeout:g} s; "
                                 "it was stopped", timeout) from None
    finally:
        end_process_group(process, 0.0)
    if not (profile / "user").is_dir():
        raise LibreOfficeFailed(f"LibreOffice ({soffice}) ended (exit code {process.returncode}) without creating "
                                f"its profile in {profile}; nothing was written")


def run_office(office: Office, profile: Path, book: Path, cells: dict[str, list[tuple[int, int]]], *,
               timeout: float, env: dict[str, str] | None = None, grace: float = 0.0) -> dict[str, Any]:
    """Open `book` in a headless LibreOffice on `profile` and read the values of `cells`.

    Parameters
    ----------
    office : Office
    profile : Path
        The ``UserInstallation`` folder (already started once).
    book : Path
    cells : dict of str to list of (row, col)
        Per sheet name, the cells to read (from 0).
    timeout : float, s
        For the whole run, LibreOffice's start included.
    env : dict, optional
        Extra environment for LibreOffice (and so for the bridge inside it).
    grace : float, s
        How long LibreOffice may take to end by itself once the values are read, before it is
        killed. 0 (the default) for a throw-away profile: its shutdown saves nothing we need.

    Returns
    -------
    dict
        The driver's answer (see `_uno_driver`), with ``seconds["total"]`` added.

    Raises
    ------
    LibreOfficeTimeout
        Not done within `timeout`; LibreOffice and the driver were killed.
    LibreOfficeFailed
        The driver reported an error or gave no answer.
    """
    started = time.monotonic()
    pipe = f"twistshare-{os.getpid()}-{uuid.uuid4().hex[:12]}"
    office_env = _clean_env(env, office_python=office.uno_python)
    try:
        office_process = _spawn(_office_args(office.soffice, profile) + [f"--accept=pipe,name={pipe};urp;"],
                                office_env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    except OSError as error:
        raise LibreOfficeFailed(f"could not start LibreOffice ({office.soffice}): {error}") from None
    answered = False
    try:
        request = {"pipe": pipe, "book": str(Path(book).resolve()), "connect_seconds": timeout,
                   "terminate": grace > 0,
                   "cells": {name: [list(rc) for rc in refs] for name, refs in cells.items()}}
        try:
            driver = subprocess.Popen([office.uno_python, str(_DRIVER)], stdin=subprocess.PIPE,
                                      stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=_clean_env())
        except OSError as error:
            raise LibreOfficeFailed(f"could not start LibreOffice's Python ({office.uno_python}): {error}") from None
        try:
            out, err = driver.communicate(json.dumps(request).encode("utf-8"),
                                          timeout=max(timeout - (time.monotonic() - started), 0.01))
        except subprocess.TimeoutExpired:
            raise LibreOfficeTimeout(f"LibreOffice did not finish within {timeout:g} s; it was stopped",
                                     timeout) from None
        finally:
            if driver.poll() is None:
                driver.kill()
                driver.wait()
        try:
            answer = json.loads(out.decode("utf-8") or "{}")
        except ValueError:
            answer = {}
        if "error" in answer or "sheets" not in answer:
            reason = answer.get("error") or (err.decode("utf-8", "replace").strip().splitlines() or ["no answer"])[-1]
            raise LibreOfficeFailed(f"LibreOffice could not compute the workbook: {reason}")
        answered = True
    finally:
        # Asked to end by the driver; given `grace` when all went well, killed at once otherwise.
        end_process_group(office_process, grace if answered else 0.0)
    answer.setdefault("seconds", {})["total"] = time.monotonic() - started
    return answer
