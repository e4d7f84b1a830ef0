"""A progress bar on a terminal, silence elsewhere (pipes, CI logs, files)."""

from __future__ import annotations

import sys
import time
from typing import TextIO

__all__ = ["Progress"]


class Progress:
    """Steps of a long run drawn as one bar on stderr; does nothing unless stderr is a terminal."""

    def __init__(self, steps: list[str], stream: TextIO | None = None, enabled: bool | None = None) -> None:
        self.stream = stream or sys.stderr
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self.steps = steps
        self.done = 0
        self.t0 = time.perf_counter()

    def step(self, name: str) -> None:
        """Mark the start of step ``name``."""
        if not self.enabled:
            return
        width = 30
        frac = self.done / max(len(self.steps), 1)
        bar = "#" * int(width * frac) + "-" * (width - int(width * frac))
        self.stream.write(f"\r[{bar}] {name:<28} {time.perf_counter() - self.t0:6.1f} s")
        self.stream.flush()
        self.done += 1

    def finish(self) -> None:
        """Clear the bar (on a terminal); nothing otherwise."""
        if not self.enabled:
            return
        self.stream.write(f"\r[{'#' * 30}] {'done':<28} {time.perf_counter() - self.t0:6.1f} s\n")
        self.stream.flush()
