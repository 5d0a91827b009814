"""Fixtures of the explorer's interaction tests (see explorer_harness)."""

from explorer_harness import clean_environment, shared_check_cache  # noqa: F401  (fixtures; the first autouse)
