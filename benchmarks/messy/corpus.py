"""The messy-files corpus: invented business tables written the awkward ways real exports are.

Every scenario's rows are generated deterministically (random.Random with a fixed seed) as plain
Python values. Each question's expected answer is computed from those rows when this module is
imported, before any file exists, so no answer depends on reading a file back. A case's
`second` is an independent pandas reading of the file(s) it wrote: the tests check that it
gives the same answers, which shows the file really holds the rows.

Each scenario has a clean-CSV control case asking the same questions, so a wrong answer on a
messy file is about reading the file, not about the wording of the question.
"""

from __future__ import annotations

import csv
import datetime
import gzip
import importlib.util
import io
import json
import math
import random
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

Row = dict[str, Any]
Cell = Callable[[Any], str]

# ---------------------------------------------------------------- what a case is


@dataclass(frozen=True)
class Question:
    """A question and the spec its answer is computed from: `agg` (count, sum, avg, max, min)
    of `column` over the rows equal to `equals` = (column, value) and in `month` = (column, m).
    `accept` holds other answers that read the same data rightly (a percent as a fraction)."""

    text: str
    expected: list
    agg: str
    column: str | None = None
    equals: tuple[str, str] | None = None
    month: tuple[str, int] | None = None
    accept: tuple[list, ...] = ()


@dataclass(frozen=True)
class Target:
    """What is passed to `tabq ask`: a file, a folder, a glob or "-" (then `stdin` is fed)."""

    arg: str
    stdin: Path | None = None


@dataclass(frozen=True)
class Case:
    """One messy file (or set of files) and the questions asked of it."""

    name: str
    scenario: str
    difficulty: str
    write: Callable[[Path], Target]
    questions: tuple[Question, ...]
    second: Callable[[Path], Any] | None   # folder -> pandas DataFrame with the rows' columns
    expect_note: bool                      # should tabq say it skipped, excluded or guessed?
    needs: tuple[str, ...] = ()            # modules the writer needs; skipped without them
    why_skip: str = ""                     # the reason when no library can write the format

    def missing(self) -> str | None:
        """Why this case cannot run here, or None when it can."""
        if self.why_skip:
            return self.why_skip
        absent = [m for m in self.needs if importlib.util.find_spec(m) is None]
        return f"{', '.join(absent)} not installed" if absent else None


# ---------------------------------------------------------------- answers from the rows


def _keep(rows: Iterable[Row], equals: tuple[str, str] | None,
          month: tuple[str, int] | None) -> list[Row]:
    kept = list(rows)
    if equals:
        kept = [r for r in kept if r[equals[0]] == equals[1]]
    if month:
        kept = [r for r in kept if r[month[0]] is not None and r[month[0]].month == month[1]]
    return kept


def _aggregate(agg: str, values: Sequence[float]) -> float | int:
    if agg == "sum":
        return math.fsum(values)
    if agg == "avg":
        return math.fsum(values) / len(values)
    return {"max": max, "min": min}[agg](values)


def ask(rows: Sequence[Row], text: str, agg: str, column: str | None = None,
        equals: tuple[str, str] | None = None, month: tuple[str, int] | None = None,
        percent: bool = False) -> Question:
    """A question whose expected answer is computed here, from the rows themselves."""
    kept = _keep(rows, equals, month)
    if agg == "count":
        value: float | int = len(kept)
    else:
        value = _aggregate(agg, [r[column] for r in kept if r[column] is not None])
    accept = ([value / 100],) if percent else ()
    return Question(text, [value], agg, column, equals, month, accept)


def answer_from_frame(question: Question, frame: Any) -> list:
    """The same spec computed by pandas over a DataFrame (the second computation)."""
    import pandas as pd
    kept = frame
    if question.equals:
        kept = kept[kept[question.equals[0]] == question.equals[1]]
    if question.month:
        dates = kept[question.month[0]]
        assert pd.api.types.is_datetime64_any_dtype(dates), f"{dates.name} is {dates.dtype}"
        kept = kept[dates.dt.month == question.month[1]]
    if question.agg == "count":
        return [len(kept)]
    values = kept[question.column].dropna()
    assert pd.api.types.is_numeric_dtype(values), f"{question.column} is {values.dtype}"
    method = {"sum": "sum", "avg": "mean", "max": "max", "min": "min"}[question.agg]
    return [getattr(values, method)().item()]


def same_answer(got: Sequence, want: Sequence, rel: float = 1e-6) -> bool:
    """Equal as multisets; two numbers are equal within a relative tolerance of `rel`."""
    if len(got) != len(want):
        return False
    unused = list(got)
    for expected in want:
        hit = next((i for i, value in enumerate(unused) if _same(value, expected, rel)), None)
        if hit is None:
            return False
        unused.pop(hit)
    return True


