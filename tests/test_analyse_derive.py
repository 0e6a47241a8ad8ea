"""analyse, derive and features, each called alone on the demo tables."""

import dataclasses

import pytest
import sqlglot

import tabq
from tabq import logic as L
from tabq.analyse import analyse
from tabq.derive import ANSWER_BEAM, MAX_SIZE, derive, rules
from tabq.features import NODE_FEATURES, Step, fragments
from tabq.model import Model
from tabq.rules import SPECS


@pytest.fixture(scope="module")
def demo(demo_csv):
    return tabq.open(demo_csv)


def test_analyse_links_columns_values_numbers_and_dates(demo):
    a = analyse("how many e-bike jobs at the wharf shed took more than 40 minutes in march 2025",
                demo.table)
    entities = {atom.value for atom in a.atoms["ENTITY"] if atom.span}
    assert ("site", "Wharf Shed") in entities and ("bike_type", "E-bike") in entities
    assert [atom.value for atom in a.atoms["NUMBER"]] == [40.0]
    assert any(atom.value.month == 3 and atom.value.year == 2025 for atom in a.atoms["PERIOD"])
    assert a.qtype == "how_many"


def test_analyse_is_permissive_every_column_can_fill_a_column_slot(demo):
    a = analyse("which one is it", demo.table)
    assert {atom.value for atom in a.atoms["ANYCOL"]} == {
        c.name for c in demo.table.columns if c.view is None}


def test_empty_question_is_refused(demo):
    with pytest.raises(tabq.TabqError):
        analyse("  ?! ", demo.table)


def test_every_rule_has_a_builder_and_the_beam_bounds_the_candidates(demo):
    assert len(rules()) >= 30
    items = derive(analyse("which mechanic has done the most jobs", demo.table), Model.prior())
    assert 0 < len(items) <= ANSWER_BEAM * MAX_SIZE
    assert all(isinstance(i.form, L.Answer) for i in items)
    assert [i.score for i in items] == sorted((i.score for i in items), reverse=True)


def test_candidate_scores_are_the_model_score_of_their_features(demo):
    model = Model.prior()
    for question in DERIVE_QUESTIONS:
        for item in derive(analyse(question, demo.table), model)[:60]:
            assert item.score == pytest.approx(model.score(item.features()))


DERIVE_QUESTIONS = ["which mechanic has done the most jobs", "difference between the most and "
                    "least expensive job", "were there more jobs at the wharf shed or the depot",
                    "how many jobs were not for members in 2025", "average price of a full service"]


def test_dropping_the_fillings_builders_refuse_changes_no_candidate(demo, monkeypatch):
    """A spec's `fits` only saves tries: with every one dropped the chart tries those fillings
    too."""
    model = Model.prior()

    def chart():
        return [[(i.form, i.score, i.features()) for i in derive(analyse(q, demo.table), model)]
                for q in DERIVE_QUESTIONS]

    with_fits = chart()
    dropped = [alias for alias, spec in SPECS.items() if spec.fits is not None]
    for alias in dropped:
        monkeypatch.setitem(SPECS, alias, dataclasses.replace(SPECS[alias], fits=None))
    assert dropped and chart() == with_fits


def test_every_candidate_sql_reparses(demo):
    result = demo.ask("how many jobs were not for members in 2025")
    for reading in result.candidates:
        assert sqlglot.parse_one(reading.sql, read="duckdb") is not None


def test_fragments_name_the_operators_a_step_adds(demo):
    a = analyse("average price", demo.table)
    agg = next(x for x in a.atoms["AGG"] if x.value == "avg")
    col = next(x for x in a.atoms["NUMCOL"] if x.value == "price")
    assert fragments(Step("aggregate", (agg, col), ())) == ["avg"]
    feats = {}
    for fn in NODE_FEATURES:
        feats.update(fn(a, Step("aggregate", (agg, col), ())))
    assert feats["col:exact"] == 1.0 and feats["cover"] >= 1.0


# ── a team word no cell names: its value must be among the candidates for teaching to find it ──
@pytest.fixture(scope="module")
def hire(tmp_path_factory):
    """An invented boat-hire sheet: a 10-value column listed before the 4-value status column."""
    path = tmp_path_factory.mktemp("hire") / "hire.csv"
    boats = ["Kite", "Wren", "Teal", "Rook", "Finch", "Lark", "Swift", "Crane", "Stork", "Gull"]
    statuses = ["paid", "cancelled", "did not arrive", "complimentary"]
    rows = ["boat,status,fee"] + [f"{boats[i % 10]},{statuses[i % 4]},{10 + i}"
                                  for i in range(40)]
    path.write_text("\n".join(rows) + "\n")
    return tabq.open(path)


def test_an_unexplained_word_offers_each_small_columns_values_on_itself(hire):
    a = analyse("how many no-shows were there", hire.table)
    shows = next(t.index for t in a.words.tokens if t.text == "shows")
    on_word = {atom.value for atom in a.atoms["ENTITY"]
               if atom.quality == "floating+word" and atom.span == (shows, shows + 1)}
    assert ("status", "did not arrive") in on_word and ("boat", "Kite") in on_word
    # a word the table explains ("paid" is a cell) gets no such reading
    a = analyse("how many paid", hire.table)
    assert not [atom for atom in a.atoms["ENTITY"] if atom.quality == "floating+word"]


def test_untaught_the_beam_keeps_every_value_of_a_small_column_within_reach(hire):
    # before teaching all floating values score alike: the 10 boats must not crowd the status out
    forms = {str(item.form) for item in derive(analyse("how many no-shows were there",
                                                       hire.table), hire.model)}
    for status in ("paid", "cancelled", "did not arrive", "complimentary"):
        assert f'(aggregate count _ (eq status "{status}"))' in forms


def test_a_floating_value_pairs_with_the_word_it_stands_on(hire):
    item = next(i for i in derive(analyse("how many no-shows were there", hire.table), hire.model)
                if str(i.form) == '(aggregate count _ (eq status "did not arrive"))')
    feats = item.features()
    assert "lexval:show|status=did not arrive" in feats
    assert "lexval:no show|status=did not arrive" in feats
    assert not any(f.startswith("lexval:how") for f in feats)
