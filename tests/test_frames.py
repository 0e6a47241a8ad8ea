"""Data frames in and out of the API, and the notebook display: `Result.to_pandas()` checked
against pandas computing the same question on the same data (palmerpenguins, Horst, Hill &
Gorman 2020), `tabq.open` of pandas, Arrow and DuckDB tables, `_repr_html_` holding the SQL."""

import sys
from html import escape
from html.parser import HTMLParser
from importlib.metadata import version
from xml.etree import ElementTree

import duckdb
import pandas as pd
import pyarrow as pa
import pytest

import tabq
from tabq import records
from tabq.frames import MissingPackageError
from tabq.model import Model
from tabq.records import Confirmation


@pytest.fixture(scope="module")
def penguins(penguins_csv) -> pd.DataFrame:
    return pd.read_csv(penguins_csv)


def ask(data, question, **kw):
    return tabq.open(data, model=Model.prior(), **kw).ask(question)


def test_to_pandas_agrees_with_pandas_on_a_per_group_mean(penguins_csv, penguins):
    result = ask(penguins_csv, "average body mass for each species")
    frame = result.to_pandas()
    assert list(frame.columns) == ["species", "average body_mass_g"]
    expected = penguins.groupby("species")["body_mass_g"].mean()       # source: pandas
    got = frame.set_index("species")["average body_mass_g"]
    pd.testing.assert_series_equal(got.sort_index(), expected.sort_index(), check_names=False)


@pytest.mark.parametrize("wrap", [lambda df: df, pa.Table.from_pandas],
                         ids=["pandas", "arrow"])
def test_a_frame_in_memory_is_asked_like_a_file(penguins, wrap):
    result = ask(wrap(penguins), "number of penguins for each island", table="penguins")
    frame = result.to_pandas()
    assert list(frame.columns) == ["island", "count"]
    expected = penguins["island"].value_counts()                       # source: pandas
    assert dict(zip(frame["island"], frame["count"])) == expected.to_dict()
    arrow = result.to_arrow()
    assert arrow.column_names == ["island", "count"] and arrow.num_rows == len(expected)
    assert arrow.schema.field("island").type == pa.string()       # not tabq's own enum


def test_a_duckdb_relation_is_asked_too(penguins):
    relation = duckdb.sql("SELECT * FROM penguins")
    result = ask(relation, "how many penguins live on Biscoe island")
    assert result.answer == [int((penguins["island"] == "Biscoe").sum())]   # source: pandas


def test_a_list_answer_is_whole_in_its_frame(tmp_path):
    frame = pd.DataFrame({"parcel": [f"P{i:05d}" for i in range(1500)],
                          "weight": [(i * 7) % 50 for i in range(1500)]})
    result = ask(frame, "list the parcels with weight above 8")
    expected = frame.loc[frame["weight"] > 8, "parcel"].tolist()        # source: pandas
    assert len(result.answer) == 1000 < len(expected)                   # kept while ranking
    assert result.to_pandas()["parcel"].tolist() == expected
    assert result.to_arrow().column("parcel").to_pylist() == expected


def test_a_frame_has_a_fingerprint_of_its_data_that_the_log_keeps(penguins):
    table = tabq.open(penguins, model=Model.prior(), table="penguins").table
    same = tabq.open(pa.Table.from_pandas(penguins), model=Model.prior()).table
    changed = penguins.copy()
    changed.loc[0, "body_mass_g"] = 1
    other = tabq.open(changed, model=Model.prior()).table
    assert table.fingerprint == same.fingerprint != other.fingerprint
    line = records.encode(Confirmation("c1", "how many penguins", table.reference, [344]))
    back = records.decode(line)
    assert back.table == table.reference and back.table.fingerprint == table.fingerprint


def test_a_named_index_is_kept_as_a_column():
    frame = pd.DataFrame({"sales": [3, 9, 4]},
                         index=pd.Index(["north", "south", "east"], name="region"))
    result = ask(frame, "which region has the highest sales")
    assert result.answer == ["south"]                    # source: frame.idxmax() == "south"
    assert frame["sales"].idxmax() == "south"


def test_something_that_is_not_a_table_is_one_clear_error():
    with pytest.raises(tabq.TabqError, match="not list"):
        tabq.open([1, 2, 3], model=Model.prior())


def test_a_missing_optional_package_is_named(monkeypatch, penguins_csv):
    result = ask(penguins_csv, "number of penguins for each island")
    for package, call in (("polars", result.to_polars), ("pandas", result.to_pandas),
                          ("pyarrow", result.to_arrow)):
        monkeypatch.setitem(sys.modules, package, None)     # as if it were not installed
        with pytest.raises(MissingPackageError, match=f"needs {package}") as err:
            call()
        assert isinstance(err.value, ImportError)
        monkeypatch.undo()


def test_to_polars_when_polars_is_installed(penguins_csv):
    pytest.importorskip("polars")
    frame = ask(penguins_csv, "number of penguins for each island").to_polars()
    assert frame.columns == ["island", "count"]


class _Text(HTMLParser):
    def __init__(self):
        super().__init__()
        self.text, self.tags = [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)

    def handle_data(self, data):
        self.text.append(data)


def test_the_notebook_display_shows_the_answer_reading_sql_and_other_readings(penguins_csv):
    result = ask(penguins_csv, "number of penguins for each island")
    html = result._repr_html_()
    assert escape(result.sql) in html and escape(result.paraphrase) in html
    parsed = _Text()
    parsed.feed(html)
    text = "".join(parsed.text)
    assert result.sql in text and "Other readings" in text and "Biscoe" in text
    assert "table" in parsed.tags and "script" not in parsed.tags
    ElementTree.fromstring(html)     # well-formed XHTML too (docs/notebook.svg embeds it)


def test_the_notebook_display_escapes_what_comes_from_the_data():
    frame = pd.DataFrame({"<b>team</b>": ["<script>alert(1)</script>", "b", "b"],
                          "score": [1, 2, 3]})
    html = ask(frame, "total score for each <b>team</b>")._repr_html_()
    parsed = _Text()
    parsed.feed(html)
    assert "script" not in parsed.tags and "b" in parsed.tags      # our own <b> only
    assert "&lt;script&gt;" in html or "script" not in html


def test_the_version_is_the_installed_distribution_s():
    assert tabq.__version__ == version("tabq")