def _same(a: Any, b: Any, rel: float) -> bool:
    numbers = (int, float)
    if isinstance(a, numbers) and isinstance(b, numbers) and not isinstance(a, bool):
        return math.isclose(a, b, rel_tol=rel, abs_tol=1e-9)
    return a == b


def is_right(question: Question, got: Sequence) -> bool:
    """The expected answer, or another right reading of the same data."""
    return any(same_answer(got, want) for want in (question.expected, *question.accept))


# ---------------------------------------------------------------- the scenarios' rows


def _day(r: random.Random, first: datetime.date, span: int) -> datetime.date:
    return first + datetime.timedelta(days=r.randrange(span))


def bakery_rows() -> list[Row]:
    """A bakery chain's invoices to cafés, hotels and canteens, January to June 2026."""
    r = random.Random(1501)
    branches = ["Harbour", "Old Town", "Riverside", "Station"]
    customers = ["Hotel Aster", "Cafe Linden", "Deli Marlow", "School Kitchen", "Canteen Nine"]
    rows = []
    for _ in range(140):
        loaves = r.randint(20, 900)
        unit = round(r.uniform(1.2, 4.8), 2)
        rows.append({"branch": r.choice(branches),
                     "invoice_date": _day(r, datetime.date(2026, 1, 2), 175),
                     "customer": r.choice(customers), "loaves": loaves, "unit_price": unit,
                     "amount": round(loaves * unit, 2)})
    rows.sort(key=lambda row: row["invoice_date"])
    return [{"invoice_no": f"B-{1001 + i}", **row} for i, row in enumerate(rows)]


def clinic_rows() -> list[Row]:
    """A physiotherapy clinic group's appointments; net is negative when a refund was paid."""
    r = random.Random(2302)
    clinics = ["Northgate", "Southbank", "Eastfield", "Westmoor"]
    doctors = ["Dr Okafor", "Dr Lindqvist", "Dr Haddad", "Dr Moreau", "Dr Tanaka"]
    rows = []
    for _ in range(160):
        fee = round(r.uniform(40, 2600), 2)
        discount = r.choice([0, 2.5, 5, 7.5, 10, 12.5, 15])
        refund = r.random() < 0.12
        net = -round(r.uniform(50, 1800), 2) if refund else round(fee * (1 - discount / 100), 2)
        rows.append({"clinic": r.choice(clinics),
                     "appointment_date": _day(r, datetime.date(2026, 1, 5), 170),
                     "doctor": r.choice(doctors), "minutes": r.choice([30, 45, 60, 90]),
                     "fee": fee, "discount": discount, "net_amount": net})
    rows.sort(key=lambda row: row["appointment_date"])
    return [{"appointment_id": f"A{5001 + i}", **row} for i, row in enumerate(rows)]


def freight_rows() -> list[Row]:
    """A freight depot's outgoing shipments, grouped by depot as its reports list them."""
    r = random.Random(3703)
    depots = ["North", "South", "East", "West"]
    ports = ["Rotterdam", "Antwerp", "Hamburg", "Gdansk", "Le Havre", "Bilbao"]
    rows = []
    for _ in range(150):
        weight = round(r.uniform(80, 24000), 1)
        rows.append({"depot": r.choice(depots),
                     "ship_date": _day(r, datetime.date(2026, 1, 3), 165),
                     "destination": r.choice(ports), "weight_kg": weight,
                     "charge": round(weight * r.uniform(0.08, 0.3) + r.uniform(40, 200), 2),
                     "fuel_surcharge": round(r.uniform(4, 60), 2)})
    rows.sort(key=lambda row: (row["depot"], row["ship_date"]))
    return [{"shipment_id": f"S-{20001 + i}", **row} for i, row in enumerate(rows)]


def tea_rows() -> list[Row]:
    """A tea wholesaler's orders from Russian cities (for the Windows-1251 file)."""
    r = random.Random(4404)
    cities = ["Москва", "Казань", "Самара", "Пермь", "Тверь"]
    teas = ["Oolong", "Sencha", "Assam", "Pu-erh"]
    rows = []
    for i in range(90):
        kilos = r.randint(5, 400)
        rows.append({"order_id": f"T-{701 + i}", "city": r.choice(cities),
                     "order_date": _day(r, datetime.date(2026, 2, 1), 120),
                     "tea": r.choice(teas), "kilograms": kilos,
                     "amount": round(kilos * r.uniform(9, 31), 2)})
    return rows


def patisserie_rows() -> list[Row]:
    """A patisserie supplier's orders from European cafés; names and notes carry accents and €.

    The city comes first so that a byte-order mark sticks to the column a question filters on.
    """
    r = random.Random(5505)
    cities = ["Zürich", "Köln", "Málaga", "Besançon", "Porto"]
    products = ["Café crème", "Crème brûlée", "Éclair", "Pain au chocolat"]
    notes = ["paid in €", "invoice", "paid in € cash", "à livrer"]
    rows = []
    for _ in range(110):
        quantity = r.randint(6, 240)
        rows.append({"city": r.choice(cities), "product": r.choice(products),
                     "order_date": _day(r, datetime.date(2026, 1, 2), 150),
                     "quantity": quantity, "amount": round(quantity * r.uniform(1.1, 6.5), 2),
                     "note": r.choice(notes)})
    return rows


