"""The main job checked against sources outside tabq.

- palmerpenguins package documentation (Horst, Hill & Gorman 2020): 344 penguins; Adelie 152,
  Gentoo 124, Chinstrap 68; Biscoe 168, Dream 124, Torgersen 52 — asked through `tabq ask`
  (its entry, `tabq.cli.main`, in this process: the command as a process is test_cli's).
- pandas as a second computation of the same questions on the same file.
"""

import json

import pandas as pd
import pytest

import tabq
from tabq.cli import main

DOCUMENTED = [  # (question, answer) — counts from the palmerpenguins package documentation
    ("how many penguins are there", 344),
    ("how many penguins live on dream island", 124),
    ("how many penguins are on biscoe", 168),
    ("how many penguins were seen on torgersen island", 52),
    ("how many adelie penguins are there", 152),
    ("how many gentoo penguins are there", 124),
    ("number of chinstrap penguins", 68),
]


def ask_cli(table, question, capsys: pytest.CaptureFixture) -> dict:
    code = main(["ask", str(table), question, "--json"])
    out = capsys.readouterr()
    assert code == 0, out.err
    return json.loads(out.out)


@pytest.mark.parametrize("question,count", DOCUMENTED)
def test_documented_penguin_counts_through_tabq_ask(penguins_csv, question, count, capsys):
    result = ask_cli(penguins_csv, question, capsys)
    best = result["answers"][0]
    assert best["answer"] == [count]
    assert best["sql"].startswith("SELECT") and best["paraphrase"]


@pytest.fixture(scope="module")
def penguins(penguins_csv):
    return tabq.open(penguins_csv), pd.read_csv(penguins_csv)


PANDAS = [  # (question, the same question computed by pandas)
    ("what is the average body mass of gentoo penguins",
     lambda df: df[df.species == "Gentoo"].body_mass_g.mean()),
    ("how many penguins weigh more than 5000 grams", lambda df: int((df.body_mass_g > 5000).sum())),
    ("which island has the most penguins", lambda df: df.island.value_counts().idxmax()),
    ("which species has the highest average flipper length",
     lambda df: df.groupby("species").flipper_length_mm.mean().idxmax()),
    ("what is the bill length of the heaviest penguin",
     lambda df: df.loc[df.body_mass_g.idxmax(), "bill_length_mm"]),
    ("how many female gentoo penguins are there",
     lambda df: int(((df.sex == "female") & (df.species == "Gentoo")).sum())),
    ("what is the total body mass of penguins on dream island",
     lambda df: df[df.island == "Dream"].body_mass_g.sum()),
    ("how many penguins were recorded in 2008", lambda df: int((df.year == 2008).sum())),
    ("what is the longest flipper length", lambda df: df.flipper_length_mm.max()),
    ("how many different islands are there", lambda df: df.island.nunique()),
]


@pytest.mark.parametrize("question,compute", PANDAS)
def test_answers_agree_with_pandas(penguins, question, compute):
    table, df = penguins
    expected = compute(df)
    answer = table.ask(question).answer
    assert len(answer) == 1
    if isinstance(expected, str):
        assert answer[0] == expected
    else:
        assert float(answer[0]) == pytest.approx(float(expected), rel=1e-6)


def test_every_answer_comes_with_sql_and_a_reading(penguins):
    table, _ = penguins
    result = table.ask("how many penguins live on dream island")
    assert result.sql and result.paraphrase and 0 < result.confidence <= 1
    assert all(r.sql for r in result.candidates)
