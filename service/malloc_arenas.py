"""A cap on glibc's malloc arenas, set by the gunicorn master.

glibc's malloc gives threads arenas of their own, up to 8 per core, and a
gthread worker runs many threads: each arena keeps the memory it once held,
so a worker's resident size crept up with the threads that had served
(tests/benchmarks/bench_service.py --only memory --long 100000). Two arenas
a process, set in the master before any thread exists, so that the workers
inherit the setting at fork. MALLOC_ARENA_MAX in the environment, which
glibc reads itself, wins; off glibc nothing happens."""
from __future__ import annotations

import ctypes
import os

M_ARENA_MAX = -8  # glibc's malloc.h
ARENAS = 2


def cap_malloc_arenas(arenas: int = ARENAS, environ=os.environ) -> bool:
    """Whether the cap was set (False off glibc, or when the environment sets it)."""
    if environ.get("MALLOC_ARENA_MAX"):
        return False
    try:
        mallopt = ctypes.CDLL(None).mallopt
    except (OSError, AttributeError):
        return False
    mallopt.argtypes, mallopt.restype = (ctypes.c_int, ctypes.c_int), ctypes.c_int
    return mallopt(M_ARENA_MAX, arenas) == 1
