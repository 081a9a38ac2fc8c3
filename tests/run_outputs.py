"""Read a run's output folder for comparing two runs of the same project file by file.

Two runs of one project write the same bytes but for the run's date and time printed in
the report (minutes apart when the runs straddle a minute) and, through it, the report's
checksum in the manifest: both are left out here, everything else is compared as written.
"""

from __future__ import annotations

import re
from pathlib import Path

RUN_TIME = re.compile(rb"\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC")
MANIFEST = "satheight-manifest-run.sha256"


def run_files(folder: Path) -> dict[str, bytes]:
    """Every file of ``folder`` by name, with the run time and the report checksum left out."""
    out = {p.name: p.read_bytes() for p in sorted(folder.iterdir()) if p.is_file()}
    if "report.html" in out:
        out["report.html"] = RUN_TIME.sub(b"<run time>", out["report.html"])
    if MANIFEST in out:
        out[MANIFEST] = b"".join(line for line in out[MANIFEST].splitlines(keepends=True)
                                 if not line.rstrip().endswith(b"report.html"))
    return out
