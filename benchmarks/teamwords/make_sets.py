"""Build the team-words set (issue 17): words for sets, ranges, thresholds and measures that
nothing in the table explains, taught by confirmed answers and tested on other questions.

The scenario is invented: Fernhollow Cabs, a taxi co-operative in the invented town of
Fernhollow, ten pickup zones, nine kinds of job, eight drivers. One row per booked ride:

  rides_2026.csv  this year's rides, 1 January - 30 November 2026
  rides_2025.csv  last year's rides, 1 January - 31 December 2025 (same columns, other rows)

Columns: ride_no, start_time ("YYYY-MM-DD HH:MM"), zone, job_type, driver, miles, fare,
wait_min (minutes the passenger waited for the cab), status (completed, cancelled, no-show,
refunded).

The dispatchers' words (WORDS below; the README has the same table):

  the river wards   SET        zone is Culver Quay, Gannet Wharf or Heronsbridge
  contract work     SET        job_type is hospital, school run or corporate
  the tourist season RANGE     start_time in May to September (month)
  the small hours   RANGE      start_time before 05:00 (time of day)
  crosstown rides   RANGE      miles from 3 to 8, both included
  long hauls        THRESHOLD  miles >= 20
  slow pickups      THRESHOLD  wait_min > 15
  meter money       MEASURE    sum of fare over completed rides
  dead miles        MEASURE    sum of miles over no-show rides

teach.jsonl: 3-4 confirmed questions per word on this year's rides, each with a `word` field,
the simplest use first, so that its first 1, first 2 or all lines per word make the three
amounts of teaching that benchmarks/teamwords.py compares. test.jsonl: different questions
that combine the words with other filters, groups, comparisons and differences, on both
tables, each with the `words` it uses and the `kind` of combination.

Every answer is computed here by pandas from the expression written beside its question (kept
in each line's `pandas` field); no answer is typed by hand, and a question whose answer stays
the same when its team words are dropped is refused (a reading that ignores the words would
pass for right). The tables come from a seeded numpy generator, and a rerun rewrites every file
byte for byte the same.

    python benchmarks/teamwords/make_sets.py
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import numpy as np
import pandas as pd

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
# ties_max and ties_min are used inside the expression strings below
from answer_sets import ties_max, ties_min, to_answer  # noqa: E402, F401

HERE = Path(__file__).resolve().parent
THIS_YEAR, LAST_YEAR = "rides_2026.csv", "rides_2025.csv"
SEED = 17_2026_12

ZONES = {"Abbotsgate": 0.15, "Brackenford": 0.13, "Culver Quay": 0.1, "Dovecote Hill": 0.09,
         "Eastmarsh": 0.11, "Fallowfield": 0.08, "Gannet Wharf": 0.09, "Heronsbridge": 0.08,
         "Inchmere": 0.09, "Juniper Park": 0.08}
# job type: (share of rides, typical miles low-high)
JOBS = {"airport": (0.12, (14, 42)), "station": (0.16, (1, 7)), "hospital": (0.1, (2, 14)),
        "school run": (0.09, (1, 6)), "corporate": (0.1, (3, 28)), "shopping": (0.13, (1, 6)),
        "night out": (0.16, (1, 11)), "wedding": (0.05, (4, 22)), "parcel": (0.09, (1, 32))}
DRIVERS = {"Maud Pellerin": 0.16, "Tobias Quarrie": 0.15, "Nia Holloway": 0.14,
           "Ewan Strickland": 0.13, "Priya Castellane": 0.12, "Joss Fairweather": 0.11,
           "Rowan Ebbs": 0.1, "Yusuf Tallis": 0.09}
STATUSES = {"completed": 0.82, "cancelled": 0.09, "no-show": 0.06, "refunded": 0.03}
# rides per hour of the day (0-23): quiet before dawn, busy at school times and evenings
HOURS = np.array([3, 2.5, 2, 1.5, 1, 1, 1.5, 4, 6, 4, 3, 3, 3.5, 3, 3, 5, 5, 4.5, 4.5, 4, 4,
                  4.5, 4.5, 3.5])
# Where and when jobs start, and who drives them, so that a word's rows have leaders of their
# own (the busiest zone overall is not the one with the most long hauls): zones a job starts
# in three times as often, the hours of nights out and school runs, drivers who work nights.
JOB_ZONES = {"airport": ["Juniper Park", "Inchmere"], "night out": ["Culver Quay", "Gannet Wharf"],
             "school run": ["Dovecote Hill", "Fallowfield"], "hospital": ["Heronsbridge"],
             "corporate": ["Brackenford"], "wedding": ["Fallowfield"]}
JOB_HOURS = {"night out": [20, 21, 22, 23, 0, 1, 2, 3], "school run": [7, 8, 15]}
NIGHT_DRIVERS = ["Rowan Ebbs", "Yusuf Tallis"]

# ---- the team words: (kind, what it means) ... -------------------------------------------
WORDS = {
    "the river wards": ("set", "zone is Culver Quay, Gannet Wharf or Heronsbridge"),
    "contract work": ("set", "job_type is hospital, school run or corporate"),
    "the tourist season": ("range", "start_time in May to September (month 5-9)"),
    "the small hours": ("range", "start_time before 05:00 (hour 0-4)"),
    "crosstown rides": ("range", "miles from 3 to 8, both included"),
    "long hauls": ("threshold", "miles >= 20"),
    "slow pickups": ("threshold", "wait_min > 15"),
    "meter money": ("measure", "sum of fare over rides whose status is completed"),
    "dead miles": ("measure", "sum of miles over rides whose status is no-show"),
}
RIVER_WARDS = ["Culver Quay", "Gannet Wharf", "Heronsbridge"]
CONTRACT_JOBS = ["hospital", "school run", "corporate"]


# ---- ... and the same definitions as pandas, used by the expressions below --------------
def river(d: pd.DataFrame) -> pd.Series:
    return d.zone.isin(RIVER_WARDS)


def contract(d: pd.DataFrame) -> pd.Series:
    return d.job_type.isin(CONTRACT_JOBS)


def tourist(d: pd.DataFrame) -> pd.Series:
    return d.start_time.dt.month.between(5, 9)


def small_hours(d: pd.DataFrame) -> pd.Series:
    return d.start_time.dt.hour < 5


def crosstown(d: pd.DataFrame) -> pd.Series:
    return d.miles.between(3, 8)


def long_haul(d: pd.DataFrame) -> pd.Series:
    return d.miles >= 20


def slow_pickup(d: pd.DataFrame) -> pd.Series:
    return d.wait_min > 15


def meter_money(d: pd.DataFrame) -> float:
    return d.loc[d.status == "completed", "fare"].sum()


def dead_miles(d: pd.DataFrame) -> float:
    return d.loc[d.status == "no-show", "miles"].sum()


def meter_money_by(d: pd.DataFrame, column: str) -> pd.Series:
    return d[d.status == "completed"].groupby(column).fare.sum()


def dead_miles_by(d: pd.DataFrame, column: str) -> pd.Series:
    return d[d.status == "no-show"].groupby(column).miles.sum()


def count_by(d: pd.DataFrame, column: str) -> pd.Series:
    return d.groupby(column).size()


def pick(rng: np.random.Generator, weights: dict[str, float], favoured: list[str]) -> str:
    """One name by its weight, the favoured ones three times as likely."""
    names = list(weights)
    p = np.array([weights[n] * (3 if n in favoured else 1) for n in names])
    return str(rng.choice(names, p=p / p.sum()))


def make_rides(path: Path, seed: int, year: int, last_month: int, n: int) -> None:
    rng = np.random.default_rng(seed)
    days = pd.date_range(f"{year}-01-01", f"{year}-{last_month:02d}-01", freq="MS")
    days = pd.date_range(days[0], days[-1] + pd.offsets.MonthEnd(0), freq="D")
    season = np.array([1.35 if 5 <= d.month <= 9 else 1.0 for d in days])
    day_index = np.sort(rng.choice(len(days), size=n, p=season / season.sum()))
    jobs = list(JOBS)
    rows = []
    for i, day in enumerate(day_index):
        job = str(rng.choice(jobs, p=[JOBS[j][0] for j in jobs]))
        hour = int(rng.choice(JOB_HOURS[job])) if job in JOB_HOURS else \
            int(rng.choice(24, p=HOURS / HOURS.sum()))
        low, high = JOBS[job][1]
        miles = round(float(rng.uniform(low, high)), 1)
        night = hour < 5
        fare = (3.5 + 2.1 * miles) * (1.5 if night else 1.0) * rng.uniform(0.95, 1.05)
        wait = int(rng.integers(1, 18)) + (int(rng.integers(0, 14)) if night else 0)
        rows.append({
            "ride_no": f"FC-{year % 100}{i + 1:04d}",
            "start_time": f"{days[day].date().isoformat()} {hour:02d}:"
                          f"{int(rng.integers(60)):02d}",
            "zone": pick(rng, ZONES, JOB_ZONES.get(job, [])),
            "job_type": job,
            "driver": pick(rng, DRIVERS, NIGHT_DRIVERS if night or hour >= 21 else []),
            "miles": miles,
            "fare": round(fare, 2),
            "wait_min": wait,
            "status": str(rng.choice(list(STATUSES), p=list(STATUSES.values()))),
        })
    pd.DataFrame(rows).to_csv(path, index=False)


T, L = THIS_YEAR, LAST_YEAR

# (word, question, table, pandas expression): the simplest use of each word first, so that
# the first one, the first two or all of a word's lines are meaningful amounts of teaching.
TEACH = [
    ("the river wards", "how many rides were in the river wards", T, "river(d).sum()"),
    ("the river wards", "average fare in the river wards", T, "d[river(d)].fare.mean()"),
    ("the river wards", "how many rides in the river wards were cancelled", T,
     "(river(d) & (d.status == 'cancelled')).sum()"),
    ("the river wards", "which driver had the most rides in the river wards", T,
     "ties_max(count_by(d[river(d)], 'driver'))"),
    ("contract work", "how many rides were contract work", T, "contract(d).sum()"),
    ("contract work", "total fare of contract work", T, "d[contract(d)].fare.sum()"),
    ("contract work", "average miles of contract work", T, "d[contract(d)].miles.mean()"),
    ("contract work", "how many contract work rides were in Abbotsgate", T,
     "(contract(d) & (d.zone == 'Abbotsgate')).sum()"),
    ("the tourist season", "how many rides were in the tourist season", T, "tourist(d).sum()"),
    ("the tourist season", "total fare in the tourist season", T, "d[tourist(d)].fare.sum()"),
    ("the tourist season", "average wait in the tourist season", T,
     "d[tourist(d)].wait_min.mean()"),
    ("the tourist season", "which zone had the most rides in the tourist season", T,
     "ties_max(count_by(d[tourist(d)], 'zone'))"),
    ("the small hours", "how many rides were in the small hours", T, "small_hours(d).sum()"),
    ("the small hours", "average fare in the small hours", T, "d[small_hours(d)].fare.mean()"),
    ("the small hours", "how many night out rides were in the small hours", T,
     "(small_hours(d) & (d.job_type == 'night out')).sum()"),
    ("crosstown rides", "how many crosstown rides were there", T, "crosstown(d).sum()"),
    ("crosstown rides", "total fare of crosstown rides", T, "d[crosstown(d)].fare.sum()"),
    ("crosstown rides", "how many crosstown rides did Maud Pellerin drive", T,
     "(crosstown(d) & (d.driver == 'Maud Pellerin')).sum()"),
    ("long hauls", "how many long hauls were there", T, "long_haul(d).sum()"),
    ("long hauls", "how many long hauls were airport jobs", T,
     "(long_haul(d) & (d.job_type == 'airport')).sum()"),
    ("long hauls", "average fare of long hauls", T, "d[long_haul(d)].fare.mean()"),
    ("long hauls", "which zone had the most long hauls", T,
     "ties_max(count_by(d[long_haul(d)], 'zone'))"),
    ("slow pickups", "how many slow pickups were there", T, "slow_pickup(d).sum()"),
    ("slow pickups", "how many slow pickups did Tobias Quarrie have", T,
     "(slow_pickup(d) & (d.driver == 'Tobias Quarrie')).sum()"),
    ("slow pickups", "average fare of slow pickups", T, "d[slow_pickup(d)].fare.mean()"),
    ("meter money", "what was the meter money", T, "meter_money(d)"),
    ("meter money", "meter money in Abbotsgate", T, "meter_money(d[d.zone == 'Abbotsgate'])"),
    ("meter money", "meter money from airport jobs", T,
     "meter_money(d[d.job_type == 'airport'])"),
    ("meter money", "which driver had the highest meter money", T,
     "ties_max(meter_money_by(d, 'driver'))"),
    ("dead miles", "how many dead miles were there", T, "dead_miles(d)"),
    ("dead miles", "dead miles in Eastmarsh", T, "dead_miles(d[d.zone == 'Eastmarsh'])"),
    ("dead miles", "dead miles of Nia Holloway", T,
     "dead_miles(d[d.driver == 'Nia Holloway'])"),
    ("dead miles", "which driver had the fewest dead miles", T,
     "ties_min(dead_miles_by(d, 'driver'))"),
]

# (words, kind of combination, question, table, pandas expression): other values, other
# combinations, and last year's rides; no test question is a teaching question.
TEST = [
    # a word with another filter, or two or three words together
    (["long hauls"], "filter", "how many long hauls started in Brackenford", T,
     "(long_haul(d) & (d.zone == 'Brackenford')).sum()"),
    (["meter money"], "filter", "meter money from wedding jobs", T,
     "meter_money(d[d.job_type == 'wedding'])"),
    (["meter money", "the river wards"], "words", "what was the meter money in the river wards",
     T, "meter_money(d[river(d)])"),
    (["slow pickups", "the river wards"], "words",
     "how many slow pickups were there in the river wards", T, "(slow_pickup(d) & river(d)).sum()"),
    (["long hauls", "contract work"], "words", "how many long hauls were contract work", T,
     "(long_haul(d) & contract(d)).sum()"),
    (["meter money", "contract work", "the tourist season"], "words",
     "meter money from contract work in the tourist season", T,
     "meter_money(d[contract(d) & tourist(d)])"),
    (["long hauls", "the small hours"], "words", "how many long hauls were in the small hours", T,
     "(long_haul(d) & small_hours(d)).sum()"),
    (["dead miles", "the tourist season"], "words", "dead miles in the tourist season", T,
     "dead_miles(d[tourist(d)])"),
    (["crosstown rides"], "filter", "average wait of crosstown rides", T,
     "d[crosstown(d)].wait_min.mean()"),
    (["crosstown rides", "slow pickups"], "words", "how many crosstown rides were slow pickups",
     T, "(crosstown(d) & slow_pickup(d)).sum()"),
    (["the small hours", "the river wards"], "words",
     "how many rides in the small hours started in the river wards", T,
     "(small_hours(d) & river(d)).sum()"),
    (["contract work"], "filter", "how many contract work rides did Rowan Ebbs drive", T,
     "(contract(d) & (d.driver == 'Rowan Ebbs')).sum()"),
    (["the tourist season"], "filter", "how many station rides were in the tourist season", T,
     "(tourist(d) & (d.job_type == 'station')).sum()"),
    (["meter money", "the river wards", "the tourist season"], "words",
     "meter money in the river wards in the tourist season", T,
     "meter_money(d[river(d) & tourist(d)])"),
    # a group: which one is best, or a value per group
    (["long hauls"], "group", "which zone had the fewest long hauls", T,
     "ties_min(count_by(d[long_haul(d)], 'zone'))"),
    (["meter money"], "group", "which driver had the lowest meter money", T,
     "ties_min(meter_money_by(d, 'driver'))"),
    (["slow pickups"], "group", "which zone had the most slow pickups", T,
     "ties_max(count_by(d[slow_pickup(d)], 'zone'))"),
    (["meter money", "the small hours"], "group",
     "which zone had the lowest meter money in the small hours", T,
     "ties_min(meter_money_by(d[small_hours(d)], 'zone'))"),
    (["crosstown rides"], "group", "which job type had the most crosstown rides", T,
     "ties_max(count_by(d[crosstown(d)], 'job_type'))"),
    (["dead miles", "contract work"], "group",
     "which driver had the most dead miles on contract work", T,
     "ties_max(dead_miles_by(d[contract(d)], 'driver'))"),
    # a comparison: which of two, or the groups past a number
    (["long hauls"], "compare", "which had more long hauls, Culver Quay or Juniper Park", T,
     "ties_max(count_by(d[long_haul(d) & d.zone.isin(['Culver Quay', 'Juniper Park'])],"
     " 'zone'))"),
    (["slow pickups", "the tourist season"], "compare",
     "which drivers had more than 8 slow pickups in the tourist season", T,
     "sorted(k for k, v in count_by(d[slow_pickup(d) & tourist(d)], 'driver').items() if v > 8)"),
    (["meter money"], "compare", "which zones had meter money over 1400", T,
     "sorted(k for k, v in meter_money_by(d, 'zone').items() if v > 1400)"),
    # a difference
    (["long hauls", "the tourist season"], "difference",
     "how many more long hauls were in the tourist season than in the small hours", T,
     "(long_haul(d) & tourist(d)).sum() - (long_haul(d) & small_hours(d)).sum()"),
    (["meter money", "contract work"], "difference",
     "how much more meter money came from airport jobs than from contract work", T,
     "meter_money(d[d.job_type == 'airport']) - meter_money(d[contract(d)])"),
    (["crosstown rides", "long hauls"], "difference",
     "how many more crosstown rides than long hauls", T, "crosstown(d).sum() - long_haul(d).sum()"),
    (["slow pickups"], "difference",
     "how many more slow pickups did Yusuf Tallis have than Maud Pellerin", T,
     "slow_pickup(d[d.driver == 'Yusuf Tallis']).sum()"
     " - slow_pickup(d[d.driver == 'Maud Pellerin']).sum()"),
    # last year's rides: the same words on the other table
    (["the river wards"], "filter", "how many rides in the river wards were refunded", L,
     "(river(d) & (d.status == 'refunded')).sum()"),
    (["long hauls"], "filter", "how many long hauls did Priya Castellane drive", L,
     "(long_haul(d) & (d.driver == 'Priya Castellane')).sum()"),
    (["meter money"], "filter", "meter money from station jobs", L,
     "meter_money(d[d.job_type == 'station'])"),
    (["dead miles", "the river wards"], "words", "dead miles in the river wards", L,
     "dead_miles(d[river(d)])"),
    (["the small hours"], "filter", "average wait in the small hours", L,
     "d[small_hours(d)].wait_min.mean()"),
    (["crosstown rides", "the tourist season"], "words",
     "how many crosstown rides were in the tourist season", L,
     "(crosstown(d) & tourist(d)).sum()"),
    (["contract work", "slow pickups"], "words", "how many slow pickups were contract work", L,
     "(contract(d) & slow_pickup(d)).sum()"),
    (["dead miles"], "group", "which zone had the most dead miles", L,
     "ties_max(dead_miles_by(d, 'zone'))"),
    (["long hauls"], "group", "which driver had the fewest long hauls", L,
     "ties_min(count_by(d[long_haul(d)], 'driver'))"),
    (["meter money", "the tourist season"], "group",
     "which driver had the highest meter money in the tourist season", L,
     "ties_max(meter_money_by(d[tourist(d)], 'driver'))"),
    (["slow pickups", "the small hours", "the river wards"], "difference",
     "how many more slow pickups were in the small hours than in the river wards", L,
     "(slow_pickup(d) & small_hours(d)).sum() - (slow_pickup(d) & river(d)).sum()"),
    (["meter money", "the river wards"], "difference",
     "how much more meter money came from the river wards than from Abbotsgate", L,
     "meter_money(d[river(d)]) - meter_money(d[d.zone == 'Abbotsgate'])"),
    (["slow pickups", "the small hours"], "compare",
     "which had more slow pickups in the small hours, Culver Quay or Fallowfield", L,
     "ties_max(count_by(d[slow_pickup(d) & small_hours(d)"
     " & d.zone.isin(['Culver Quay', 'Fallowfield'])], 'zone'))"),
]


def read(table: str) -> pd.DataFrame:
    return pd.read_csv(HERE / table, parse_dates=["start_time"])


def answer_of(expression: str, d: pd.DataFrame, names: dict | None = None) -> list:
    """The stored answer of one pandas expression on a table, floats to 6 decimals (so that
    sums of money keep no binary noise). No per-group tables: an examples file holds plain
    values only (tabq.teaching.read_examples refuses a list of rows). `names` stand in for
    the word helpers (see WITHOUT_WORDS)."""
    raw = eval(expression, {**globals(), **(names or {})}, {"d": d})   # our own, above
    answer = six_decimals(to_answer(raw))
    assert answer, f"empty answer: {expression}"
    return answer


def six_decimals(values: list) -> list:
    return [round(v, 6) if isinstance(v, float) else v for v in values]


def every_row(d: pd.DataFrame) -> pd.Series:
    return pd.Series(True, index=d.index)


# The words read as if the team had said nothing: no condition, a measure without its own.
WITHOUT_WORDS = {
    **{name: every_row for name in ("river", "contract", "tourist", "small_hours", "crosstown",
                                    "long_haul", "slow_pickup")},
    "meter_money": lambda d: d.fare.sum(), "dead_miles": lambda d: d.miles.sum(),
    "meter_money_by": lambda d, column: d.groupby(column).fare.sum(),
    "dead_miles_by": lambda d, column: d.groupby(column).miles.sum(),
}


def words_matter(question: str, expression: str, d: pd.DataFrame, answer: list) -> None:
    """Refuse a question whose answer stays the same when its team words are dropped: a
    reading that ignores them would pass for right (as "which zone had the most long hauls"
    would when the busiest zone also has the most long hauls)."""
    try:
        naive = answer_of(expression, d, WITHOUT_WORDS)
    except AssertionError:          # a tie or an empty answer: not the same answer
        return
    assert naive != answer, f"the same answer without its words: {question}"


def teach_lines(frames: dict[str, pd.DataFrame]) -> list[dict]:
    lines = []
    for number, (word, question, table, expression) in enumerate(TEACH, 1):
        answer = answer_of(expression, frames[table])
        words_matter(question, expression, frames[table], answer)
        lines.append({"id": f"teach-{number:02d}", "question": question, "table": table,
                      "answer": answer, "kind": word,
                      "word": word, "word_kind": WORDS[word][0], "pandas": expression})
    return lines


def test_lines(frames: dict[str, pd.DataFrame]) -> list[dict]:
    taught = {(q, t) for _, q, t, _ in TEACH}
    lines = []
    for number, (words, kind, question, table, expression) in enumerate(TEST, 1):
        assert (question, table) not in taught, f"a teaching question in the test: {question}"
        assert all(w in WORDS for w in words), words
        answer = answer_of(expression, frames[table])
        words_matter(question, expression, frames[table], answer)
        if kind == "difference":
            assert answer[0] > 0, f"a difference should read as a positive amount: {question}"
        lines.append({"id": f"test-{number:02d}", "question": question, "table": table,
                      "answer": answer, "kind": kind, "words": words,
                      "word_kinds": sorted({WORDS[w][0] for w in words}),
                      "pandas": expression})
    return lines


def write_lines(path: Path, lines: list[dict]) -> None:
    with open(path, "w", encoding="utf-8") as f:
        for line in lines:
            f.write(json.dumps(line, ensure_ascii=False) + "\n")


def main() -> None:
    make_rides(HERE / THIS_YEAR, SEED, 2026, 11, 640)
    make_rides(HERE / LAST_YEAR, SEED - 1, 2025, 12, 560)
    frames = {name: read(name) for name in (THIS_YEAR, LAST_YEAR)}
    write_lines(HERE / "teach.jsonl", teach_lines(frames))
    write_lines(HERE / "test.jsonl", test_lines(frames))


if __name__ == "__main__":
    main()
