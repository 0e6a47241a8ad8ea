"""Build the third zero-shot set for tabq: compositions (issue 16) on a new invented table.

Written before the engine changes that rank compositions (share, top n, the row with the
most, differences, above the average, filters on groups, missing cells), so that those changes
are measured on a table and wording they were not tuned on. Answers are computed here by
pandas, one small expression beside each question; none is typed by hand.

  toolhire.csv / toolhire.jsonl   hires of Thornbury Tool Hire (invented), 2024 (seeded)

Run from anywhere:  python benchmarks/zeroshot3/make_set.py   (byte-identical on rerun)
The answer format and helpers are those of benchmarks/zeroshot2/make_sets.py.
"""

from __future__ import annotations

import datetime as dt
import importlib.util
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent
_spec = importlib.util.spec_from_file_location("zs2", HERE.parent / "zeroshot2" / "make_sets.py")
zs2 = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(zs2)
one, ties_max, ties_min, top, pct, write_set = (zs2.one, zs2.ties_max, zs2.ties_min, zs2.top,
                                                zs2.pct, zs2.write_set)
zs2.HERE = HERE  # write_set writes its jsonl into zs2.HERE: here, not into zeroshot2

SEED = 20240316
N_HIRES = 560
BRANCHES = {"Elmsworth": 0.36, "Fallowby": 0.27, "Gristhorpe": 0.22, "Hollins Cross": 0.15}
CUSTOMERS = ["Bram Kettering", "Odile Sayer", "Cormac Lusk", "Petra Vance", "Idris Marchbank",
             "Wynn Tallis", "Sable Orrin", "Jory Penhallow", "Mireille Dax", "Tobin Ashgrove",
             "Ursula Quenby", "Ned Calloway", "Fenna Rooke", "Lazlo Brimm", "Ysolde Farrant",
             "Gideon Mott"]
CLERKS = {"Elmsworth": ["Harriet Coyle", "Anselm Birch"], "Fallowby": ["Dorcas Pim"],
          "Gristhorpe": ["Leofric Yate"], "Hollins Cross": ["Maude Renner"]}
TOOLS = {"Drill": (9.0, False), "Mixer": (24.0, True), "Sander": (14.0, False),
         "Ladder": (7.5, False), "Generator": (38.0, True), "Saw": (18.0, True)}


def make_table(path: Path) -> None:
    rng = np.random.default_rng(SEED)
    first = dt.date(2024, 1, 2)
    days = [first + dt.timedelta(i) for i in range(330)]
    days = [x for x in days if x.weekday() != 6]  # closed on Sundays: no hire starts on one
    branches = list(BRANCHES)
    bw = np.array(list(BRANCHES.values()))
    cw = rng.dirichlet(np.ones(len(CUSTOMERS)) * 1.5)
    tools = list(TOOLS)
    rows = []
    for i in range(N_HIRES):
        branch = branches[int(rng.choice(len(branches), p=bw / bw.sum()))]
        customer = CUSTOMERS[int(rng.choice(len(CUSTOMERS), p=cw))]
        clerks = CLERKS[branch]
        clerk = clerks[int(rng.integers(len(clerks)))] if rng.random() > 0.12 else ""
        tool = tools[int(rng.integers(len(tools)))]
        rate, fuel = TOOLS[tool]
        start = days[int(rng.integers(len(days)))]
        hire_days = int(np.clip(rng.geometric(0.3), 1, 21))
        fee = round(rate * hire_days * float(rng.uniform(0.85, 1.15)), 2)
        deposit = int(rng.choice([20, 50, 100, 150]))
        returned = start + dt.timedelta(hire_days + int(rng.integers(0, 4)))
        out = returned > dt.date(2024, 11, 20) or rng.random() < 0.05
        overdue = "" if out else ("Y" if rng.random() < 0.22 else "N")
        damaged = "yes" if rng.random() < 0.08 else "no"
        litres = round(float(rng.gamma(2.0, 2.2)), 1) if fuel and rng.random() > 0.1 else None
        rows.append({"hire_ref": f"TT-{50001 + i}", "branch": branch, "customer": customer,
                     "clerk": clerk, "tool": tool, "hired_on": start.isoformat(),
                     "returned_on": "" if out else returned.isoformat(),
                     "hire_days": hire_days, "fee": fee, "deposit": deposit,
                     "overdue": overdue, "damaged": damaged,
                     "fuel_litres": "" if litres is None else litres})
    pd.DataFrame(rows).to_csv(path, index=False, lineterminator="\n")


