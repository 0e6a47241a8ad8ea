"""A question word that names a column is no piece of a cell value (issue 16): "districts"
names the district column, not the one school district whose name holds the word. On an
invented table of school districts built here, where a single district is named "… School
District".

Every expected answer is computed by pandas from the same rows (the `# pandas` comment beside
each), never by tabq. The model is the untaught prior.
"""

from __future__ import annotations

import pandas as pd
import pytest

import tabq
from tabq.answers import matches

DISTRICTS = """district,county,pupils
Heronsgate School District,Ashvale,820
Marsh End Elementary,Ashvale,410
Quarry Hill Union,Bellbrook,650
Saltings Elementary,Bellbrook,300
Tanner's Cross Union,Bellbrook,520
Upper Weald Elementary,Bellbrook,280
Vetch Lane Union,Corrin,700
Wickham Ford Elementary,Corrin,390
"""


@pytest.fixture(scope="module")
def districts(tmp_path_factory) -> tuple[pd.DataFrame, object]:
    path = tmp_path_factory.mktemp("headers") / "districts.csv"
    path.write_text(DISTRICTS, encoding="utf-8")
    return pd.read_csv(path), tabq.open(path, model=tabq.Model.prior())


def test_a_column_word_is_not_read_as_part_of_a_value(districts):
    rows, table = districts
    most = rows.county.value_counts()                  # pandas: districts per county
    assert most.iloc[0] > most.iloc[1]
    result = table.ask("Which county has the most districts?")
    assert matches(result.answer, [most.index[0]])
    named = [c for c in result.candidates if "Heronsgate School District" in c.sql]
    assert not named


def test_a_value_is_still_found_by_its_own_words(districts):
    rows, table = districts
    pupils = int(rows.loc[rows.district.str.contains("Heronsgate"), "pupils"].iloc[0])   # pandas
    result = table.ask("How many pupils does Heronsgate have?")
    assert matches(result.answer, [pupils])
    assert "Heronsgate School District" in result.sql
