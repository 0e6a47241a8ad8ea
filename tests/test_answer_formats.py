"""`tabq ask --format text|json|ndjson|csv|markdown`, `--all` and `-o FILE`: each format read
back by a standard reader (csv, json, a Markdown table split on its bars) and compared with
pandas computing the same question on the same file (palmerpenguins' CSV, Horst, Hill & Gorman
2020, and a table written here)."""

import csv
import hashlib
import io
import json
import os
from pathlib import Path

import pandas as pd
import pytest

from tabq.cli import _colour_wanted, main
from tabq.output import bar_chart_lines

PER_ISLAND = "number of penguins for each island"


def ask(capsys, *args) -> tuple[int, str, str]:
    code = main(["ask", *map(str, args)])
    out = capsys.readouterr()
    return code, out.out, out.err


@pytest.fixture(scope="module")
def island_counts(penguins_csv) -> dict:
    """The outside check: pandas counting the rows of each island."""
    return pd.read_csv(penguins_csv)["island"].value_counts().to_dict()


@pytest.fixture
def long_table(tmp_path):
    """1500 parcels (more than the 1000 rows kept while ranking), 1234 of them heavy."""
    frame = pd.DataFrame({"parcel": [f"P{i:05d}" for i in range(1500)],
                          "weight": [(i * 7) % 50 for i in range(1500)]})
    path = tmp_path / "parcels.csv"
    frame.to_csv(path, index=False)
    return path, frame


def test_csv_has_a_header_and_a_row_a_group_that_pandas_reads_back(capsys, penguins_csv,
                                                                    island_counts):
    code, out, _ = ask(capsys, penguins_csv, PER_ISLAND, "--format", "csv")
    assert code == 0
    back = pd.read_csv(io.StringIO(out))
    assert list(back.columns) == ["island", "count"]
    assert dict(zip(back["island"], back["count"])) == island_counts   # source: pandas


def test_json_names_the_columns_of_every_answer(capsys, penguins_csv, island_counts):
    code, out, _ = ask(capsys, penguins_csv, PER_ISLAND, "--format", "json")
    first = json.loads(out)["answers"][0]
    assert code == 0 and first["columns"] == ["island", "count"]
    assert {k: v for k, v in first["answer"]} == island_counts
    _, alias, _ = ask(capsys, penguins_csv, PER_ISLAND, "--json")     # the old spelling
    assert json.loads(alias) == json.loads(out)


def test_ndjson_is_one_object_a_row_keyed_by_column(capsys, penguins_csv, island_counts):
    _, out, _ = ask(capsys, penguins_csv, PER_ISLAND, "--format", "ndjson")
    rows = [json.loads(line) for line in out.splitlines()]
    assert {r["island"]: r["count"] for r in rows} == island_counts
    assert all(set(r) == {"island", "count"} for r in rows)


def test_markdown_is_a_table_then_the_reading_and_the_sql(capsys, penguins_csv, island_counts):
    _, out, _ = ask(capsys, penguins_csv, PER_ISLAND, "--format", "markdown")
    lines = out.splitlines()
    table = [[c.strip() for c in ln.strip("|").split("|")] for ln in lines
             if ln.startswith("|")]
    assert table[0] == ["island", "count"] and set(table[1]) <= {"---", "---:"}
    assert {k: int(v) for k, v in table[2:]} == island_counts
    assert "```sql" in lines and any('GROUP BY "island"' in ln for ln in lines)


def test_a_per_group_answer_is_drawn_as_bars_in_text(capsys, penguins_csv, island_counts):
    _, out, _ = ask(capsys, penguins_csv, PER_ISLAND)
    lines = out.splitlines()
    assert lines[0] == "Answer:   a table of 3 rows (island, count)"
    biggest = max(island_counts, key=island_counts.get)
    bars = {ln.split()[0]: ln.count("█") for ln in lines[2:5]}
    assert max(bars, key=bars.get) == biggest and "\x1b" not in out   # not a terminal: no colour


def test_colour_only_on_a_terminal_and_never_with_no_color(monkeypatch):
    class Terminal(io.StringIO):
        def isatty(self):
            return True
    monkeypatch.delenv("NO_COLOR", raising=False)
    assert _colour_wanted(Terminal()) and not _colour_wanted(io.StringIO())
    monkeypatch.setenv("NO_COLOR", "1")
    assert not _colour_wanted(Terminal())
    coloured = "\n".join(bar_chart_lines(("site", "count"), [("a", 3), ("b", 1)], colour=True))
    plain = "\n".join(bar_chart_lines(("site", "count"), [("a", 3), ("b", 1)], colour=False))
    assert "\x1b[" in coloured and "\x1b" not in plain


