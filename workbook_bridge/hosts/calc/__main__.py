"""``python -m twistshare.workbook_bridge.hosts.calc setup|undo|recalc``."""

import sys

from ._cli import main

sys.exit(main())
