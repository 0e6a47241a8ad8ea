"""Feature names: built and read by one codec, spelled exactly as models and logs hold them."""

import datetime

import pytest
from hypothesis import given
from hypothesis import strategies as st

from tabq import featurenames as names
from tabq.featurenames import Pair


def test_names_are_spelled_as_models_and_logs_hold_them():
    assert names.lex("how mani", "count") == "lex:how mani|count"
    assert names.lex("qtype:how_many", "count") == "lex:qtype:how_many|count"
    assert names.op("cmp:gt") == "op:cmp:gt"
    assert names.column("spanner", "labour_min") == "lexcol:spanner|labour_min"
    assert names.value("return", "status", "refunded") == "lexval:return|status=refunded"
    assert names.value("stuck", "mechanic", "Mina Castellane") == \
        "lexval:stuck|mechanic=Mina Castellane"


def test_a_value_that_is_not_text_is_written_as_an_f_string_writes_it():
    assert names.value("cheap", "price", 3.5) == "lexval:cheap|price=3.5"
    assert names.value("top", "rank", 1) == "lexval:top|rank=1"
    assert names.value("launch", "day", datetime.date(2024, 3, 1)) == "lexval:launch|day=2024-03-01"
    assert names.value("open", "done", True) == "lexval:open|done=True"


@pytest.mark.parametrize("name, pair", [
    ("lex:how mani|count", Pair("operator", "how mani", "count")),
    ("lex:at least|cmp:ge", Pair("operator", "at least", "cmp:ge")),
    ("lex:top|extreme:max", Pair("operator", "top", "extreme:max")),
    ("lex:lowest|dir:min", Pair("operator", "lowest", "dir:min")),
    ("lex:each|group:avg", Pair("operator", "each", "group:avg")),
    ("lex:stuck|eq", Pair("fragment", "stuck", "eq")),
    ("lex:which|which_of", Pair("fragment", "which", "which_of")),
    ("lex:qtype:which|group_best", Pair("fragment", "qtype:which", "group_best")),
    ("lexcol:spanner|labour_min", Pair("column", "spanner", "labour_min")),
    ("lexval:no show|status=did not arrive", Pair("value", "no show", "status=did not arrive")),
    ("lexval:odd|code=a|b=c", Pair("value", "odd", "code=a|b=c")),
])
def test_parse_reads_word_kind_and_meaning(name, pair):
    assert names.parse(name) == pair
    assert pair.name == name


@pytest.mark.parametrize("name", [
    "op:sum", "op:eq", "cover", "ent:exact", "den:how_many|number", "cue:unexplained",
    "lex:nobar", "lex:|sum", "lex:word|", "lexcol:|status", "lexval:word|", "lexicon:a|b", "",
])
def test_structure_and_broken_names_are_not_word_pairs(name):
    assert names.parse(name) is None


def test_a_value_splits_at_its_first_equals_sign():
    assert names.parse("lexval:odd|code=a|b=c").cell == ("code", "a|b=c")
    assert names.parse("lexval:blank|note=").cell == ("note", "")


def test_question_type_pairs_are_told_apart_from_words():
    assert names.parse("lex:qtype:how_many|count").is_question_type
    assert names.parse("lexcol:qtype:which|site").is_question_type
    assert not names.parse("lex:how mani|count").is_question_type


_gram = st.lists(st.text(st.characters(blacklist_characters="|\x00 "), min_size=1, max_size=8),
                 min_size=1, max_size=3).map(" ".join)
_meaning = st.text(min_size=1, max_size=20)


@given(_gram, _meaning, _meaning, st.one_of(st.text(max_size=20), st.integers(), st.floats()))
def test_every_kind_reads_back_as_built(gram, fragment, col, cell_value):
    col = col.replace("=", "_")          # column names never hold "="
    lex = names.parse(names.lex(gram, fragment))
    assert (lex.word, lex.meaning) == (gram, fragment)
    assert lex.kind == names.fragment_kind(fragment)
    assert lex.name == names.lex(gram, fragment)
    assert names.parse(names.column(gram, col)) == Pair("column", gram, col)
    value = names.parse(names.value(gram, col, cell_value))
    assert (value.kind, value.word, value.cell) == ("value", gram, (col, f"{cell_value}"))
    assert value.name == names.value(gram, col, cell_value)
    assert names.parse(names.op(fragment)) is None


def test_fragment_kinds():
    for fragment in ["sum", "avg", "min", "max", "median", "count", "first", "last", "next",
                     "prev", "cmp:gt", "cmp:le", "extreme:max", "dir:min", "group:avg"]:
        assert names.fragment_kind(fragment) == "operator"
    for fragment in ["eq", "and", "or", "not", "missing", "contains", "between", "which_of",
                     "group_best", "top_n", "per_group", "difference", "yes_no"]:
        assert names.fragment_kind(fragment) == "fragment"


def test_a_sense_takes_the_word_out_except_from_a_value():
    assert names.sense("lex:how mani|count") == "lex:*|count"
    assert names.sense("lex:stuck|eq") == "lex:*|eq"
    assert names.sense("lexcol:spanner|labour_min") == "lexcol:*|labour_min"
    assert names.sense("lexval:return|status=refunded") == "lexval:return|status=refunded"
    assert names.sense("op:sum") == "op:sum"
    assert names.sense("ent:floating") == "ent:floating"


def test_senses_are_sorted_distinct_and_skip_features_that_did_not_fire():
    fired = {"lex:how mani|count": 1.0, "lex:job|count": 1.0, "op:count": 1.0,
             "lexcol:time|labour_min": 2.0, "cover": 0.0, "lexval:stuck|status=Waiting": 1.0}
    assert names.senses(fired) == ["lex:*|count", "lexcol:*|labour_min",
                                   "lexval:stuck|status=Waiting", "op:count"]


def test_an_open_sense_is_a_pair_whose_word_was_taken_out():
    assert names.open_sense("lex:*|count") == Pair("operator", "*", "count")
    assert names.open_sense("lexcol:*|site").with_word("where").name == "lexcol:where|site"
    assert names.open_sense("lexval:return|status=refunded") is None
    assert names.open_sense("op:count") is None


def test_the_lexical_features_of_a_question_are_spelled_as_before(demo_csv):
    from tabq.analyse import analyse
    from tabq.features import lexical, lexical_column, lexical_value
    from tabq.load import load_table
    analysis = analyse("how many no-shows at Wharf Shed", load_table(demo_csv))
    grams = analysis.grams
    assert "no show" in grams and "qtype:how_many" in grams
    assert list(lexical(analysis, "count")) == [f"lex:{g}|count" for g in grams] + ["op:count"]
    assert list(lexical_column(analysis, "site")) == [f"lexcol:{g}|site" for g in grams
                                                      if " " not in g]
    assert list(lexical_value(analysis, "status", "Cancelled")) == [
        f"lexval:{g}|status=Cancelled" for g in grams if " " not in g]
    at = next(i for i, t in enumerate(analysis.words.tokens) if t.stem == "show")
    assert list(lexical_value(analysis, "status", "Cancelled", at=at)) == [
        f"lexval:{g}|status=Cancelled" for g in grams
        if "show" in g.split(" ") and g.count(" ") < 2]