def nursery_rows() -> list[Row]:
    """A plant nursery's web orders; in JSON the customer is a nested object."""
    r = random.Random(6606)
    cities = ["Lyon", "Nantes", "Lille", "Rennes"]
    names = ["Ada Perrin", "Noah Vidal", "Lina Roche", "Jules Marin", "Eva Colin", "Tom Brun"]
    rows = []
    for i in range(70):
        rows.append({"order_id": f"P-{301 + i}", "placed": _day(r, datetime.date(2026, 3, 1), 60),
                     "name": r.choice(names), "city": r.choice(cities),
                     "plants": r.randint(1, 30), "amount": round(r.uniform(8, 420), 2)})
    return rows


def farmshop_rows() -> list[Row]:
    """A farm shop's till sales, January to March 2026 (one file a month in some cases)."""
    r = random.Random(7707)
    stalls = ["Eggs", "Cheese", "Apples", "Honey", "Bread"]
    rows = []
    for _ in range(180):
        kilos = round(r.uniform(0.2, 12), 2)
        rows.append({"sale_date": _day(r, datetime.date(2026, 1, 1), 90),
                     "stall": r.choice(stalls), "kilos": kilos,
                     "amount": round(kilos * r.uniform(2.5, 19), 2)})
    rows.sort(key=lambda row: row["sale_date"])
    return [{"sale_id": 90001 + i, **row} for i, row in enumerate(rows)]


def with_gaps(rows: list[Row], column: str, every: int) -> list[Row]:
    """The rows with `column` missing in every `every`-th row (for the missing-cell cases)."""
    return [{**row, column: None} if i % every == 3 else row for i, row in enumerate(rows)]


BAKERY = bakery_rows()
CLINIC = clinic_rows()
FREIGHT = freight_rows()
TEA = tea_rows()
PATISSERIE = patisserie_rows()
NURSERY = nursery_rows()
FARMSHOP = farmshop_rows()
BAKERY_GAPS = with_gaps(BAKERY, "amount", 7)
FREIGHT_SHORT = with_gaps(FREIGHT, "fuel_surcharge", 11)   # the ragged file's short rows

# ---------------------------------------------------------------- cell formats


def plain(value: Any) -> str:
    """A value as a clean export writes it: ISO dates, Python's shortest float text."""
    if value is None:
        return ""
    if isinstance(value, datetime.date):
        return value.isoformat()
    return str(value)


def _grouped(value: float, places: int, thousands: str, point: str) -> str:
    text = f"{abs(value):,.{places}f}"
    return text.replace(",", "\0").replace(".", point).replace("\0", thousands)


def german(value: float | None) -> str:
    """1234.5 → "1.234,50"."""
    return "" if value is None else ("-" if value < 0 else "") + _grouped(value, 2, ".", ",")


def dollars(value: float) -> str:
    """Accounting style: 1234.5 → "$1,234.50", -1234.5 → "($1,234.50)"."""
    text = "$" + _grouped(value, 2, ",", ".")
    return f"({text})" if value < 0 else text


def percent(value: float) -> str:
    return f"{value:g}%"


def euro_prefix(value: float) -> str:
    """12.5 → "€ 12,50"."""
    return "€ " + _grouped(value, 2, ".", ",")


def euro_suffix(value: float) -> str:
    """1234.5 → "1 234,50 EUR" (a space between thousands, as French exports write it)."""
    return _grouped(value, 2, " ", ",") + " EUR"


def day_first(value: datetime.date) -> str:
    return value.strftime("%d/%m/%Y")


def month_first(value: datetime.date) -> str:
    return value.strftime("%m/%d/%Y")


MISSING = ["N/A", "-", "n/a", "—", ""]


def spell_missing(rows: Sequence[Row], column: str) -> list[Row]:
    """The rows with each missing cell of `column` spelled one of the ways people write
    "no value", in turn (text from here on: only for writing)."""
    spelled, turn = [], 0
    for row in rows:
        if row[column] is None:
            row, turn = {**row, column: MISSING[turn % len(MISSING)]}, turn + 1
        spelled.append(row)
    return spelled


# ---------------------------------------------------------------- writers


def records(rows: Sequence[Row], formats: dict[str, Cell] | None = None) -> list[list[str]]:
    """The header and the rows as text cells, each column in its format (plain by default)."""
    formats = formats or {}
    header = list(rows[0])
    return [header] + [[formats.get(k, plain)(row[k]) for k in header] for row in rows]


