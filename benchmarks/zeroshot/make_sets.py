"""Build the zero-shot evaluation sets for tabq.

Two tables, each with hand-written questions whose answers are computed here by pandas
(one small expression beside each question; no answer is typed by hand):

  penguins.csv / penguins.jsonl          the palmerpenguins data (copied from the package)
  ticket_sales.csv / ticket_sales.jsonl  an invented theatre's ticket orders (seeded)

Run from anywhere:
    python benchmarks/zeroshot/make_sets.py

Answer format (each jsonl line: id, question, table, answer, answer_rounded, kind):
  answer          JSON list (a set; one element for a single value); numbers stay numbers and
                  are the exact pandas value; yes/no questions answer "yes"/"no"; dates are
                  ISO strings.
  answer_rounded  the same list with floats rounded to 2 decimals, for people reading it.
Aggregates skip missing values (pandas' default, which matches SQL's).
"""

from __future__ import annotations

import csv
import datetime as dt
import importlib.resources
import json
import math
import shutil
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent

# ======================================================================================
# Table (b): the Lantern Row Playhouse, an invented 200-seat community theatre in the
# invented town of Kestrelbury. One row per ticket order in its 2025 season.
# ======================================================================================
SEED = 4242025
N_ORDERS = 420

# show, genre, first performance, last performance, popularity weight
SHOWS = [
    ("The Glass Orchard", "Drama", dt.date(2025, 2, 20), dt.date(2025, 4, 12), 1.0),
    ("Brindle & Finch Go Sailing", "Comedy", dt.date(2025, 4, 24), dt.date(2025, 6, 14), 1.3),
    ("Salt and Thunder", "Drama", dt.date(2025, 6, 26), dt.date(2025, 8, 16), 0.8),
    ("The Lamplighter's Wager", "Musical", dt.date(2025, 9, 11), dt.date(2025, 11, 8), 1.6),
    ("Marigold and the Moon Goose", "Family", dt.date(2025, 11, 27), dt.date(2026, 1, 10), 1.2),
]
ZONES = ["Stalls", "Circle", "Balcony", "Box"]
ZONE_WEIGHTS = [0.46, 0.30, 0.19, 0.05]
ZONE_PRICE = {"Stalls": 24.0, "Circle": 20.0, "Balcony": 14.0, "Box": 36.0}
MUSICAL_SURCHARGE = 4.0
CONCESSION_RATE = 0.70  # concessions pay 70% of the full price
MATINEE_RATE = 0.85  # afternoon performances are 15% cheaper
CHANNELS = ["Online", "Box office", "Phone"]
BOOKING_FEE = {"Online": 1.50, "Box office": 0.0, "Phone": 2.25}  # per order
CHANNEL_WEIGHTS = [0.55, 0.30, 0.15]
STAFF = ["Odile Carrow", "Barnaby Sethi", "Lucinda Morrow-Hay", "Jasper Quill"]
STAFF_WEIGHTS = [0.38, 0.29, 0.21, 0.12]


