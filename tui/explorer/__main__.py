"""`python -m ladle.tui.explorer [SYSTEM] [--ascii]`: the explorer (used by `ladle serve`)."""

import os
import sys

from ladle.tui.blas_threads import limit_blas_threads

limit_blas_threads(os.environ)

from . import run  # noqa: E402  (numpy is imported below this, after the thread limit)

sys.exit(run(sys.argv[1:]))
