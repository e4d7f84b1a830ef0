"""The helper process: the engine in its own Python, serving LibreOffice's bridge over a pipe.

Used when LibreOffice's Python cannot import the engine (another Python minor version or build,
as LibreOffice's bundled Python on Windows and macOS usually is). The bridge module starts
``python -m <this module>`` with the Python that ran setup, and talks to it over the child's
standard input and output: no port, nothing another user or machine could reach.

Protocol, one JSON object per line: the helper first writes ``{"ready": true, "names": [...]}``
(or ``{"ready": false, "error": "..."}`` and ends); then each request
``{"name": "TWS_SHARE", "args": [...]}`` gets ``{"value": ...}``. The helper ends when its input
closes, so it never outlives the LibreOffice process that started it.
"""

from __future__ import annotations

import json
import os
import sys
from typing import IO, Any

__all__ = ["serve", "main"]


def _send(out: IO[bytes], message: dict[str, Any]) -> None:
    out.write(json.dumps(message, ensure_ascii=True, default=str).encode("ascii") + b"\n")
    out.flush()


def serve(requests: IO[bytes], replies: IO[bytes]) -> int:
    """Answer requests until `requests` ends; returns the exit code."""
    try:
        from ._runtime import Runtime

        runtime = Runtime()
    except Exception as error:  # reported to the bridge, which shows it in the cell
        _send(replies, {"ready": False, "error": f"{type(error).__name__}: {error}"})
        return 1
    _send(replies, {"ready": True, "names": list(runtime.names)})
    for line in requests:
        if not line.strip():
            continue
        try:
            request = json.loads(line)
            value = runtime.call(request["name"], request.get("args") or [])
        except Exception as error:  # a malformed request: answer, keep serving
            value = f"\u26a0 the twistshare helper could not read a request: {type(error).__name__}: {error}"
        _send(replies, {"value": value})
    return 0


def main() -> int:
    """Serve on standard input and output; anything the engine prints goes to standard error."""
    replies = os.fdopen(os.dup(sys.stdout.fileno()), "wb")
    os.dup2(sys.stderr.fileno(), sys.stdout.fileno())  # a stray print must not break the protocol
    sys.stdout = sys.stderr
    return serve(sys.stdin.buffer, replies)


if __name__ == "__main__":
    sys.exit(main())