def delimited(cells: Iterable[Sequence[str]], sep: str = ",") -> str:
    sink = io.StringIO()
    csv.writer(sink, delimiter=sep, lineterminator="\n").writerows(cells)
    return sink.getvalue()


Edit = Callable[[list[list[str]]], list[list[str]]]


def csv_file(name: str, rows: Sequence[Row], formats: dict[str, Cell] | None = None,
             sep: str = ",", encoding: str = "utf-8", before: str = "",
             edit: Edit | None = None) -> Callable[[Path], Target]:
    """A writer of one delimited file: `before` is raw text above the header; `edit` changes
    the text records (header first) before they are written, to make them ragged or add rows."""
    def write(folder: Path) -> Target:
        cells = records(rows, formats)
        text = before + delimited(edit(cells) if edit else cells, sep)
        (folder / name).write_bytes(text.encode(encoding))
        return Target(str(folder / name))
    return write


# ---------------------------------------------------------------- pandas, second computation


def _typed(frame: Any, dates: dict[str, str | None]) -> Any:
    """Date columns parsed with the format the file used (None: ISO or real date cells)."""
    import pandas as pd
    for column, fmt in dates.items():
        frame[column] = pd.to_datetime(frame[column], format=fmt)
    return frame


def read_csv(name: str, dates: dict[str, str | None], **options: Any) -> Callable[[Path], Any]:
    """pandas, second computation: pd.read_csv with the options this file needs."""
    def second(folder: Path) -> Any:
        import pandas as pd
        return _typed(pd.read_csv(folder / name, **options), dates)
    return second


def pandas_reader(read: Callable[[Path], Any],
                  dates: dict[str, str | None]) -> Callable[[Path], Any]:
    """pandas, second computation: any reading of the folder, then its dates parsed."""
    return lambda folder: _typed(read(folder), dates)


# ---------------------------------------------------------------- the questions


def bakery_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many invoices are there", "count"),
            "total": ask(rows, "what is the total amount", "sum", "amount"),
            "avg_price": ask(rows, "what is the average unit price", "avg", "unit_price"),
            "avg": ask(rows, "what is the average amount", "avg", "amount"),
            "max": ask(rows, "what is the highest amount", "max", "amount"),
            "march": ask(rows, "how many invoices in March", "count",
                         month=("invoice_date", 3))}


def clinic_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many appointments are there", "count"),
            "total": ask(rows, "what is the total fee", "sum", "fee"),
            "avg": ask(rows, "what is the average fee", "avg", "fee"),
            "max": ask(rows, "what is the highest fee", "max", "fee"),
            "march": ask(rows, "how many appointments in March", "count",
                         month=("appointment_date", 3)),
            "april_fee": ask(rows, "what is the total fee in April", "sum", "fee",
                             month=("appointment_date", 4)),
            "net": ask(rows, "what is the total net amount", "sum", "net_amount"),
            "lowest_net": ask(rows, "what is the lowest net amount", "min", "net_amount"),
            "discount": ask(rows, "what is the average discount", "avg", "discount",
                            percent=True)}


def freight_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many shipments are there", "count"),
            "total": ask(rows, "what is the total charge", "sum", "charge"),
            "fuel": ask(rows, "what is the average fuel surcharge", "avg", "fuel_surcharge"),
            "max": ask(rows, "what is the highest charge", "max", "charge"),
            "march": ask(rows, "how many shipments in March", "count",
                         month=("ship_date", 3))}


def tea_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many orders are there", "count"),
            "moscow": ask(rows, "how many orders from Москва", "count",
                          equals=("city", "Москва")),
            "total": ask(rows, "what is the total amount", "sum", "amount")}


def patisserie_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many orders are there", "count"),
            "zurich": ask(rows, "how many orders from Zürich", "count",
                          equals=("city", "Zürich")),
            "creme": ask(rows, "how many orders of Crème brûlée", "count",
                         equals=("product", "Crème brûlée")),
            "total": ask(rows, "what is the total amount", "sum", "amount")}


def nursery_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many orders are there", "count"),
            "lyon": ask(rows, "how many orders from Lyon", "count", equals=("city", "Lyon")),
            "total": ask(rows, "what is the total amount", "sum", "amount"),
            "april": ask(rows, "how many orders in April", "count", month=("placed", 4))}


def farmshop_questions(rows: Sequence[Row]) -> dict[str, Question]:
    return {"count": ask(rows, "how many sales are there", "count"),
            "total": ask(rows, "what is the total amount", "sum", "amount"),
            "february": ask(rows, "how many sales in February", "count",
                            month=("sale_date", 2)),
            "max": ask(rows, "what is the highest amount", "max", "amount")}


def pick(questions: dict[str, Question], *keys: str) -> tuple[Question, ...]:
    return tuple(questions[k] for k in keys)


