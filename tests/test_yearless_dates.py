"""A date said without its year takes the year the table's dates imply (issue 16): in a log
that runs from March of one year to February of the next, "after 20 October" and "between
3 April and 9 May" fall in the first year, "before 14 January" in the second. Every expected
answer is computed by pandas beside its check; the table (an invented canoe hire's bookings)
is built here. The model is the untaught prior.
"""

from __future__ import annotations

import datetime
import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches

START = datetime.date(2025, 3, 1)


@pytest.fixture(scope="module")
def frame() -> pd.DataFrame:
    rng = random.Random(311)
    rows = [{"booking": f"CH-{501 + i}",
             "hired_on": (START + datetime.timedelta(days=rng.randrange(0, 365))).isoformat(),
             "boats": rng.randrange(1, 5)} for i in range(300)]
    return pd.DataFrame(rows)


@pytest.fixture(scope="module")
def table(tmp_path_factory, frame):
    path = tmp_path_factory.mktemp("yearless") / "canoe_hire.csv"
    frame.to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


def _count(frame: pd.DataFrame, keep) -> int:
    return int(keep(pd.to_datetime(frame.hired_on)).sum())


def test_a_day_in_the_first_year(table, frame):
    # pandas: hires after 20 October 2025 (October falls only in 2025 here)
    expected = _count(frame, lambda d: d > "2025-10-20")
    assert 0 < expected < len(frame)
    assert matches(table.ask("How many hires were there after 20 October?").answer, [expected])


def test_a_day_in_the_second_year(table, frame):
    # pandas: hires before 14 January 2026 (January falls only in 2026 here)
    expected = _count(frame, lambda d: d < "2026-01-14")
    assert matches(table.ask("How many hires were there before 14 January?").answer, [expected])


def test_a_range_of_days(table, frame):
    # pandas: hires from 3 April to 9 May 2025, both ends kept
    expected = _count(frame, lambda d: (d >= "2025-04-03") & (d <= "2025-05-09"))
    assert expected > 0
    assert matches(table.ask("How many hires were there between 3 April and 9 May?").answer,
                   [expected])
