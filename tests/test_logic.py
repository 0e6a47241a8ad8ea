"""tabq.logic: canonical text (to_text / from_text), English paraphrase, malformed text."""

import datetime

import pytest

from tabq import logic as L
from tabq.errors import TabqError

FENWICK = L.Eq("route", "Fenwick Loop")
CHEAP = L.Cmp("fare", "lt", 10)

SAMPLES = [
    L.All(),
    FENWICK,
    CHEAP,
    L.Cmp("sailed_on", "ge", datetime.date(2025, 6, 30)),
    L.Between("fare", 9, 18.5),
    L.Contains("rider", "ash"),
    L.Missing("fare"),
    L.Defined("the island routes", L.InSet("route", ("Fenwick Loop", "Harrow Spur", 3))),
    L.Defined("late sailings", L.Hours("sailed_at", 21, 2)),
    L.Defined("the busy season", L.Months("sailed_on", 6, 8)),
    L.Period("sailed_on", 2025, 3),
    L.Period("sailed_on", None, 3),
    L.Period("sailed_on", 2024, None),
    L.And(FENWICK, CHEAP),
    L.Or(FENWICK, L.Not(CHEAP)),
    L.Not(L.And(FENWICK, L.Missing("seats"))),
    L.Extreme(FENWICK, "fare", "max"),
    L.Extreme(L.All(), "sailed_on", "min"),
    L.Position(L.All(), "first"),
    L.Position(L.Or(FENWICK, CHEAP), "last"),
    L.Neighbour(L.Eq("rider", "Tamsin Greaves"), "next"),
    L.Neighbour(L.Position(FENWICK, "first"), "prev"),
    L.Values("rider", L.Extreme(FENWICK, "fare", "min")),
    L.Distinct("route", L.Not(L.Missing("fare"))),
    L.Aggregate("count", None, FENWICK),
    L.Aggregate("count_distinct", "route", L.All()),
    L.Aggregate("median", "fare", L.Period("sailed_on", 2025, None)),
    L.Difference(L.Aggregate("max", "fare", L.All()), L.Aggregate("min", "fare", L.All())),
    L.WhichOf("route", "Fenwick Loop", "Harrow Spur", "sum", "fare", "max"),
    L.WhichOf("deck", 1, 2, "count", None, "min"),
    L.GroupBest("route", "count", None, L.All(), "max"),
    L.GroupBest("select", "avg", "fare", CHEAP, "min"),
    L.GroupTop("route", "sum", "seats", 2, L.All(), "max"),
    L.TopN("rider", 3, FENWICK, "fare", "max"),
    L.YesNo(L.And(FENWICK, L.Cmp("order", "gt", 4))),
    L.GroupTable("route", "avg", "fare", L.Not(CHEAP)),
    L.Distinct("route", L.InGroups("route", "count", None, CHEAP, "gt", 3)),
    L.Aggregate("count_distinct", "rider", L.InGroups("rider", "avg", "fare", L.All(), "ge", 9.5)),
    L.Values("rider", L.And(FENWICK, L.CmpAgg("fare", "lt", "avg"))),
    L.Share("percent", CHEAP, L.All()),
    L.Share("fraction", CHEAP, FENWICK),
    L.PeriodTable("sailed_on", "month", "count", None, L.All()),
    L.PeriodTable("sailed_on", "year", "sum", "fare", FENWICK),
    L.PeriodTable("sailed_on", "weekday", "count", None, L.DayOfWeek("sailed_on", 1, 5)),
    L.PeriodBest("sailed_on", "month", "count", None, None, L.All(), "max"),
    L.PeriodBest("sailed_on", "year", "avg", "fare", 2, L.And(FENWICK, L.DayOfWeek(
        "sailed_on", 6, 7)), "min"),
]


def test_samples_cover_every_form_class():
    assert {type(node) for form in SAMPLES for node in L.walk(form)} == set(L.FORMS.values())


def test_forms_are_keyed_by_their_tag():
    assert all(cls.tag == tag for tag, cls in L.FORMS.items())


# ── canonical text ────────────────────────────────────────────────────────────────────────────
@pytest.mark.parametrize("form", SAMPLES, ids=str)
def test_text_round_trip(form):
    assert L.from_text(L.to_text(form)) == form


@pytest.mark.parametrize("form", SAMPLES, ids=str)
def test_text_is_one_line_and_stable(form):
    text = L.to_text(form)
    assert "\n" not in text
    assert L.to_text(L.from_text(text)) == text == str(form)


def test_text_shape():
    form = L.Aggregate("count", None, L.Eq("route", "harrow spur"))
    assert L.to_text(form) == '(aggregate count _ (eq route "harrow spur"))'


def test_date_text_shape():
    assert L.to_text(L.Cmp("sailed_on", "gt", datetime.date(2025, 6, 30))) == (
        "(cmp sailed_on gt @2025-06-30)")


@pytest.mark.parametrize(
    "value",
    ["x'; DROP TABLE t; --", 'say "ahoy"', "back\\slash", "two\nlines", "Zoë “Ó Brien”", "_",
     "3", "", None, 0, -5, 2.5, -0.125, 1e-07, 12345678901234, datetime.date(1999, 12, 31)],
    ids=repr,
)
def test_literal_values_round_trip(value):
    form = L.Eq("rider", value)
    back = L.from_text(L.to_text(form))
    assert back == form and type(back.value) is type(value)


def test_reserved_word_column_names_round_trip():
    form = L.TopN("select", 2, L.Eq("order", 3), "from", "min")
    assert L.from_text(L.to_text(form)) == form