def test_all_gives_every_row_past_those_kept_while_ranking(capsys, long_table):
    path, frame = long_table
    question = "list the parcels with weight above 8"
    expected = frame.loc[frame["weight"] > 8, "parcel"].tolist()       # source: pandas
    assert len(expected) > 1000
    _, cut, _ = ask(capsys, path, question)
    assert cut.splitlines()[0].endswith("… and 988+ more (--all shows every one)")   # 1000 kept
    _, out, _ = ask(capsys, path, question, "--format", "csv", "--all")
    back = list(csv.reader(io.StringIO(out)))
    assert back[0] == ["parcel"] and [r[0] for r in back[1:]] == expected
    _, text, _ = ask(capsys, path, question, "--all")
    assert text.splitlines()[0].count("P0") == len(expected)


def test_output_file_takes_its_format_from_its_extension(capsys, penguins_csv, tmp_path,
                                                         island_counts):
    target = tmp_path / "islands.csv"
    code, out, err = ask(capsys, penguins_csv, PER_ISLAND, "-o", target)
    assert code == 0 and out == "" and str(target) in err
    back = pd.read_csv(target)
    assert dict(zip(back["island"], back["count"])) == island_counts


def _digest(path) -> str:
    return hashlib.sha256(open(path, "rb").read()).hexdigest()


def test_the_table_asked_is_never_written_over(capsys, tmp_path, penguins_csv):
    table = tmp_path / "penguins.csv"
    table.write_bytes(penguins_csv.read_bytes())
    link = tmp_path / "other-name.csv"
    os.symlink(table, link)
    before = _digest(table)
    for target in (table, link, tmp_path / "." / "penguins.csv"):
        code, out, err = ask(capsys, table, PER_ISLAND, "-o", target)
        assert code == 2 and out == "" and err.count("\n") == 1
        assert err.startswith("tabq: -o ") and "never writes over its input" in err
    assert _digest(table) == before


def test_a_file_that_would_join_the_table_asked_is_refused(capsys, tmp_path, penguins_csv):
    folder = tmp_path / "exports"
    folder.mkdir()
    (folder / "a.csv").write_bytes(penguins_csv.read_bytes())
    code, _, err = ask(capsys, folder, PER_ISLAND, "-o", folder / "answer.csv")
    assert code == 2 and "inside the folder asked" in err
    code, _, err = ask(capsys, tmp_path / "exports" / "*.csv", PER_ISLAND,
                       "-o", folder / "b.csv")
    assert code == 2 and "matches the pattern asked" in err
    code, _, _ = ask(capsys, folder, PER_ISLAND, "-o", folder / "answer.md")   # not a table
    assert code == 0 and (folder / "answer.md").read_text().startswith("| island | count |")
    assert not (folder / "answer.csv").exists() and not (folder / "b.csv").exists()


def test_a_folder_or_a_bad_format_is_one_line(capsys, penguins_csv, tmp_path):
    code, _, err = ask(capsys, penguins_csv, PER_ISLAND, "-o", tmp_path)
    assert code == 2 and err.count("\n") == 1 and "is a folder" in err
    with pytest.raises(SystemExit) as stop:
        ask(capsys, penguins_csv, PER_ISLAND, "--format", "xml")
    assert stop.value.code == 2


def test_an_output_that_cannot_be_written_is_named_as_given(capsys, penguins_csv, tmp_path):
    code, _, err = ask(capsys, penguins_csv, PER_ISLAND, "-o", tmp_path / "no" / "such.csv")
    assert code == 2 and err.count("\n") == 1 and "does not exist" in err
    if not Path("/proc/self").is_dir():
        pytest.skip("needs Linux's /proc, a folder where no file can be made, even by root")
    target = Path("/proc/tabq-answer.csv")
    code, _, err = ask(capsys, penguins_csv, PER_ISLAND, "-o", target)
    assert code == 1 and err.startswith(f"tabq: -o {target}: cannot write it")
    assert ".tmp-" not in err and err.count("\n") == 1