def iso(column: str) -> dict[str, str | None]:
    return {column: "%Y-%m-%d"}


# ---------------------------------------------------------------- bakery: number formats, preambles

BAKERY_Q = bakery_questions(BAKERY)
BAKERY_GAPS_Q = bakery_questions(BAKERY_GAPS)
BAKERY_TITLE = "Harbour Bakeries — invoices, January to June 2026"


def bakery_xlsx(folder: Path) -> Target:
    """A title row, a blank row, then the header; dates are real date cells."""
    import openpyxl
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.title = "Invoices"
    sheet.append([BAKERY_TITLE])
    sheet.append([])
    for row in [list(BAKERY[0])] + [list(r.values()) for r in BAKERY]:
        sheet.append(row)
    book.save(folder / "invoices.xlsx")
    return Target(str(folder / "invoices.xlsx"))


def bakery_cases() -> list[Case]:
    money = {"amount": german, "unit_price": german}
    before = f"{BAKERY_TITLE}\nExported 2026-07-01 by accounts; amounts in EUR, VAT excluded\n\n"
    dates = iso("invoice_date")
    return [
        Case("bakery_clean", "bakery", "control: a clean CSV",
             csv_file("invoices.csv", BAKERY),
             tuple(BAKERY_Q.values()), read_csv("invoices.csv", dates), False),
        Case("bakery_semicolon_decimal_comma", "bakery", 'semicolons, "1.234,50"',
             csv_file("invoices.csv", BAKERY, money, sep=";"),
             pick(BAKERY_Q, "count", "total", "avg_price", "max"),
             read_csv("invoices.csv", dates, sep=";", decimal=",", thousands="."), True),
        Case("bakery_preamble_csv", "bakery", "title, notes and blank line above the header",
             csv_file("invoices.csv", BAKERY, before=before),
             pick(BAKERY_Q, "count", "total", "march"),
             read_csv("invoices.csv", dates, skiprows=3), True),
        Case("bakery_preamble_xlsx", "bakery", "xlsx: title row, blank row, date cells",
             bakery_xlsx, pick(BAKERY_Q, "count", "total", "march"),
             pandas_reader(lambda f: _read_excel(f / "invoices.xlsx", skiprows=2,
                                                         engine="openpyxl"),
                           {"invoice_date": None}), True, needs=("openpyxl",)),
        Case("bakery_missing_spellings", "bakery", 'missing as "N/A", "-", "n/a", "—", ""',
             csv_file("invoices.csv", spell_missing(BAKERY_GAPS, "amount")),
             pick(BAKERY_GAPS_Q, "count", "total", "avg", "max"),
             read_csv("invoices.csv", dates, na_values=["-", "—"]), True),
    ]


def _read_excel(path: Path, **options: Any) -> Any:
    import pandas as pd
    return pd.read_excel(path, **options)


# ---------------------------------------------------------------- clinic: totals, money, dates

CLINIC_Q = clinic_questions(CLINIC)
CLINIC_TOTAL = ["Total", "", "", "", str(sum(r["minutes"] for r in CLINIC)),
                f"{math.fsum(r['fee'] for r in CLINIC):.2f}", "",
                f"{math.fsum(r['net_amount'] for r in CLINIC):.2f}"]


def _accounting(text: str) -> float:
    """pandas, second computation: "($1,234.50)" → -1234.5."""
    negative = text.startswith("(")
    value = float(text.strip("()").replace("$", "").replace(",", ""))
    return -value if negative else value


def clinic_cases() -> list[Case]:
    dates = iso("appointment_date")
    money = {"fee": dollars, "net_amount": dollars, "discount": percent}
    converters = {"fee": _accounting, "net_amount": _accounting,
                  "discount": lambda s: float(s.rstrip("%"))}
    return [
        Case("clinic_clean", "clinic", "control: a clean CSV",
             csv_file("appointments.csv", CLINIC),
             tuple(CLINIC_Q.values()), read_csv("appointments.csv", dates), False),
        Case("clinic_total_row", "clinic", 'a last row "Total"',
             csv_file("appointments.csv", CLINIC, edit=lambda cells: cells + [CLINIC_TOTAL]),
             pick(CLINIC_Q, "count", "total", "avg", "max"),
             read_csv("appointments.csv", dates, skipfooter=1, engine="python"), True),
        Case("clinic_accounting_money", "clinic",
             '"$1,200.00", "($1,200.00)" and "12.5%"',
             csv_file("appointments.csv", CLINIC, money),
             pick(CLINIC_Q, "total", "net", "lowest_net", "discount"),
             read_csv("appointments.csv", dates, converters=converters), False),
        Case("clinic_day_first_dates", "clinic", 'day-first dates "13/03/2026"',
             csv_file("appointments.csv", CLINIC, {"appointment_date": day_first}),
             pick(CLINIC_Q, "count", "march", "april_fee"),
             read_csv("appointments.csv", {"appointment_date": "%d/%m/%Y"}), True),
        Case("clinic_month_first_dates", "clinic", 'month-first dates "03/13/2026"',
             csv_file("appointments.csv", CLINIC, {"appointment_date": month_first}),
             pick(CLINIC_Q, "count", "march", "april_fee"),
             read_csv("appointments.csv", {"appointment_date": "%m/%d/%Y"}), True),
    ]


