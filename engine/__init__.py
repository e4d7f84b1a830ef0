"""twistshare engine: pure-numpy physics (`twistshare.engine.core`), the shared unit registry
(`twistshare.engine.units`) and the worksheet-function surface (`twistshare.engine.cells`).

Nothing is imported here, so ``import twistshare.engine`` stays cheap: import the part you
need by its full name, e.g. ``from twistshare.engine.core import rate``.
"""

__all__: list[str] = []
