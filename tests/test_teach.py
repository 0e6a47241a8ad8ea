"""Teaching from answers alone: a team word the prior misreads, learned on one table, used on
another; example files; rebuilding a model from its log."""

import csv
import json

import pytest

import tabq
from tabq.store import ModelFolder
from tabq.teaching import ExamplesError, Job, read_examples, rebuild, teach

PLANTS = ["Fern", "Basil", "Monstera", "Cactus", "Lavender", "Rosemary", "Orchid", "Aloe"]
SIZES = ["small", "medium", "large"]


def _nursery(path, statuses):
    """A plant nursery's orders: one row per order, `status` paid / refunded / pending."""
    with open(path, "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["order_id", "plant", "pot_size", "price", "status"])
        for i, status in enumerate(statuses):
            w.writerow([1000 + i, PLANTS[i % 8], SIZES[(i * 7) % 3],
                        f"{4 + (i * 37) % 56}.{(i * 13) % 100:02d}", status])
    return path


@pytest.fixture(scope="module")
def tables(tmp_path_factory):
    root = tmp_path_factory.mktemp("nursery")
    first = _nursery(root / "orders.csv",
                     ["paid", "pending", "paid", "refunded", "paid", "paid", "pending", "refunded",
                      "paid", "paid", "refunded", "pending", "paid", "paid", "paid", "pending",
                      "refunded", "paid", "paid", "pending", "paid", "paid", "pending", "paid"])
    # same columns, other rows: 7 refunds among 17 orders
    second = _nursery(root / "spring_orders.csv",
                      ["refunded", "paid", "refunded", "refunded", "pending", "paid", "refunded",
                       "paid", "refunded", "paid", "refunded", "pending", "paid", "refunded",
                       "paid", "paid", "pending"])
    return first, second


TAUGHT = ["how many returns were there", "count the returns", "number of returns",
          "how many returns did we get"]
NEW_PHRASING = "how many returns in all"


@pytest.fixture(scope="module")
def taught(tables, tmp_path_factory):
    first, _ = tables
    folder = ModelFolder(tmp_path_factory.mktemp("model"))
    jobs = [Job(str(i), q, str(first), [4]) for i, q in enumerate(TAUGHT)]
    report = teach(folder, jobs, epochs=3, workers=1)
    return folder, report


def test_untaught_the_team_word_is_misread_but_the_right_reading_is_a_candidate(tables):
    first, second = tables
    for path, refunds in [(first, 4), (second, 7)]:
        for q in (NEW_PHRASING, "how many returns were there"):
            result = tabq.open(path).ask(q)
            assert result.answer != [refunds], (path.name, q, result.sql)
            assert any("refunded" in (c.sql or "") for c in result.candidates), q


def test_answers_alone_teach_the_word_and_a_new_phrasing_is_read_right(tables, taught):
    first, _ = tables
    folder, report = taught
    assert (report.taught, report.reachable, report.skipped) == (4, 4, [])
    result = tabq.open(first, model=folder.path).ask(NEW_PHRASING)
    assert result.answer == [4]
    assert "refunded" in result.sql
    # untouched questions keep their prior reading
    assert tabq.open(first, model=folder.path).ask("how many orders were paid").answer == [14]


def test_the_word_taught_on_one_table_helps_on_another_with_the_same_columns(tables, taught):
    _, second = tables
    folder, _ = taught
    result = tabq.open(second, model=folder.path).ask("how many returns were there")
    assert result.answer == [7]
    assert "refunded" in result.sql


def test_teaching_logs_every_confirmation(taught):
    folder, _ = taught
    log = folder.read_log()
    assert [r.question for r in log] == TAUGHT
    assert all(r.batch == 1 and r.answer == [4] and r.table.fingerprint for r in log)
    assert all("refunded" in (r.query or "") for r in log)


def test_rebuild_from_the_log_gives_the_saved_models_answers(tables, taught):
    first, second = tables
    folder, _ = taught
    rebuilt = rebuild(folder, workers=1)
    saved = tabq.open(first, model=folder.path)
    again = tabq.open(first, model=rebuilt)
    for q in [*TAUGHT, NEW_PHRASING]:
        assert again.ask(q).answer == saved.ask(q).answer, q
    assert (tabq.open(second, model=rebuilt).ask("how many returns were there").answer
            == tabq.open(second, model=folder.path).ask("how many returns were there").answer)


def test_a_version_1_log_still_rebuilds_the_same_model(taught, tmp_path):
    """A log written before typed records (no header, no kind, the table a bare path with the
    file's sha256 beside it) is read and replayed like a new one."""
    import hashlib

    folder, _ = taught
    old = ModelFolder(tmp_path / "old")
    lines = []
    for r in folder.read_log():
        digest = hashlib.sha256(open(r.table.path, "rb").read()).hexdigest()
        lines.append(json.dumps({"id": r.id, "question": r.question, "table": r.table.path,
                                 "fingerprint": digest, "answer": r.answer, "query": r.query,
                                 "senses": r.senses, "time": r.time, "batch": r.batch}))
    old.path.mkdir()
    (old.path / "log.jsonl").write_text("\n".join(lines) + "\n")
    assert [(r.question, r.table.fingerprint) for r in old.read_log()] == [
        (r.question, r.table.fingerprint) for r in folder.read_log()]
    assert rebuild(old, workers=1).as_dict() == rebuild(folder, workers=1).as_dict()


def _count(path, **where):
    """Rows of a CSV whose columns hold these values, counted by the csv module."""
    with open(path, newline="") as f:
        return sum(all(row[k] == v for k, v in where.items()) for row in csv.DictReader(f))


def test_one_confirmation_carries_to_related_questions(tables, tmp_path):
    # one confirmed answer teaches the word; questions that add a plant or a size to it are
    # read right on both tables, though none of them was ever confirmed
    first, second = tables
    folder = ModelFolder(tmp_path / "model")
    teach(folder, [Job("1", "how many returns were there", str(first),
                       [_count(first, status="refunded")])], workers=1)
    for path in (first, second):
        opened = tabq.open(path, model=folder.path)
        for question, where in [("how many returns of Fern", {"plant": "Fern"}),
                                ("how many returns for Orchid", {"plant": "Orchid"}),
                                ("how many returns of large pots", {"pot_size": "large"})]:
            result = opened.ask(question)
            assert result.answer == [_count(path, status="refunded", **where)], (
                path.name, question, result.sql)
            assert "refunded" in result.sql


# ── example files ─────────────────────────────────────────────────────────────────────────────
def test_read_examples_reads_a_good_file(tmp_path, tables):
    first, _ = tables
    path = tmp_path / "ex.jsonl"
    path.write_text(json.dumps({"question": "how many returns", "answer": 4}) + "\n\n"
                    + json.dumps({"id": "b", "question": "q two", "answer": ["x", 2]}) + "\n")
    jobs = read_examples(path, table=first)
    assert [(j.id, j.question, j.answer) for j in jobs] == [
        ("1", "how many returns", [4]), ("b", "q two", ["x", 2])]
    assert all(j.table == str(first.resolve()) for j in jobs)


@pytest.mark.parametrize("bad", [
    '{"question": "how many", "answer": [4]',      # not JSON
    '[1, 2]',                                       # not an object
    '{"answer": [4]}',                              # no question
    '{"question": "how many"}',                     # no answer
    '{"question": "how many", "answer": {"a": 1}}',  # answer of the wrong kind
])
def test_read_examples_names_the_bad_line(tmp_path, tables, bad):
    first, _ = tables
    path = tmp_path / "ex.jsonl"
    path.write_text('{"question": "one", "answer": [1]}\n\n' + bad + "\n"
                    + '{"question": "four", "answer": [4]}\n')
    with pytest.raises(ExamplesError) as info:
        read_examples(path, table=first)
    assert f"{path}:3:" in str(info.value)


def test_read_examples_without_a_table_needs_one_per_line(tmp_path):
    path = tmp_path / "ex.jsonl"
    path.write_text('{"question": "one", "answer": [1]}\n')
    with pytest.raises(ExamplesError, match=":1:"):
        read_examples(path)


@pytest.mark.parametrize("kind", ["fifo", "zero"])
def test_an_examples_file_that_never_ends_is_refused_at_once(tmp_path, kind):
    """`tabq teach t.csv /dev/zero` or a FIFO: refused before a read that would never end."""
    import os
    import threading
    path = tmp_path / "examples.jsonl"
    os.mkfifo(path) if kind == "fifo" else path.symlink_to("/dev/zero")
    caught: list = []

    def read():
        try:
            read_examples(path, table="t.csv")
        except ExamplesError as err:
            caught.append(err)
    worker = threading.Thread(target=read, daemon=True)
    worker.start()
    worker.join(20)
    assert not worker.is_alive() and caught and "not a regular file" in str(caught[0])


def test_an_examples_file_past_its_limit_is_refused(tmp_path, monkeypatch):
    from tabq.teaching import examples
    monkeypatch.setattr(examples, "MAX_BYTES", 100)
    path = tmp_path / "examples.jsonl"
    path.write_text('{"question": "how many", "answer": [1]}\n' * 10)
    with pytest.raises(ExamplesError, match="too large"):
        read_examples(path, table="t.csv")


def test_read_examples_missing_or_empty_file(tmp_path):
    with pytest.raises(ExamplesError, match="no such file"):
        read_examples(tmp_path / "nope.jsonl", table="t.csv")
    (tmp_path / "empty.jsonl").write_text("\n\n")
    with pytest.raises(ExamplesError, match="no examples"):
        read_examples(tmp_path / "empty.jsonl", table="t.csv")


# ── the app's needs: a search cache, retractions, a pick confirmed on some rows ──────────────
def test_a_cache_of_searches_gives_the_same_model_without_searching_again(tables, monkeypatch):
    from tabq import teaching
    from tabq.model import Model
    first, _ = tables
    jobs = [Job(str(i), q, str(first), [4]) for i, q in enumerate(TAUGHT)]
    searches = teaching.Searches()
    searched, _, _ = teaching.learn_from(Model.prior(), jobs, workers=1, searches=searches)
    assert len(searches.found) == len(jobs)

    def no_search(*args, **kwargs):
        raise AssertionError("searched again")
    monkeypatch.setattr(teaching.learning, "run_parallel", no_search)
    cached, report, _ = teaching.learn_from(Model.prior(), jobs, workers=1, searches=searches)
    assert report.taught == len(jobs)
    assert cached.as_dict() == searched.as_dict()


def test_a_retracted_confirmation_stays_in_the_log_and_stops_counting(tables, tmp_path):
    from tabq.records import live
    from tabq.teaching import retract
    first, _ = tables
    folder = ModelFolder(tmp_path / "m")
    before = folder.load()
    report = teach(folder, [Job("r1", TAUGHT[0], str(first), [4], strength=2.0)], workers=1)
    assert tabq.open(first, model=folder.path).ask(TAUGHT[0]).answer == [4]
    assert tabq.open(first, model=before).ask(TAUGHT[0]).answer != [4]
    saved = retract(folder, report.records[0], before=before)
    log = folder.read_log()
    assert log[0].question == TAUGHT[0]                          # nothing is lost
    assert log[1].of_id == "r1" and log[1].of_batch == 1 and log[1].batch == 2
    assert live(log) == []
    assert folder.load().as_dict() == saved.as_dict() == before.as_dict()
    assert rebuild(folder, workers=1).as_dict() == before.as_dict()
    assert tabq.open(first, model=folder.path).ask(TAUGHT[0]).answer != [4]
    # the next teaching replays nothing retracted
    assert teach(folder, [Job("r2", TAUGHT[1], str(first), [4])], workers=1).replayed == 0


def test_retracting_an_older_batch_rebuilds_from_the_log(tables, tmp_path):
    from tabq.teaching import retract
    first, _ = tables
    folder = ModelFolder(tmp_path / "m")
    one = teach(folder, [Job("a", TAUGHT[0], str(first), [4])], workers=1)
    teach(folder, [Job("b", "how many orders were paid", str(first), [14])], workers=1)
    saved = retract(folder, one.records[0])
    only_b = ModelFolder(tmp_path / "b")
    teach(only_b, [Job("b", "how many orders were paid", str(first), [14])], workers=1)
    def nonzero(model):
        return {k: v for k, v in model.as_dict().items() if abs(v) > 1e-9}
    assert nonzero(saved) == pytest.approx(nonzero(only_b.load()))


def test_a_pick_confirmed_on_some_rows_narrows_the_consistent_readings(tables):
    from tabq.learn import candidates
    first, _ = tables
    table = tabq.open(first)
    # order 1000 (row 0) is paid, 1001 (row 1) pending: on those rows "paid" gives 1, "not
    # refunded" gives 2, though both give 14 and 20 … on the whole table they differ anyway;
    # the check is that the row answer filters the consistent set
    whole = candidates(table, "how many orders were paid", [14])
    narrowed = candidates(table, "how many orders were paid", [14], rows=[0, 1], rows_gold=[1])
    assert whole.forms == narrowed.forms
    kept = [f for f, ok in zip(narrowed.forms, narrowed.correct) if ok]
    assert kept and set(kept) <= {f for f, ok in zip(whole.forms, whole.correct) if ok}
    assert all("paid" in f for f in kept)
    wrong_rows = candidates(table, "how many orders were paid", [14], rows=[0, 1], rows_gold=[2])
    assert not any(c and "\"paid\"" in f and "not" not in f
                   for f, c in zip(wrong_rows.forms, wrong_rows.correct))
