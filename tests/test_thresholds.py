"""A number said after a comparison word is a threshold, and a comparative compares the way its
superlative ranks (issue 16): on an invented greenhouse log built here, where the number asked
about is also a value of the column, so reading it as that value gives another answer.

Every expected answer is computed by pandas from the same rows (the `# pandas` comment beside
each), never by tabq. The model is the untaught prior.
"""

from __future__ import annotations

import pandas as pd
import pytest

import tabq
from tabq.answers import matches

LOG = """logged,house,temp,humidity
2025-05-01,east,18,61
2025-05-02,east,20,64
2025-05-03,west,23,58
2025-05-04,east,20,70
2025-05-05,west,25,55
2025-05-06,west,19,66
2025-05-07,east,27,52
2025-05-08,west,21,60
2025-05-09,east,20,63
"""

@pytest.fixture(scope="module")
def frame(tmp_path_factory) -> tuple[pd.DataFrame, object]:
    path = tmp_path_factory.mktemp("thresholds") / "greenhouse_log.csv"
    path.write_text(LOG, encoding="utf-8")
    return pd.read_csv(path), tabq.open(path, model=tabq.Model.prior())


def test_a_number_after_than_is_a_threshold_not_a_cell_value(frame):
    rows, table = frame
    above = 100 * (rows.temp > 20).mean()      # pandas: share of days above 20
    assert above != 100 * (rows.temp == 20).mean()   # the value reading would differ
    assert matches(table.ask("What percentage of days were warmer than 20?").answer, [above])

def test_a_comparative_compares_the_way_its_superlative_ranks(frame):
    rows, table = frame
    below = int((rows.temp < 20).sum())         # pandas: days below 20
    above = int((rows.temp > 20).sum())         # pandas: days above 20
    assert below != above
    assert matches(table.ask("How many days were colder than 20?").answer, [below])
    assert matches(table.ask("How many days were hotter than 20?").answer, [above])
    drier = int((rows.humidity < 60).sum())     # pandas: days with humidity below 60
    assert matches(table.ask("How many days had a humidity drier than 60?").answer, [drier])
