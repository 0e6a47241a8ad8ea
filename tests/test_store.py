"""tabq.store.ModelFolder: round trips, damaged files, the log, the lock and kills mid-save."""

import json
import multiprocessing
import os
import random
import signal
import time
import warnings

import pytest

from tabq.errors import ModelError
from tabq.table import TableRef
from tabq.model import Model
from tabq.records import Confirmation, LogWarning
from tabq.store import LOG, WEIGHTS, ModelFolder

FORK = multiprocessing.get_context("fork")


# ── (a) round trip ────────────────────────────────────────────────────────────────────────────
def test_a_fresh_folder_loads_the_prior(tmp_path):
    model = ModelFolder(tmp_path / "new").load()
    assert model.as_dict() == Model.prior().as_dict()
    assert ModelFolder(tmp_path / "new").read_log() == []


def test_save_then_load_keeps_the_weights(tmp_path):
    model = Model.prior()
    name, _ = next(iter(model.items()))
    model.update({name: 0.123456789, "learned:new|feature": -2.5, "another": 1e-3})
    folder = ModelFolder(tmp_path / "m")
    folder.save(model, objective="hinge", batches=1)
    back = folder.load()
    assert set(back.index) == set(model.index)
    for key, value in model.items():
        assert abs(back.weight(key) - value) < 1e-9, key
    data = json.loads((tmp_path / "m" / WEIGHTS).read_text())
    assert data["objective"] == "hinge" and data["batches"] == 1
    # stored as offsets from the prior: untouched prior weights are not written
    assert set(data["learned"]) == {name, "learned:new|feature", "another"}


def test_saving_the_prior_writes_no_offsets_and_loads_as_the_prior(tmp_path):
    folder = ModelFolder(tmp_path)
    folder.save(Model.prior())
    assert json.loads((tmp_path / WEIGHTS).read_text())["learned"] == {}
    assert folder.load().as_dict() == Model.prior().as_dict()


def test_a_file_in_place_of_the_folder_is_refused(tmp_path):
    (tmp_path / "file").write_text("x")
    with pytest.raises(ModelError):
        ModelFolder(tmp_path / "file")


# ── (b) damaged or foreign weights ────────────────────────────────────────────────────────────
BAD_WEIGHTS = {
    "garbage": b"\x89PNG\r\n\x1a\n\x00\xff\xfe garbage",
    "truncated": b'{"format": "tabq-weights", "version": 1, "learned": {"a": 1',
    "foreign": json.dumps({"name": "something else", "weights": [1, 2, 3]}).encode(),
    "list": b"[1, 2, 3]",
    "version": json.dumps({"format": "tabq-weights", "version": 99, "learned": {}}).encode(),
    "no version": json.dumps({"format": "tabq-weights", "learned": {}}).encode(),
    "bad learned": json.dumps({"format": "tabq-weights", "version": 1,
                               "learned": {"a": "high"}}).encode(),
    "bool learned": json.dumps({"format": "tabq-weights", "version": 1,
                                "learned": {"a": True}}).encode(),
}


@pytest.mark.parametrize("kind", list(BAD_WEIGHTS))
def test_damaged_or_foreign_weights_raise_model_error_and_are_left_alone(tmp_path, kind):
    path = tmp_path / WEIGHTS
    path.write_bytes(BAD_WEIGHTS[kind])
    with pytest.raises(ModelError) as info:
        ModelFolder(tmp_path).load()
    message = str(info.value)
    assert message and "\n" not in message and str(path) in message
    if kind == "version":
        assert "99" in message
    assert path.read_bytes() == BAD_WEIGHTS[kind]


def test_a_foreign_folder_is_not_taken_over(tmp_path):
    (tmp_path / "holiday.jpg").write_bytes(b"\xff\xd8")
    with pytest.raises(ModelError) as info, ModelFolder(tmp_path).locked():
        pass
    assert "\n" not in str(info.value)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["holiday.jpg"]


# ── (c) the log ───────────────────────────────────────────────────────────────────────────────
def _record(n, question: str = "q", **more) -> Confirmation:
    """A confirmation numbered n (its id), as the log keeps them."""
    return Confirmation(str(n), question, TableRef("/data/t.csv", None, None), [n], **more)


def _numbers(log) -> list[int]:
    return [int(r.id) for r in log]


def test_log_round_trip_in_order(tmp_path):
    folder = ModelFolder(tmp_path)
    folder.append_log([_record(1), _record(2, "é ✓")])
    folder.append_log([])
    folder.append_log([_record(3)])
    assert folder.read_log() == [_record(1), _record(2, "é ✓"), _record(3)]


def test_a_torn_last_line_is_ignored_and_left_as_it_is(tmp_path):
    folder = ModelFolder(tmp_path)
    folder.append_log([_record(1), _record(2)])
    with open(tmp_path / LOG, "ab") as f:
        f.write(b'{"kind": "confirmation", "id": "3", "quest')
    before = (tmp_path / LOG).read_bytes()
    with pytest.warns(LogWarning, match="torn"):
        assert _numbers(folder.read_log()) == [1, 2]
    assert (tmp_path / LOG).read_bytes() == before


