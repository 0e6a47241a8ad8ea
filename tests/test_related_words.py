"""Words related by meaning, from WordNet (tools/make_related.py → tabq/data/related.tsv): the
generator's reading of the WNDB format, and question words that name a column only through
them. Every expected answer is computed by pandas from the same rows; the tables are invented."""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import tabq
from tabq import prior
from tabq.answers import matches

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tools"))
import make_related  # noqa: E402

LICENCE = "  1 This software and database is being provided to you, the LICENSEE\n"
# offsets are invented; the layout is wndb(5WN)'s: words and their count in hex, then pointers
DATA = {
    "adj": LICENCE +
    "00000100 00 a 01 heavy 0 002 = 00000200 n 0000 + 00000300 n 0101 | of great weight\n"
    "00000150 00 s 01 hefty 0 001 & 00000100 a 0000 | large and strong\n",
    "noun": LICENCE +
    "00000200 07 n 02 weight 0 free_weight 0 001 = 00000100 a 0000 | the vertical force\n"
    "00000300 07 n 01 heaviness 0 001 + 00000100 a 0101 | the property of being heavy\n"
    "00000400 18 n 03 student 0 pupil 0 educatee 0 001 @ 00000500 n 0000 | a learner\n"
    "00000500 18 n 01 enrollee 0 000 | a person enrolled\n",
    "verb": LICENCE +
    "00000600 40 v 02 spend 0 expend 0 001 + 00000700 n 0201 01 + 01 00 | pay out\n",
    "adv": LICENCE,
}
DATA["noun"] += "00000700 04 n 01 expenditure 0 001 + 00000600 v 0102 | money paid out\n"
INDEX = {
    "adj": LICENCE + "heavy a 1 2 = + 1 1 00000100  \nhefty a 1 1 & 1 1 00000150  \n",
    "noun": LICENCE + "weight n 1 1 = 1 1 00000200  \nstudent n 1 1 @ 1 1 00000400  \n"
    "pupil n 1 1 @ 1 1 00000400  \nexpenditure n 1 1 + 1 1 00000700  \n"
    "enrollee n 1 0 1 1 00000500  \nheaviness n 1 1 + 1 1 00000300  \n",
    "verb": LICENCE + "spend v 1 1 + 1 1 00000600  \nexpend v 1 1 + 1 1 00000600  \n",
    "adv": LICENCE,
}


@pytest.fixture(scope="module")
def wordnet(tmp_path_factory) -> Path:
    folder = tmp_path_factory.mktemp("wndb")
    for name in DATA:
        (folder / f"data.{name}").write_text(DATA[name])
        (folder / f"index.{name}").write_text(INDEX[name])
    (folder / "adj.exc").write_text("heavier heavy\nheftier hefty\n")
    (folder / "verb.exc").write_text("spent spend\n")
    return folder


def test_a_data_line_gives_words_and_pointers():
    s = make_related.parse_data_line(DATA["adj"].splitlines()[1])
    assert (s.offset, s.pos, s.words) == ("00000100", "a", ["heavy"])
    assert s.pointers == [("=", "00000200", "n", 0, 0), ("+", "00000300", "n", 1, 1)]
    assert make_related.parse_data_line(LICENCE) is None


def test_an_index_line_gives_the_tagged_senses():
    assert make_related.parse_index_line("weight n 1 1 = 1 1 00000200  ") == (
        "weight", ["00000200"], True)
    assert make_related.parse_index_line("enrollee n 1 0 1 0 00000500  ") == (
        "enrollee", [], False)


def test_the_relations_read_from_a_sample(wordnet):
    synsets, senses, tagged = make_related.read(wordnet)
    table = make_related.relations(synsets, senses, tagged)
    make_related.add_exceptions(table, make_related.read_exceptions(wordnet))
    assert table["attr"]["heavy"] == {"weight", "free_weight"}
    assert table["attr"]["hefty"] == {"weight", "free_weight"}   # through its head, heavy
    assert table["attr"]["heavier"] == table["attr"]["heavy"]    # adj.exc
    assert table["deriv"]["heavy"] == {"heaviness"}               # lexical: word 1 → word 1
    assert table["deriv"]["expend"] == {"expenditure"}           # word 2 of the verb synset
    assert table["syn"]["pupil"] >= {"student", "educatee"}
    assert table["hyper"]["student"] == {"enrollee"}
    rows = make_related.stemmed(table)
    assert ("attr", "heavi", ["weight"]) in rows                 # free_weight is two words


def test_the_shipped_table_holds_measure_words():
    assert "weight" in prior.related("heavi")
    assert "temperatur" in prior.related("hot")
    assert "citat" in prior.related("cite")
    assert "student" in prior.related("pupil")
    assert "distanc" in prior.related("farthest")


@pytest.fixture(scope="module")
def schools(tmp_path_factory) -> tuple[pd.DataFrame, tabq.OpenTable]:
    rng = np.random.default_rng(7)
    n = 30
    frame = pd.DataFrame({
        "school": [a + b for a in ("Ash", "Bram", "Corr", "Dun", "Elm", "Fern")
                   for b in ("ford", "ley", "wick", "mere", "holt")],
        "enrltot": rng.choice(np.arange(100, 2000), n, replace=False),
        "distance": rng.choice(np.arange(10, 400), n, replace=False) / 10,
        "citestot": rng.choice(np.arange(0, 900), n, replace=False),
    })
    path = tmp_path_factory.mktemp("related") / "schools.csv"
    frame.to_csv(path, index=False)
    return frame, tabq.open(path, model=tabq.Model.prior())


@pytest.mark.parametrize("question, expected", [
    ("which school has the most pupils", lambda f: f.school[f.enrltot.idxmax()]),
    ("how many schools have more than 1000 students", lambda f: int((f.enrltot > 1000).sum())),
    ("which school is farthest", lambda f: f.school[f.distance.idxmax()]),
    ("which school is the most cited", lambda f: f.school[f.citestot.idxmax()]),
])
def test_a_related_word_names_a_column(schools, question, expected):
    frame, table = schools
    assert matches(table.ask(question).answer, [expected(frame)]), question   # pandas


def test_heaviest_names_a_weight_column(tmp_path):
    frame = pd.DataFrame({"parcel": ["P1", "P2", "P3", "P4"], "wt": [2.5, 9.1, 4.0, 0.7]})
    path = tmp_path / "parcels.csv"
    frame.to_csv(path, index=False)
    answer = tabq.open(path, model=tabq.Model.prior()).ask("which parcel is the heaviest").answer
    assert matches(answer, [frame.parcel[frame.wt.idxmax()]])   # pandas