def make_ticket_sales(path: Path) -> None:
    rng = np.random.default_rng(SEED)
    weights = np.array([s[4] for s in SHOWS])
    weights /= weights.sum()
    rows = []
    for _ in range(N_ORDERS):
        show, genre, first, last, _w = SHOWS[int(rng.choice(len(SHOWS), p=weights))]
        # orders open five weeks before opening night and close on the last night
        window = (last - first).days + 35
        offset = int(min(window, rng.triangular(0, window * 0.6, window)))
        sale_date = first - dt.timedelta(35) + dt.timedelta(offset)
        zone = str(rng.choice(ZONES, p=ZONE_WEIGHTS))
        channel = str(rng.choice(CHANNELS, p=CHANNEL_WEIGHTS))
        sold_by = "" if channel == "Online" else str(rng.choice(STAFF, p=STAFF_WEIGHTS))
        if genre == "Family":
            tickets = int(rng.choice([2, 3, 4, 5, 6, 7], p=[0.2, 0.25, 0.3, 0.15, 0.07, 0.03]))
        else:
            tickets = int(rng.choice([1, 2, 3, 4, 5, 6], p=[0.2, 0.45, 0.14, 0.13, 0.05, 0.03]))
        if zone == "Box":
            tickets = min(tickets, 4)  # a box seats four
        concession = "yes" if rng.random() < 0.28 else "no"
        performance = "Matinee" if rng.random() < (0.45 if genre == "Family" else 0.25) else "Evening"
        unit = ZONE_PRICE[zone] + (MUSICAL_SURCHARGE if genre == "Musical" else 0.0)
        if performance == "Matinee":
            unit *= MATINEE_RATE
        if concession == "yes":
            unit *= CONCESSION_RATE
        unit = round(unit, 2)
        total = round(unit * tickets + BOOKING_FEE[channel], 2)
        # post-show survey: most people never answer
        rating = ""
        if rng.random() < 0.4:
            base = {"Drama": 4.0, "Comedy": 3.7, "Musical": 4.2, "Family": 3.9}[genre]
            if show == "Salt and Thunder":
                base = 3.3
            rating = str(int(np.clip(round(rng.normal(base, 0.9)), 1, 5)))
        row = {
            "sale_date": sale_date,
            "show": show,
            "genre": genre,
            "performance": performance,
            "seat_zone": zone,
            "channel": channel,
            "sold_by": sold_by,
            "tickets": str(tickets),
            "unit_price": f"{unit:.2f}",
            "total": f"{total:.2f}",
            "concession": concession,
            "rating": rating,
        }
        # gaps a real box office log has
        if rng.random() < 0.015:
            row["channel"] = ""  # imported from the old system without a channel
        if channel != "Online" and rng.random() < 0.04:
            row["sold_by"] = ""  # staff member forgot to sign the slip
        rows.append(row)
    rows.sort(key=lambda r: r["sale_date"])
    with path.open("w", newline="", encoding="utf-8") as f:
        fields = ["order_id"] + list(rows[0].keys())
        wr = csv.DictWriter(f, fieldnames=fields, lineterminator="\n")
        wr.writeheader()
        for i, r in enumerate(rows):
            r = dict(r, order_id=f"LR-{1001 + i}", sale_date=r["sale_date"].isoformat())
            wr.writerow(r)


def copy_penguins(path: Path) -> None:
    src = importlib.resources.files("palmerpenguins") / "data" / "penguins.csv"
    with importlib.resources.as_file(src) as p:
        shutil.copyfile(p, path)


# ======================================================================================
# helpers that turn a pandas result into the stored answer
# ======================================================================================
def ties_max(s: pd.Series) -> list:
    """Index labels of a Series that share its maximum (all of them when tied)."""
    s = s.dropna()
    return list(s[s == s.max()].index)


def ties_min(s: pd.Series) -> list:
    s = s.dropna()
    return list(s[s == s.min()].index)


def _plain(v):
    if isinstance(v, (bool, np.bool_)):
        return "yes" if v else "no"
    if isinstance(v, (int, np.integer)):
        return int(v)
    if isinstance(v, (float, np.floating)):
        v = float(v)
        if math.isnan(v):
            raise ValueError("NaN answer")
        return int(v) if v.is_integer() else v
    if isinstance(v, pd.Timestamp):
        return v.date().isoformat()
    if isinstance(v, (dt.date,)):
        return v.isoformat()
    if isinstance(v, str):
        return v
    raise TypeError(f"unexpected answer type {type(v)!r}: {v!r}")


def to_answer(x) -> list:
    if isinstance(x, (pd.Series, pd.Index, pd.api.extensions.ExtensionArray, np.ndarray,
                      list, tuple, set)):
        vals = [_plain(v) for v in list(x)]
        # a set: de-duplicate, keep a stable order
        out = []
        for v in vals:
            if v not in out:
                out.append(v)
        return out
    return [_plain(x)]


def _rounded(ans: list) -> list:
    return [round(v, 2) if isinstance(v, float) else v for v in ans]


