"""A column whose header says it is already a rate, a share or an average is not added up
(issue 16): on an invented table of schools built here, where one district has many schools
with middling pass rates (the largest total) and another one school with the best rate.

Every expected answer is computed by pandas from the same rows (the `# pandas` comment beside
each), never by tabq. The model is the untaught prior.
"""

from __future__ import annotations

import pandas as pd
import pytest

import tabq
from tabq.answers import matches
from tabq.features import RATE_HEADER

SCHOOLS = """school,district,pupils,pass_rate
Alder Row,Brackwater,310,61.5
Birch Lane,Brackwater,280,64.0
Cedar Court,Brackwater,355,66.5
Damson Hill,Brackwater,295,62.0
Elm Yard,Fellmoor,190,93.5
Fir Green,Gorsedge,240,71.0
Gean Walk,Gorsedge,260,58.5
"""


@pytest.fixture(scope="module")
def schools(tmp_path_factory) -> tuple[pd.DataFrame, object]:
    path = tmp_path_factory.mktemp("rates") / "schools.csv"
    path.write_text(SCHOOLS, encoding="utf-8")
    return pd.read_csv(path), tabq.open(path, model=tabq.Model.prior())


def test_the_highest_rate_is_a_rows_not_a_groups_total(schools):
    rows, table = schools
    best = rows.loc[rows.pass_rate.idxmax(), "district"]          # pandas: the best school's district
    summed = rows.groupby("district").pass_rate.sum().idxmax()    # pandas: the largest total
    assert best != summed
    assert matches(table.ask("Which district has the highest pass rate?").answer, [best])


def test_rate_headers_are_told_from_amounts():
    for name in ("pass_rate", "percbelowpoverty", "avg_income", "cost_per_unit", "pct_late",
                 "share_of_votes", "ratio"):
        assert RATE_HEADER.search(name), name
    for name in ("pupils", "category", "separated", "operator", "price", "total"):
        assert not RATE_HEADER.search(name), name
