"""tabq.text: tokens, numbers (digits, words, ordinals), dates and quoted strings of a question."""

import pytest

from tabq.text import (
    DateMention,
    normalise,
    parse_number_token,
    read_question,
    split_words,
    stem,
)


def numbers(question: str) -> list[float]:
    return [n.value for n in read_question(question).numbers]


def only_date(question: str) -> DateMention:
    (date,) = read_question(question).dates
    return date


# ── tokens ────────────────────────────────────────────────────────────────────────────────────
def test_tokens_are_lower_cased_words_in_order():
    words = read_question("How many Tickets were REFUNDED?")
    assert [t.text for t in words.tokens] == ["how", "many", "tickets", "were", "refunded", "?"]


def test_token_index_is_its_position():
    words = read_question("which dock opened last")
    assert [t.index for t in words.tokens] == [0, 1, 2, 3]


def test_function_words_and_punctuation_are_stop_tokens():
    words = read_question("the ferry of Pellmouth ?")
    assert {t.text: t.stop for t in words.tokens} == {
        "the": True, "ferry": False, "of": True, "pellmouth": False, "?": True}


def test_tokens_carry_their_stem():
    (token,) = read_question("tickets").tokens
    assert token.stem == stem("ticket") == "ticket"


def test_stem_drops_a_possessive():
    assert stem("harbour's") == stem("harbour")


def test_normalise_folds_case_width_and_spaces():
    assert normalise("  Ｆｅｒｒｙ\u00a0 LINE\t2 ") == "ferry line 2"


def test_split_words_keeps_words_and_numbers_only():
    assert split_words("Fare (per trip) - 2025!") == ["fare", "per", "trip", "2025"]


# ── numbers ───────────────────────────────────────────────────────────────────────────────────
def test_thousands_separator_is_read():
    assert numbers("more than 7,169 riders") == [7169]


def test_decimal_number():
    assert numbers("fares above 3.5") == [3.5]


def test_currency_and_percent_signs_are_dropped():
    assert numbers("$40 or 15%") == [40, 15]


def test_number_words_are_added_up():
    assert numbers("twenty five boats") == [25]


def test_hyphenated_number_words():
    assert numbers("twenty-five boats") == [25]


def test_number_words_with_multiplier():
    assert numbers("two thousand five hundred seats") == [2500]


def test_a_dozen_is_twelve():
    assert numbers("a dozen crates") == [12]


def test_dozens_multiply():
    assert numbers("more than two dozen crates") == [24]
    assert numbers("three dozen and five") == [36, 5]


def test_number_word_span_covers_all_its_words():
    (mention,) = read_question("over twenty five boats").numbers
    assert (mention.start, mention.end, mention.ordinal) == (1, 3, False)


def test_one_of_is_not_a_number():
    assert numbers("one of the lighthouses") == []


def test_digit_ordinal():
    (mention,) = read_question("the 4th stop").numbers
    assert (mention.value, mention.ordinal) == (4, True)


def test_word_ordinal():
    (mention,) = read_question("the fourth stop").numbers
    assert (mention.value, mention.ordinal) == (4, True)


def test_plain_number_is_not_an_ordinal():
    (mention,) = read_question("top 3 stops").numbers
    assert mention.ordinal is False


def test_four_digit_number_reads_as_a_year():
    (mention,) = read_question("boats built in 1987").numbers
    assert (mention.value, mention.year) == (1987, True)


def test_other_numbers_are_not_years():
    (mention,) = read_question("more than 3000 crates").numbers
    assert mention.year is False


@pytest.mark.parametrize(
    "text,value",
    [("7,169", 7169), ("$40", 40), ("40%", 40), ("4th", 4), ("3.25", 3.25), ("22nd", 22)],
)
def test_parse_number_token(text, value):
    assert parse_number_token(text) == value


@pytest.mark.parametrize("text", ["pier", "4x", "", "th"])
def test_parse_number_token_rejects_other_text(text):
    assert parse_number_token(text) is None


# ── dates ─────────────────────────────────────────────────────────────────────────────────────
def test_bare_month_name_is_a_month_without_year():
    date = only_date("how many tickets were refunded in march")
    assert (date.year, date.month, date.day) == (None, 3, None)


def test_month_without_day_has_no_iso_form():
    assert only_date("refunds in march").iso() is None


def test_iso_date_is_a_full_date():
    date = only_date("after 2025-06-30")
    assert (date.year, date.month, date.day) == (2025, 6, 30)
    assert date.iso() == "2025-06-30"


def test_iso_date_is_not_also_a_number():
    assert read_question("after 2025-06-30").numbers == ()


def test_month_and_year():
    date = only_date("sailings in sept 2021")
    assert (date.year, date.month, date.day) == (2021, 9, None)


def test_month_then_day():
    date = only_date("on march 3 2025")
    assert date.iso() == "2025-03-03"


def test_day_then_month():
    date = only_date("on 3 march")
    assert (date.year, date.month, date.day) == (None, 3, 3)


def test_day_of_month():
    date = only_date("jobs after the 3rd of march 2025")
    assert date.iso() == "2025-03-03" and (date.start, date.end) == (3, 7)
    assert (only_date("on 14 of may").month, only_date("on 14 of may").day) == (5, 14)


def test_a_day_number_before_of_without_a_month_is_no_date():
    assert read_question("the 3rd of the boats").dates == ()


def test_slash_date_reads_day_first():
    assert only_date("on 04/05/2025").iso() == "2025-05-04"


def test_slash_date_reads_month_first_when_day_says_so():
    assert only_date("on 02/13/2024").iso() == "2024-02-13"


def test_ambiguous_short_month_alone_is_not_a_date():
    assert read_question("it may rain").dates == ()


def test_ambiguous_short_month_with_year_is_a_date():
    date = only_date("in may 2024")
    assert (date.year, date.month) == (2024, 5)


def test_lone_year_is_a_year_date():
    date = only_date("boats built in 1987")
    assert (date.year, date.month, date.day) == (1987, None, None)


# ── quotes ────────────────────────────────────────────────────────────────────────────────────
def test_double_quoted_text_is_one_token():
    words = read_question('riders on "Harrow Spur Line"')
    assert words.quoted == (("harrow spur line", 2),)
    assert words.tokens[2].text == "harrow spur line"


def test_single_quoted_text():
    assert read_question("rows with 'gull rock'").quoted == (("gull rock", 2),)


def test_curly_quoted_text():
    assert read_question("rows with “Gull Rock”").quoted == (("gull rock", 2),)


def test_apostrophe_inside_double_quotes_is_kept():
    assert read_question('fares at "Ola\'s Tap"').quoted == (("ola's tap", 2),)


def test_apostrophes_inside_single_quotes_are_kept():
    assert read_question("jobs at 'O'Brien's yard' in may").quoted == (("o'brien's yard", 2),)
    assert read_question("jobs at ‘O’Brien’s yard’").quoted == (("o’brien’s yard", 2),)


def test_several_quoted_strings():
    words = read_question("'north' or 'south'")
    assert [text for text, _ in words.quoted] == ["north", "south"]


def test_empty_quotes_are_not_a_quoted_string():
    assert read_question('name is ""').quoted == ()


def test_apostrophe_inside_a_word_is_not_a_quote():
    words = read_question("what's the skipper's boat")
    assert words.quoted == ()
    assert "skipper's" in [t.text for t in words.tokens]
