"""Alloys of any number of elements in the line commands (issue 14): `--comp` with the balance
implied, repeated or comma-separated, and one line with exit status 2 for every mistake."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))

from test_line_commands import _one_line_error, own_folders, run  # noqa: E402,F401  (shared fixtures)


def test_binary_alloy_named_both_ways_gives_one_answer(run):
    answers = [json.loads(run("point", "pb-sn", "--temp", "250C", *argv, "--json")[1])
               for argv in (("--comp", "Sn=10wt%"), ("--comp", "Sn=10wt%", "--comp", "Pb=90wt%"),
                            ("--comp", "Pb=90wt%,Sn=10wt%"))]
    assert answers[0] == answers[1] == answers[2]


BAD = [
    (("point", "pb-sn", "--temp", "250C", "--comp", "Sn=10wt%,Pb=80wt%"), "sums to 90 %, not 100 %"),
    (("point", "pb-sn", "--temp", "250C", "--comp", "Sn=10wt%", "--comp", "Pb=90at%"), "mix wt% and at%"),
    (("melt", "pb-sn", "--comp", "Sn=60wt%,Pb=50wt%"), "sums to 110 %, over 100 %"),
    (("cool", "pb-sn", "--comp", "Sn=10wt%,Sn=5wt%"), "element Sn is given twice"),
    (("point", "pb-sn", "--temp", "250C", "--comp", "Sn=10wt%,Ag=1wt%"), "element Ag is not in this system"),
]


@pytest.mark.parametrize("argv,expected", BAD, ids=[" ".join(a) for a, _ in BAD])
def test_bad_alloys_are_one_line_and_status_2(run, argv, expected):
    _one_line_error(*run(*argv), argv[0], expected)
