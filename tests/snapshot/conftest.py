"""Fixtures of the explorer's snapshot tests: the interaction tests' harness."""

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "interaction"))

from explorer_harness import clean_environment  # noqa: E402,F401  (a fixture, autouse)
