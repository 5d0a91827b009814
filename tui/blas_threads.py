"""One BLAS thread for ladle's processes, unless the person chose a number.

numpy's BLAS library starts worker threads at import that spin while waiting for work; the
engine's linear algebra is a few tiny matrices, so those threads only take CPU time from the
computation (a third of a line command's CPU time on a two-core machine). The thread count is
read from the environment when numpy is first imported, so this runs before that.
"""

from __future__ import annotations

from collections.abc import MutableMapping

#: The variables the usual BLAS builds read (OpenBLAS, OpenMP-based builds, Intel MKL).
THREAD_VARIABLES = ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS")


def limit_blas_threads(environ: MutableMapping[str, str]) -> None:
    """Set every BLAS thread-count variable to 1, unless the person set any of them."""
    if any(name in environ for name in THREAD_VARIABLES):
        return
    for name in THREAD_VARIABLES:
        environ[name] = "1"
