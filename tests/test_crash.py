"""Real teaching (teaching.teach, the work behind `tabq teach`) killed at random moments, many
times, and two teachers at once on one model folder. tests/test_store.py kills the bare store
while it saves; here the whole teaching step is the victim."""

import multiprocessing
import os
import random
import signal
import time
from pathlib import Path

import pytest

from tabq.store import ModelFolder
from tabq.teaching import Job, teach

FORK = multiprocessing.get_context("fork")
# A small invented table (a tool library's loans) keeps each teaching step short; its answers
# are counted by hand from the rows below.
LOANS = "tool,status,days\ndrill,out,3\nsaw,back,2\nladder,out,5\ndrill,back,1\nsander,late,9\n"
CONFIRMED = [("how many loans are out", [2]), ("how many loans", [5]),
             ("how many loans were late", [1])]


def _job(table: Path, who: str, n: int) -> Job:
    question, answer = CONFIRMED[n % len(CONFIRMED)]
    return Job(f"{who}{n}", question, str(table), answer)


def _loans(tmp_path: Path) -> Path:
    path = tmp_path / "loans.csv"
    path.write_text(LOANS)
    return path


def _teacher(path, table, who, count, write_fd):
    """Teach one confirmation at a time; report each only after teach() returned."""
    folder = ModelFolder(path)
    for n in range(count):
        teach(folder, [_job(table, who, n)], epochs=1, workers=1)
        os.write(write_fd, f"{who}{n}\n".encode())
    os._exit(0)


def _reported(read_fd) -> list[str]:
    with os.fdopen(read_fd, "rb") as pipe:
        return pipe.read().decode().split()


@pytest.mark.long   # twelve teachers killed after waits of up to 1.5 s each: about 13 s
def test_teaching_killed_at_random_moments_loses_nothing_it_reported(tmp_path):
    rng = random.Random(11)
    table = _loans(tmp_path)
    reported: list[str] = []
    kills = 0
    for round_ in range(12):
        models = tmp_path / f"model{round_ // 4}"   # a fresh folder now and then: the replay
        read_fd, write_fd = os.pipe()              # of a long log makes each step slower
        child = FORK.Process(target=_teacher, args=(models, table, f"r{round_}-", 100,
                                                    write_fd))
        child.start()
        os.close(write_fd)
        told = b""
        if rng.random() < 0.5:                     # half the kills come after a reported step
            while not told.endswith(b"\n"):
                told += os.read(read_fd, 1) or b"\n"
        time.sleep(rng.uniform(0.0, 1.5))
        os.kill(child.pid, signal.SIGKILL)
        child.join(10)
        kills += child.exitcode == -signal.SIGKILL
        reported += told.decode().split() + _reported(read_fd)
        folder = ModelFolder(models)
        folder.load()                              # loads: old weights or new, never torn
        logged = {r.id for r in folder.read_log()}
        same_folder = tuple(f"r{r}-" for r in range(round_ // 4 * 4, round_ + 1))
        assert {r for r in reported if r.startswith(same_folder)} <= logged   # none lost since
        with folder.locked():                      # a killed teacher left no lock behind
            pass
    assert kills >= 10
    assert len(reported) >= 4, "few teaching steps finished: the test proves little"


def test_two_teachers_of_one_model_lose_nothing(tmp_path):
    table, models = _loans(tmp_path), tmp_path / "model"
    pipes, procs = [], []
    for who in "xy":
        read_fd, write_fd = os.pipe()
        procs.append(FORK.Process(target=_teacher, args=(models, table, who, 3, write_fd)))
        pipes.append((read_fd, write_fd))
    for proc, (_, write_fd) in zip(procs, pipes):
        proc.start()
        os.close(write_fd)
    reported = []
    for proc, (read_fd, _) in zip(procs, pipes):
        proc.join(300)
        assert proc.exitcode == 0
        reported += _reported(read_fd)
    folder = ModelFolder(models)
    log = folder.read_log()
    assert sorted(reported) == sorted(f"{w}{n}" for w in "xy" for n in range(3))
    assert sorted(r.id for r in log) == sorted(reported)
    assert sorted({r.batch for r in log}) == list(range(1, 7))   # six steps, one at a time
    folder.load()
