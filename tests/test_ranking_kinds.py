"""Ranking of compositions by kind (issue 16, "right out of the box"): questions whose right
reading the untaught prior used to rank below a misreading, on an invented bakery's wholesale
deliveries built here. Each check is one kind of question, not one wording:

- a difference of counts inside a shared condition ("how many more late deliveries did A have
  than B": the condition stays on both sides);
- a filter on groups whose number is followed by the things it counts ("more than 12 late
  deliveries": a count per group, not a sum of a column);
- a number that counts the answers ("which 3 shops"): that many answers;
- one comparison with the average for one "than the average";
- "who": a column of people's names, not the row's id;
- "which X have … with no Y recorded": the distinct values, not one best group;
- "was PX-2 refrigerated?" over a Y/N column: yes or no, not the cell's code (own small table).
- "how many drivers": the distinct names of a column of names; "how many late deliveries" over
  a yes/no column still counts rows;
- "what models does Brackwell make?": each model once, not once per row (own small table).

Every expected answer is computed by pandas from the same rows (the `pandas:` comment beside
each), never by tabq. The model is the untaught prior.
"""

from __future__ import annotations

import datetime
import random

import pandas as pd
import pytest

import tabq
from tabq.answers import matches

SHOPS = ["Crumb Corner", "Larder Lane", "Oven Door", "Rye House", "Yeast Street"]
DRIVERS = ["Agnieszka Brook", "Tomasz Reed", "Lena Ouko", "Farid Salim"]


def delivery_rows() -> list[dict]:
    """240 deliveries in 2024: five shops (two of them often late), four drivers (sometimes none
    recorded), a weight and a price per delivery."""
    rng = random.Random(2016)
    rows = []
    for i in range(240):
        shop = rng.choices(SHOPS, weights=[5, 4, 3, 2, 2])[0]
        late = rng.random() < (0.35 if shop in ("Crumb Corner", "Larder Lane") else 0.1)
        day = datetime.date(2024, 1, 2) + datetime.timedelta(days=rng.randrange(0, 300))
        rows.append({"delivery": f"BK-{7001 + i}", "shop": shop, "day": day.isoformat(),
                     "driver": rng.choice(DRIVERS) if rng.random() > 0.1 else "",
                     "late": "yes" if late else "no",
                     "weight_kg": round(rng.uniform(2, 60), 1),
                     "price": round(rng.uniform(15, 400), 2)})
    return rows


@pytest.fixture(scope="module")
def frame() -> pd.DataFrame:
    return pd.DataFrame(delivery_rows())


@pytest.fixture(scope="module")
def table(tmp_path_factory, frame):
    path = tmp_path_factory.mktemp("ranking") / "bakery_deliveries.csv"
    frame.to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


def _ask(table, question: str) -> list:
    return table.ask(question).answer


def test_difference_keeps_the_shared_condition(table, frame):
    late = frame[frame.late == "yes"]
    counts = late.shop.value_counts()
    # pandas: late deliveries of Crumb Corner minus those of Oven Door
    expected = int(counts["Crumb Corner"] - counts["Oven Door"])
    assert expected > 0
    assert matches(_ask(table, "How many more late deliveries did Crumb Corner have than "
                               "Oven Door?"), [expected])


def test_groups_with_more_than_a_number_of_things(table, frame):
    counts = frame[frame.late == "yes"].shop.value_counts()
    # pandas: shops with more than 12 late deliveries (no shop sits on 12 or 13: one reading)
    assert not counts.isin([12, 13]).any()
    expected = sorted(counts[counts > 12].index)
    assert 0 < len(expected) < len(SHOPS)
    assert matches(_ask(table, "Which shops had more than 12 late deliveries?"), expected)


def test_a_number_that_counts_the_answers(table, frame):
    counts = frame.shop.value_counts()
    # pandas: the three shops with the most deliveries (no tie at the cut)
    assert counts.iloc[2] != counts.iloc[3]
    assert matches(_ask(table, "Which 3 shops received the most deliveries?"),
                   list(counts.index[:3]))


def test_one_comparison_with_the_average(table, frame):
    # pandas: deliveries heavier than the mean weight
    expected = int((frame.weight_kg > frame.weight_kg.mean()).sum())
    assert matches(_ask(table, "How many deliveries weighed more than the average weight?"),
                   [expected])


def test_who_answers_with_a_person(table, frame):
    heaviest = frame.loc[frame.weight_kg.idxmax()]
    assert (frame.weight_kg == heaviest.weight_kg).sum() == 1 and heaviest.driver
    # pandas: the driver of the heaviest delivery
    assert matches(_ask(table, "Who delivered the heaviest order?"), [heaviest.driver])


