"""Build the team-vocabulary sets: words that can only be learned from confirmed answers.

The scenario is invented: Fenwick Basin Boat Hire, a canal boat hire co-operative with three
moorings. Its staff have their own words for things in their booking sheets:

  takings        the sum of `fee`                       ("takings for Kingfisher")
  no-shows       status = "did not arrive"              ("how many no-shows at Mill Pond")
  freebies       status = "complimentary"
  big boats      class = "widebeam"
  outings        party = "school"
  dropouts      status = "cancelled"

None of these words appears in a header or a cell, so an untaught model cannot read them.
`teach.jsonl` confirms ~30 questions on the 2025 sheet; `test.jsonl` asks ~30 different
questions with the same words about other boats, moorings and parties, on both the 2025 sheet
and the 2026 sheet (same columns, other rows). Every answer is computed here by pandas, one
small expression beside each question; no answer is typed by hand.

    python benchmarks/vocabulary/make_sets.py       # rewrites the CSVs and jsonl files
"""

from __future__ import annotations

import csv
import datetime as dt
import json
from pathlib import Path

import numpy as np
import pandas as pd

HERE = Path(__file__).resolve().parent
BOATS = ["Kingfisher", "Dabchick", "Otter's Rest", "Willow Wren", "Heron", "Moorhen",
         "Lady Marsh", "Coot", "Bittern", "Tansy"]
CLASSES = {"Kingfisher": "widebeam", "Dabchick": "narrowboat", "Otter's Rest": "widebeam",
           "Willow Wren": "narrowboat", "Heron": "day boat", "Moorhen": "narrowboat",
           "Lady Marsh": "widebeam", "Coot": "day boat", "Bittern": "narrowboat",
           "Tansy": "widebeam"}
MOORINGS = ["Lock End", "Mill Pond", "Wharf Street"]
PARTIES = ["family", "couple", "school", "club"]
STATUSES = ["paid", "cancelled", "did not arrive", "complimentary"]
NIGHTLY = {"widebeam": 95, "narrowboat": 70, "day boat": 35}


def make_sheet(path: Path, year: int, seed: int, rows: int) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    records = []
    for i in range(rows):
        boat = BOATS[int(rng.integers(len(BOATS)))]
        cls = CLASSES[boat]
        nights = 1 if cls == "day boat" else int(rng.choice([2, 3, 4, 7, 10, 14]))
        status = str(rng.choice(STATUSES, p=[0.72, 0.12, 0.09, 0.07]))
        fee = 0 if status == "complimentary" else NIGHTLY[cls] * nights
        records.append({
            "booking": f"FB-{year % 100}{i + 1:03d}",
            "boat": boat,
            "class": cls,
            "mooring": MOORINGS[int(rng.integers(len(MOORINGS)))],
            "start": (dt.date(year, 3, 1) + dt.timedelta(int(rng.integers(240)))).isoformat(),
            "nights": nights,
            "party": str(rng.choice(PARTIES, p=[0.4, 0.3, 0.15, 0.15])),
            "status": status,
            "fee": fee,
        })
    with path.open("w", newline="", encoding="utf-8") as f:
        writer = csv.DictWriter(f, fieldnames=list(records[0]), lineterminator="\n")
        writer.writeheader()
        writer.writerows(records)
    return pd.DataFrame(records)


def no_show(d):
    return d.status == "did not arrive"


def freebie(d):
    return d.status == "complimentary"


def big(d):
    return d["class"] == "widebeam"


def dropout(d):
    return d.status == "cancelled"


def outing(d):
    return d.party == "school"