# ======================================================================================
# Questions. Each: (kind, question, pandas expression over the DataFrame d).
# ======================================================================================
def penguin_questions():
    return [
        # --- count_filter
        ("count_filter", "How many Gentoo penguins are in the data?",
         lambda d: (d.species == "Gentoo").sum()),
        ("count_filter", "Number of female penguins on Dream island?",
         lambda d: ((d.sex == "female") & (d.island == "Dream")).sum()),
        ("count_filter", "Count the Adelie penguins that were recorded on Torgersen.",
         lambda d: ((d.species == "Adelie") & (d.island == "Torgersen")).sum()),
        # --- count_date (the only time column is the study year)
        ("count_date", "How many penguins were recorded in 2008?",
         lambda d: (d.year == 2008).sum()),
        ("count_date", "How many Gentoos were observed in 2009?",
         lambda d: ((d.species == "Gentoo") & (d.year == 2009)).sum()),
        ("count_date", "How many penguins were measured before 2009?",
         lambda d: (d.year < 2009).sum()),
        ("count_date", "Number of Adelie penguins seen on Biscoe in 2007",
         lambda d: ((d.species == "Adelie") & (d.island == "Biscoe") & (d.year == 2007)).sum()),
        # --- compare
        ("compare", "How many penguins weigh more than 5000 g?",
         lambda d: (d.body_mass_g > 5000).sum()),
        ("compare", "How many penguins have a flipper length of at least 210 mm?",
         lambda d: (d.flipper_length_mm >= 210).sum()),
        ("compare", "Count the penguins whose bill length is between 40 and 43 mm.",
         lambda d: d.bill_length_mm.between(40, 43).sum()),
        ("compare", "How many penguins have a bill depth under 15 mm?",
         lambda d: (d.bill_depth_mm < 15).sum()),
        # --- aggregate
        ("aggregate", "What is the average body mass of Gentoo penguins?",
         lambda d: d[d.species == "Gentoo"].body_mass_g.mean()),
        ("aggregate", "What's the heaviest body mass recorded?",
         lambda d: d.body_mass_g.max()),
        ("aggregate", "Median flipper length for Chinstrap penguins?",
         lambda d: d[d.species == "Chinstrap"].flipper_length_mm.median()),
        ("aggregate", "What is the shortest bill length among female Adelies?",
         lambda d: d[(d.species == "Adelie") & (d.sex == "female")].bill_length_mm.min()),
        ("aggregate", "What's the combined body mass of all the penguins on Torgersen?",
         lambda d: d[d.island == "Torgersen"].body_mass_g.sum()),
        # --- lookup
        ("lookup", "Which island do the Chinstrap penguins live on?",
         lambda d: d[d.species == "Chinstrap"].island.unique()),
        ("lookup", "What was the body mass of the penguin with a 59.6 mm bill?",
         lambda d: d[d.bill_length_mm == 59.6].body_mass_g),
        ("lookup", "What sex is the penguin whose flippers are 172 mm long?",
         lambda d: d[d.flipper_length_mm == 172].sex),
        # --- argmax_row
        ("argmax_row", "Which species is the heaviest penguin?",
         lambda d: d.loc[ties_max(d.body_mass_g), "species"]),
        ("argmax_row", "On which island was the penguin with the longest bill found?",
         lambda d: d.loc[ties_max(d.bill_length_mm), "island"]),
        ("argmax_row", "In what year was the lightest Gentoo recorded?",
         lambda d: d.loc[ties_min(d[d.species == "Gentoo"].body_mass_g), "year"]),
        ("argmax_row", "What is the flipper length of the penguin with the deepest bill?",
         lambda d: d.loc[ties_max(d.bill_depth_mm), "flipper_length_mm"]),
        # --- argmax_group
        ("argmax_group", "Which species has the highest average body mass?",
         lambda d: ties_max(d.groupby("species").body_mass_g.mean())),
        ("argmax_group", "Which island has the most penguins?",
         lambda d: ties_max(d.island.value_counts())),
        ("argmax_group", "Which species has the longest bills on average?",
         lambda d: ties_max(d.groupby("species").bill_length_mm.mean())),
        ("argmax_group", "Which year had the most penguins recorded?",
         lambda d: ties_max(d.year.value_counts())),
        ("argmax_group", "What's the most common species on Dream?",
         lambda d: ties_max(d[d.island == "Dream"].species.value_counts())),
        # --- distinct
        ("distinct", "List the islands where Adelie penguins were seen.",
         lambda d: sorted(d[d.species == "Adelie"].island.unique())),
        ("distinct", "What species are in this table?",
         lambda d: sorted(d.species.unique())),
        ("distinct", "Which years does the data cover?",
         lambda d: sorted(d.year.unique())),
        # --- count_distinct
        ("count_distinct", "How many different islands are there?",
         lambda d: d.island.nunique()),
        ("count_distinct", "How many species were found on Biscoe?",
         lambda d: d[d.island == "Biscoe"].species.nunique()),
        ("count_distinct", "Number of distinct flipper lengths recorded for Chinstraps",
         lambda d: d[d.species == "Chinstrap"].flipper_length_mm.nunique()),
        # --- negation (only on columns with no blanks, so "not" is unambiguous)
        ("negation", "How many penguins are not Adelie?",
         lambda d: (d.species != "Adelie").sum()),
        ("negation", "How many penguins were found somewhere other than Biscoe?",
         lambda d: (d.island != "Biscoe").sum()),
        ("negation", "What's the average body mass of penguins not living on Biscoe?",
         lambda d: d[d.island != "Biscoe"].body_mass_g.mean()),
        ("negation", "How many non-Gentoo penguins were recorded in 2007?",
         lambda d: ((d.species != "Gentoo") & (d.year == 2007)).sum()),
        # --- missing
        ("missing", "How many penguins have no sex recorded?",
         lambda d: d.sex.isna().sum()),
        ("missing", "How many penguins are missing a body mass measurement?",
         lambda d: d.body_mass_g.isna().sum()),
        ("missing", "Which species have penguins whose sex is unknown?",
         lambda d: sorted(d[d.sex.isna()].species.unique())),
        # --- difference
        ("difference", "How many more Adelie penguins are there than Chinstrap?",
         lambda d: (d.species == "Adelie").sum() - (d.species == "Chinstrap").sum()),
        ("difference", "How much heavier is the average Gentoo than the average Adelie?",
         lambda d: d[d.species == "Gentoo"].body_mass_g.mean()
         - d[d.species == "Adelie"].body_mass_g.mean()),
        ("difference", "What's the difference between the longest and shortest flipper?",
         lambda d: d.flipper_length_mm.max() - d.flipper_length_mm.min()),
        # --- top_n
        ("top_n", "What are the top 3 bill lengths?",
         lambda d: d.bill_length_mm.nlargest(3)),
        ("top_n", "Which 2 islands have the most penguins?",
         lambda d: d.island.value_counts().nlargest(2).index),
        ("top_n", "name the two species with the heaviest average body mass",
         lambda d: d.groupby("species").body_mass_g.mean().nlargest(2).index),
        # --- yesno
        ("yesno", "Are there any Gentoo penguins on Dream island?",
         lambda d: bool(((d.species == "Gentoo") & (d.island == "Dream")).any())),
        ("yesno", "Is there a penguin heavier than 6000 grams?",
         lambda d: bool((d.body_mass_g > 6000).any())),
        ("yesno", "Did any Adelie have flippers longer than 210 mm?",
         lambda d: bool(((d.species == "Adelie") & (d.flipper_length_mm > 210)).any())),
    ]


