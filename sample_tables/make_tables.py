"""Generate the demo tables for tabq: the Brambleford Bike Kitchen.

The Brambleford Bike Kitchen is an invented, volunteer-run community bicycle repair
workshop in the invented town of Brambleford. Everything here (names, sites, prices)
is made up.

Writes, next to this file:
  repair_jobs.csv  - the job log the operations lead keeps (one row per bike booked in)
  services.csv     - the service menu (reference table; its standard_time column is
                     deliberately written with units, e.g. "45 min")

Reproducible: seeded numpy generator, stdlib + numpy only.
    python sample_tables/make_tables.py
"""

from __future__ import annotations

import csv
import datetime as dt
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
SEED = 20250107
N_JOBS = 240

# --- reference table: the service menu -------------------------------------------------
# code, service, category, standard_price, standard minutes, needs_booking
SERVICES = [
    ("SV01", "Puncture repair", "Repair", 8.00, 20, "no"),
    ("SV02", "Brake adjustment", "Maintenance", 12.00, 30, "no"),
    ("SV03", "Gear tune", "Maintenance", 15.00, 35, "no"),
    ("SV04", "Chain replacement", "Repair", 10.00, 25, "no"),
    ("SV05", "Wheel truing", "Repair", 18.00, 40, "no"),
    ("SV06", "Tyre fitting", "Repair", 9.00, 20, "no"),
    ("SV07", "Safety check", "Safety", 5.00, 15, "no"),
    ("SV08", "Full service", "Maintenance", 55.00, 120, "yes"),
    ("SV09", "Headset service", "Maintenance", 22.00, 45, "yes"),
    ("SV10", "Cable replacement", "Repair", 14.00, 30, "no"),
    ("SV11", "E-bike check", "Safety", 25.00, 50, "yes"),
    ("SV12", "Donor bike rebuild", "Build", 40.00, 180, "yes"),
    ("SV13", "Wheel build", "Build", 35.00, 150, "yes"),
    ("SV14", "Hub overhaul", "Maintenance", 20.00, 60, "yes"),
]
# how often each service is booked (relative weights, same order as SERVICES)
SERVICE_WEIGHTS = [22, 14, 12, 9, 7, 8, 10, 8, 3, 6, 5, 3, 2, 3]
# typical parts spend per service (mean, in the same currency as prices); 0 = usually none
PARTS_MEAN = [3, 4, 2, 14, 2, 18, 0, 22, 6, 7, 0, 30, 45, 9]

SITES = ["Wharf Shed", "Library Yard", "Market Pop-up"]
SITE_WEIGHTS = [0.5, 0.35, 0.15]

BIKE_TYPES = ["City", "Road", "Mountain", "Kids", "Cargo", "E-bike", "Folding"]
BIKE_WEIGHTS = [0.32, 0.16, 0.16, 0.12, 0.06, 0.10, 0.08]

# volunteer mechanics and how much of the work each takes on
MECHANICS = [
    "Ines Okafor-Lund",
    "Tomasz Wrenfield",
    "Priya Halloway",
    "Dev Marchetti",
    "Ruth Abernathy",
    "Kofi Penhallow",
    "Mina Castellane",
]
MECHANIC_WEIGHTS = [0.24, 0.20, 0.16, 0.14, 0.11, 0.09, 0.06]

MEMBER_DISCOUNT = 0.25  # members pay 25% less labour
START = dt.date(2025, 1, 6)
END = dt.date(2026, 2, 27)


def _money(x: float) -> str:
    return f"{x:.2f}"


def make_services() -> list[dict]:
    rows = []
    for code, name, cat, price, minutes, booking in SERVICES:
        rows.append(
            {
                "service_code": code,
                "service": name,
                "category": cat,
                "standard_price": _money(price),
                # the "mess": durations are written as text with a unit, like a person would
                "standard_time": f"{minutes} min",
                "needs_booking": booking,
            }
        )
    return rows