def questions():
    over = lambda d: d.overdue == "Y"  # noqa: E731
    dmg = lambda d: d.damaged == "yes"  # noqa: E731
    return [
        # --- share (percentages 0-100)
        ("share", "What percentage of hires were overdue?",
         lambda d: pct(over(d).sum(), len(d))),
        ("share", "What percentage of hires came back damaged?",
         lambda d: pct(dmg(d).sum(), len(d))),
        ("share", "What share of the Fallowby hires were ladders?",
         lambda d: pct(((d.branch == "Fallowby") & (d.tool == "Ladder")).sum(),
                       (d.branch == "Fallowby").sum())),
        ("share", "What percentage of hires were for a generator?",
         lambda d: pct((d.tool == "Generator").sum(), len(d))),
        ("share", "Of the returned hires, what percentage were overdue?",
         lambda d: pct(over(d).sum(), d.returned_on.notna().sum())),
        ("share", "What percentage of hires have no clerk recorded?",
         lambda d: pct(d.clerk.isna().sum(), len(d))),
        # --- top_n
        ("top_n", "Which 3 customers made the most hires?",
         lambda d: top(d.customer.value_counts(), 3)),
        ("top_n", "Which 2 branches took the most in fees?",
         lambda d: top(d.groupby("branch").fee.sum(), 2)),
        ("top_n", "What are the references of the 4 most expensive hires?",
         lambda d: d.loc[top(d.fee, 4), "hire_ref"]),
        ("top_n", "Top 2 tools by number of hires",
         lambda d: top(d.tool.value_counts(), 2)),
        ("top_n", "Which 3 customers spent the most?",
         lambda d: top(d.groupby("customer").fee.sum(), 3)),
        # --- argmax_row
        ("argmax_row", "Who paid the highest fee?",
         lambda d: d.loc[ties_max(d.fee), "customer"]),
        ("argmax_row", "When was the most expensive hire made?",
         lambda d: d.loc[ties_max(d.fee), "hired_on"]),
        ("argmax_row", "Which branch made the cheapest hire?",
         lambda d: d.loc[ties_min(d.fee), "branch"]),
        ("argmax_row", "Which tool used the most fuel?",
         lambda d: d.loc[ties_max(d.fuel_litres), "tool"]),
        ("argmax_row", "Who hired the tool that used the least fuel?",
         lambda d: d.loc[ties_min(d.fuel_litres), "customer"]),
        # --- difference
        ("difference", "How many more hires did Elmsworth make than Hollins Cross?",
         lambda d: (d.branch == "Elmsworth").sum() - (d.branch == "Hollins Cross").sum()),
        ("difference", "How many more overdue hires did Elmsworth have than Gristhorpe?",
         lambda d: (over(d) & (d.branch == "Elmsworth")).sum()
         - (over(d) & (d.branch == "Gristhorpe")).sum()),
        ("difference", "How much more did Ned Calloway pay in fees than Odile Sayer?",
         lambda d: d[d.customer == "Ned Calloway"].fee.sum()
         - d[d.customer == "Odile Sayer"].fee.sum()),
        ("difference", "What's the difference between the highest and the lowest fee?",
         lambda d: d.fee.max() - d.fee.min()),
        ("difference", ("What is the difference between the average fee of generators and "
         "of mixers?"),
         lambda d: abs(d[d.tool == "Generator"].fee.mean() - d[d.tool == "Mixer"].fee.mean())),
        # --- above_average
        ("above_average", "How many hires cost more than the average fee?",
         lambda d: (d.fee > d.fee.mean()).sum()),
        ("above_average", "How many hires lasted longer than average?",
         lambda d: (d.hire_days > d.hire_days.mean()).sum()),
        ("above_average", "How many hires used more fuel than average?",
         lambda d: (d.fuel_litres > d.fuel_litres.mean()).sum()),
        ("above_average", "How many Fallowby hires had a fee above the average?",
         lambda d: ((d.branch == "Fallowby") & (d.fee > d.fee.mean())).sum()),
        # --- group_filter
        ("group_filter", "Which branches had more than 25 overdue hires?",
         lambda d: sorted(k for k, v in d[over(d)].branch.value_counts().items() if v > 25)),
        ("group_filter", "Which customers made more than 40 hires?",
         lambda d: sorted(k for k, v in d.customer.value_counts().items() if v > 40)),
        ("group_filter", "Which tools have an average fee over 60?",
         lambda d: sorted(k for k, v in d.groupby("tool").fee.mean().items() if v > 60)),
        ("group_filter", "Which customers had more than 3 damaged hires?",
         lambda d: sorted(k for k, v in d[dmg(d)].customer.value_counts().items() if v > 3)),
        # --- missing
        ("missing", "How many hires have no return date?",
         lambda d: d.returned_on.isna().sum()),
        ("missing", "How many hires are missing a clerk?",
         lambda d: d.clerk.isna().sum()),
        ("missing", "Which customers have hires with no clerk recorded?",
         lambda d: sorted(d[d.clerk.isna()].customer.unique())),
        ("missing", "Which clerks handled hires that have no return date?",
         lambda d: sorted(d[d.returned_on.isna()].clerk.dropna().unique())),
        ("missing", "Which branches have hires that were not returned?",
         lambda d: sorted(d[d.returned_on.isna()].branch.unique())),
    ]


def check_table(d: pd.DataFrame) -> None:
    """Facts the questions lean on."""
    assert d.hire_ref.is_unique
    assert not (pd.to_datetime(d.hired_on).dt.day_of_week == 6).any()
    # the mean of a column is no row's value, so 'more than the average' has one reading
    for col in ("fee", "hire_days", "fuel_litres"):
        assert not (d[col] == d[col].mean()).any(), col


def main() -> None:
    make_table(HERE / "toolhire.csv")
    d = pd.read_csv(HERE / "toolhire.csv")
    check_table(d)
    rows = write_set("toolhire.jsonl", "toolhire.csv", "th", d, questions())
    kinds = pd.Series([r["kind"] for r in rows]).value_counts().sort_index()
    print(f"toolhire.jsonl: {len(rows)} questions; "
          + ", ".join(f"{k} {v}" for k, v in kinds.items()))


if __name__ == "__main__":
    main()