def _dates(d: pd.DataFrame) -> pd.Series:
    return pd.to_datetime(d.sale_date)


def ticket_questions():
    return [
        # --- count_filter
        ("count_filter", "How many orders were for The Glass Orchard?",
         lambda d: (d.show == "The Glass Orchard").sum()),
        ("count_filter", "Number of online orders for Salt and Thunder",
         lambda d: ((d.show == "Salt and Thunder") & (d.channel == "Online")).sum()),
        ("count_filter", "Count the box office orders for Circle seats.",
         lambda d: ((d.channel == "Box office") & (d.seat_zone == "Circle")).sum()),
        # --- count_date
        ("count_date", "How many orders were placed in March 2025?",
         lambda d: ((_dates(d).dt.year == 2025) & (_dates(d).dt.month == 3)).sum()),
        ("count_date", "How many ticket orders came in during 2026?",
         lambda d: (_dates(d).dt.year == 2026).sum()),
        ("count_date", "how many orders were made after 8 October 2025",
         lambda d: (_dates(d) > "2025-10-08").sum()),
        ("count_date", "Number of orders placed before 30 May 2025?",
         lambda d: (_dates(d) < "2025-05-30").sum()),
        ("count_date", "How many Musical orders were sold by phone in October 2025?",
         lambda d: ((d.genre == "Musical") & (d.channel == "Phone")
                    & (_dates(d).dt.to_period("M") == "2025-10")).sum()),
        # --- compare
        ("compare", "How many orders were for more than 4 tickets?",
         lambda d: (d.tickets > 4).sum()),
        ("compare", "How many orders had a total of at least 100?",
         lambda d: (d.total >= 100).sum()),
        ("compare", "Count the orders with a total between 50 and 75.",
         lambda d: d.total.between(50, 75).sum()),
        ("compare", "How many Stalls orders cost less than 30 in total?",
         lambda d: ((d.seat_zone == "Stalls") & (d.total < 30)).sum()),
        # --- aggregate
        ("aggregate", "What's the total number of tickets sold for The Lamplighter's Wager?",
         lambda d: d[d.show == "The Lamplighter's Wager"].tickets.sum()),
        ("aggregate", "Average order value for Brindle & Finch Go Sailing?",
         lambda d: d[d.show == "Brindle & Finch Go Sailing"].total.mean()),
        ("aggregate", "What was the biggest single order total?",
         lambda d: d.total.max()),
        ("aggregate", "What is the median number of tickets per order?",
         lambda d: d.tickets.median()),
        ("aggregate", "What's the average rating given to Salt and Thunder?",
         lambda d: d[d.show == "Salt and Thunder"].rating.mean()),
        # --- lookup
        ("lookup", "What genre is Salt and Thunder?",
         lambda d: d[d.show == "Salt and Thunder"].genre.unique()),
        ("lookup", "Which show was order LR-1042 for?",
         lambda d: d[d.order_id == "LR-1042"].show),
        ("lookup", "Who sold order LR-1100?",
         lambda d: d[d.order_id == "LR-1100"].sold_by),
        ("lookup", "How many tickets were in order LR-1200?",
         lambda d: d[d.order_id == "LR-1200"].tickets),
        # --- argmax_row
        ("argmax_row", "Which show was the cheapest single order for?",
         lambda d: d.loc[ties_min(d.total), "show"]),
        ("argmax_row", "Which Circle order had the highest total? Give the order id.",
         lambda d: d.loc[ties_max(d[d.seat_zone == "Circle"].total), "order_id"]),
        ("argmax_row", "Who sold the biggest phone order?",
         lambda d: d.loc[ties_max(d[d.channel == "Phone"].total), "sold_by"]),
        ("argmax_row", "What seat zone was the very first order for?",
         lambda d: d.loc[ties_min(_dates(d)), "seat_zone"]),
        # --- argmax_group
        ("argmax_group", "Which show sold the most tickets?",
         lambda d: ties_max(d.groupby("show").tickets.sum())),
        ("argmax_group", "Which seat zone brought in the most money?",
         lambda d: ties_max(d.groupby("seat_zone").total.sum())),
        ("argmax_group", "Who sold the most tickets?",
         lambda d: ties_max(d.groupby("sold_by").tickets.sum())),
        ("argmax_group", "Which show got the best average rating?",
         lambda d: ties_max(d.groupby("show").rating.mean())),
        # --- distinct
        ("distinct", "List the shows in the season.",
         lambda d: sorted(d.show.unique())),
        ("distinct", "What seat zones are there?",
         lambda d: sorted(d.seat_zone.unique())),
        ("distinct", "Who are the staff members that took phone orders?",
         lambda d: sorted(d[d.channel == "Phone"].sold_by.dropna().unique())),
        # --- count_distinct
        ("count_distinct", "How many different shows were on?",
         lambda d: d.show.nunique()),
        ("count_distinct", "How many staff members have sold tickets?",
         lambda d: d.sold_by.nunique()),
        ("count_distinct", "On how many different days were tickets sold in June 2025?",
         lambda d: d[_dates(d).dt.to_period("M") == "2025-06"].sale_date.nunique()),
        # --- negation (on columns with no blanks)
        ("negation", "How many orders weren't for the Stalls?",
         lambda d: (d.seat_zone != "Stalls").sum()),
        ("negation", "How many orders were not concessions?",
         lambda d: (d.concession != "yes").sum()),
        ("negation", "What's the average order total for shows that aren't dramas?",
         lambda d: d[d.genre != "Drama"].total.mean()),
        # --- missing
        ("missing", "How many orders have no rating?",
         lambda d: d.rating.isna().sum()),
        ("missing", "How many orders don't say which channel they came through?",
         lambda d: d.channel.isna().sum()),
        ("missing", "Number of phone orders with no staff member recorded",
         lambda d: ((d.channel == "Phone") & d.sold_by.isna()).sum()),
        # --- difference
        ("difference", "How many more tickets did The Glass Orchard sell than Salt and Thunder?",
         lambda d: d[d.show == "The Glass Orchard"].tickets.sum()
         - d[d.show == "Salt and Thunder"].tickets.sum()),
        ("difference", "How much more revenue came from online orders than from phone orders?",
         lambda d: d[d.channel == "Online"].total.sum() - d[d.channel == "Phone"].total.sum()),
        ("difference", "How many more Stalls orders were there than Balcony orders?",
         lambda d: (d.seat_zone == "Stalls").sum() - (d.seat_zone == "Balcony").sum()),
        # --- top_n
        ("top_n", "Top 3 shows by tickets sold",
         lambda d: d.groupby("show").tickets.sum().nlargest(3).index),
        ("top_n", "top 3 seat zones by revenue",
         lambda d: d.groupby("seat_zone").total.sum().nlargest(3).index),
        ("top_n", "Which 2 staff members sold the most tickets?",
         lambda d: d.groupby("sold_by").tickets.sum().nlargest(2).index),
        # --- yesno
        ("yesno", "Were any Box seats sold for Marigold and the Moon Goose?",
         lambda d: bool(((d.show == "Marigold and the Moon Goose")
                         & (d.seat_zone == "Box")).any())),
        ("yesno", "Is there any order with more than 7 tickets?",
         lambda d: bool((d.tickets > 7).any())),
        ("yesno", "Did anyone give The Glass Orchard a rating of 1?",
         lambda d: bool(((d.show == "The Glass Orchard") & (d.rating == 1)).any())),
    ]


