"""Answer time against the floor of one DuckDB scan of the same data, measured in one run.

    python benchmarks/latency.py [ROWS ...]        (default 10000 1000000 10000000)

For each size: a seeded synthetic table (an invented orchard co-operative's deliveries: text,
numeric and date columns) written as Parquet in a temporary folder; the time to open it with
tabq; every question below asked once on a fresh open table (cold: nothing cached) and once
more (warm: answers cached by SQL); the median and max of each; peak memory of this process;
and the median of one filtered aggregate scan of the same data in an in-memory DuckDB table,
with the ratio of the median answer time to it. Results go in docs/performance.md.
"""

from __future__ import annotations

import os
import resource
import statistics
import sys
import tempfile
import time

import duckdb
import numpy as np
import pandas as pd

sys.path.insert(0, os.path.join(os.path.dirname(__file__), ".."))
import tabq  # noqa: E402

QUESTIONS = [   # one or more of every kind: counts, filters, aggregates, superlatives, groups
    "how many deliveries were there",
    "how many deliveries were late",
    "how many deliveries came from the mill lane depot",
    "what is the average weight of pear crates",
    "total crates delivered by brigid",
    "which driver delivered the most crates",
    "which depot has the highest average weight",
    "what is the heaviest delivery",
    "how many deliveries weighed more than 30 kg",
    "how many plum deliveries after 2024-06-01",
    "were there any quince deliveries from the harbour",
    "how many different drivers are there",
    "the 3 drivers with the most deliveries",
    "number of deliveries per depot",
]


def build(rows: int, path: str) -> None:
    rng = np.random.default_rng(11)
    pd.DataFrame({
        "delivery_id": np.arange(1, rows + 1),
        "placed_on": pd.Timestamp("2024-01-01") + pd.to_timedelta(rng.integers(0, 700, rows),
                                                                  unit="D"),
        "depot": rng.choice(["north yard", "mill lane", "harbour", "east gate"], rows,
                            p=[0.4, 0.3, 0.2, 0.1]),
        "fruit": rng.choice(["apple", "pear", "plum", "quince", "cherry"], rows),
        "weight_kg": np.round(rng.gamma(3.0, 6.0, rows), 1),
        "crates": rng.integers(1, 30, rows),
        "driver": rng.choice(["ansel", "brigid", "corvin", "dagny", "elspeth", "fenwick"], rows),
        "late": rng.choice(["yes", "no"], rows, p=[0.1, 0.9]),
        "note": rng.choice(["", "bruised", "left at gate", "signed by farmer"], rows),
    }).to_parquet(path, index=False)


def floor(path: str) -> float:
    con = duckdb.connect()
    con.execute(f"CREATE TABLE t AS SELECT * FROM read_parquet('{path}')")
    scan = "SELECT count(*), sum(weight_kg), max(crates) FROM t WHERE depot = 'mill lane'"
    con.execute(scan).fetchall()
    times = []
    for _ in range(9):
        start = time.perf_counter()
        con.execute(scan).fetchall()
        times.append(time.perf_counter() - start)
    con.close()
    return statistics.median(times)


def measure(rows: int) -> dict:
    with tempfile.TemporaryDirectory() as folder:
        path = os.path.join(folder, "deliveries.parquet")
        build(rows, path)
        scan = floor(path)
        start = time.perf_counter()
        table = tabq.open(path, model=tabq.Model.prior())    # not a taught default folder
        opened = time.perf_counter() - start
        cold, warm = [], []
        for question in QUESTIONS:
            for times in (cold, warm):
                start = time.perf_counter()
                table.ask(question)
                times.append(time.perf_counter() - start)
        peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    return {"rows": rows, "open": opened, "scan": scan, "cold": cold, "warm": warm, "peak": peak}


def main(argv: list[str]) -> None:
    sizes = [int(a) for a in argv] or [10_000, 1_000_000, 10_000_000]
    print(f"{len(QUESTIONS)} questions; {os.cpu_count()} cores; DuckDB {duckdb.__version__}")
    print("rows       open s  scan ms  cold median/max ms  warm median/max ms  "
          "ratio cold/warm  peak MB")
    for rows in sizes:
        r = measure(rows)
        cold, warm = statistics.median(r["cold"]), statistics.median(r["warm"])
        print(f"{rows:<10} {r['open']:6.2f} {r['scan'] * 1000:8.2f} "
              f"{cold * 1000:9.0f}/{max(r['cold']) * 1000:<9.0f} "
              f"{warm * 1000:9.0f}/{max(r['warm']) * 1000:<9.0f} "
              f"{cold / r['scan']:7.0f}/{warm / r['scan']:<7.0f} {r['peak']:8.0f}", flush=True)


if __name__ == "__main__":
    main(sys.argv[1:])