def test_which_have_lists_the_distinct_values(table, frame):
    no_driver = frame[frame.driver.isna() | (frame.driver == "")]
    # pandas: the shops with at least one delivery whose driver is blank
    expected = sorted(no_driver.shop.unique())
    assert 1 < len(expected)
    assert matches(_ask(table, "Which shops have deliveries with no driver recorded?"),
                   expected)


def test_a_superlative_names_its_measure(table, frame):
    priciest = frame.loc[frame.price.idxmax()]
    assert (frame.price == priciest.price).sum() == 1
    # pandas: the shop of the priciest delivery ("priciest" → price, not the shop with most rows)
    assert matches(_ask(table, "What shop got the priciest delivery?"), [priciest.shop])


def test_the_average_compared_with_is_explained(table, frame):
    shop = frame[frame.shop == "Rye House"]
    # pandas: Rye House deliveries priced above the mean price of all deliveries
    expected = int((shop.price > frame.price.mean()).sum())
    assert matches(_ask(table, "How many Rye House deliveries had a price above the overall "
                               "average?"), [expected])


def test_money_verbs_name_the_price(table, frame):
    # pandas: the total price of Oven Door's deliveries ("charged" names price)
    expected = round(float(frame[frame.shop == "Oven Door"].price.sum()), 2)
    assert matches(_ask(table, "How much was Oven Door charged altogether?"), [expected])



def test_a_yes_no_question_about_a_coded_cell_is_answered_yes_or_no(tmp_path):
    """"Was PX-2 refrigerated?" over a column coded Y/N asks whether: yes or no, not the code."""
    rng = random.Random(77)
    frame = pd.DataFrame({"parcel": [f"PX-{i}" for i in range(40)],
                          "depot": [rng.choice(["Harrowgate", "Lowfield"]) for _ in range(40)],
                          "refrigerated": [rng.choice("YN") for _ in range(40)],
                          "weight_kg": [round(rng.uniform(1, 30), 1) for _ in range(40)]})
    path = tmp_path / "parcels.csv"
    frame.to_csv(path, index=False)
    table = tabq.open(path, model=tabq.Model.prior())
    for parcel in ("PX-2", "PX-3", "PX-5"):
        code = frame.set_index("parcel").refrigerated[parcel]                       # pandas
        result = table.ask(f"Was {parcel} refrigerated?")
        assert matches(result.answer, ["yes" if code == "Y" else "no"]), (parcel, code)


@pytest.mark.parametrize("question, column", [
    ("How many drivers are there?", "driver"),
    ("How many shops are there?", "shop"),
    ("How many shops did Lena Ouko deliver to?", "shop"),
])
def test_how_many_of_a_column_of_names_counts_the_names(table, frame, question, column):
    """"How many drivers": the drivers (a column of names that repeat), not the deliveries."""
    rows = frame[frame.driver == "Lena Ouko"] if "Lena" in question else frame
    want = rows[column].replace("", pd.NA).nunique()                            # pandas
    assert matches(table.ask(question).answer, [want]), table.ask(question).sql


def test_how_many_of_a_flag_still_counts_the_rows(table, frame):
    """"How many late deliveries": late is a yes/no property of the rows counted."""
    want = int(((frame.late == "yes") & (frame.driver == "Lena Ouko")).sum())   # pandas
    result = table.ask("How many late deliveries did Lena Ouko make?")
    assert matches(result.answer, [want]), result.sql



def test_a_list_of_values_that_repeat_is_given_once_each(tmp_path):
    """"What models does Brackwell make?" over a mower catalogue with a row per model year:
    each model once, not once per row (own small table)."""
    rng = random.Random(31)
    makers = {"Brackwell": ["glide 40", "glide 46", "ridge pro"], "Tamsin": ["leaf 3", "leaf 5"]}
    rows = [{"maker": maker, "model": model, "year": year,
             "price": round(rng.uniform(150, 900), 2)}
            for maker, models in makers.items() for model in models
            for year in (2022, 2023, 2024)]
    frame = pd.DataFrame(rows)
    path = tmp_path / "mowers.csv"
    frame.to_csv(path, index=False)
    table = tabq.open(path, model=tabq.Model.prior())
    for maker in makers:
        want = sorted(frame[frame.maker == maker].model.unique())                # pandas
        result = table.ask(f"What models does {maker} make?")
        assert matches(result.answer, want), result.sql