# ======================================================================================
def check_penguin_facts(d: pd.DataFrame) -> None:
    """Facts stated in the palmerpenguins documentation."""
    assert len(d) == 344, len(d)
    assert d.species.value_counts().to_dict() == {"Adelie": 152, "Gentoo": 124, "Chinstrap": 68}
    assert d.island.value_counts().to_dict() == {"Biscoe": 168, "Dream": 124, "Torgersen": 52}


def check_edges(pg: pd.DataFrame, ts: pd.DataFrame) -> None:
    """"between", "before" and "after" read the same inclusive or exclusive only if no row
    sits exactly on an edge; the questions use edges chosen so that none does."""
    assert not pg.bill_length_mm.isin([40, 43]).any()
    assert not ts.sale_date.isin(["2025-10-08", "2025-05-30"]).any()
    assert not ts.total.isin([50, 75]).any()
    # top-n questions: the n-th and (n+1)-th must differ
    for s, n in [
        (pg.bill_length_mm.dropna(), 3),
        (pg.island.value_counts(), 2),
        (pg.groupby("species").body_mass_g.mean(), 2),
        (ts.groupby("show").tickets.sum(), 3),
        (ts.groupby("seat_zone").total.sum(), 3),
        (ts.groupby("sold_by").tickets.sum(), 2),
    ]:
        top = s.sort_values(ascending=False).tolist()
        assert top[n - 1] != top[n], (s.name, top[: n + 1])