# ---------------------------------------------------------------- freight: ragged rows, subtotals

FREIGHT_Q = freight_questions(FREIGHT)
FREIGHT_SHORT_Q = freight_questions(FREIGHT_SHORT)
FREIGHT_COLUMNS = list(FREIGHT[0])


def _extra_last(cells: list[list[str]]) -> list[list[str]]:
    """The last line gets one field more than the header: a clerk's trailing remark."""
    return cells[:-1] + [cells[-1] + ["late pickup"]]


def _ragged(cells: list[list[str]]) -> list[list[str]]:
    """Rows whose surcharge is missing lose that last field; every 13th row has one extra."""
    out = [cells[0]]
    for i, (row, record) in enumerate(zip(FREIGHT_SHORT, cells[1:])):
        if row["fuel_surcharge"] is None:
            record = record[:-1]
        elif i % 13 == 5:
            record = record + ["re-weighed"]
        out.append(record)
    return out


def _subtotals(cells: list[list[str]]) -> list[list[str]]:
    """After each depot's rows, a "Subtotal North" row summing weight, charge and surcharge."""
    out = [cells[0]]
    for depot in sorted({r["depot"] for r in FREIGHT}):
        group = [(r, c) for r, c in zip(FREIGHT, cells[1:]) if r["depot"] == depot]
        out += [c for _, c in group]
        sums = [f"{math.fsum(r[k] for r, _ in group):.2f}"
                for k in ("weight_kg", "charge", "fuel_surcharge")]
        out.append([f"Subtotal {depot}", "", "", "", *sums])
    return out


def _without_extra(folder: Path, name: str) -> Any:
    """pandas, second computation: one more column than the header names, then dropped."""
    import pandas as pd
    frame = pd.read_csv(folder / name, header=None, skiprows=1,
                        names=[*FREIGHT_COLUMNS, "extra"])
    return frame.drop(columns="extra")


def _without_subtotals(folder: Path) -> Any:
    import pandas as pd
    frame = pd.read_csv(folder / "shipments.csv")
    return frame[~frame["shipment_id"].str.startswith("Subtotal")].reset_index(drop=True)


def _euro(text: str) -> float:
    """pandas, second computation: "€ 12,50" and "1 234,50 EUR" → 12.5 and 1234.5."""
    digits = text.replace("€", "").replace("EUR", "").replace(" ", "")
    return float(digits.replace(".", "").replace(",", "."))


def freight_cases() -> list[Case]:
    dates = iso("ship_date")
    return [
        Case("freight_clean", "freight", "control: a clean CSV",
             csv_file("shipments.csv", FREIGHT),
             tuple(FREIGHT_Q.values()), read_csv("shipments.csv", dates), False),
        Case("freight_extra_field_last_line", "freight", "the last line has one extra field",
             csv_file("shipments.csv", FREIGHT, edit=_extra_last),
             pick(FREIGHT_Q, "count", "total", "max"),
             pandas_reader(lambda f: _without_extra(f, "shipments.csv"), dates), True),
        Case("freight_ragged_rows", "freight", "short and long rows in the middle",
             csv_file("shipments.csv", FREIGHT_SHORT, edit=_ragged),
             pick(FREIGHT_SHORT_Q, "count", "total", "fuel", "max"),
             pandas_reader(lambda f: _without_extra(f, "shipments.csv"), dates), True),
        Case("freight_subtotal_rows", "freight", '"Subtotal North" rows after each depot',
             csv_file("shipments.csv", FREIGHT, edit=_subtotals),
             pick(FREIGHT_Q, "count", "total", "fuel", "max"),
             pandas_reader(_without_subtotals, dates), True),
        Case("freight_euro_amounts", "freight", '"€ 12,50" and "1 234,50 EUR"',
             csv_file("shipments.csv", FREIGHT,
                      {"charge": euro_suffix, "fuel_surcharge": euro_prefix}, sep=";"),
             pick(FREIGHT_Q, "total", "fuel", "max"),
             read_csv("shipments.csv", dates, sep=";",
                      converters={"charge": _euro, "fuel_surcharge": _euro}), True),
    ]


# ---------------------------------------------------------------- encodings

TEA_Q = tea_questions(TEA)
PATISSERIE_Q = patisserie_questions(PATISSERIE)


