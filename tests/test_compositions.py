"""Compositions of issue 16: filters on groups, shares, above/below the average, per-month and
per-year tables, and existing compositions checked on plain wordings.

The questions were written before the compositions existed, over an invented delivery firm's
orders and product list built here. Every expected answer is computed by pandas from the same
rows (the `pandas:` line beside each check), never by tabq and never typed by hand. The model is
the untaught prior: these are the wordings it must read right without teaching.
"""

from __future__ import annotations

import datetime
import random

import pandas as pd
import pytest

import tabq
from tabq import logic as L
from tabq.answers import matches


# ── the tables ────────────────────────────────────────────────────────────────────────────────
def order_rows() -> list[dict]:
    """150 orders over two years: four depots (two of them often late), six clients, five
    drivers (sometimes none recorded), card or cash."""
    rng = random.Random(16)
    clients = ["Ashby Foods", "Brook & Sons", "Cinder Cafe", "Dale Hardware", "Elm Florists",
               "Fenn Bakery"]
    depots = ["North Yard", "River Dock", "Hill Gate", "Mill Lane"]
    drivers = ["Priya Nandi", "Tom Okello", "Sara Lind", "Marek Wolny", "Jo Adeyemi"]
    rows = []
    start = datetime.date(2023, 1, 3)
    for i in range(150):
        day = start + datetime.timedelta(days=rng.randrange(0, 720))
        depot = rng.choice(depots)
        late = 3 if depot in ("North Yard", "River Dock") else 1
        status = rng.choices(["on time", "late", "returned"], weights=[6, late, 1])[0]
        driver = rng.choice(drivers) if rng.random() > 0.08 else ""
        rows.append({"order_id": f"O-{i + 1:03d}", "placed_on": day.isoformat(),
                     "weekday": day.strftime("%A"), "client": rng.choice(clients),
                     "depot": depot, "driver": driver, "status": status,
                     "weight_kg": round(rng.uniform(0.5, 30), 1),
                     "amount": round(rng.uniform(20, 900) * (1.6 if rng.random() < 0.3 else 1), 2),
                     "paid_by": rng.choice(["card", "card", "cash"])})
    return rows


def product_rows() -> list[dict]:
    """24 products in four categories, some cheaper than 10."""
    rng = random.Random(3)
    categories = ["Stationery", "Kitchen", "Garden", "Lighting"]
    names = ["Amber", "Birch", "Cobalt", "Dune", "Ember", "Fern"]
    rows = []
    for i in range(24):
        category = categories[i % 4]
        cheap = {"Stationery": 0.8, "Kitchen": 0.5, "Garden": 0.2, "Lighting": 0.1}[category]
        price = round(rng.uniform(2, 9.9) if rng.random() < cheap else rng.uniform(11, 60), 2)
        rows.append({"product": f"{names[i // 4]} {category.lower()} set", "category": category,
                     "price": price, "stock": rng.randrange(0, 40)})
    return rows


@pytest.fixture(scope="module")
def orders_df() -> pd.DataFrame:
    df = pd.DataFrame(order_rows())
    df["driver"] = df["driver"].replace("", None)
    df["placed_on"] = pd.to_datetime(df["placed_on"])
    return df


@pytest.fixture(scope="module")
def products_df() -> pd.DataFrame:
    return pd.DataFrame(product_rows())


@pytest.fixture(scope="module")
def orders(tmp_path_factory):
    path = tmp_path_factory.mktemp("orders") / "orders.csv"
    pd.DataFrame(order_rows()).to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


@pytest.fixture(scope="module")
def products(tmp_path_factory):
    path = tmp_path_factory.mktemp("products") / "products.csv"
    pd.DataFrame(product_rows()).to_csv(path, index=False)
    return tabq.open(path, model=tabq.Model.prior())


def check(table, question: str, expected: list):
    result = table.ask(question)
    assert matches(result.answer, expected), (
        f"{question!r}: got {result.answer[:8]} from {result.best and result.best.form}, "
        f"want {expected[:8]}")
    return result


