"""``twistshare functions``: every cell function with its arguments, units and description."""

from __future__ import annotations

from ._output import EXIT_OK

__all__ = ["run_functions"]


def run_functions() -> int:
    """Print every cell function with its arguments, their units and descriptions."""
    from twistshare.engine.cells import list_functions

    for fn in list_functions():
        print(f"{fn['name']}({', '.join(a['name'] for a in fn['arguments'])})")
        print(f"    {fn['description']}")
        for a in fn["arguments"]:
            unit = f" [{a['unit']}]" if a.get("unit") else ""
            print(f"      {a['name']}{unit}: {a['description']}")
    return EXIT_OK
