"""Words that ask about money (cheapest, most expensive, bill, worth) name a column whose header
says money in any of its usual words (price, cost, fee, charge, amount, invoice, bill, payment,
fare). Answers computed by pandas over an invented locksmith's call-outs."""

import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches


@pytest.fixture(scope="module")
def callouts(tmp_path_factory):
    rng = random.Random(5)
    surnames = ["Marsh", "Okafor", "Lindqvist", "Bell", "Ruiz"]
    frame = pd.DataFrame([{
        "job_ref": f"L{300 + i}",
        "householder": f"{rng.choice('ABCDEFGHJK')}. {rng.choice(surnames)}",
        "lock_type": rng.choice(["mortice", "cylinder", "padlock"]),
        "minutes_on_site": rng.randint(15, 180),
        "invoice_amount": round(rng.uniform(40, 420), 2)} for i in range(50)])
    path = tmp_path_factory.mktemp("locksmith") / "callouts.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, expected", [
    ("Which job was the cheapest?", lambda d: d.loc[d.invoice_amount.idxmin(), "job_ref"]),
    ("What was the average bill for a padlock job?",
     lambda d: d[d.lock_type == "padlock"].invoice_amount.mean()),
    ("How many jobs were worth more than 300?", lambda d: (d.invoice_amount > 300).sum()),
])
def test_money_word_names_the_money_column(callouts, question, expected):
    frame, table = callouts
    result = table.ask(question)
    assert matches(result.answer, [expected(frame)]), (question, result.answer, result.sql)
