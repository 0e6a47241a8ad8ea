"""A corpus of malformed table files, made in tmp_path: each loads, or fails with one clean
tabq error; none is changed and nothing is written beside it."""

import io
import sqlite3
import subprocess
import sys
import zipfile

import pytest

import tabq
from tabq.errors import InputError, TabqError


def _parquet_bytes() -> bytes:
    import pyarrow as pa
    import pyarrow.parquet as pq
    sink = io.BytesIO()
    pq.write_table(pa.table({"a": list(range(100)), "b": ["x"] * 100}), sink)
    return sink.getvalue()


def _xlsx_bytes() -> bytes:
    import openpyxl
    book = openpyxl.Workbook()
    book.active.append(["name", "n"])
    book.active.append(["a", 1])
    sink = io.BytesIO()
    book.save(sink)
    return sink.getvalue()


def _zip_bytes() -> bytes:
    sink = io.BytesIO()
    with zipfile.ZipFile(sink, "w") as z:
        z.writestr("hello.txt", "not a workbook")
    return sink.getvalue()


CORPUS = {   # name → (bytes, what is expected: "error" or "any")
    "empty.csv": (b"", "error"),
    "binary.csv": (bytes(range(256)) * 40, "error"),
    "nul_bytes.csv": (b"a,b\n1,\x002\n", "any"),
    "truncated.parquet": (_parquet_bytes()[:200], "error"),
    "truncated.xlsx": (_xlsx_bytes()[:300], "error"),
    "ragged.csv": (b"x,x,,y\n1,2,3\n4,5,6,7,8\n\"unterminated,9\n", "any"),
    "header_only.csv": (b"name\n", "any"),
    "csv_named.parquet": (b"a,b\n1,2\n", "error"),
    "parquet_named.csv": (_parquet_bytes(), "error"),
    "text_named.xlsx": (b"name,n\na,1\n", "error"),
    "zip_not_workbook.xlsx": (_zip_bytes(), "error"),
    "fake.sqlite": (b"SQLite format 3\0 not really", "error"),
    "huge_cell.csv": (b"note,n\n\"" + b"z" * 3_000_000 + b"\",1\n", "any"),
    "utf16.csv": ("name,n\nÄrger,1\n".encode("utf-16"), "any"),
    "garbage.json": (b"{\"a\": [1, 2", "error"),
    "only_newlines.csv": (b"\n\n\n\n", "error"),
    "one_cell.tsv": (b"x", "any"),
}


def make(tmp_path, name: str) -> bytes:
    data = CORPUS[name][0]
    (tmp_path / name).write_bytes(data)
    return data


@pytest.mark.parametrize("name", sorted(CORPUS))
def test_malformed_file_loads_or_fails_cleanly(tmp_path, name):
    data = make(tmp_path, name)
    expect = CORPUS[name][1]
    try:
        table = tabq.open(tmp_path / name)
        table.ask("how many rows are there")
    except InputError as err:
        assert "\n" not in str(err) and str(err)
    else:
        assert expect == "any", f"{name} loaded but should not"
    assert (tmp_path / name).read_bytes() == data
    assert [p.name for p in tmp_path.iterdir()] == [name]


def test_sqlite_file_without_tables(tmp_path):
    path = tmp_path / "empty.sqlite"
    db = sqlite3.connect(path)
    db.execute("CREATE VIEW v AS SELECT 1 AS x")   # a schema, but no table
    db.commit()
    db.close()
    data = path.read_bytes()
    with pytest.raises(TabqError, match="no tables"):
        tabq.open(path)
    assert path.read_bytes() == data
    assert [p.name for p in tmp_path.iterdir()] == ["empty.sqlite"]


@pytest.mark.parametrize("name", ["binary.csv", "truncated.xlsx", "zip_not_workbook.xlsx",
                                  "huge_cell.csv", "ragged.csv"])
def test_malformed_file_through_the_cli(tmp_path, name):
    data = make(tmp_path, name)
    out = subprocess.run([sys.executable, "-m", "tabq", "ask", str(tmp_path / name),
                          "how many rows"], capture_output=True, text=True, timeout=120)
    assert "Traceback" not in out.stdout + out.stderr
    assert out.returncode in (0, 2), out.stderr
    if out.returncode:
        assert out.stderr.startswith("tabq: ") and out.stderr.count("\n") == 1
    assert (tmp_path / name).read_bytes() == data
    assert [p.name for p in tmp_path.iterdir()] == [name]
