"""Issue 16: how the question's words are read — signed numbers, dates in comparisons, the scope
of "not", one-letter cell values and wh-words.

Two invented tables are written by the test: weather readings of one year (2024), with
temperatures below zero, and delivery orders over two years (2023 and 2024). Every expected
answer is computed by pandas from the same rows (the outside computation is named beside each
check); tabq's untaught model must give it.
"""

from __future__ import annotations

import datetime

import pandas as pd
import pytest

import tabq
from tabq.answers import matches
from tabq.text import read_question

CITIES = ["Oslo", "Tromso", "Bergen", "Narvik", "Alta"]
OBSERVERS = ["Maria Lopez", "John Carter", "Aiko Tanaka", "Peter Novak"]
DEPOTS = ["North Yard", "Harbour", "Mill Lane"]
DRIVERS = ["Sam Hill", "Rita Moss", "Omar Said"]
PAYMENTS = ["card", "cash", "invoice", "card", "cash"]


def _readings() -> pd.DataFrame:
    """48 weekly readings through 2024; temperatures from -9 to 12 with one lowest."""
    rows = []
    for i in range(48):
        temperature = round(((i * 37) % 23) - 9 + (i % 3) * 0.5, 1)
        rows.append({"reading_date": datetime.date(2024, 1, 3) + datetime.timedelta(days=7 * i),
                     "city": CITIES[(i * 3) % 5], "observer": OBSERVERS[(i * 5 + i // 4) % 4],
                     "temperature": temperature if i != 17 else -12.5,
                     "wind": (i * 11) % 31, "grade": "abc"[(i * 7 + i // 3) % 3]})
    return pd.DataFrame(rows)


def _orders() -> pd.DataFrame:
    """70 orders nine days apart from February 2023 to October 2024; one highest amount."""
    rows = []
    for i in range(70):
        rows.append({"order_date": datetime.date(2023, 2, 1) + datetime.timedelta(days=9 * i),
                     "depot": DEPOTS[(i * 2 + i // 5) % 3], "driver": DRIVERS[(i + i // 7) % 3],
                     "payment": PAYMENTS[(i * 3 + i // 2) % 5], "size": "abc"[(i * 2 + i // 4) % 3],
                     "amount": 250 if i == 33 else 5 + (i * 29) % 180})
    return pd.DataFrame(rows)


READINGS, ORDERS = _readings(), _orders()


@pytest.fixture(scope="module")
def tables(tmp_path_factory):
    folder = tmp_path_factory.mktemp("reading")
    opened = {}
    for name, frame in (("readings", READINGS), ("orders", ORDERS)):
        frame.to_csv(folder / f"{name}.csv", index=False)
        opened[name] = tabq.open(folder / f"{name}.csv", model=tabq.Model.prior())
    return opened


def _count(mask) -> list:
    return [int(mask.sum())]


def _date(text: str) -> datetime.date:
    return datetime.date.fromisoformat(text)


R, O = READINGS, ORDERS
RD, OD = R.reading_date, O.order_date
O_YEAR = O.order_date.map(lambda d: d.year)

# (table, question, answer computed by pandas)
CASES = [
    # 1. a number keeps its sign
    ("readings", "how many readings had a temperature below -3", _count(R.temperature < -3)),
    ("readings", "how many readings had a temperature under −2.5", _count(R.temperature < -2.5)),
    ("readings", "how many readings with a temperature less than minus 3",
     _count(R.temperature < -3)),
    ("readings", "how many temperatures lower than negative 4", _count(R.temperature < -4)),
    ("readings", "what is the average wind when the temperature is above -1.5",
     [R.wind[R.temperature > -1.5].mean()]),
    # 2. dates in comparisons
    ("readings", "how many readings before 3 april 2024", _count(RD < _date("2024-04-03"))),
    ("readings", "how many readings after 12 june", _count(RD > _date("2024-06-12"))),
    ("readings", "how many readings before october 2024", _count(RD < _date("2024-10-01"))),
    ("readings", "how many readings after october 2024", _count(RD > _date("2024-10-31"))),
    ("readings", "how many readings since october 2024", _count(RD >= _date("2024-10-01"))),
    ("readings", "how many readings in march", _count(RD.map(lambda d: d.month) == 3)),
    ("readings", "how many readings in march 2024", _count(RD.map(lambda d: d.month) == 3)),
    ("orders", "how many orders in 2024", _count(O_YEAR == 2024)),
    ("orders", "how many orders in march 2024",
     _count((O_YEAR == 2024) & (OD.map(lambda d: d.month) == 3))),
    # a day and month without a year: the year of the table's latest date (2024 here)
    ("orders", "how many orders after 12 june", _count(OD > _date("2024-06-12"))),
    # a range of dates, each end kept ("between" and "from … to" include both ends)
    ("orders", "how many orders between 3 march 2024 and 24 march 2024",
     _count((OD >= _date("2024-03-03")) & (OD <= _date("2024-03-24")))),
    ("orders", "how many harbour orders were placed between 10 january and 20 april",
     _count((O.depot == "Harbour") & (OD >= _date("2024-01-10")) & (OD <= _date("2024-04-20")))),
    ("orders", "how many orders from 1 may 2023 to 31 july 2023",
     _count((OD >= _date("2023-05-01")) & (OD <= _date("2023-07-31")))),
    ("orders", "total amount of orders between march 2023 and june 2023",
     [int(O.amount[(OD >= _date("2023-03-01")) & (OD <= _date("2023-06-30"))].sum())]),
    ("readings", "average temperature between 5 february and 20 march",
     [R.temperature[(RD >= _date("2024-02-05")) & (RD <= _date("2024-03-20"))].mean()]),
    # 3. "not" takes only the condition it stands next to
    ("orders", "in 2023, how many orders weren't paid by card",
     _count((O_YEAR == 2023) & (O.payment != "card"))),
    ("orders", "how many orders were not paid by card in 2023",
     _count((O_YEAR == 2023) & (O.payment != "card"))),
    ("orders", "how many orders from harbour were not paid in cash",
     _count((O.depot == "Harbour") & (O.payment != "cash"))),
    ("orders", "how many orders were not paid by card", _count(O.payment != "card")),
    # 4. a one-letter cell value beside its column's name
    ("orders", "how many orders of size a", _count(O["size"] == "a")),
    ("orders", "what is the total amount for size b", [int(O.amount[O["size"] == "b"].sum())]),
    ("readings", "how many readings in grade c", _count(R.grade == "c")),
    ("readings", "how many readings have a grade of b", _count(R.grade == "b")),
    ("orders", "how many orders had a card payment", _count(O.payment == "card")),
    ("orders", "how many orders have a size of a", _count(O["size"] == "a")),
    ("readings", "how many readings have a grade of a", _count(R.grade == "a")),
    # 5. who / where / when ask for a person, a place, a date
    ("readings", "who recorded the lowest temperature",
     [R.observer[R.temperature.idxmin()]]),
    ("readings", "where was the lowest temperature", [R.city[R.temperature.idxmin()]]),
    ("readings", "when was the lowest temperature",
     [R.reading_date[R.temperature.idxmin()].isoformat()]),
    ("orders", "who delivered the highest amount", [O.driver[O.amount.idxmax()]]),
    ("orders", "where did the highest amount go", [O.depot[O.amount.idxmax()]]),
    ("orders", "when was the highest amount", [O.order_date[O.amount.idxmax()].isoformat()]),
]


@pytest.mark.parametrize("table,question,expected", CASES, ids=[c[1] for c in CASES])
def test_question_reads_as_pandas_answers(tables, table, question, expected):
    result = tables[table].ask(question)
    assert matches(result.answer, expected), (result.answer, str(result.best.form))


@pytest.mark.parametrize("question,values", [
    ("below -3", [-3.0]), ("under −2.5", [-2.5]), ("less than minus 3", [-3.0]),
    ("lower than negative four", [-4.0]), ("between -5 and -2", [-5.0, -2.0]),
    ("a wind of 3-4", [3.0, 4.0]), ("the 2023-24 season", [2023.0, 24.0]),
    ("weeks 3–5", [3.0, 5.0]), ("e-bike jobs over 2", [2.0]), ("on 2024-04-03", []),
])
def test_numbers_keep_their_sign_and_ranges_stay_ranges(question, values):
    """A minus before a number is its sign; a dash between two numbers joins a range (pure
    text: the expected values are the numbers as written)."""
    assert [n.value for n in read_question(question).numbers] == values


@pytest.mark.parametrize("question", ["how many orders had a card payment",
                                      "how many a size orders were paid by card"])
def test_the_article_a_is_no_size(tables, question):
    """"a" names the value a of size only right after the column's name ("size a")."""
    from tabq.analyse import analyse
    analysis = analyse(question, tables["orders"].table)
    at = [t.text for t in analysis.words.tokens].index("a")
    assert not [atom for atom in analysis.atoms["ENTITY"] if atom.value == ("size", "a")
                and atom.span and atom.span[0] <= at < atom.span[1]
                and not atom.quality.startswith("floating")]


def test_wh_words_find_columns_by_header_and_values(tmp_path):
    """"who" finds the column of people's names though its header ("lead") says nothing, and
    not the venues, whose names look alike; "where" the venues, "when" the dates."""
    frame = pd.DataFrame({"lead": ["Ann Lee", "Bo Grant", "Cy Moss"],
                          "venue": ["Wharf Shed", "Old Mill", "Wharf Shed"],
                          "day": ["2024-03-01", "2024-03-08", "2024-03-15"], "fee": [5, 9, 7]})
    frame.to_csv(tmp_path / "gigs.csv", index=False)
    table = tabq.open(tmp_path / "gigs.csv", model=tabq.Model.prior()).table
    from tabq.analyse import analyse

    def wh(question):
        return {a.value for a in analyse(question, table).atoms["ANYCOL"] if a.quality == "wh"}

    assert wh("who had the highest fee") == {"lead"}
    assert wh("where was the highest fee") == {"venue"}
    assert wh("when was the highest fee") == {"day"}
    assert wh("what was the highest fee") == set()
