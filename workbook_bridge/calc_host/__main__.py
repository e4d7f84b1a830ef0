"""``python -m twistshare.workbook_bridge.calc_host setup|undo|recalc``."""

import sys

from ._cli import main

sys.exit(main())
