"""Time and peak memory of one call, for the cases of bench/run.py (each run in its own process)."""

from __future__ import annotations

import gc
import resource
import time
from pathlib import Path


def _status_mb(key: str) -> float | None:
    """A memory figure of this process from /proc/self/status [MB] (Linux), or None."""
    try:
        for line in Path("/proc/self/status").read_text().splitlines():
            if line.startswith(key + ":"):
                return int(line.split()[1]) / 1024.0
    except (OSError, ValueError, IndexError):
        pass
    return None


def _peak_mb() -> float:
    """Peak resident memory of this program [MB].

    ``VmHWM`` counts from the start of this program only (``ru_maxrss`` would
    include the parent's memory at the time it forked this process).
    """
    hwm = _status_mb("VmHWM")
    return hwm if hwm is not None else resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def _reset_peak() -> float:
    """Reset the peak to the current resident memory where Linux allows it; return the base."""
    try:
        with open("/proc/self/clear_refs", "w") as f:
            f.write("5")
        return _status_mb("VmRSS") or _peak_mb()
    except OSError:
        return _peak_mb()


def _measure(fn, repeat: int) -> dict:
    """Best time of ``repeat`` calls; growth of the peak RSS over the start."""
    gc.collect()
    base = _reset_peak()
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t)
        del out
        gc.collect()
    return {"seconds": min(times), "peak_mb": _peak_mb() - base, "base_mb": base}
