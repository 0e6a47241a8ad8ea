"""rules: one spec per grammar alternative, and the grammar and the specs agree."""

import dataclasses

import pytest

import tabq
from tabq import logic as L
from tabq.analyse import Atom, analyse
from tabq.derive import Rule, check_specs, derive, rules
from tabq.features import Step, fragments
from tabq.model import Model
from tabq.rules import SPECS, Spec


@pytest.fixture(scope="module")
def demo(demo_csv):
    return tabq.open(demo_csv)


def test_every_grammar_alternative_has_a_spec_and_every_spec_an_alternative():
    assert {rule.alias for rule in rules()} == set(SPECS)
    check_specs(rules(), SPECS)    # raises on any disagreement


def test_a_spec_naming_no_grammar_alternative_is_refused():
    fake = Spec(lambda a, rows: rows)
    with pytest.raises(RuntimeError, match=r"naming no grammar rule: \['fake'\]"):
        check_specs(rules(), {**SPECS, "fake": fake})


def test_a_grammar_alternative_without_a_spec_is_refused():
    without_compare = {alias: spec for alias, spec in SPECS.items() if alias != "compare"}
    with pytest.raises(RuntimeError, match=r"without a spec in rules.py: \['compare'\]"):
        check_specs(rules(), without_compare)
    with pytest.raises(RuntimeError, match=r"without a spec in rules.py: \['fake'\]"):
        check_specs((*rules(), Rule("rows", ("ALL",), "fake")), SPECS)


@pytest.mark.parametrize("change, problem", [
    ({"build": lambda a, col, op: None}, "builder does not take"),
    ({"fits": lambda col, op: True}, "fits does not take"),
    ({"fragments": ("cmp:{DIR}",)}, r"fragments name \['DIR'\]"),
])
def test_a_spec_that_does_not_fit_its_alternative_is_refused(change, problem):
    broken = {**SPECS, "compare": dataclasses.replace(SPECS["compare"], **change)}
    with pytest.raises(RuntimeError, match=f"the spec of compare in rules.py: its {problem}"):
        check_specs(rules(), broken)


def test_the_chart_gives_a_builder_only_sub_forms_its_spec_accepts(demo, monkeypatch):
    """Builders leave to `accepts` what it already refuses: the chart must hold to that."""
    given: list[tuple[str, bool]] = []

    def watched(alias, spec):
        def build(a, *values):
            given.extend((alias, spec.accepts(v)) for v in values if isinstance(v, L.Rows))
            return spec.build(a, *values)
        return build

    for alias, spec in list(SPECS.items()):
        if spec.accepts is not None:
            monkeypatch.setitem(SPECS, alias, dataclasses.replace(spec, build=watched(alias, spec)))
    for question in ("were there more jobs at the wharf shed or the depot",
                     "how many jobs were not for members in 2025",
                     "which job came after the most expensive one at the depot",
                     "was there a job at the depot costing more than 100"):
        derive(analyse(question, demo.table), Model.prior())
    assert {"both", "either", "negate", "count_difference", "extreme", "neighbour",
            "yes_no"} <= {alias for alias, _ in given}
    assert all(accepted for _, accepted in given)


def test_accepts_and_the_builder_each_refuse_their_own_forms(demo):
    a = analyse("jobs", demo.table)
    depot, cheapest = L.Eq("site", "Depot"), L.Extreme(L.All(), "price", "min")
    negate = SPECS["negate"]
    assert negate.accepts(depot) and not negate.accepts(cheapest)
    assert negate.build(a, "not", depot) == L.Not(depot)
    assert negate.accepts(L.Missing("status"))
    assert negate.build(a, "not", L.Missing("status")) is None    # `present` says that
    # top_values takes any rows (it has no `accepts`) and refuses the picked ones itself
    top_values = SPECS["top_values"]
    assert top_values.accepts is None
    assert top_values.build(a, "price", 3.0, cheapest, "max") is None
    assert top_values.build(a, "price", 3.0, depot, "max") == L.TopN("price", 3, depot, "price",
                                                                     "max")


def test_fits_drops_only_fillings_the_builder_refuses(demo):
    a = analyse("jobs", demo.table)
    spread = SPECS["spread"]
    assert spread.fits("max", "min", "price")
    assert spread.build(a, "max", "min", "price", L.All()) is not None
    assert not spread.fits("min", "max", "price")
    assert spread.build(a, "min", "max", "price", L.All()) is None
    which = SPECS["which_of_value"]
    depot, shed = ("site", "Depot"), ("site", "Wharf Shed")
    assert which.fits(depot, shed, "price", "max")
    assert which.build(a, depot, shed, "price", "max") == L.WhichOf(
        "site", "Depot", "Wharf Shed", "sum", "price", "max")
    for first, second, col in ((depot, depot, "price"), (depot, shed, "site")):
        assert not which.fits(first, second, col, "max")
        assert which.build(a, first, second, col, "max") is None


@pytest.mark.parametrize("alias, atoms, expected", [
    ("group_best", (Atom("KEYCOL", "mechanic"), Atom("AGG", "sum"), Atom("NUMCOL", "price"),
                    Atom("DIR", "max")), ["group_best", "group:sum", "dir:max"]),
    ("aggregate", (Atom("AGG", "avg"), Atom("NUMCOL", "price")), ["avg"]),
    ("count", (Atom("COUNT", "count"),), ["count", "count"]),
    ("extreme", (Atom("ORDCOL", "price"), Atom("DIR", "min")), ["extreme:min"]),
    ("spread", (Atom("AGG", "max"), Atom("AGG", "min"), Atom("NUMCOL", "price")),
     ["difference", "max", "min"]),
    ("all_rows", (Atom("ALL", "all"),), []),
])
def test_a_steps_fragments_are_its_specs_with_the_operators_filled_in(alias, atoms, expected):
    assert fragments(Step(alias, atoms, ())) == expected
