"""`python -m ladle.tui.explorer [SYSTEM] [--ascii]`: the explorer (used by `ladle serve`)."""

import sys

from . import run

sys.exit(run(sys.argv[1:]))
