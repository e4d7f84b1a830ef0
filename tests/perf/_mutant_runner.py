"""Run one module's mutants against its tests in forked pytest processes, the mutant held in memory.

The parent imports pytest, the third-party libraries and every twistshare module that does not
depend on the module under test, once; each mutant then runs in a child forked from it: the child
drops the mutated module and every module that imports it (directly or through others, found from
the sources' import statements) from ``sys.modules``, puts an import hook first on
``sys.meta_path`` that compiles the mutated source under the module's real file name, and runs
pytest in-process. Nothing is written into the source tree, so several children can run side by
side in one checkout and an interrupted run leaves no mutant behind. A child is killed when it
runs past its timeout (the mutant then counts as killed, as with a hang).

Used by ``mutation_score.py``; a development tool, not part of the package.
"""

from __future__ import annotations

import ast
import importlib
import importlib.abc
import importlib.util
import os
import shutil
import signal
import sys
import tempfile
import time
from pathlib import Path

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")  # a forked child must not inherit BLAS threads
os.environ.setdefault("OMP_NUM_THREADS", "1")
THIRD_PARTY = ("numpy", "pint", "pytest", "hypothesis", "openpyxl", "python_calamine")

# the installed names of the repository's folders (pyproject's package-dir)
PACKAGE_DIRS = {"engine": "twistshare.engine", "workbook_bridge": "twistshare.workbook_bridge",
                "sample_books": "twistshare.sample_books"}


def module_name(root: Path, relative: str) -> str:
    """``engine/core/_demand.py`` -> ``twistshare.engine.core._demand`` (a package's ``__init__`` -> the package)."""
    parts = list(Path(relative).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join([PACKAGE_DIRS[parts[0]], *parts[1:]])


def _modules(root: Path) -> dict[str, tuple[Path, bool]]:
    """Every module of the package: name -> (file, is a package)."""
    found = {}
    for folder in PACKAGE_DIRS:
        for path in sorted((root / folder).rglob("*.py")):
            relative = path.relative_to(root).as_posix()
            found[module_name(root, relative)] = (path, path.name == "__init__.py")
    return found


def _imports(name: str, path: Path, is_package: bool, known: set[str]) -> set[str]:
    """The package's own modules this module imports anywhere in its text (functions included),
    with the packages whose ``__init__`` each import runs."""
    package = name if is_package else name.rpartition(".")[0]
    wanted: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(), str(path))):
        if isinstance(node, ast.Import):
            wanted.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.rsplit(".", node.level - 1)[0] if node.level > 1 else package
                base = f"{base}.{node.module}" if node.module else base
            else:
                base = node.module or ""
            wanted.add(base)
            wanted.update(f"{base}.{alias.name}" for alias in node.names)
    edges = set()
    for target in wanted:
        parts = target.split(".")
        for i in range(1, len(parts) + 1):  # importing a.b.c runs a, a.b and a.b.c
            prefix = ".".join(parts[:i])
            if prefix in known and prefix != name:
                edges.add(prefix)
    return edges


def dependants(root: Path, target: str) -> set[str]:
    """The target module and every module of the package that imports it, directly or not."""
    modules = _modules(root)
    importers: dict[str, set[str]] = {}
    for name, (path, is_package) in modules.items():
        for imported in _imports(name, path, is_package, set(modules)):
            importers.setdefault(imported, set()).add(name)
    found, todo = {target}, [target]
    while todo:
        for importer in importers.get(todo.pop(), ()):
            if importer not in found:
                found.add(importer)
                todo.append(importer)
    return found


class _MutantFinder(importlib.abc.MetaPathFinder, importlib.abc.Loader):
    """Serves one module's mutated text under its real file name."""

    def __init__(self, name: str, path: Path, source: str):
        self.name, self.path, self.source = name, path, source

    def find_spec(self, fullname, path=None, target=None):
        if fullname != self.name:
            return None
        return importlib.util.spec_from_file_location(fullname, self.path, loader=self)

    def create_module(self, spec):
        return None

    def exec_module(self, module):
        exec(compile(self.source, str(self.path), "exec"), module.__dict__)


class MutantRunner:
    """A parent process prepared for one target: pre-imports done, the modules to drop known."""

    def __init__(self, root: Path, relative: str, pytest_args: list[str]):
        self.root = root
        self.name = module_name(root, relative)
        self.path = root / relative
        self.pytest_args = pytest_args
        self.purge = dependants(root, self.name)
        sys.dont_write_bytecode = True  # a child must never leave a mutant's bytecode behind
        for name in THIRD_PARTY:
            try:
                importlib.import_module(name)
            except ImportError:
                pass
        for name in sorted(_modules(root)):
            if name not in self.purge:
                try:
                    importlib.import_module(name)
                except Exception:  # noqa: BLE001 - a host module without its host: the child imports it if needed
                    pass

    def start(self, source: str | None) -> tuple[int, str]:
        """Fork a child that runs the tests against `source` (None: the module's own file).
        Returns (pid, its temporary folder)."""
        basetemp = tempfile.mkdtemp(prefix="mutant-")
        pid = os.fork()
        if pid:
            return pid, basetemp
        status = 3
        try:
            devnull = os.open(os.devnull, os.O_WRONLY)
            os.dup2(devnull, 1)
            os.dup2(devnull, 2)
            for name in self.purge:
                sys.modules.pop(name, None)
            for name in self.purge:  # `from package import module` looks at the package's attribute first
                parent, _, leaf = name.rpartition(".")
                if parent in sys.modules and parent not in self.purge and hasattr(sys.modules[parent], leaf):
                    delattr(sys.modules[parent], leaf)
            if source is not None:
                sys.meta_path.insert(0, _MutantFinder(self.name, self.path, source))
            import pytest

            os.chdir(self.root)
            status = int(pytest.main([*self.pytest_args, "--basetemp", os.path.join(basetemp, "t")]))
        finally:
            os._exit(status)

    def run(self, sources: list[str | None], timeout: float, jobs: int = 1) -> list[str]:
        """The status of each source, `jobs` children at a time."""
        statuses: list[str] = [""] * len(sources)
        running: dict[int, tuple[int, str, float]] = {}
        queue = list(enumerate(sources))
        while queue or running:
            while queue and len(running) < jobs:
                index, source = queue.pop(0)
                pid, basetemp = self.start(source)
                running[index] = (pid, basetemp, time.monotonic() + timeout)
            for index, (pid, basetemp, deadline) in list(running.items()):
                done, status = os.waitpid(pid, os.WNOHANG)
                if done:
                    statuses[index] = "survived" if os.waitstatus_to_exitcode(status) == 0 else "killed"
                elif time.monotonic() > deadline:
                    os.kill(pid, signal.SIGKILL)
                    os.waitpid(pid, 0)
                    statuses[index] = "timeout"
                else:
                    continue
                shutil.rmtree(basetemp, ignore_errors=True)
                del running[index]
            time.sleep(0.005)
        return statuses