def make_jobs(rng: np.random.Generator) -> list[dict]:
    n_days = (END - START).days
    # workshop is busier in spring/summer: sample days with a seasonal weight
    days = np.arange(n_days + 1)
    doy = np.array([(START + dt.timedelta(int(d))).timetuple().tm_yday for d in days])
    season = 1.0 + 0.6 * np.sin((doy - 80) / 365.0 * 2 * np.pi)
    weekday = np.array([(START + dt.timedelta(int(d))).weekday() for d in days])
    open_day = np.isin(weekday, [1, 3, 5, 6])  # Tue, Thu, Sat, Sun sessions
    w = season * open_day
    w = w / w.sum()
    day_idx = np.sort(rng.choice(days, size=N_JOBS, p=w))

    sw = np.array(SERVICE_WEIGHTS, dtype=float)
    sw /= sw.sum()

    rows = []
    for i, d in enumerate(day_idx, start=1):
        date_in = START + dt.timedelta(int(d))
        s = int(rng.choice(len(SERVICES), p=sw))
        code, name, cat, std_price, std_min, _ = SERVICES[s]
        # the Market Pop-up only does quick jobs on Saturdays
        if date_in.weekday() == 5 and std_min <= 40 and rng.random() < 0.45:
            site = "Market Pop-up"
        else:
            site = str(rng.choice(SITES[:2], p=[0.58, 0.42]))
        if name == "E-bike check":
            bike = "E-bike"
        else:
            bike = str(rng.choice(BIKE_TYPES, p=BIKE_WEIGHTS))
        mechanic = str(rng.choice(MECHANICS, p=MECHANIC_WEIGHTS))
        member = "yes" if rng.random() < 0.45 else "no"

        # status: older jobs are settled; the last few weeks still have open ones
        age = (END - date_in).days
        u = rng.random()
        if u < 0.06:
            status = "Cancelled"
        elif age < 21 and u < 0.5:
            status = "In progress"
        elif age < 90 and u < 0.3:
            status = "Waiting for parts"
        else:
            status = "Done"

        labour = max(5, int(round(rng.normal(std_min, std_min * 0.25) / 5.0) * 5))
        pm = PARTS_MEAN[s]
        parts = 0.0 if pm == 0 or rng.random() < 0.15 else round(float(rng.gamma(2.0, pm / 2.0)), 2)

        labour_fee = std_price * (1 - MEMBER_DISCOUNT if member == "yes" else 1.0)
        price = round(labour_fee + parts, 2)

        row = {
            "job_id": f"BK-{i:04d}",
            "date_in": date_in.isoformat(),
            "site": site,
            "service": name,
            "bike_type": bike,
            "mechanic": mechanic,
            "status": status,
            "labour_min": str(labour),
            "parts_cost": _money(parts),
            "price": _money(price),
            "member": member,
        }
        # realistic gaps
        if status == "Cancelled":
            row["labour_min"] = ""
            row["price"] = ""
            row["parts_cost"] = ""
            if rng.random() < 0.5:
                row["mechanic"] = ""  # nobody was assigned before it was cancelled
        elif status in ("In progress", "Waiting for parts"):
            row["price"] = ""  # not charged yet
        if rng.random() < 0.03:
            row["bike_type"] = ""  # not written down at the counter
        if status == "Done" and rng.random() < 0.03:
            row["parts_cost"] = ""  # receipt lost
        rows.append(row)
    return rows


def write_csv(path: Path, rows: list[dict]) -> None:
    with path.open("w", newline="", encoding="utf-8") as f:
        wr = csv.DictWriter(f, fieldnames=list(rows[0].keys()), lineterminator="\n")
        wr.writeheader()
        wr.writerows(rows)


def main() -> None:
    rng = np.random.default_rng(SEED)
    write_csv(HERE / "services.csv", make_services())
    write_csv(HERE / "repair_jobs.csv", make_jobs(rng))


if __name__ == "__main__":
    main()
