"""tabq.store.ModelFolder: round trips, damaged files, the log, the lock and kills mid-save."""

import errno
import json
import multiprocessing
import os
import random
import signal
import stat
import threading
import time
import warnings

import pytest

from tabq.errors import ModelError
from tabq.table import TableRef
from tabq.model import Model
from tabq.records import Confirmation, LogWarning
from tabq import records, safeio, store
from tabq.store import LOCK, LOG, WEIGHTS, ModelFolder

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
    # weights that are not finite numbers would make every score NaN and --json invalid
    **{f"learned {text}": b'{"format": "tabq-weights", "version": 1, "learned": {"cover": '
       + text.encode() + b'}}' for text in ("NaN", "Infinity", "-Infinity", "1e400", "1e308",
                                           "1" + "0" * 400)},
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


# ── (f) links, modes, odd files, full and read-only disks ─────────────────────────────────────
def _taught(folder: ModelFolder) -> None:
    """What teaching does to a folder: log under the lock, then save."""
    with folder.locked():
        folder.append_log([_record(1)])
        model = folder.load()
        model.update({"feat:x": 0.5})
        folder.save(model, batches=1)


@pytest.mark.parametrize("name", [LOG, LOCK])
def test_a_dangling_link_in_the_folder_is_refused_and_its_target_never_made(tmp_path, name):
    folder_path, outside = tmp_path / "m", tmp_path / "outside" / "target"
    folder_path.mkdir()
    outside.parent.mkdir()
    (folder_path / name).symlink_to(outside)
    with pytest.raises(ModelError) as info:
        _taught(ModelFolder(folder_path))
    assert "is a symbolic link" in str(info.value) and "\n" not in str(info.value)
    assert not outside.exists() and list(outside.parent.iterdir()) == []


@pytest.mark.parametrize("name", [LOG, WEIGHTS])
def test_a_link_to_a_real_file_is_neither_read_nor_written(tmp_path, name):
    folder_path, outside = tmp_path / "m", tmp_path / "elsewhere.txt"
    folder_path.mkdir()
    outside.write_text("someone else's file\n")
    (folder_path / name).symlink_to(outside)
    folder = ModelFolder(folder_path)
    with pytest.raises(ModelError, match="symbolic link"):
        folder.load() if name == WEIGHTS else folder.read_log()
    with pytest.raises(ModelError):
        _taught(folder)
    assert outside.read_text() == "someone else's file\n"


@pytest.mark.parametrize("umask", [0o022, 0o027, 0o077])
def test_weights_and_log_get_the_mode_of_any_new_file(tmp_path, umask):
    """tempfile.mkstemp made weights.json 0600 while log.jsonl beside it was 0644."""
    old = os.umask(umask)
    try:
        _taught(ModelFolder(tmp_path / "m"))
    finally:
        os.umask(old)
    modes = {name: stat.S_IMODE((tmp_path / "m" / name).stat().st_mode)
             for name in (WEIGHTS, LOG, LOCK)}
    assert set(modes.values()) == {0o666 & ~umask}, modes


def _finishes(call, seconds: float = 20.0):
    """What `call` raised or returned, failing (not hanging) when it does not end in time."""
    out: dict = {}

    def run():
        try:
            out["value"] = call()
        except BaseException as err:  # noqa: BLE001 - handed back to the test
            out["error"] = err
    worker = threading.Thread(target=run, daemon=True)
    worker.start()
    worker.join(seconds)
    assert not worker.is_alive(), f"{call} did not finish: it blocked on the file"
    return out


@pytest.mark.parametrize("name", [WEIGHTS, LOG])
def test_a_fifo_in_place_of_a_folder_file_is_refused_without_waiting(tmp_path, name):
    os.mkfifo(tmp_path / name)
    folder = ModelFolder(tmp_path)
    out = _finishes(folder.load if name == WEIGHTS else folder.read_log)
    assert isinstance(out.get("error"), ModelError), out
    assert "not a regular file" in str(out["error"])


def test_a_weights_file_past_its_limit_is_refused_unread(tmp_path, monkeypatch):
    monkeypatch.setattr(store, "MAX_WEIGHTS_BYTES", 1000)
    with open(tmp_path / WEIGHTS, "wb") as f:
        f.truncate(1 << 40)               # a terabyte, sparse: reading it whole would never end
    with pytest.raises(ModelError, match="too large"):
        ModelFolder(tmp_path).load()


