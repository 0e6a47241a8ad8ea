"""tabq.answers: normalising values, comparing answers, cleaning DuckDB values, Denotation keys."""

import datetime
import decimal

import numpy as np
import pytest

from tabq.answers import Denotation, clean, matches, norm


# ── norm / matches ────────────────────────────────────────────────────────────────────────────
@pytest.mark.parametrize("gold", [12467, 12467.0, "12467", "12,467.0"])
def test_thousands_text_matches_the_number(gold):
    assert matches(["12,467"], [gold])


def test_number_text_normalises_to_a_number():
    assert norm("12,467") == norm(12467) == ("n", 12467.0)


def test_different_numbers_do_not_match():
    assert not matches(["12,467"], [12468])


def test_numbers_match_within_tolerance():
    assert matches([0.1 + 0.2], [0.3])


def test_text_match_ignores_case_spaces_and_surrounding_punctuation():
    assert matches(["  Harrow   SPUR. "], ['"harrow spur"'])


def test_text_match_is_unicode_folded():
    assert matches(["Ｇｕｌｌ Rock"], ["gull rock"])


def test_different_text_does_not_match():
    assert not matches(["harrow spur"], ["harrow spurs"])


def test_sets_match_in_any_order():
    assert matches(["Osric Lane", 3, "fenwick loop"], ["Fenwick Loop", "osric lane", "3"])


def test_answers_of_different_sizes_do_not_match():
    assert not matches(["fenwick loop"], ["fenwick loop", "fenwick loop"])


def test_repeats_count_as_a_multiset():
    assert not matches(["a", "a"], ["a", "b"])


def test_empty_answers_match():
    assert matches([], [])


def test_true_reads_yes():
    assert norm(True) == norm("Yes") == ("s", "yes")
    assert matches([True], ["yes"])


def test_false_reads_no():
    assert matches([False], ["no"])
    assert not matches([False], [0])


def test_none_is_empty_text():
    assert norm(None) == ("s", "")


def test_date_compares_by_iso_text():
    assert matches([datetime.date(2025, 6, 30)], ["2025-06-30"])


def test_table_rows_normalise_as_tuples():
    assert norm(("Fenwick Loop", 3)) == ("t", (("s", "fenwick loop"), ("n", 3.0)))


# ── clean ─────────────────────────────────────────────────────────────────────────────────────
def test_whole_decimal_cleans_to_int():
    value = clean(decimal.Decimal("12.00"))
    assert value == 12 and type(value) is int


def test_fractional_decimal_cleans_to_float():
    assert clean(decimal.Decimal("12.5")) == 12.5


def test_whole_numpy_float_cleans_to_int():
    value = clean(np.float64(3.0))
    assert value == 3 and type(value) is int


def test_whole_float_cleans_to_int():
    assert type(clean(30.0)) is int


def test_float_is_rounded():
    assert clean(1 / 3) == 0.3333333333


@pytest.mark.parametrize("value", [float("nan"), float("inf"), float("-inf")])
def test_nan_and_infinity_clean_to_none(value):
    assert clean(value) is None


def test_date_cleans_to_iso():
    assert clean(datetime.date(2025, 6, 30)) == "2025-06-30"


def test_midnight_timestamp_cleans_to_iso_date():
    assert clean(datetime.datetime(2025, 6, 30)) == "2025-06-30"


def test_timestamp_with_time_keeps_it():
    assert clean(datetime.datetime(2025, 6, 30, 14, 5)) == "2025-06-30T14:05:00"


def test_bools_clean_to_yes_no():
    assert (clean(True), clean(False)) == ("yes", "no")


def test_tuples_are_cleaned_inside():
    assert clean(("Osric Lane", decimal.Decimal("4.00"), datetime.date(2024, 1, 2))) == (
        "Osric Lane", 4, "2024-01-02")


def test_text_and_int_pass_through():
    assert (clean("Fenwick Loop"), clean(7), clean(None)) == ("Fenwick Loop", 7, None)


# ── Denotation ────────────────────────────────────────────────────────────────────────────────
def test_key_ignores_order():
    assert Denotation(("b", 3, "a")).key() == Denotation(("a", "b", 3)).key()


def test_key_unifies_number_text_and_number():
    assert Denotation(("12,467",)).key() == Denotation((12467.0,)).key()


def test_key_keeps_repeats():
    assert Denotation(("a", "a")).key() != Denotation(("a",)).key()


def test_key_is_hashable():
    assert {Denotation(("a", 1)).key(): 1}[Denotation((1, "A")).key()] == 1


@pytest.mark.parametrize(
    "values,is_table,kind",
    [((3,), False, "number"), (("yes",), False, "yesno"), ((True,), False, "yesno"),
     (("2025-06-30",), False, "date"), (("Osric Lane",), False, "text"),
     ((None, 2.5), False, "number"), ((("a", 1),), True, "table")],
)
def test_kind(values, is_table, kind):
    assert Denotation(values, is_table=is_table).kind == kind