def test_from_text_allows_extra_whitespace():
    text = ' ( values  rider\n  (eq  route "Fenwick Loop") ) '
    assert L.from_text(text) == L.Values("rider", FENWICK)


@pytest.mark.parametrize(
    "text",
    ["", "(", ")", "eq route 1", "(eq route)", "(eq route 1 2)", "(nosuch route)",
     '(eq route "open', "(values rider (all)", "(eq route 1) (all)", "(Eq route 1)",
     "(eq route 'single')", "(cmp fare gt 1.2.3)", "(cmp sailed_on gt @2025-13-40)"],
)
def test_malformed_text_raises_logic_text_error(text):
    with pytest.raises(L.LogicTextError):
        L.from_text(text)


def test_logic_text_error_is_a_tabq_error():
    assert issubclass(L.LogicTextError, TabqError)


# ── walking ───────────────────────────────────────────────────────────────────────────────────
def test_walk_visits_parents_before_children():
    form = L.Values("rider", L.And(FENWICK, CHEAP))
    assert [node.tag for node in L.walk(form)] == ["values", "and", "eq", "cmp"]


def test_columns_of_lists_every_column_read():
    form = L.GroupBest("route", "sum", "fare", L.And(FENWICK, CHEAP), "max")
    assert L.columns_of(form) == ["route", "fare", "route", "fare"]


def test_size_counts_nodes():
    assert L.size(L.Values("rider", L.Not(FENWICK))) == 3


# ── paraphrase ────────────────────────────────────────────────────────────────────────────────
ANSWERS = [form for form in SAMPLES if isinstance(form, L.Answer)]
ROW_SETS = [form for form in SAMPLES if isinstance(form, L.Rows)]


@pytest.mark.parametrize("form", ANSWERS, ids=str)
def test_paraphrase_of_an_answer_is_nonempty_english(form):
    text = L.paraphrase(form)
    assert isinstance(text, str) and text.strip() and "(" + form.tag not in text


@pytest.mark.parametrize("rows", ROW_SETS, ids=str)
def test_paraphrase_reads_every_row_set_as_a_condition(rows):
    text = L.paraphrase(L.Values("rider", rows))
    assert text.startswith("the rider") and "(" + rows.tag not in text


def test_paraphrase_uses_the_label():
    text = L.paraphrase(L.Values("rider", CHEAP), label=lambda name: name.upper())
    assert text == "the RIDER where FARE is less than 10"


def test_paraphrase_names_the_row_position():
    assert "row position" in L.paraphrase(L.Values("rider", L.Cmp("__row", "gt", 2)))


def test_paraphrase_names_the_month():
    text = L.paraphrase(L.Aggregate("count", None, L.Period("sailed_on", 2025, 3)))
    assert text == "the number of rows where sailed_on is in March 2025"


def test_paraphrase_reads_whole_floats_as_ints():
    assert L.paraphrase(L.YesNo(L.Cmp("fare", "gt", 30.0))) == (
        "whether there is any row where fare is more than 30")


def test_paraphrase_says_which_direction():
    most = L.paraphrase(L.GroupBest("route", "count", None, L.All(), "max"))
    least = L.paraphrase(L.GroupBest("route", "count", None, L.All(), "min"))
    assert "largest" in most and "smallest" in least


def test_paraphrase_of_groups_names_the_groups_and_their_filter():
    listed = L.Distinct("route", L.InGroups("route", "count", None, CHEAP, "gt", 3))
    assert L.paraphrase(listed) == (
        "the route values that have more than 3 rows where fare is less than 10")
    counted = L.Aggregate("count_distinct", "rider",
                          L.InGroups("rider", "avg", "fare", L.All(), "ge", 9.5))
    assert L.paraphrase(counted) == (
        "the number of rider values that have an average fare that is at least 9.5")


def test_paraphrase_of_an_average_comparison_says_over_the_whole_table():
    text = L.paraphrase(L.Aggregate("count", None, L.CmpAgg("fare", "gt", "avg")))
    assert text == "the number of rows where fare is more than the average fare of the whole table"


def test_paraphrase_of_a_share_says_its_scale():
    assert L.paraphrase(L.Share("percent", CHEAP, L.All())) == (
        "the percentage (0 to 100) of all rows where fare is less than 10")
    assert L.paraphrase(L.Share("fraction", CHEAP, FENWICK)) == (
        'among rows where route is "Fenwick Loop", the fraction (0 to 1) where fare is less than 10')


def test_paraphrase_of_a_best_period_names_the_period_and_the_days():
    text = L.paraphrase(L.PeriodBest("sailed_on", "month", "count", None, None,
                                     L.DayOfWeek("sailed_on", 6, 7), "max"))
    assert text == ("the month of sailed_on (as year-month: months of different years kept "
                    "apart) with the largest number of rows where sailed_on falls on a Saturday "
                    "or Sunday")
    text = L.paraphrase(L.PeriodBest("sailed_on", "weekday", "sum", "fare", 3,
                                     L.DayOfWeek("sailed_on", 1, 5), "min"))
    assert text == ("the 3 days of the week of sailed_on with the smallest total fare where "
                    "sailed_on falls on a day from Monday to Friday")


def test_paraphrase_of_a_month_table_says_years_stay_apart():
    text = L.paraphrase(L.PeriodTable("sailed_on", "month", "sum", "fare", L.Period(
        "sailed_on", 2025, None)))
    assert text == ("the total fare where sailed_on is in 2025, for each month of sailed_on, "
                    "as year-month (months of different years kept apart)")
