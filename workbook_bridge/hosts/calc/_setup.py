"""``setup`` and ``undo``: the cell functions into (or out of) a LibreOffice user profile."""

from __future__ import annotations

import os
import subprocess
from dataclasses import replace
from pathlib import Path

from ._bridge import engine_location
from ._errors import CalcHostError, LibreOfficeMissing
from ._office import _clean_env, find_office, find_soffice, start_profile
from ._profile import Installed, SetupReport, default_profile, install, profile_started, uninstall

__all__ = ["setup_profile"]


def _installation(profile_dir: str | os.PathLike | None) -> Path:
    """The profile folder LibreOffice calls UserInstallation (a path to its ``user`` folder is accepted)."""
    if profile_dir is None:
        return default_profile()
    path = Path(profile_dir).expanduser().absolute()
    if path.name == "user" and (path / "registrymodifications.xcu").is_file() and not (path / "user").exists():
        return path.parent
    return path


def _engine_note() -> str | None:
    """How LibreOffice's bridge will reach the engine, when LibreOffice is there to ask."""
    try:
        office = find_office()
        probe = subprocess.run([office.uno_python, "-c", "import sysconfig, sys; "
                                "print(sysconfig.get_config_var('SOABI')); print(sys.version.split()[0])"],
                               capture_output=True, text=True, timeout=30, env=_clean_env())
    except (LibreOfficeMissing, OSError, subprocess.TimeoutExpired):
        return None
    lines = probe.stdout.split()
    engine = engine_location()
    if len(lines) >= 2 and lines[0] == engine.soabi:
        return (f"LibreOffice's Python {lines[1]} is the same build as twistshare's: it imports the engine "
                f"from {', '.join(engine.site_dirs) or engine.python}")
    shown = lines[1] if len(lines) >= 2 else "?"
    return (f"LibreOffice's Python ({shown}) is not twistshare's: each LibreOffice session starts "
            f"{engine.python} as a helper process for the engine")


def setup_profile(profile_dir: str | os.PathLike | None = None, *, undo: bool = False) -> SetupReport:
    """Install the cell functions into a LibreOffice user profile, or take them out (`undo`).

    Parameters
    ----------
    profile_dir : path, optional
        The profile folder (what ``-env:UserInstallation`` names). Default: the user's own, where
        LibreOffice puts it on this system (see `default_profile`).
    undo : bool
        Remove exactly what setup added (the user's own Basic code in Standard stays).

    Returns
    -------
    SetupReport
        ``str()`` says what was done and how to undo it. A second setup changes nothing.

    Raises
    ------
    LibreOfficeMissing
        The profile has never been used and there is no LibreOffice to create it.
    ProfileRefused
        A Basic module of our name that we did not write is in the way; nothing was changed.
    """
    profile = _installation(profile_dir)
    if undo:
        return uninstall(profile)
    notes: list[str] = []
    if not profile_started(profile):
        soffice = find_soffice()
        profile.mkdir(parents=True, exist_ok=True)
        start_profile(soffice, profile)
        if not profile_started(profile):
            raise CalcHostError(f"LibreOffice did not create its profile in {profile}; nothing was written")
        notes.append("LibreOffice had not used this profile yet: it was started once, headless, to create it")
    report = install(profile, Installed.build())
    if report.changed:
        note = _engine_note()
        if note:
            notes.append(note)
    return replace(report, notes=tuple(notes) + report.notes)