def _no_space(*_args, **_kwargs):
    raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))


def test_a_full_disk_while_saving_says_so_and_keeps_the_log(tmp_path, monkeypatch):
    folder = ModelFolder(tmp_path)
    _taught(folder)
    monkeypatch.setattr(store, "atomic_write", _no_space)
    with pytest.raises(ModelError) as info:
        _taught(folder)
    message = str(info.value)
    assert f"cannot write the model folder {tmp_path}: no space left on device" in message
    assert "\n" not in message
    # both confirmations are logged; the stale weights are gone, so the next use rebuilds them
    assert _numbers(folder.read_log()) == [1, 1]
    assert not (tmp_path / WEIGHTS).exists()
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".tmp-")] == []


def test_a_full_disk_while_logging_says_so_and_saves_nothing(tmp_path, monkeypatch):
    if not os.path.exists("/dev/full"):
        pytest.skip("needs /dev/full")
    folder = ModelFolder(tmp_path)
    _taught(folder)
    before = (tmp_path / LOG).read_bytes(), (tmp_path / WEIGHTS).read_bytes()
    monkeypatch.setattr(records, "open_regular", lambda *a: os.open("/dev/full", os.O_RDWR))
    with pytest.raises(ModelError, match="no space left on device"):
        _taught(folder)
    assert ((tmp_path / LOG).read_bytes(), (tmp_path / WEIGHTS).read_bytes()) == before


@pytest.mark.parametrize("code", [errno.EROFS, errno.EACCES])
def test_a_read_only_folder_says_so_in_one_line(tmp_path, monkeypatch, code):
    """Root ignores file modes, so a read-only folder is simulated at os.open."""
    folder = ModelFolder(tmp_path)
    _taught(folder)
    real_open = os.open

    def refuse(path, flags, *args):
        if flags & (os.O_WRONLY | os.O_RDWR | os.O_CREAT):
            raise OSError(code, os.strerror(code), str(path))
        return real_open(path, flags, *args)
    monkeypatch.setattr(safeio.os, "open", refuse)
    with pytest.raises(ModelError) as info:
        _taught(folder)
    assert f"cannot write the model folder {tmp_path}: {os.strerror(code).lower()}" in str(
        info.value)
    monkeypatch.undo()
    assert ModelFolder(tmp_path).load().weight("feat:x") > 0     # what was there is still there


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes to a 0555 folder regardless")
def test_a_folder_without_write_permission_says_so(tmp_path):
    folder = ModelFolder(tmp_path / "m")
    _taught(folder)
    os.chmod(tmp_path / "m", 0o555)
    try:
        with pytest.raises(ModelError, match="permission denied"):
            _taught(folder)
    finally:
        os.chmod(tmp_path / "m", 0o755)


def test_a_log_line_missing_a_field_is_skipped_with_a_warning_naming_it(tmp_path):
    folder = ModelFolder(tmp_path)
    folder.append_log([_record(1)])
    line = json.dumps({"kind": "confirmation", "id": "2", "answer": [2],
                       "table": {"path": "/t.csv"}}) + "\n"
    with open(tmp_path / LOG, "a") as f:
        f.write(line)
    folder.append_log([_record(3)])
    with pytest.warns(LogWarning, match="line 3 .*the field 'question' is missing"):
        assert _numbers(folder.read_log()) == [1, 3]
    assert line in (tmp_path / LOG).read_text()


@pytest.mark.parametrize("record", [
    {"kind": "import", "source": "x.json", "sha256": "0", "mode": "merge",
     "learned": {"cover": "high"}},
    {"kind": "import", "source": "x.json", "sha256": "0", "mode": "merge",
     "learned": {"cover": float("nan")}},
    {"kind": "confirmation", "question": "q", "answer": [1], "table": "t.csv", "senses": "abc"},
    {"kind": "confirmation", "question": "q", "answer": [1], "table": "t.csv", "rows": "1,2"},
    {"kind": "confirmation", "question": "q", "answer": [1], "table": "t.csv",
     "strength": "strong"},
])
def test_a_log_field_of_the_wrong_kind_is_damage_not_a_crash_later(tmp_path, record):
    (tmp_path / LOG).write_text(json.dumps(record) + "\n")
    with pytest.warns(LogWarning, match="line 1 is damaged"):
        assert ModelFolder(tmp_path).read_log() == []
