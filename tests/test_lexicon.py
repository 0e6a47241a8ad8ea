"""The lexicon file: export, import, round trips, hostile files, the schema, diff and show."""

import copy
import csv
import hashlib
import json
import os
import shutil
import stat
import subprocess
import sys
from pathlib import Path

import jsonschema
import pytest

import tabq
from tabq import featurenames, lexicon
from tabq.analyse import analyse, question_grams
from tabq.featurenames import Pair
from tabq.errors import InputError
from tabq.lexicon import LexiconError
from tabq.load import load_table
from tabq.model import Model
from tabq.store import LOG, WEIGHTS, ModelFolder
from tabq.teaching import Job, rebuild, teach
from tabq.ui import learned

SCHEMA = json.loads((Path(__file__).resolve().parent.parent / "docs" / "lexicon.schema.json")
                    .read_text(encoding="utf-8"))
PLANTS = ["Fern", "Basil", "Monstera", "Cactus", "Lavender", "Rosemary", "Orchid", "Aloe"]
TAUGHT = ["how many returns were there", "count the returns", "number of returns",
          "how many returns did we get"]


def _orders(path, statuses):
    """An invented plant nursery's orders: `status` paid / refunded / pending."""
    with open(path, "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["order_id", "plant", "price", "status"])
        for i, status in enumerate(statuses):
            w.writerow([1000 + i, PLANTS[i % 8], f"{4 + (i * 37) % 56}.{(i * 13) % 100:02d}",
                        status])
    return path


@pytest.fixture(scope="module")
def shop(tmp_path_factory):
    """A taught model folder (4 confirmations: "returns" means refunded) and two tables."""
    root = tmp_path_factory.mktemp("shop")
    first = _orders(root / "orders.csv", ["paid", "pending", "refunded", "paid", "paid",
                                          "refunded", "paid", "pending", "refunded", "paid",
                                          "paid", "refunded", "pending", "paid", "paid"])
    second = _orders(root / "later.csv", ["refunded", "paid", "refunded", "pending", "refunded",
                                          "paid", "refunded", "paid", "paid"])
    folder = ModelFolder(root / "model")
    teach(folder, [Job(str(i), q, str(first), [4]) for i, q in enumerate(TAUGHT)], workers=1)
    return folder, first, second


def _export(folder, path):
    lexicon.export(folder, path)
    return Path(path)


def _state(folder: ModelFolder) -> dict:
    """The bytes of a model folder's weights and log, to show they were not touched."""
    return {name: hashlib.sha256((folder.path / name).read_bytes()).hexdigest()
            for name in (WEIGHTS, LOG) if (folder.path / name).exists()}


# ── export ────────────────────────────────────────────────────────────────────────────────────
def test_export_holds_every_learned_weight_with_readable_fields(shop, tmp_path):
    folder, _, _ = shop
    data = json.loads(_export(folder, tmp_path / "lex.json").read_text())
    assert (data["format"], data["version"], data["confirmations"]) == ("tabq-lexicon", 1, 4)
    pairs = {(e["word"], e["kind"], e["meaning"]): e for e in data["entries"]}
    # the team word, as the stem the model sees, means the refunded rows; all 4 back it
    taught = pairs[("return", "value", "status=refunded")]
    assert taught["learned"] > 0 and taught["support"] == 4
    # the value stands on "returns": it pairs with that word and the phrases around it, and
    # "the returns" appears in one of the four questions only ("count the returns")
    assert pairs[("the return", "value", "status=refunded")]["support"] == 1
    assert ("count", "value", "status=refunded") not in pairs
    # nothing lost: every weight that differs from the prior is in the file, once
    prior, model = Model.prior(), folder.load()
    moved = {k for k, v in model.items() if round(v - prior.weight(k), 6) != 0}
    listed = [lexicon.Entry(e["word"], e["kind"], e["meaning"], 0, 0, 0).feature
              for e in data["entries"]] + [s["feature"] for s in data["structure"]]
    assert sorted(listed) == sorted(moved)
    for e in data["entries"] + data["structure"]:
        name = e.get("feature") or lexicon.Entry(e["word"], e["kind"], e["meaning"], 0, 0,
                                                 0).feature
        assert abs(e["weight"] - model.weight(name)) < 2e-6
        assert abs(e["learned"] - (model.weight(name) - prior.weight(name))) < 1e-6


def test_export_is_sorted_one_entry_a_line(shop, tmp_path):
    folder, _, _ = shop
    text = _export(folder, tmp_path / "lex.json").read_text()
    data = json.loads(text)
    keys = [(e["word"], e["kind"], e["meaning"]) for e in data["entries"]]
    assert keys == sorted(keys)
    assert [s["feature"] for s in data["structure"]] == sorted(s["feature"]
                                                               for s in data["structure"])
    lines = [line for line in text.splitlines() if '"word":' in line]
    assert len(lines) == len(data["entries"])


@pytest.mark.parametrize("kind", ["json", "csv"])
def test_exports_validate_against_the_json_schema(shop, tmp_path, kind):
    """The schema in docs/ checked by the jsonschema package; a CSV is checked as the same
    structure once read."""
    folder, _, _ = shop
    path = _export(folder, tmp_path / f"lex.{kind}")
    data = json.loads(path.read_text()) if kind == "json" else lexicon._parse_csv(
        path.read_text(), path)
    jsonschema.Draft202012Validator.check_schema(SCHEMA)
    jsonschema.validate(data, SCHEMA)


def test_export_refuses_to_overwrite_a_file_that_is_not_a_lexicon(shop, tmp_path):
    folder, first, _ = shop
    table = tmp_path / "orders.csv"
    shutil.copy(first, table)
    before = table.read_bytes()
    with pytest.raises(tabq.errors.InputError, match="not a tabq lexicon"):
        lexicon.export(folder, table)
    assert table.read_bytes() == before
    with pytest.raises(tabq.errors.InputError, match=".json or .csv"):
        lexicon.export(folder, tmp_path / "lex.txt")
    # an older lexicon is replaced
    path = _export(folder, tmp_path / "lex.json")
    assert _export(folder, path).read_text() == path.read_text()


# ── import ────────────────────────────────────────────────────────────────────────────────────
@pytest.mark.parametrize("kind", ["json", "csv"])
@pytest.mark.parametrize("mode", ["merge", "replace"])
def test_round_trip_into_an_empty_model_gives_the_same_file(shop, tmp_path, kind, mode):
    folder, _, _ = shop
    first = _export(folder, tmp_path / f"a.{kind}")
    empty = ModelFolder(tmp_path / "empty")
    lexicon.import_file(empty, first, mode)
    again = _export(empty, tmp_path / f"b.{kind}")
    assert again.read_bytes() == first.read_bytes()


def test_json_and_csv_carry_the_same_lexicon(shop, tmp_path):
    folder, _, _ = shop
    via_csv = ModelFolder(tmp_path / "via-csv")
    lexicon.import_file(via_csv, _export(folder, tmp_path / "a.csv"))
    assert (_export(via_csv, tmp_path / "b.json").read_bytes()
            == _export(folder, tmp_path / "a.json").read_bytes())


def test_the_importing_model_answers_as_the_taught_one(shop, tmp_path):
    folder, first, second = shop
    empty = ModelFolder(tmp_path / "colleague")
    lexicon.import_file(empty, _export(folder, tmp_path / "lex.json"))
    questions = [*TAUGHT, "how many returns in all", "how many orders were paid"]
    for table in (first, second):
        source, target = tabq.open(table, model=folder.path), tabq.open(table, model=empty.path)
        for q in questions:
            a, b = source.ask(q), target.ask(q)
            assert (b.answer, b.sql) == (a.answer, a.sql), q
    # and the team word is read as taught (4 refunds in the first table, 4 in the second)
    assert tabq.open(second, model=empty.path).ask("how many returns were there").answer == [4]


def test_merge_adds_weights_and_keeps_where_they_came_from(shop, tmp_path):
    folder, _, _ = shop
    path = _export(folder, tmp_path / "lex.json")
    entry = lexicon.read(path)[0].entries[0]
    target = ModelFolder(tmp_path / "m")
    lexicon.import_file(target, path)
    once = target.load().weight(entry.feature)
    other = tmp_path / "other.json"
    other.write_text(path.read_text().replace('"confirmations": 4', '"confirmations": 5'))
    lexicon.import_file(target, other, "merge")
    twice = target.load().weight(entry.feature)
    prior = Model.prior().weight(entry.feature)
    assert abs((twice - prior) - 2 * (once - prior)) < 1e-6
    records = lexicon.imports(target)
    assert [Path(r.source).name for r in records] == ["lex.json", "other.json"]
    assert records[0].sha256 == hashlib.sha256(path.read_bytes()).hexdigest()
    merged = lexicon.from_folder(target)
    assert merged.confirmations == 9
    assert next(e for e in merged.entries if e.key == entry.key).support == 2 * entry.support


def test_merging_the_same_file_twice_is_refused(shop, tmp_path):
    folder, _, _ = shop
    path = _export(folder, tmp_path / "lex.json")
    target = ModelFolder(tmp_path / "m")
    lexicon.import_file(target, path)
    before = _state(target)
    with pytest.raises(tabq.errors.InputError, match="already merged"):
        lexicon.import_file(target, path)
    assert _state(target) == before


def test_replace_makes_the_file_the_model(shop, tmp_path):
    folder, _, _ = shop
    path = _export(folder, tmp_path / "lex.json")
    target = ModelFolder(tmp_path / "m")
    lexicon.import_file(target, path)
    lexicon.import_file(target, path.rename(tmp_path / "again.json"), "replace")
    assert (_export(target, tmp_path / "out.json").read_bytes()
            == (tmp_path / "again.json").read_bytes())
    assert len(target.read_log()) == 2       # the log keeps both imports


def test_rebuild_replays_imports_in_order(shop, tmp_path):
    folder, first, _ = shop
    target = ModelFolder(tmp_path / "m")
    lexicon.import_file(target, _export(folder, tmp_path / "lex.json"))
    assert rebuild(target, workers=1).as_dict() == pytest.approx(target.load().as_dict())
    # teaching after an import, then rebuilding from the log, gives the same answers
    teach(target, [Job("p", "how many orders were paid", str(first), [7])], workers=1)
    rebuilt = rebuild(target, workers=1)
    for q in [*TAUGHT, "how many orders were paid"]:
        assert (tabq.open(first, model=rebuilt).ask(q).answer
                == tabq.open(first, model=target.path).ask(q).answer), q


def test_support_of_old_log_lines_is_worked_out_again_or_counted_unknown(shop, tmp_path):
    folder, first, _ = shop
    expected = lexicon.from_folder(folder)
    old = ModelFolder(tmp_path / "old")
    shutil.copytree(folder.path, old.path)
    records = old.read_log()
    (old.path / LOG).write_text("".join(_version_1_line(r) for r in records))
    again = lexicon.from_folder(old)
    assert [(e.key, e.support) for e in again.all()] == [(e.key, e.support)
                                                         for e in expected.all()]
    assert again.support_unknown == 0
    # the table is gone: the weights are all there, their support is unknown
    (old.path / LOG).write_text("".join(
        _version_1_line(r, str(tmp_path / "gone.csv")) for r in records))
    gone = lexicon.from_folder(old)
    assert [e.key for e in gone.all()] == [e.key for e in expected.all()]
    assert gone.support_unknown == 4 and all(e.support == 0 for e in gone.all())


def _version_1_line(record, table: str | None = None) -> str:
    """A confirmation as tabq wrote it before typed records: no kind, the table a path with
    the file's sha256 beside it, and no senses."""
    return json.dumps({"id": record.id, "question": record.question,
                       "table": table or record.table.path,
                       "fingerprint": record.table.fingerprint, "answer": record.answer,
                       "query": record.query, "time": record.time,
                       "batch": record.batch}) + "\n"


def test_question_grams_are_the_grams_analyse_uses(shop):
    _, first, _ = shop
    table = load_table(first)
    for q in [*TAUGHT, "What's the TOTAL price of 'Fern' orders, by status?", "  x\x00y  "]:
        assert question_grams(q) == analyse(q, table).grams


# ── malformed and hostile files ───────────────────────────────────────────────────────────────
def _good(shop, tmp_path) -> dict:
    folder, _, _ = shop
    return json.loads(_export(folder, tmp_path / "good.json").read_text())


def _mutations(good: dict) -> dict[str, object]:
    """Bad files: name → the file's content (a dict is written as JSON, text as it is)."""
    def changed(fn):
        data = copy.deepcopy(good)
        fn(data)
        return data

    text = json.dumps(good)
    return {
        "truncated": text[: len(text) // 2],
        "not json": "format = tabq-lexicon\n",
        "empty": "",
        "deeply nested": "[" * 200_000 + "]" * 200_000,
        "nested in a field": changed(lambda d: d["entries"][0].update(
            word=json.loads("[" * 500 + "]" * 500))),
        "a list": [good],
        "unknown version": changed(lambda d: d.update(version=2)),
        "version as text": changed(lambda d: d.update(version="1")),
        "other format": changed(lambda d: d.update(format="something-else")),
        "no entries": changed(lambda d: d.pop("entries")),
        "extra field": changed(lambda d: d.update(comment="hi")),
        "entries not a list": changed(lambda d: d.update(entries={"a": 1})),
        "learned as text": changed(lambda d: d["entries"][0].update(learned="0.5")),
        "learned huge": changed(lambda d: d["entries"][0].update(learned=1e300)),
        "weight true": changed(lambda d: d["entries"][0].update(weight=True)),
        "support negative": changed(lambda d: d["entries"][0].update(support=-1)),
        "support fraction": changed(lambda d: d["entries"][0].update(support=1.5)),
        "unknown kind": changed(lambda d: d["entries"][0].update(kind="colour")),
        "empty word": changed(lambda d: d["entries"][0].update(word="")),
        "value without column": changed(lambda d: next(
            e for e in d["entries"] if e["kind"] == "value").update(meaning="refunded")),
        "entry missing a field": changed(lambda d: d["entries"][0].pop("support")),
        "repeated entry": changed(lambda d: d["entries"].append(d["entries"][0])),
        "word pair in structure": changed(lambda d: d["structure"].append(
            {"feature": "lex:return|sum", "learned": 1.0, "weight": 1.0, "support": 0})),
        "confirmations negative": changed(lambda d: d.update(confirmations=-3)),
        "NaN": text.replace(f'"learned": {good["entries"][0]["learned"]}', '"learned": NaN', 1),
        "repeated key": text.replace('"version": 1', '"version": 1, "version": 1', 1),
    }


# The schema cannot say these (they are about parsing or about two entries at once).
NOT_FOR_THE_SCHEMA = {"truncated", "not json", "empty", "deeply nested", "NaN", "repeated key",
                      "repeated entry"}


def test_bad_files_are_refused_and_the_model_is_untouched(shop, tmp_path):
    folder, _, _ = shop
    target = ModelFolder(tmp_path / "target")
    shutil.copytree(folder.path, target.path)
    before = _state(target)
    for name, content in _mutations(_good(shop, tmp_path)).items():
        path = tmp_path / "bad.json"
        path.write_text(content if isinstance(content, str) else json.dumps(content))
        with pytest.raises(LexiconError) as info:
            lexicon.import_file(target, path)
        message = str(info.value)
        assert message.startswith(str(path)) and "\n" not in message and len(message) < 300, (
            name, message)
        assert _state(target) == before, name
        if name not in NOT_FOR_THE_SCHEMA:
            with pytest.raises(jsonschema.ValidationError):
                jsonschema.validate(content, SCHEMA)


def test_the_messages_name_the_problem(shop, tmp_path):
    cases = {"truncated": "cut short", "unknown version": "version 2", "learned as text":
             "entry 1: learned must be a number", "deeply nested": "nested too deeply",
             "support negative": "support must be a whole number", "repeated key": "twice",
             "other format": "not a tabq lexicon", "extra field": "unknown field 'comment'"}
    mutations = _mutations(_good(shop, tmp_path))
    for name, words in cases.items():
        path = tmp_path / "bad.json"
        content = mutations[name]
        path.write_text(content if isinstance(content, str) else json.dumps(content))
        with pytest.raises(LexiconError, match=words):
            lexicon.read(path)


def test_a_file_cut_inside_a_string_is_called_cut_short(shop, tmp_path):
    # json reports an open string at its start, not at the end of the file
    text = json.dumps(_good(shop, tmp_path))
    path = tmp_path / "cut.json"
    path.write_text(text[: text.index('"format"') + 4])     # ends in the middle of a key
    with pytest.raises(LexiconError, match="Unterminated string.*cut short"):
        lexicon.read(path)


def test_a_huge_file_is_refused_before_it_is_read(tmp_path):
    path = tmp_path / "huge.json"
    with open(path, "wb") as f:
        f.truncate(lexicon.MAX_BYTES + 1)
    with pytest.raises(LexiconError, match="too large"):
        lexicon.read(path)


@pytest.mark.parametrize("change, words", [
    (lambda rows: rows[:2], "too short"),
    (lambda rows: [["format", "version"]] + rows[1:], "line 1"),
    (lambda rows: rows[:1] + [["tabq-lexicon", "2", "4", "0"]] + rows[2:], "version 2"),
    (lambda rows: rows[:3] + [rows[3][:4]] + rows[4:], "line 4 has 4 fields"),
    (lambda rows: rows[:3] + [rows[3][:3] + ["lots", *rows[3][4:]]] + rows[4:],
     "line 4: learned must be a number"),
    (lambda rows: rows[:3] + [rows[3][:3] + ["inf", *rows[3][4:]]] + rows[4:],
     "learned must be a number between"),
])
def test_bad_csv_files_are_refused_with_the_line(shop, tmp_path, change, words):
    folder, _, _ = shop
    rows = list(csv.reader(_export(folder, tmp_path / "good.csv").open()))
    bad = tmp_path / "bad.csv"
    with open(bad, "w", newline="") as f:
        csv.writer(f).writerows(change(rows))
    with pytest.raises(LexiconError, match=words):
        lexicon.read(bad)


# ── diff, show and the command line ───────────────────────────────────────────────────────────
def test_diff_reports_added_removed_and_changed(shop, tmp_path):
    a = lexicon.read(_export(shop[0], tmp_path / "a.json"))[0]
    b = copy.deepcopy(a)
    removed = b.entries.pop(0)
    old = b.entries[0]
    b.entries[0] = lexicon.Entry(old.word, old.kind, old.meaning, old.learned + 1, old.weight + 1,
                                 old.support + 1)
    added = lexicon.Entry("refund", "value", "status=refunded", 0.5, 0.5, 1)
    b.entries.append(added)
    d = lexicon.diff(a, b)
    assert d.added == [added] and d.removed == [removed]
    assert d.changed == [(old, b.entries[0])]
    text = lexicon.diff_text(d, a, b)
    assert "1 added, 1 removed, 1 changed" in text
    assert f"+ 'refund' → value status=refunded" in text


def tabq_cli(*args):
    return subprocess.run([sys.executable, "-m", "tabq", *map(str, args)], capture_output=True,
                          text=True, timeout=120)


def test_cli_export_show_import_diff(shop, tmp_path):
    folder, _, _ = shop
    out = tabq_cli("lexicon", "export", "--model", folder.path, tmp_path / "a.json")
    assert out.returncode == 0, out.stderr
    shown = tabq_cli("lexicon", "show", "--model", folder.path, "--word", "returns")
    assert shown.returncode == 0
    lines = shown.stdout.splitlines()
    assert lines[0].split() == ["word", "kind", "meaning", "learned", "weight", "support"]
    assert any(line.split()[:3] == ["return", "value", "status=refunded"] for line in lines)
    assert all("return" in line for line in lines[1:])
    imported = tabq_cli("lexicon", "import", tmp_path / "a.json", "--model", tmp_path / "m",
                        "--replace")
    assert imported.returncode == 0, imported.stderr
    tabq_cli("lexicon", "export", "--model", tmp_path / "m", tmp_path / "b.json")
    same = tabq_cli("lexicon", "diff", tmp_path / "a.json", tmp_path / "b.json")
    assert same.returncode == 0 and "0 added, 0 removed, 0 changed" in same.stdout


def _shown(stdout: str) -> dict[tuple[str, str, str], int]:
    """(word, kind, meaning) → support of each row `tabq lexicon show` prints. The three numbers
    end a row; the header says where kind and meaning start (a word may hold spaces)."""
    lines = stdout.split("\n\n")[0].splitlines()
    kind_at, meaning_at = lines[0].index("kind"), lines[0].index("meaning")
    rows = {}
    for line in lines[1:]:
        text, _, _, support = line.rsplit(maxsplit=3)
        key = (text[:kind_at].strip(), text[kind_at:meaning_at].strip(), text[meaning_at:].strip())
        rows[key] = int(support)
    return rows


def test_the_app_and_lexicon_show_count_the_same_support(shop):
    folder, _, _ = shop
    shown = tabq_cli("lexicon", "show", "--model", folder.path)
    assert shown.returncode == 0, shown.stderr
    by_cli = {(word, learned.plain(Pair(kind, word, meaning))): support
              for (word, kind, meaning), support in _shown(shown.stdout).items()
              if kind != "structure"}
    in_app = learned.entries(folder.load(), folder.read_log())
    assert in_app and any(e.support for e in in_app)
    for e in in_app:
        assert e.support == by_cli[e.words, e.means], e
    # a reading the taught questions pushed down: each holds the word, none chose the reading
    assert any(e.learned < 0 and e.support == 0 for e in in_app)


def test_cli_bad_lexicon_is_one_line_and_exit_2(shop, tmp_path):
    bad = tmp_path / "bad.json"
    bad.write_text('{"format": "tabq-lexicon", "version": 7}')
    for args in [("import", bad, "--model", tmp_path / "m"), ("diff", bad, bad),
                 ("import", tmp_path / "missing.json", "--model", tmp_path / "m")]:
        out = tabq_cli("lexicon", *args)
        assert out.returncode == 2, out
        assert len(out.stderr.strip().splitlines()) == 1 and "Traceback" not in out.stderr
    assert not (tmp_path / "m").exists()      # nothing was created for a refused file
    none = tabq_cli("lexicon")
    assert none.returncode == 2 and "export" in none.stderr


# ── odd files and hostile words ───────────────────────────────────────────────────────────────
def _ends(call, seconds: float = 20.0):
    """What `call` raised, failing (not hanging) when it blocks."""
    import threading
    out: dict = {}

    def run():
        try:
            call()
        except BaseException as err:  # noqa: BLE001 - handed back to the test
            out["error"] = err
    worker = threading.Thread(target=run, daemon=True)
    worker.start()
    worker.join(seconds)
    assert not worker.is_alive(), "blocked on the file"
    return out.get("error")


@pytest.mark.parametrize("kind", ["fifo", "zero", "folder"])
def test_a_lexicon_that_is_no_regular_file_is_refused_without_reading(tmp_path, kind):
    """A FIFO or /dev/zero reports size 0: the 5 MB limit read from the size let them through
    to a read that never ends."""
    path = tmp_path / "team.json"
    if kind == "fifo":
        os.mkfifo(path)
    elif kind == "zero":
        path.symlink_to("/dev/zero")     # a link the person made is followed, then checked
    else:
        path.mkdir()
    error = _ends(lambda: lexicon.read(path))
    assert isinstance(error, LexiconError) and "not a regular file" in str(error)


def test_export_does_not_open_a_fifo_in_place_of_its_file(shop, tmp_path):
    folder, _, _ = shop
    os.mkfifo(tmp_path / "out.json")
    error = _ends(lambda: lexicon.export(folder, tmp_path / "out.json"))
    assert isinstance(error, InputError) and "not a regular file" in str(error)
    assert stat.S_ISFIFO((tmp_path / "out.json").lstat().st_mode)


HOSTILE = "\x1b[2J\x1b]0;pwned\x07ret\rurns\x00\u202e"


def test_lexicon_show_and_diff_escape_what_a_terminal_would_act_on(tmp_path):
    entry = lexicon.Entry(HOSTILE, "column", "stat\x1b[31mus", 1.0, 1.0, 1)
    shown = lexicon.as_table([entry]) + lexicon.describe(entry)
    assert not set(shown) & {"\x1b", "\r", "\x00", "\x07", "\u202e"}
    assert "\\x1b[2J" in shown and "\\r" in shown and "\\x00" in shown


def test_cli_lexicon_show_prints_no_control_characters_from_an_imported_file(tmp_path):
    path = tmp_path / "hostile.json"
    path.write_text(json.dumps({
        "format": "tabq-lexicon", "version": 1, "confirmations": 1, "support_unknown": 0,
        "entries": [{"word": HOSTILE, "kind": "column", "meaning": "status\x1b[8m",
                     "learned": 1.0, "weight": 1.0, "support": 1}],
        "structure": []}))
    out = tabq_cli("lexicon", "import", path, "--model", tmp_path / "m")
    assert out.returncode == 0, out.stderr
    shown = tabq_cli("lexicon", "show", "--model", tmp_path / "m")
    assert shown.returncode == 0, shown.stderr
    assert not set(shown.stdout) & {"\x1b", "\r", "\x00", "\x07", "\u202e"}
    assert "\\x1b[2J" in shown.stdout


# ── writers and reader agree on any lexicon ───────────────────────────────────────────────────
from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

_text = st.text(min_size=1, max_size=30).filter(lambda t: "\x00" not in t)
_weight = st.floats(-999, 999, allow_nan=False).map(lambda x: round(x, 6) + 0.0)
def _meaning(kind: str, col: str, val: str) -> str:
    """What an entry of this kind may mean: column=value for a value, a row set's text (any
    value in it) for a definition, any text for the rest."""
    from tabq import logic as L
    if kind == "value":
        return f"{col}={val}"
    return L.to_text(L.InSet("area", (val,))) if kind == "definition" else col


_entry = st.builds(lambda word, kind, col, val, learned, weight, support: lexicon.Entry(
    word, kind, _meaning(kind, col, val), learned, weight, support),
    _text.filter(lambda w: "|" not in w), st.sampled_from(lexicon.KINDS), _text, _text,
    _weight, _weight, st.integers(0, 10**6))
_structure = st.builds(lambda name, learned, weight, support: lexicon.Entry(
    "", "structure", name, learned, weight, support),
    _text.filter(lambda n: featurenames.parse(n) is None), _weight, _weight,
    st.integers(0, 10**6))


@settings(max_examples=40, deadline=None)
@given(st.lists(_entry, max_size=6, unique_by=lambda e: e.feature),
       st.lists(_structure, max_size=4, unique_by=lambda e: e.feature),
       st.integers(0, 50), st.sampled_from(["json", "csv"]))
def test_any_lexicon_reads_back_as_written(tmp_path_factory, entries, structure, n, kind):
    names = {e.feature for e in entries}
    structure = [s for s in structure if s.feature not in names]
    written = lexicon._sorted(lexicon.Lexicon(n + 3, 3, list(entries), list(structure)))
    path = tmp_path_factory.mktemp("any") / f"lex.{kind}"
    path.write_text(lexicon.render(written, kind), encoding="utf-8")
    back, _ = lexicon.read(path)
    assert back == written
    if kind == "json":
        jsonschema.validate(json.loads(path.read_text(encoding="utf-8")), SCHEMA)
