"""`tabq ui TABLE`: ask a table questions and teach tabq by confirming answers.

Slow work (loading, asking, teaching, comparing readings) runs in thread workers; the screen only
shows results. Each question gets a number, and a result that arrives for an older number than
the one last asked is dropped.
"""

from __future__ import annotations

import threading
import time
from pathlib import Path

from rich.text import Text
from textual import work
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.widgets import DataTable, Footer, Input, Static, TabbedContent, TabPane

from .. import pipeline
from ..errors import TabqError
from ..load import table_names
from ..table import ReadChoices
from .learned import entries
from .session import Comparison, Session, parse_answer, preview
from .widgets import SHOWN, AnswerList, AnswerPrompt, CompareScreen, ReadingPanel, TablePicker
from .widgets import HEADER_MOST, answer_text, read_summary, read_text, short

BUSY_AFTER = 1.0         # seconds a slow step runs before its status line counts them
BUSY_TICK = 0.5          # seconds between two counts


class TabqApp(App):
    """Ask a table in plain English; confirm, correct or clarify answers to teach the model."""

    CSS_PATH = "tabq.tcss"
    TITLE = "tabq"
    BINDINGS = [
        Binding("ctrl+q", "quit", "Quit", priority=True),
        Binding("f2", "tab('ask')", "Ask"),
        Binding("f3", "tab('rows')", "Table"),
        Binding("f4", "tab('words')", "Words"),
        Binding("f5", "tab('history')", "History"),
        Binding("ctrl+z", "undo", "Undo last confirm"),
    ]

    def __init__(self, path: str | Path, model: str | Path | None = None,
                 table: str | None = None, choices: ReadChoices | None = None):
        super().__init__()
        self.source = (path, model, table)
        self.choices = choices      # reading choices that overrule tabq's guesses
        self.session: Session | None = None
        self.loaded = threading.Event()
        self.not_open: str | None = None   # why no table is open, once loading has stopped
        self.result: pipeline.Result | None = None
        self.alikes: list[list[pipeline.Reading]] = []
        self.asked = 0            # number of the latest question; older results are dropped
        self.status: tuple[str, str, float | None] = ("", "#8a94a0", None)   # text, colour, busy since

    # ── layout ─────────────────────────────────────────────────────────────────────────────
    def compose(self) -> ComposeResult:
        yield Static(Text("tabq", style="bold") + Text(f"  {Path(self.source[0]).name}  "
                                                      "loading…"), id="bar")
        with TabbedContent(initial="ask", id="tabs"):
            with TabPane("Ask", id="ask"):
                yield Input(placeholder="Ask the table a question, then press enter",
                            id="question")
                yield Static("", id="status")
                with Horizontal(id="work"):
                    yield AnswerList(id="answers")
                    yield ReadingPanel(id="detail")
            with TabPane("Table", id="rows"):
                yield Static("", id="rows-info")
                yield Static("", id="read-info")
                yield DataTable(id="rows-table", zebra_stripes=True)
            with TabPane("Words", id="words"):
                yield Static("What tabq has learned each word to mean (changes from the "
                             "untaught model).", id="words-info")
                yield DataTable(id="words-table", cursor_type="row")
            with TabPane("History", id="history"):
                yield Static("This session: questions and confirmations. ctrl+z takes back "
                             "the last confirmation.", id="history-info")
                yield DataTable(id="history-table", cursor_type="row")
        yield Footer()

    def on_mount(self) -> None:
        self._q("#question", Input).focus()
        self._q(ReadingPanel).show(None)
        self.set_interval(BUSY_TICK, self._tick)
        self.say(f"loading {Path(self.source[0]).name}…", busy=True)
        self.load()

    def _q(self, selector, expect=None):
        """A widget of the main screen, also while a prompt is open above it."""
        base = self.screen_stack[0] if self.screen_stack else self
        return base.query_one(selector, expect) if expect else base.query_one(selector)

    # ── messages in the status line ─────────────────────────────────────────────────────────
    def say(self, text: str, tone: str = "info", busy: bool = False) -> None:
        """A message in the status line; a `busy` one (a slow step under way) counts its
        seconds once it has run past BUSY_AFTER, until the next message replaces it."""
        colour = {"info": "#8a94a0", "good": "#7fc97f", "warn": "#c9a25a",
                  "bad": "#e0685f"}[tone]
        self.status = (text, colour, time.monotonic() if busy else None)
        self._q("#status", Static).update(Text(text, style=colour))

    def _tick(self) -> None:
        text, colour, since = self.status
        if since is not None and (seconds := time.monotonic() - since) >= BUSY_AFTER:
            self._q("#status", Static).update(Text(f"{text} {seconds:.0f} s", style=colour))

    def fail(self, err: BaseException) -> None:
        if isinstance(err, TabqError):
            self.say(f"tabq: {' '.join(str(err).split())[:300]}", "bad")
        else:   # a bug of ours: still a message, never a crash
            self.say(f"internal error ({err.__class__.__name__}): {err}"[:300], "bad")

    # ── loading ────────────────────────────────────────────────────────────────────────────
    @work(thread=True, group="load")
    def load(self) -> None:
        path, model, table = self.source
        self.not_open = None
        try:
            if table is None and len(names := table_names(path)) > 1:
                self.not_open = "Choose a table first."
                self.call_from_thread(self._choose_table, names)
                return
            session = Session(path, model, table, self.choices)
        except Exception as err:       # bad table or model: shown, and the app stays up
            self.not_open = f"No table is open ({Path(path).name} could not be loaded)."
            self.call_from_thread(self.fail, err)
            self.call_from_thread(self._bar, f"{Path(path).name}  (not loaded)")
            return
        self.session = session
        self.loaded.set()
        self.call_from_thread(self._loaded)
        try:
            session.warm()
        except Exception as err:
            self.call_from_thread(self.fail, err)

    def _choose_table(self, names: list[str]) -> None:
        """Several tables or sheets and none named: ask which, then load it."""
        path = self.source[0]
        self._bar(f"{Path(path).name}  (choose a table)")
        self.say(f"{Path(path).name} holds several tables: choose one.")

        def chosen(name: str | None) -> None:
            if name is None:
                self.say(f"{Path(path).name} holds several tables: choose one to ask about "
                         "(or start with --table NAME).", "warn")
                self.call_later(self._choose_table, names)
                return
            self.source = (path, self.source[1], name)
            self._bar(f"{Path(path).name}  loading {name}…")
            self.say(f"loading {name}…", busy=True)
            self.load()

        self.push_screen(TablePicker(Path(path).name, names), chosen)

    def _bar(self, text: str, read: Text | None = None) -> None:
        self._q("#bar", Static).update(Text("tabq", style="bold") + Text(f"  {text}")
                                       + (read or Text("")))

    def _loaded(self) -> None:
        s = self.session
        t = s.open.table
        where = Path(t.path).name + (f" · {t.name}" if t.name else "")
        self._bar(f"{where}  ·  {t.row_count} rows", read_summary(t)
                  + Text(f"  ·  model {s.folder.path}"))
        if not self.result:
            self.say("Type a question and press enter.")
        elif self.status[2] is not None:     # loading is over: stop counting its seconds
            self.say(self.status[0].removesuffix("…"))
        self._fill_rows()
        self._refresh_words()

    def _fill_rows(self) -> None:
        t = self.session.open.table
        cols = [c for c in t.columns]
        grid = self._q("#rows-table", DataTable)
        grid.clear(columns=True)
        for c in cols:
            header = short(c.header, HEADER_MOST)
            grid.add_column(header if c.view is None else f"{header} → {c.view}", key=c.name)
        with self.session.lock:
            rows = preview(t, [c.name for c in cols])
        grid.add_rows([tuple("·" if v is None else str(v) for v in row) for row in rows])
        views = [f"{short(c.header, HEADER_MOST)} → {c.view}" for c in cols if c.view]
        info = f"{t.row_count} rows, {len(cols) - len(views)} columns"
        if len(rows) < t.row_count:
            info += f", first {len(rows)} shown"
        info += (f"; typed views of messy columns: {', '.join(views)}" if views
                 else "; no messy columns needed typed views")
        self._q("#rows-info", Static).update(info)
        self._q("#read-info", Static).update(read_text(t))

    # ── asking ─────────────────────────────────────────────────────────────────────────────
    def on_input_submitted(self, event: Input.Submitted) -> None:
        if event.input.id != "question":
            return
        question = event.value.strip()
        if not question:
            self.say("Type a question first.", "warn")
            return
        if self.session is None and self.not_open:
            self.say(self.not_open, "warn")
            return
        self.asked += 1
        self.say(f"asking: {question}", busy=True)
        self.ask(question, self.asked)

    @work(thread=True, exclusive=True, group="ask")
    def ask(self, question: str, number: int, note: str = "") -> None:
        self.loaded.wait()
        try:
            result = self.session.ask(question)
        except Exception as err:
            self.call_from_thread(self._failed_ask, err, number)
            return
        self.call_from_thread(self.show, result, number, note)

    def _failed_ask(self, err: BaseException, number: int) -> None:
        if number == self.asked:
            self.fail(err)
            self._refresh_history()

    def show(self, result: pipeline.Result, number: int, note: str = "") -> None:
        """Show a result, unless a newer question was asked since (then it is dropped)."""
        if number != self.asked:
            return
        self.result = result
        self.alikes = [self.session.look_alikes(result, r) for r in result.readings]
        answers = self._q(AnswerList)
        answers.show(result, [len(a) for a in self.alikes])
        self._show_reading(0)
        if not result.best:
            self.say("No reading of this question fits the table.", "warn")
        else:
            sure = (f"unsure: {result.unsure_reason}; check the readings" if result.unsure
                    else f"{result.confidence:.0%} of the model's belief")
            listed = min(len(result.readings), SHOWN)
            self.say((note + "  " if note else "") + f"{len(result.readings)} distinct answers, "
                     f"best {listed} listed ({sure}).  y: yes, this one · n: none of these · "
                     "d: compare",
                     "warn" if result.unsure and not note else "good" if note else "info")
            answers.focus()
        self._refresh_history()

    def on_option_list_option_highlighted(self, event: AnswerList.OptionHighlighted) -> None:
        if self.screen_stack and self.result and event.option_index < len(self.result.readings):
            self._show_reading(event.option_index)

    def _show_reading(self, index: int) -> None:
        """The reading panel for answer `index` of the result; the top one says how sure."""
        result = self.result
        if not result.readings:
            self._q(ReadingPanel).show(None)
            return
        top = index == 0
        self._q(ReadingPanel).show(result.readings[index], len(self.alikes[index]),
                                   top and not result.unsure,
                                   result.unsure_reason if top else None)

    # ── teaching ───────────────────────────────────────────────────────────────────────────
    def on_answer_list_chosen(self, event: AnswerList.Chosen) -> None:
        if not self.result or event.index is None or not self.result.readings:
            return
        reading = self.result.readings[event.index]
        if event.action == "confirm":
            if reading.error or not reading.answer:
                self.say("An empty or failed reading cannot be confirmed: press n and type "
                         "the right answer.", "warn")
                return
            self.say("learning…", busy=True)
            self.teach(self.result.question, reading.answer)
        elif event.action == "none":
            question = self.result.question
            self.push_screen(AnswerPrompt(question),
                             lambda typed: typed and self.search_typed(question, typed))
        elif event.action == "compare":
            readings = self.session.competing(self.result, event.index)
            if len(readings) < 2:
                self.say("Only one reading gives this answer: nothing to compare.", "warn")
                return
            self.say("looking for rows where the readings differ…", busy=True)
            self.compare(self.result.question, readings)

    @work(thread=True, group="teach")
    def teach(self, question: str, answer: list, kind: str = "confirm") -> None:
        try:
            taught = self.session.confirm(question, answer, kind)
        except Exception as err:
            self.call_from_thread(self.fail, err)
            return
        self.call_from_thread(self._taught, taught.question, taught.seconds, taught.reachable,
                              taught.kind)

    def _taught(self, question: str, seconds: float, reachable: bool, kind: str) -> None:
        what = {"confirm": "confirmed", "typed": "taught your answer",
                "pick": "taught the meant reading"}[kind]
        note = (f"{what} and logged in {seconds:.1f} s; answers re-ranked" if reachable else
                f"logged, but no reading gives that answer yet ({seconds:.1f} s)")
        self._refresh_words()
        self.asked += 1
        self.ask(question, self.asked, note)

    @work(thread=True, group="teach")
    def search_typed(self, question: str, typed: str) -> None:
        """'None of these': find readings that give the typed answer, then teach or compare."""
        values = parse_answer(typed)
        try:
            hits = self.session.readings_giving(self.result, values)
        except Exception as err:
            self.call_from_thread(self.fail, err)
            return
        if not hits:
            self.call_from_thread(self.say, f"No reading of the question gives {typed}; "
                                  "nothing was taught. Try rephrasing.", "warn")
            return
        groups = self.session.look_alikes(self.result, hits[0]) if hits[0] in \
            self.result.candidates else []
        readings = hits[:3] if len(hits) > 1 else groups
        if len(readings) > 1:
            self._offer_pick(question, readings)
            return
        self.call_from_thread(self.say, f"one reading gives {typed}: "
                              f"{hits[0].paraphrase}; learning…")
        self.teach(question, hits[0].answer, "typed")

    @work(thread=True, group="teach")
    def compare(self, question: str, readings: list[pipeline.Reading]) -> None:
        self._offer_pick(question, readings)

    def _offer_pick(self, question: str, readings: list[pipeline.Reading]) -> None:
        """(In a worker thread.) Compare the readings, then ask the analyst to pick one."""
        try:
            comparison = self.session.compare(readings)
        except Exception as err:
            self.call_from_thread(self.fail, err)
            return
        self.call_from_thread(self._ask_pick, question, comparison)

    def _ask_pick(self, question: str, comparison: Comparison) -> None:
        answer = answer_text(comparison.readings[0]).plain
        self.say("Pick the reading you meant: 1, 2 or 3.")

        def picked(index: int | None) -> None:
            if index is None:
                self.say("Nothing was taught.")
                return
            self.say("learning the meant reading…", busy=True)
            self.pick(question, comparison, index)
        self.push_screen(CompareScreen(comparison, answer), picked)

    @work(thread=True, group="teach")
    def pick(self, question: str, comparison: Comparison, index: int) -> None:
        try:
            taught = self.session.pick(question, comparison, index)
        except Exception as err:
            self.call_from_thread(self.fail, err)
            return
        self.call_from_thread(self._taught, taught.question, taught.seconds, taught.reachable,
                              "pick")

    def action_undo(self) -> None:
        if not self.session or not self.session.taught:
            self.say("Nothing to take back in this session.", "warn")
            return
        self.say("taking back the last confirmation…", busy=True)
        self.undo()

    @work(thread=True, group="teach")
    def undo(self) -> None:
        try:
            last = self.session.undo()
        except Exception as err:
            self.call_from_thread(self.fail, err)
            return
        self.call_from_thread(self._undone, last.question, last.answer)

    def _undone(self, question: str, answer: list) -> None:
        self._refresh_words()
        self.asked += 1
        self.ask(question, self.asked, f"took back {answer!r} (a retraction is logged)")

    # ── the other tabs ─────────────────────────────────────────────────────────────────────
    def action_tab(self, name: str) -> None:
        self._q(TabbedContent).active = name
        target = {"ask": "#question", "rows": "#rows-table", "words": "#words-table",
                  "history": "#history-table"}[name]
        self._q(target).focus()

    @work(thread=True, exclusive=True, group="words")
    def _refresh_words(self) -> None:
        """Count what was learned off the screen's thread: for old log lines the lexicon asks
        their questions again to find what they taught."""
        try:
            found = entries(self.session.open.model, self.session.folder.read_log())
        except Exception as err:
            self.call_from_thread(self.fail, err)
            return
        self.call_from_thread(self._show_words, found)

    def _show_words(self, found: list) -> None:
        grid = self._q("#words-table", DataTable)
        grid.clear(columns=True)
        grid.add_columns("words", "mean", "weight", "learned", "confirmations")
        for e in found:
            grid.add_row(e.words, e.means, f"{e.weight:+.2f}", f"{e.learned:+.2f}",
                         str(e.support))
        self._q("#words-info", Static).update(
            f"What tabq has learned each word to mean: {len(found)} weights moved from the "
            "untaught model. confirmations = confirmed answers whose reading used the pairing."
            if found else "Nothing learned yet: confirm an answer on the Ask tab.")

    def _refresh_history(self) -> None:
        if not self.session:
            return
        grid = self._q("#history-table", DataTable)
        grid.clear(columns=True)
        grid.add_columns("time", "what", "question", "answer")
        labels = {"ask": "asked", "confirm": "confirmed", "typed": "typed answer",
                  "pick": "picked reading", "undo": "took back"}
        for e in reversed(self.session.history):
            grid.add_row(e.clock, labels.get(e.kind, e.kind), e.question, e.detail)
