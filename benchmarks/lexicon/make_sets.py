"""Build the team-vocabulary set for the lexicon benchmark (benchmarks/lexicon.py).

The Hollowmere Seed Library is invented: members borrow packets of seed in spring, grow them,
and bring saved seed back in autumn. Its volunteers have their own words, which the untaught
model cannot know:

  comebacks    loans whose seed came back          status = 'returned'
  keepers      heirloom varieties                  seed_type = 'heirloom'
  sprout rate  the germination test result         germination_pct
  growers      the members who borrowed            member (counted as different people)

teach.jsonl holds 30 confirmed questions about this year's loans (loans.csv) that use these
words with some crops, branches and numbers; test.jsonl holds 30 other questions that use the
same words with other crops, branches and numbers, and on last year's loans (loans_2024.csv).
Every answer is computed here by sqlite3 from the SQL written beside its question (no answer
is typed by hand). The table is generated with a fixed seed.

    python benchmarks/lexicon/make_sets.py
"""

from __future__ import annotations

import csv
import datetime as dt
import json
import random
import sqlite3
from pathlib import Path

HERE = Path(__file__).resolve().parent
SEED = 20251108
N_LOANS = 360

CROPS = {  # crop: (varieties, share of heirloom)
    "bean": (["Kestrel Pole", "Borlotti Red"], 0.6), "tomato": (["Moneymaker", "Tigerella"], 0.5),
    "squash": (["Crown Prince", "Uchiki Kuri"], 0.4), "kale": (["Cavolo Nero", "Red Russian"], 0.7),
    "pea": (["Hurst Green Shaft", "Alderman"], 0.5), "chard": (["Bright Lights", "Fordhook"], 0.3),
    "radish": (["French Breakfast", "Cherry Belle"], 0.4),
    "pumpkin": (["Jack Be Little", "Atlantic Giant"], 0.2),
    "lettuce": (["Little Gem", "Lollo Rosso"], 0.5), "carrot": (["Chantenay", "Nantes"], 0.6),
    "beetroot": (["Boltardy", "Chioggia"], 0.5), "onion": (["Ailsa Craig", "Red Baron"], 0.3),
}
BRANCHES = ["Mill Lane", "Orchard Hall", "Quayside", "Tanners Yard"]
FIRST = ["Ada", "Bram", "Cleo", "Dev", "Esme", "Finn", "Gita", "Hal", "Iona", "Jude", "Kit",
         "Lorna", "Mo", "Nell", "Oz", "Pia", "Quin", "Rhea", "Sol", "Tam"]
LAST = ["Ashby", "Birch", "Coyle", "Dunmore", "Ellery", "Frome"]
STATUS = (["returned", "outstanding", "lost"], [0.55, 0.3, 0.15])  # "lost": a stray


def make_table(path: Path, seed: int, n: int) -> None:
    rng = random.Random(seed)
    members = [f"{f} {s}" for f in FIRST for s in LAST]
    rng.shuffle(members)
    members = members[:70]
    rows = []
    for i in range(n):
        crop = rng.choice(sorted(CROPS))
        varieties, heirloom = CROPS[crop]
        rows.append({
            "loan_id": 5001 + i,
            "member": rng.choice(members),
            "branch": rng.choices(BRANCHES, [0.35, 0.3, 0.2, 0.15])[0],
            "crop": crop,
            "variety": rng.choice(varieties),
            "seed_type": "heirloom" if rng.random() < heirloom else rng.choice(
                ["hybrid", "open pollinated"]),
            "packets": rng.choice([1, 1, 1, 2, 2, 3, 4, 5]),
            "lent_on": (dt.date(2025, 2, 1) + dt.timedelta(days=rng.randrange(120))).isoformat(),
            "status": rng.choices(*STATUS)[0],
            "germination_pct": rng.randrange(42, 99),
        })
    with open(path, "w", newline="", encoding="utf-8") as f:
        writer = csv.DictWriter(f, fieldnames=list(rows[0]))
        writer.writeheader()
        writer.writerows(rows)


def avg(col: str, where: str) -> str:
    return f"SELECT AVG({col}) FROM t WHERE {where}"