def encoding_cases() -> list[Case]:
    tea, pat = iso("order_date"), iso("order_date")
    every = ("count", "zurich", "creme", "total")
    return [
        Case("tea_clean", "tea", "control: a clean UTF-8 CSV", csv_file("orders.csv", TEA),
             pick(TEA_Q, "count", "moscow", "total"), read_csv("orders.csv", tea), False),
        Case("tea_cp1251", "tea", "Windows-1251 (Cyrillic city names)",
             csv_file("orders.csv", TEA, encoding="cp1251"),
             pick(TEA_Q, "count", "moscow", "total"),
             read_csv("orders.csv", tea, encoding="cp1251"), True),
        Case("patisserie_clean", "patisserie", "control: a clean UTF-8 CSV",
             csv_file("orders.csv", PATISSERIE), pick(PATISSERIE_Q, *every),
             read_csv("orders.csv", pat), False),
        Case("patisserie_utf8_bom", "patisserie", "UTF-8 with a byte-order mark",
             csv_file("orders.csv", PATISSERIE, encoding="utf-8-sig"),
             pick(PATISSERIE_Q, *every),
             read_csv("orders.csv", pat, encoding="utf-8-sig"), False),
        Case("patisserie_cp1252", "patisserie", 'Windows-1252 ("Café", "€")',
             csv_file("orders.csv", PATISSERIE, encoding="cp1252"),
             pick(PATISSERIE_Q, *every), read_csv("orders.csv", pat, encoding="cp1252"), True),
        Case("patisserie_utf16_bom", "patisserie", "UTF-16 with a byte-order mark",
             csv_file("orders.csv", PATISSERIE, encoding="utf-16"),
             pick(PATISSERIE_Q, *every), read_csv("orders.csv", pat, encoding="utf-16"), False),
    ]


# ---------------------------------------------------------------- nested JSON

NURSERY_Q = nursery_questions(NURSERY)


def nursery_json(folder: Path) -> Target:
    """A JSON array of objects whose customer is a nested {"name", "city"} object."""
    nested = [{"order_id": r["order_id"], "placed": r["placed"].isoformat(),
               "customer": {"name": r["name"], "city": r["city"]},
               "plants": r["plants"], "amount": r["amount"]} for r in NURSERY]
    (folder / "orders.json").write_text(json.dumps(nested, indent=1), encoding="utf-8")
    return Target(str(folder / "orders.json"))


def _normalized_json(folder: Path) -> Any:
    """pandas, second computation: json_normalize flattens customer.city into a column."""
    import pandas as pd
    frame = pd.json_normalize(json.loads((folder / "orders.json").read_text(encoding="utf-8")))
    return frame.rename(columns={"customer.city": "city", "customer.name": "name"})


def nursery_cases() -> list[Case]:
    every = ("count", "lyon", "total", "april")
    return [
        Case("nursery_clean", "nursery", "control: a clean CSV (customer flattened)",
             csv_file("orders.csv", NURSERY), pick(NURSERY_Q, *every),
             read_csv("orders.csv", iso("placed")), False),
        Case("nursery_json_nested", "nursery", "JSON array, the city in a nested object",
             nursery_json, pick(NURSERY_Q, *every),
             pandas_reader(_normalized_json, iso("placed")), False),
    ]


# ---------------------------------------------------------------- containers and other formats

FARMSHOP_Q = farmshop_questions(FARMSHOP)
FARMSHOP_CSV = delimited(records(FARMSHOP)).encode("utf-8")
MONTHS = sorted({r["sale_date"].strftime("%Y-%m") for r in FARMSHOP})


def _month_files(folder: Path) -> list[Path]:
    """One CSV a month, same columns: sales_2026-01.csv, sales_2026-02.csv, ..."""
    paths = []
    for month in MONTHS:
        rows = [r for r in FARMSHOP if r["sale_date"].strftime("%Y-%m") == month]
        path = folder / f"sales_{month}.csv"
        path.write_text(delimited(records(rows)), encoding="utf-8")
        paths.append(path)
    return paths


def _write_folder(folder: Path) -> Target:
    (folder / "sales").mkdir()
    _month_files(folder / "sales")
    return Target(str(folder / "sales"))


def _write_glob(folder: Path) -> Target:
    """The monthly files and, beside them, returns with the same columns that the glob
    "sales_*.csv" leaves out."""
    _month_files(folder)
    returns = [{**r, "amount": -r["amount"]} for r in FARMSHOP[:9]]
    (folder / "returns_2026-01.csv").write_text(delimited(records(returns)), encoding="utf-8")
    return Target(str(folder / "sales_*.csv"))


def _write_bytes(name: str, encode: Callable[[bytes], bytes]) -> Callable[[Path], Target]:
    def write(folder: Path) -> Target:
        (folder / name).write_bytes(encode(FARMSHOP_CSV))
        return Target(str(folder / name))
    return write


def _zstd(data: bytes) -> bytes:
    import zstandard
    return zstandard.ZstdCompressor().compress(data)