# (word, question template, pandas answer over (d, value)); {v} is a boat, mooring or party
TEMPLATES = {
    "takings-boat": ("takings", "takings for {v}", lambda d, v: d.fee[d.boat == v].sum()),
    "takings-mooring": ("takings", "what were the takings at {v}",
                        lambda d, v: d.fee[d.mooring == v].sum()),
    "noshow-mooring": ("no-shows", "how many no-shows at {v}",
                       lambda d, v: (no_show(d) & (d.mooring == v)).sum()),
    "noshow-boat": ("no-shows", "how many no-shows for {v}",
                    lambda d, v: (no_show(d) & (d.boat == v)).sum()),
    "freebie-mooring": ("freebies", "how many freebies at {v}",
                        lambda d, v: (freebie(d) & (d.mooring == v)).sum()),
    "freebie-party": ("freebies", "how many freebies went to {v} parties",
                      lambda d, v: (freebie(d) & (d.party == v)).sum()),
    "big-mooring": ("big boats", "how many big boats were booked at {v}",
                    lambda d, v: (big(d) & (d.mooring == v)).sum()),
    "outing-mooring": ("outings", "how many outings from {v}",
                       lambda d, v: (outing(d) & (d.mooring == v)).sum()),
    "dropout-boat": ("dropouts", "how many dropouts for {v}",
                     lambda d, v: (dropout(d) & (d.boat == v)).sum()),
    "dropout-party": ("dropouts", "number of dropouts among {v} parties",
                      lambda d, v: (dropout(d) & (d.party == v)).sum()),
}
# whole-table questions, one per word: (word, question, pandas answer over d)
PLAIN = {
    "takings": ("takings", "what were the takings", lambda d: d.fee.sum()),
    "no-shows": ("no-shows", "how many no-shows were there", lambda d: no_show(d).sum()),
    "freebies": ("freebies", "how many freebies did we give", lambda d: freebie(d).sum()),
    "big boats": ("big boats", "how many bookings were for big boats", lambda d: big(d).sum()),
    "outings": ("outings", "how many outings were booked", lambda d: outing(d).sum()),
    "dropouts": ("dropouts", "how many dropouts in all", lambda d: dropout(d).sum()),
}

# which values each template is taught with, and which it is tested with (always others)
TAUGHT_VALUES = {
    "takings-boat": ["Kingfisher", "Heron", "Moorhen"],
    "takings-mooring": ["Lock End", "Mill Pond"],
    "noshow-mooring": ["Lock End", "Wharf Street"],
    "noshow-boat": ["Dabchick", "Coot", "Tansy"],
    "freebie-mooring": ["Mill Pond", "Wharf Street"],
    "freebie-party": ["family", "couple"],
    "big-mooring": ["Lock End", "Mill Pond"],
    "outing-mooring": ["Lock End", "Wharf Street"],
    "dropout-boat": ["Willow Wren", "Bittern", "Coot"],
    "dropout-party": ["family"],
}
TESTED_VALUES = {
    "takings-boat": ["Dabchick", "Lady Marsh"],
    "takings-mooring": ["Wharf Street"],
    "noshow-mooring": ["Mill Pond"],
    "noshow-boat": ["Willow Wren", "Otter's Rest"],
    "freebie-mooring": ["Lock End"],
    "freebie-party": ["club"],
    "big-mooring": ["Wharf Street"],
    "outing-mooring": ["Mill Pond"],
    "dropout-boat": ["Tansy", "Kingfisher"],
    "dropout-party": ["couple", "school"],
}


def plain(value):
    value = value.item() if hasattr(value, "item") else value
    return int(value) if float(value).is_integer() else float(value)


def questions(sheets: dict[str, pd.DataFrame], values: dict[str, list], which: str,
              plain_on: list[str]) -> list[dict]:
    lines = []
    for name, d in sheets.items():
        for key, (word, template, answer) in TEMPLATES.items():
            for v in values[key]:
                lines.append({"question": template.format(v=v), "table": name,
                              "answer": [plain(answer(d, v))], "kind": word})
    for name in plain_on:
        for word, question, answer in PLAIN.values():
            lines.append({"question": question, "table": name,
                          "answer": [plain(answer(sheets[name]))], "kind": word})
    return [{"id": f"{which}-{i + 1:02d}", **line} for i, line in enumerate(lines)]


def write(path: Path, lines: list[dict]) -> None:
    with path.open("w", encoding="utf-8") as f:
        for line in lines:
            f.write(json.dumps(line, ensure_ascii=False) + "\n")


def main() -> None:
    sheet_2025 = make_sheet(HERE / "bookings_2025.csv", 2025, seed=2025_0301, rows=260)
    sheet_2026 = make_sheet(HERE / "bookings_2026.csv", 2026, seed=2026_0301, rows=240)
    teach = questions({"bookings_2025.csv": sheet_2025}, TAUGHT_VALUES, "teach",
                      ["bookings_2025.csv"])
    test = questions({"bookings_2025.csv": sheet_2025}, TESTED_VALUES, "test", [])
    test += questions({"bookings_2026.csv": sheet_2026}, TESTED_VALUES, "test2",
                      ["bookings_2026.csv"])
    write(HERE / "teach.jsonl", teach)
    write(HERE / "test.jsonl", test)
    print(f"{len(teach)} teaching questions, {len(test)} test questions")


if __name__ == "__main__":
    main()
