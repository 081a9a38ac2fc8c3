import sys
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT / "src") not in sys.path:
    sys.path.insert(0, str(ROOT / "src"))

# Hypothesis profiles for the fuzz tests (tests/fuzzkit.py, tests/test_fuzz_*.py):
# "ci" (default) keeps the fuzz part of the suite within about a minute on 2 cores;
# "long" (SATHEIGHT_FUZZ=long) runs FUZZ_SCALE times more cases per test.
import os  # noqa: E402

from hypothesis import HealthCheck, settings  # noqa: E402

FUZZ_PROFILE = os.environ.get("SATHEIGHT_FUZZ", "ci")
settings.register_profile("ci", deadline=None, max_examples=100, print_blob=True,
                          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
settings.register_profile("long", deadline=None, max_examples=2000, print_blob=True,
                          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
settings.load_profile(FUZZ_PROFILE if FUZZ_PROFILE in ("ci", "long") else "ci")