def test_a_damaged_middle_line_is_skipped_with_a_warning_naming_it_and_kept(tmp_path):
    path = tmp_path / LOG
    folder = ModelFolder(tmp_path)
    folder.append_log([_record(1)])
    content = path.read_bytes() + b'{"n": 2, oops\n'
    path.write_bytes(content)
    folder.append_log([_record(3)])
    with pytest.warns(LogWarning, match="line 3") as caught:
        assert _numbers(folder.read_log()) == [1, 3]
    assert all("\n" not in str(w.message) for w in caught)
    assert path.read_bytes().startswith(content)


def test_a_log_line_that_is_not_an_object_is_skipped_with_a_warning(tmp_path):
    (tmp_path / LOG).write_text('{"question": "q", "answer": [1], "table": "t.csv"}\n[1, 2]\n')
    with pytest.warns(LogWarning, match="line 2"):
        assert len(ModelFolder(tmp_path).read_log()) == 1


def test_a_torn_write_does_not_stop_later_teaching(tmp_path):
    """A write cut short (disk full, a kill mid-append): the next append cuts the torn tail off
    and every later read sees every complete record, without a warning."""
    path = tmp_path / LOG
    folder = ModelFolder(tmp_path)
    folder.append_log([_record(1)])
    with open(path, "ab") as f:
        f.write(b'{"kind": "confirmation", "id": "2", "quest')
    with pytest.warns(LogWarning, match="cut off"):
        folder.append_log([_record(3)])
    folder.append_log([_record(4)])
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert _numbers(folder.read_log()) == [1, 3, 4]


def test_a_log_from_a_newer_tabq_is_refused_and_left_as_it_is(tmp_path):
    content = b'{"kind": "log", "format": "tabq-log", "version": 99}\n'
    (tmp_path / LOG).write_bytes(content)
    with pytest.raises(ModelError, match="newer tabq"):
        ModelFolder(tmp_path).read_log()
    assert (tmp_path / LOG).read_bytes() == content


# ── (d) two teachers at once ──────────────────────────────────────────────────────────────────
def _teacher(path, who, count, start):
    start.wait()
    folder = ModelFolder(path)
    for n in range(count):
        with folder.locked():
            log = folder.read_log()
            folder.append_log([Confirmation(str(n), who, TableRef("t.csv", None, None),
                                            [len(log)])])
            model = folder.load()
            model.update({f"feat:{who}": 0.01})
            folder.save(model, batches=len(log) + 1)
    os._exit(0)


def test_two_processes_teaching_at_once_lose_nothing(tmp_path):
    start = FORK.Event()
    procs = [FORK.Process(target=_teacher, args=(tmp_path, who, 50, start)) for who in "xy"]
    for p in procs:
        p.start()
    start.set()
    for p in procs:
        p.join(30)
        assert p.exitcode == 0
    log = ModelFolder(tmp_path).read_log()
    assert len(log) == 100
    assert sorted((r.question, int(r.id)) for r in log) == sorted(
        (w, n) for w in "xy" for n in range(50))
    # under the lock each teacher saw every record written before it
    assert sorted(r.answer[0] for r in log) == list(range(100))
    model = ModelFolder(tmp_path).load()
    assert model.weight("feat:x") == pytest.approx(0.5)
    assert model.weight("feat:y") == pytest.approx(0.5)


# ── (e) killed while saving ───────────────────────────────────────────────────────────────────
def _big_model():
    model = Model.prior()
    model.update({f"big:{i}": i * 1e-3 for i in range(8000)})    # ~160 kB of weights
    return model


def _saver(path, model, write_fd):
    folder = ModelFolder(path)
    n = 0
    while True:
        folder.append_log([_record(n)])
        os.write(write_fd, f"{n}\n".encode())     # only after append_log returned (fsynced)
        model.update({"big:0": 1.0})
        folder.save(model, batches=n)
        n += 1


def _read_line(fd):
    line = b""
    while not line.endswith(b"\n"):
        chunk = os.read(fd, 1)
        if not chunk:
            break
        line += chunk
    return line


def test_a_kill_at_any_moment_leaves_loadable_weights_and_every_acknowledged_record(tmp_path):
    rng = random.Random(7)
    model = _big_model()
    acknowledged = []
    for round_ in range(20):
        read_fd, write_fd = os.pipe()
        child = FORK.Process(target=_saver, args=(tmp_path, model, write_fd))
        child.start()
        os.close(write_fd)
        first = _read_line(read_fd)                # the child is running and has logged once
        if round_ % 2:                             # and, on a slow machine too, has saved once
            first += _read_line(read_fd)
        time.sleep(rng.uniform(0.0, 0.1))
        os.kill(child.pid, signal.SIGKILL)
        child.join(10)
        assert child.exitcode == -signal.SIGKILL
        with os.fdopen(read_fd, "rb") as pipe:
            told = [int(x) for x in (first + pipe.read()).split()]
        assert told, "the child was killed before it logged anything"
        folder = ModelFolder(tmp_path)
        loaded = folder.load()                     # the old or the new weights, never torn
        assert "op:count" in loaded.index
        if (tmp_path / "weights.json").exists():
            assert "big:7999" in loaded.index
        written = _numbers(folder.read_log())
        assert set(told) <= set(written)
        acknowledged += told
    assert (tmp_path / "weights.json").exists(), "no save ever completed: the test proves nothing"
    assert len(acknowledged) > 20