def by_first_seen(series: pd.Series) -> list:
    return list(dict.fromkeys(series))


# ── 1. filters on groups ──────────────────────────────────────────────────────────────────────
def test_groups_with_more_than_n_rows_meeting_a_condition(orders, orders_df):
    late = orders_df[orders_df.status == "late"].groupby("depot").size()
    expected = sorted(late[late > 7].index)                 # pandas: groupby size > 7
    check(orders, "which depots have more than 7 late orders", expected)
    check(orders, "depots with more than 7 late orders", expected)


def test_groups_whose_average_is_over_a_number(orders, orders_df):
    means = orders_df.groupby("client").amount.mean()
    expected = sorted(means[means > 600].index)             # pandas: groupby mean > 600
    check(orders, "clients whose average amount is over 600", expected)


def test_groups_with_at_least_n_rows_under_a_number(products, products_df):
    cheap = products_df[products_df.price < 10].groupby("category").size()
    expected = sorted(cheap[cheap >= 3].index)              # pandas: groupby size >= 3
    check(products, "which categories have at least 3 products under 10", expected)


def test_how_many_groups_meet_a_condition(orders, orders_df):
    late = orders_df[orders_df.status == "late"].groupby("depot").size()
    expected = [int((late > 5).sum())]                      # pandas: groups with size > 5
    check(orders, "how many depots have more than 5 late orders", expected)


# ── 2. shares and percentages ─────────────────────────────────────────────────────────────────
def test_share_of_rows_is_a_percentage(orders, orders_df):
    expected = [100 * (orders_df.status == "returned").mean()]   # pandas: 100 × mean
    result = check(orders, "what share of orders were returned", expected)
    assert "percentage" in result.paraphrase


def test_proportion_of_rows_is_a_fraction(orders, orders_df):
    expected = [(orders_df.status == "returned").mean()]    # pandas: mean of a boolean
    result = check(orders, "what proportion of orders were returned", expected)
    assert "0 to 1" in result.paraphrase


def test_percentage_of_rows_is_out_of_100(orders, orders_df):
    expected = [100 * (orders_df.status == "late").mean()]  # pandas: 100 × mean
    result = check(orders, "percentage of orders that were late", expected)
    assert "percentage" in result.paraphrase


def test_fraction_among_rows_meeting_another_condition(orders, orders_df):
    tuesday = orders_df[orders_df.weekday == "Tuesday"]
    expected = [(tuesday.paid_by == "card").mean()]         # pandas: mean within a subset
    check(orders, "what fraction of Tuesday orders were paid by card", expected)


def test_percentage_among_rows_meeting_another_condition(orders, orders_df):
    card = orders_df[orders_df.paid_by == "card"]
    expected = [100 * (card.status == "late").mean()]       # pandas: 100 × mean in a subset
    check(orders, "what percentage of card orders were late", expected)


# ── 3. above or below the average ─────────────────────────────────────────────────────────────
def test_count_above_the_average(orders, orders_df):
    expected = [int((orders_df.amount > orders_df.amount.mean()).sum())]   # pandas
    check(orders, "how many orders are above the average amount", expected)


def test_distinct_values_where_heavier_than_average(orders, orders_df):
    heavy = orders_df[orders_df.weight_kg > orders_df.weight_kg.mean()]
    expected = sorted(heavy.driver.dropna().unique())       # pandas: unique over a mask
    check(orders, "which drivers delivered orders heavier than average", expected)


def test_list_below_the_mean(products, products_df):
    expected = list(products_df[products_df.price < products_df.price.mean()]["product"])
    check(products, "list the products priced below the mean", expected)   # pandas mask


def test_above_average_composes_with_another_condition(orders, orders_df):
    mask = (orders_df.amount > orders_df.amount.mean()) & (orders_df.status == "late")
    expected = [int(mask.sum())]                            # pandas: mean over the whole table
    check(orders, "how many late orders have an amount above the average", expected)


