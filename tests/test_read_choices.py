"""Reading choices a person makes when tabq's guess was wrong (--header-line, --decimal-mark,
--encoding): they change how the file is read, they are shown, and a confirmation taught with
them keeps them, so rebuilding the model asks the same table again.

Outside source: pandas reads the same invented file with the same choices (`header`, `decimal`,
`thousands`, `encoding`) as a second computation of the sum.
"""

import json

import pandas as pd
import pytest

from tabq import records
from tabq.cli import main
from tabq.store import WEIGHTS, ModelFolder
from tabq.table import ReadChoices
from tabq.teaching import current

# A seed merchant's price list: weights written "1.250" (a thousand and more, thousands dot).
# No cell settles the decimal mark, so tabq reads "1.250" as 1.25 until told otherwise.
GRAMS = [1250, 2500, 4125, 900]
ROWS = [f"S{i};{g // 1000}.{g % 1000:03d}" if g >= 1000 else f"S{i};{g}"
        for i, g in enumerate(GRAMS)]
TEXT = "Seed stock, spring\nsku;grams\n" + "\n".join(ROWS) + "\n"


@pytest.fixture
def price_list(tmp_path):
    path = tmp_path / "seeds.csv"
    path.write_text(TEXT, encoding="utf-8")
    return path


def _ask(capsys, path, model, *choices) -> dict:
    assert main(["ask", str(path), "what is the total grams", "--model", str(model), "--json",
                 *choices]) == 0
    return json.loads(capsys.readouterr().out)


def test_choices_change_the_reading_and_are_shown(capsys, tmp_path, price_list):
    model = tmp_path / "model"
    guessed = _ask(capsys, price_list, model)
    assert guessed["answers"][0]["answer"] != [sum(GRAMS)]       # the guess this test corrects
    chosen = _ask(capsys, price_list, model, "--decimal-mark", ",", "--header-line", "2")
    assert chosen["answers"][0]["answer"] == [sum(GRAMS)]
    assert chosen["read"]["header_line"] == 2 and chosen["read"]["decimal_mark"] == ","
    second = pd.read_csv(price_list, sep=";", header=1, decimal=",", thousands=".")
    assert second["grams"].sum() == sum(GRAMS)                    # pandas, second computation


def test_bad_choices_are_one_line(capsys, price_list):
    for extra in (["--encoding", "no-such-codec"], ["--header-line", "40"],
                  ["--header-line", "0"]):
        assert main(["ask", str(price_list), "how many rows", *extra]) == 2
        err = capsys.readouterr().err.strip()
        assert err.startswith("tabq: ") and "\n" not in err


def test_taught_with_choices_is_replayed_with_them(capsys, tmp_path, price_list):
    model = tmp_path / "model"
    examples = tmp_path / "examples.jsonl"
    examples.write_text(json.dumps({"question": "what is the total grams",
                                    "answer": [sum(GRAMS)]}) + "\n")
    assert main(["teach", str(price_list), str(examples), "--model", str(model),
                 "--decimal-mark", ","]) == 0
    capsys.readouterr()
    folder = ModelFolder(model)
    logged = records.confirmations(folder.read_log())
    assert [r.table.reading for r in logged] == [ReadChoices(decimal_mark=",")]
    taught = folder.load().as_dict()
    (model / WEIGHTS).unlink()
    assert current(folder).as_dict() == taught      # rebuilt from the log, read the same way
