"""The ``twistshare`` command line: rate, check, handout, demo, functions, calc-setup, recalc.

Each command opens the book through `..reading`, reads its tables through the intake, writes
through `..sheets` and `..ooxml`, and returns an exit code: 0 every part rated; 1 some parts had
errors (the output is still written); 2 the input is unusable (nothing written).
"""

from ._output import EXIT_OK, EXIT_PART_ERRORS, EXIT_UNUSABLE
from .cli import main

__all__ = ["main", "EXIT_OK", "EXIT_PART_ERRORS", "EXIT_UNUSABLE"]