@pytest.mark.parametrize("question", ["what is the average price of products in stock",
                                      "what is the median price of stocked products"])
def test_an_average_asked_for_is_no_comparison_with_the_average(products, question):
    # no comparison word beside "average": the average is the answer, not a row filter
    assert "cmp_agg" not in str(products.ask(question).best.form)


# ── 4. per-month and per-year tables ──────────────────────────────────────────────────────────
def month_table(frame: pd.DataFrame, values: pd.Series) -> list[tuple]:
    months = frame.placed_on.dt.strftime("%Y-%m")
    return [tuple(x) for x in values.groupby(months).agg(list).items()]


def test_count_per_month_keeps_years_apart(orders, orders_df):
    counts = orders_df.groupby(orders_df.placed_on.dt.strftime("%Y-%m")).size()
    expected = [(k, int(v)) for k, v in counts.items()]    # pandas: groupby year-month size
    result = check(orders, "orders per month", expected)
    assert result.best.is_table and "month" in result.paraphrase


def test_count_each_year(orders, orders_df):
    counts = orders_df.groupby(orders_df.placed_on.dt.year).size()
    expected = [(int(k), int(v)) for k, v in counts.items()]   # pandas: groupby year size
    check(orders, "number of orders each year", expected)


def test_total_by_month_in_one_year(orders, orders_df):
    in_2024 = orders_df[orders_df.placed_on.dt.year == 2024]
    sums = in_2024.groupby(in_2024.placed_on.dt.strftime("%Y-%m")).amount.sum()
    expected = [(k, v) for k, v in sums.items()]            # pandas: groupby sum
    check(orders, "total amount by month in 2024", expected)


def test_average_per_year(orders, orders_df):
    means = orders_df.groupby(orders_df.placed_on.dt.year).amount.mean()
    expected = [(int(k), v) for k, v in means.items()]      # pandas: groupby mean
    check(orders, "average amount per year", expected)


# "per" and "each" a column: one row per value of it
@pytest.mark.parametrize("question", ["number of orders per depot", "how many orders per depot",
                                      "how many orders did each depot have"])
def test_count_per_group(orders, orders_df, question):
    counts = orders_df.groupby("depot").size()
    expected = [(k, int(v)) for k, v in counts.items()]      # pandas: groupby size
    result = check(orders, question, expected)
    assert result.best.is_table


def test_total_per_group(orders, orders_df):
    sums = orders_df.groupby("client").amount.sum()
    expected = [(k, v) for k, v in sums.items()]            # pandas: groupby sum
    check(orders, "total amount per client", expected)


# ── 5. existing compositions on plain wordings ────────────────────────────────────────────────
def test_distinct_values_where_another_column_is_missing(orders, orders_df):
    expected = sorted(orders_df[orders_df.driver.isna()].depot.unique())   # pandas: isna mask
    check(orders, "which depots have orders with no driver recorded", expected)


def test_top_groups_by_count(orders, orders_df):
    counts = orders_df.groupby("depot").size().sort_values(ascending=False)
    expected = list(counts.index[:3])                       # pandas: value counts, top 3
    assert counts.iloc[2] != counts.iloc[3]                 # no tie at the cut
    check(orders, "top 3 depots by number of orders", expected)


def test_how_many_more_rows_of_one_value_than_another(orders, orders_df):
    counts = orders_df.status.value_counts()
    expected = [int(counts["late"] - counts["returned"])]   # pandas: value counts
    check(orders, "how many more late orders than returned orders", expected)


def test_difference_of_two_filtered_averages(orders, orders_df):
    means = orders_df.groupby("paid_by").amount.mean()
    expected = [abs(means["card"] - means["cash"])]         # pandas: groupby mean
    check(orders, "difference between the average amount of card orders and cash orders",
          expected)
