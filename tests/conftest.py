"""Fixtures of the whole suite."""

import pytest


@pytest.fixture(scope="session")
def shared_check_cache(tmp_path_factory):
    """One folder of remembered check counts for the whole run, none from outside it: the counts
    are keyed by the system files' contents and the engine's code, so they hold in every test.
    Measuring every shipped system's checks afresh takes 35-40 s on the 2-core machine; with this
    folder only the first test that lists the systems (the picker, `ladle systems`) in each
    pytest-xdist worker pays it."""
    return tmp_path_factory.mktemp("check-cache")