def write_set(name: str, table: str, prefix: str, d: pd.DataFrame, questions) -> list[dict]:
    seen = set()
    out = []
    for i, (kind, question, fn) in enumerate(questions, start=1):
        assert question not in seen, question
        seen.add(question)
        ans = to_answer(fn(d))
        assert ans, f"empty answer: {question}"
        if kind in ("argmax_row", "argmax_group", "lookup", "aggregate", "difference"):
            assert len(ans) == 1, f"not a single answer (a tie?): {question} -> {ans}"
        out.append(
            {
                "id": f"{prefix}-{i:02d}",
                "question": question,
                "table": table,
                "answer": ans,
                "answer_rounded": _rounded(ans),
                "kind": kind,
            }
        )
    with (HERE / name).open("w", encoding="utf-8") as f:
        for r in out:
            f.write(json.dumps(r, ensure_ascii=False) + "\n")
    return out


def main() -> None:
    copy_penguins(HERE / "penguins.csv")
    make_ticket_sales(HERE / "ticket_sales.csv")

    pg = pd.read_csv(HERE / "penguins.csv")
    check_penguin_facts(pg)
    ts = pd.read_csv(HERE / "ticket_sales.csv")
    check_edges(pg, ts)

    for name, table, prefix, d, qs in [
        ("penguins.jsonl", "penguins.csv", "pg", pg, penguin_questions()),
        ("ticket_sales.jsonl", "ticket_sales.csv", "ts", ts, ticket_questions()),
    ]:
        rows = write_set(name, table, prefix, d, qs)
        kinds = pd.Series([r["kind"] for r in rows]).value_counts().sort_index()
        print(f"{name}: {len(rows)} questions; " + ", ".join(f"{k} {v}" for k, v in kinds.items()))


if __name__ == "__main__":
    main()
