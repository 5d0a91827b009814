"""Fixtures of the explorer's interaction tests (see explorer_harness)."""

from explorer_harness import clean_environment  # noqa: F401  (a fixture, autouse)