def best(group: str, measure: str, top: str = "MAX", where: str = "1=1") -> str:
    """The group(s) with the largest (or smallest) measure, ties kept."""
    inner = f"SELECT {measure} AS m FROM t WHERE {where} GROUP BY {group}"
    return (f"SELECT {group} FROM t WHERE {where} GROUP BY {group} "
            f"HAVING {measure} = (SELECT {top}(m) FROM ({inner}))")


def growers(crop: str) -> str:
    return f"SELECT COUNT(DISTINCT member) FROM t WHERE crop='{crop}'"


RETURNED, HEIRLOOM = "status='returned'", "seed_type='heirloom'"
THIS_YEAR, LAST_YEAR = "loans.csv", "loans_2024.csv"

# (kind, question, table, SQL): the team words with some values …
TEACH = [
    *[("sprout rate", f"average sprout rate of {p}", THIS_YEAR, avg("germination_pct",
                                                                    f"crop='{c}'"))
      for c, p in [("bean", "beans"), ("tomato", "tomatoes"), ("squash", "squash"),
                   ("kale", "kale")]],
    *[("sprout rate", f"highest sprout rate of {p}", THIS_YEAR,
       f"SELECT MAX(germination_pct) FROM t WHERE crop='{c}'")
      for c, p in [("pea", "peas"), ("chard", "chard")]],
    *[("sprout rate", f"lowest sprout rate at {b}", THIS_YEAR,
       f"SELECT MIN(germination_pct) FROM t WHERE branch='{b}'")
      for b in ["Mill Lane", "Orchard Hall"]],
    ("sprout rate", "how many loans had a sprout rate above 80", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct > 80"),
    ("sprout rate", "how many loans had a sprout rate above 60", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct > 60"),
    ("sprout rate", "how many loans had a sprout rate below 50", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct < 50"),
    ("sprout rate", "how many loans had a sprout rate of at least 90", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct >= 90"),
    *[("growers", f"how many different growers borrowed {p}", THIS_YEAR, growers(c))
      for c, p in [("bean", "beans"), ("tomato", "tomatoes"), ("squash", "squash"),
                   ("kale", "kale"), ("pea", "peas"), ("chard", "chard")]],
    ("comebacks", "how many comebacks were there", THIS_YEAR,
     f"SELECT COUNT(*) FROM t WHERE {RETURNED}"),
    ("keepers", "how many keepers went out", THIS_YEAR,
     f"SELECT COUNT(*) FROM t WHERE {HEIRLOOM}"),
    ("keepers", "average sprout rate of keepers", THIS_YEAR, avg("germination_pct", HEIRLOOM)),
    ("comebacks", "average sprout rate of comebacks", THIS_YEAR,
     avg("germination_pct", RETURNED)),
    ("keepers", "average packets for keepers", THIS_YEAR, avg("packets", HEIRLOOM)),
    ("comebacks", "average packets for comebacks", THIS_YEAR, avg("packets", RETURNED)),
    ("keepers", "highest sprout rate among keepers", THIS_YEAR,
     f"SELECT MAX(germination_pct) FROM t WHERE {HEIRLOOM}"),
    ("comebacks", "lowest sprout rate among comebacks", THIS_YEAR,
     f"SELECT MIN(germination_pct) FROM t WHERE {RETURNED}"),
    ("comebacks", "which branch had the most comebacks", THIS_YEAR,
     best("branch", "COUNT(*)", where=RETURNED)),
    ("keepers", "which crop had the most keepers", THIS_YEAR,
     best("crop", "COUNT(*)", where=HEIRLOOM)),
    ("sprout rate", "which crop had the highest average sprout rate", THIS_YEAR,
     best("crop", "AVG(germination_pct)")),
    ("sprout rate", "which branch had the lowest average sprout rate", THIS_YEAR,
     best("branch", "AVG(germination_pct)", "MIN")),
]
# … and the same words with other crops, branches and numbers, and on last year's loans.
TEST = [
    *[("sprout rate", f"average sprout rate of {p}", THIS_YEAR, avg("germination_pct",
                                                                    f"crop='{c}'"))
      for c, p in [("radish", "radishes"), ("pumpkin", "pumpkins"), ("lettuce", "lettuce"),
                   ("carrot", "carrots")]],
    *[("sprout rate", f"highest sprout rate of {p}", THIS_YEAR,
       f"SELECT MAX(germination_pct) FROM t WHERE crop='{c}'")
      for c, p in [("onion", "onions"), ("beetroot", "beetroot")]],
    *[("sprout rate", f"lowest sprout rate at {b}", THIS_YEAR,
       f"SELECT MIN(germination_pct) FROM t WHERE branch='{b}'")
      for b in ["Quayside", "Tanners Yard"]],
    ("sprout rate", "how many loans had a sprout rate above 70", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct > 70"),
    ("sprout rate", "how many loans had a sprout rate above 90", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct > 90"),
    ("sprout rate", "how many loans had a sprout rate below 55", THIS_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct < 55"),
    *[("growers", f"how many different growers borrowed {p}", THIS_YEAR, growers(c))
      for c, p in [("radish", "radishes"), ("pumpkin", "pumpkins"), ("lettuce", "lettuce"),
                   ("carrot", "carrots"), ("onion", "onions"), ("beetroot", "beetroot")]],
    ("keepers", "lowest sprout rate among keepers", THIS_YEAR,
     f"SELECT MIN(germination_pct) FROM t WHERE {HEIRLOOM}"),
    ("comebacks", "highest sprout rate among comebacks", THIS_YEAR,
     f"SELECT MAX(germination_pct) FROM t WHERE {RETURNED}"),
    ("comebacks", "how many comebacks were there", LAST_YEAR,
     f"SELECT COUNT(*) FROM t WHERE {RETURNED}"),
    ("keepers", "how many keepers went out", LAST_YEAR,
     f"SELECT COUNT(*) FROM t WHERE {HEIRLOOM}"),
    ("keepers", "average sprout rate of keepers", LAST_YEAR, avg("germination_pct", HEIRLOOM)),
    ("comebacks", "average sprout rate of comebacks", LAST_YEAR,
     avg("germination_pct", RETURNED)),
    ("keepers", "average packets for keepers", LAST_YEAR, avg("packets", HEIRLOOM)),
    ("comebacks", "average packets for comebacks", LAST_YEAR, avg("packets", RETURNED)),
    ("comebacks", "which branch had the most comebacks", LAST_YEAR,
     best("branch", "COUNT(*)", where=RETURNED)),
    ("keepers", "which crop had the most keepers", LAST_YEAR,
     best("crop", "COUNT(*)", where=HEIRLOOM)),
    ("sprout rate", "which crop had the highest average sprout rate", LAST_YEAR,
     best("crop", "AVG(germination_pct)")),
    ("sprout rate", "which branch had the lowest average sprout rate", LAST_YEAR,
     best("branch", "AVG(germination_pct)", "MIN")),
    ("sprout rate", "how many loans had a sprout rate of at least 85", LAST_YEAR,
     "SELECT COUNT(*) FROM t WHERE germination_pct >= 85"),
]


def database(path: Path) -> sqlite3.Connection:
    db = sqlite3.connect(":memory:")
    with open(path, encoding="utf-8") as f:
        rows = list(csv.DictReader(f))
    db.execute(f"CREATE TABLE t ({', '.join(rows[0])})")
    db.executemany(f"INSERT INTO t VALUES ({', '.join('?' * len(rows[0]))})",
                   [[int(v) if v.isdigit() else v for v in r.values()] for r in rows])
    return db


def examples(items: list[tuple], prefix: str, dbs: dict) -> list[dict]:
    out = []
    for number, (kind, question, table, sql) in enumerate(items, 1):
        values = [row[0] for row in dbs[table].execute(sql).fetchall()]
        values = [round(v, 6) if isinstance(v, float) else v for v in values]
        out.append({"id": f"{prefix}-{number:02d}", "question": question, "table": table,
                    "answer": values, "kind": kind, "sql": sql})
    return out


def main() -> None:
    make_table(HERE / THIS_YEAR, SEED, N_LOANS)
    make_table(HERE / LAST_YEAR, SEED - 1, N_LOANS - 60)
    dbs = {name: database(HERE / name) for name in (THIS_YEAR, LAST_YEAR)}
    for name, items in [("teach", TEACH), ("test", TEST)]:
        with open(HERE / f"{name}.jsonl", "w", encoding="utf-8") as f:
            for ex in examples(items, name, dbs):
                f.write(json.dumps(ex, ensure_ascii=False) + "\n")


if __name__ == "__main__":
    main()