def _write_duckdb(folder: Path) -> Target:
    import duckdb
    with duckdb.connect(str(folder / "shop.duckdb")) as con:
        con.execute("CREATE TABLE sales (sale_id INTEGER, sale_date DATE, stall VARCHAR, "
                    "kilos DOUBLE, amount DOUBLE)")
        con.executemany("INSERT INTO sales VALUES (?, ?, ?, ?, ?)",
                        [list(r.values()) for r in FARMSHOP])
    return Target(str(folder / "shop.duckdb"))


def _arrow_table() -> Any:
    import pyarrow as pa
    return pa.Table.from_pylist(FARMSHOP)


def _write_feather(folder: Path) -> Target:
    import pyarrow.feather as feather
    feather.write_feather(_arrow_table(), folder / "sales.feather")
    return Target(str(folder / "sales.feather"))


def _write_ods(folder: Path) -> Target:
    import pandas as pd
    pd.DataFrame(FARMSHOP).to_excel(folder / "sales.ods", engine="odf", index=False)
    return Target(str(folder / "sales.ods"))


def _write_xls(folder: Path) -> Target:
    import xlwt
    book = xlwt.Workbook()
    sheet = book.add_sheet("sales")
    dates = xlwt.easyxf(num_format_str="YYYY-MM-DD")
    for j, name in enumerate(FARMSHOP[0]):
        sheet.write(0, j, name)
    for i, row in enumerate(FARMSHOP, start=1):
        for j, value in enumerate(row.values()):
            sheet.write(i, j, value, dates) if isinstance(value, datetime.date) \
                else sheet.write(i, j, value)
    book.save(str(folder / "sales.xls"))
    return Target(str(folder / "sales.xls"))


def _write_stdin(folder: Path) -> Target:
    (folder / "sales.csv").write_bytes(FARMSHOP_CSV)
    return Target("-", stdin=folder / "sales.csv")


def _concat(paths: Iterable[Path]) -> Any:
    import pandas as pd
    return pd.concat([pd.read_csv(p) for p in sorted(paths)], ignore_index=True)


def _duckdb_frame(folder: Path) -> Any:
    import duckdb
    with duckdb.connect(str(folder / "shop.duckdb"), read_only=True) as con:
        return con.table("sales").df()


def _pandas(reader: str, name: str, **options: Any) -> Callable[[Path], Any]:
    def read(folder: Path) -> Any:
        import pandas as pd
        return getattr(pd, reader)(folder / name, **options)
    return pandas_reader(read, {"sale_date": None})


def farmshop_cases() -> list[Case]:
    every = pick(FARMSHOP_Q, "count", "total", "february", "max")
    dates = {"sale_date": None}

    def case(name: str, what: str, write: Callable[[Path], Target], second: Any,
             note: bool = False, needs: tuple[str, ...] = (), why_skip: str = "") -> Case:
        return Case(f"farmshop_{name}", "farmshop", what, write, every, second, note,
                    needs, why_skip)
    return [
        case("clean", "control: a clean CSV", _write_bytes("sales.csv", bytes),
             _pandas("read_csv", "sales.csv")),
        case("csv_gz", "gzip-compressed CSV", _write_bytes("sales.csv.gz", gzip.compress),
             _pandas("read_csv", "sales.csv.gz", compression="gzip")),
        case("csv_zst", "zstandard-compressed CSV", _write_bytes("sales.csv.zst", _zstd),
             _pandas("read_csv", "sales.csv.zst", compression="zstd"), needs=("zstandard",)),
        case("folder", "a folder of monthly CSVs", _write_folder,
             pandas_reader(lambda f: _concat((f / "sales").glob("*.csv")), dates), True),
        case("glob", 'a glob "sales_*.csv" (a returns file beside it)', _write_glob,
             pandas_reader(lambda f: _concat(f.glob("sales_*.csv")), dates), True),
        case("duckdb", "a DuckDB database file", _write_duckdb,
             pandas_reader(_duckdb_frame, dates), needs=("duckdb",)),
        case("feather", "Arrow/Feather", _write_feather, _pandas("read_feather", "sales.feather"),
             needs=("pyarrow",)),
        case("ods", "OpenDocument spreadsheet", _write_ods,
             _pandas("read_excel", "sales.ods", engine="odf"), needs=("odf",)),
        case("xls", "Excel 97 .xls", _write_xls, _pandas("read_excel", "sales.xls"),
             needs=("xlwt", "xlrd")),
        case("stdin", 'standard input ("tabq ask - ...")', _write_stdin,
             _pandas("read_csv", "sales.csv")),
    ]


CASES: list[Case] = [*bakery_cases(), *clinic_cases(), *freight_cases(), *encoding_cases(),
                     *nursery_cases(), *farmshop_cases()]
BY_NAME: dict[str, Case] = {case.name: case for case in CASES}
