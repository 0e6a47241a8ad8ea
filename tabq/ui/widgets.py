"""The app's own widgets: the answer list, the reading panel, the comparison and answer prompts."""

from __future__ import annotations

from rich.console import Group
from rich.syntax import Syntax
from rich.table import Table as RichTable
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.message import Message
from textual.screen import ModalScreen
from textual.widgets import Input, OptionList, Static
from textual.widgets.option_list import Option

from .. import pipeline
from ..output import read_details
from ..table import Table
from .chart import bar_rows
from .session import Comparison

SQL_THEME = "native"
METER = 8                # cells of the confidence meter
SHOWN = 12               # distinct answers listed: a glance, not a report
HEADER_MOST = 40         # characters of a header in the table view (a header can be a paragraph)
READ_MOST = 44           # characters of the reading notes in the title bar


def answer_text(reading: pipeline.Reading, most: int = 6) -> Text:
    """An answer as people read it; an empty or failed reading says so."""
    if reading.error:
        return Text(f"failed: {reading.error}", style="bold #e0685f")
    if not reading.answer:
        return Text("(empty answer)", style="italic #c9a25a")
    if reading.is_table:
        n = len(reading.answer)
        return Text(f"a table of {n} group{'' if n == 1 else 's'}", style="bold #9ad0c2")
    shown = ", ".join("(missing)" if v is None else str(v) for v in reading.answer[:most])
    more = f" … {len(reading.answer)} values" if len(reading.answer) > most else ""
    return Text(shown + more, style="bold #9ad0c2")


def short(text: str, most: int) -> str:
    """Text cut to `most` characters, the cut marked."""
    return text if len(text) <= most else text[:most - 1] + "…"


def read_summary(table: Table) -> Text:
    """For the title bar: what was left out or guessed in reading the file, if anything; the key
    to the full list first, so a narrow terminal cuts the notes, not the way to them."""
    notes = table.report.notes() if table.report is not None else []
    if not notes:
        return Text("")
    return Text("  ·  read (f3): ") + Text(short("; ".join(notes), READ_MOST), style="#f0c27a")


def read_text(table: Table) -> Text:
    """For the Table tab: how the file was read, a line each; what needs a look in amber."""
    text = Text("How the file was read", style="bold #8fb3d9")
    for line, look in read_details(table):
        text += Text("\n") + Text(line, style="#c9a25a" if look else "#8a94a0")
    return text


def meter(probability: float, sure: bool = False) -> Text:
    """A confidence hint: filled dots for the answer's probability, green only for a top answer
    tabq is sure of (a runner-up is never the answer to act on)."""
    filled = round(probability * METER)
    colour = "#7fc97f" if sure else "#c9a25a"
    return Text("●" * filled, style=colour) + Text("○" * (METER - filled), style="#5b6470") + \
        Text(f" {probability:4.0%}", style=colour)


def sql_view(sql: str) -> Syntax:
    return Syntax(sql, "sql", theme=SQL_THEME, word_wrap=True, background_color="default")


def group_table(reading: pipeline.Reading, width: int = 24) -> RichTable:
    """A per-group answer as a table with a bar per group."""
    table = RichTable(box=None, pad_edge=False, show_header=True, header_style="bold #8fb3d9")
    table.add_column("group")
    table.add_column("value", justify="right")
    table.add_column("")
    for label, bar, value in bar_rows([tuple(r) for r in reading.answer], width):
        table.add_row(label, value, Text(bar, style="#d9a35f"))
    return table


class AnswerList(OptionList):
    """The distinct answers, best first. Keys act on the highlighted one."""

    BINDINGS = [
        Binding("y", "confirm", "Yes, this one"),
        Binding("n", "none", "None of these"),
        Binding("d", "compare", "Compare look-alikes"),
        Binding("slash", "question", "Ask", show=False),
    ]

    class Chosen(Message):
        """Announces a key pressed on the highlighted answer: "confirm", "none" or "compare".
        Handle with `on_answer_list_chosen`."""

        def __init__(self, action: str, index: int | None) -> None:
            super().__init__()
            self.action, self.index = action, index

    def show(self, result: pipeline.Result, alikes: list[int]) -> None:
        """Fill the list, in order of probability; `alikes[i]` is how many readings give
        answer i."""
        self.clear_options()
        for i, reading in enumerate(result.readings[:SHOWN]):
            line = Text(f"{i + 1:>2} ", style="#5b6470") + answer_text(reading, 4)
            hint = Text("\n   ") + meter(reading.probability, i == 0 and not result.unsure)
            if alikes[i] > 1:
                hint += Text(f"  {alikes[i]} readings", style="#c39bd3")
            self.add_option(Option(line + hint, id=str(i)))
        if result.readings:
            self.highlighted = 0

    def _chosen(self, action: str) -> None:
        self.post_message(self.Chosen(action, self.highlighted))

    def action_confirm(self) -> None:
        self._chosen("confirm")

    def action_none(self) -> None:
        self._chosen("none")

    def action_compare(self) -> None:
        self._chosen("compare")

    def action_question(self) -> None:
        self.app.query_one("#question", Input).focus()


class ReadingPanel(VerticalScroll):
    """The highlighted answer in full: its plain reading, its SQL and, for groups, bars."""

    def compose(self) -> ComposeResult:
        yield Static(id="reading-text")

    def show(self, reading: pipeline.Reading | None, alikes: int = 1,
             sure: bool = False, doubt: str | None = None) -> None:
        """`sure`: the top answer of a sure result; `doubt`: why the top answer is unsure."""
        body = self.query_one("#reading-text", Static)
        if reading is None:
            body.update(Text("Ask a question about the table above.", style="#8a94a0"))
            return
        parts: list = [Text("reads as ", style="#8a94a0") + Text(reading.paraphrase,
                                                                  style="bold"),
                       Text(""), answer_text(reading, 20), meter(reading.probability, sure)]
        if doubt:
            parts.append(Text(f"unsure: {doubt}", style="#c9a25a"))
        parts.append(Text(""))
        if alikes > 1:
            parts.append(Text(f"{alikes} readings give this answer but mean different things: "
                              "press d to compare them", style="#c39bd3"))
            parts.append(Text(""))
        parts.append(Text("SQL", style="bold #8fb3d9"))
        parts.append(sql_view(reading.sql))
        if reading.is_table and reading.answer and not reading.error:
            parts += [Text(""), group_table(reading)]
        body.update(Group(*parts))


class AnswerPrompt(ModalScreen[str | None]):
    """"None of these": the analyst types the right answer."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, question: str) -> None:
        super().__init__()
        self.question = question

    def compose(self) -> ComposeResult:
        with Vertical(id="prompt-box"):
            yield Static(Text("None of these. What is the right answer to\n", style="bold")
                         + Text(self.question, style="italic"))
            yield Input(placeholder="e.g. 124, or several values: Dream; Biscoe", id="typed")
            yield Static(Text("enter: search the readings for it · escape: cancel",
                              style="#8a94a0"))

    def on_input_submitted(self, event: Input.Submitted) -> None:
        self.dismiss(event.value.strip() or None)

    def action_cancel(self) -> None:
        self.dismiss(None)


class TablePicker(ModalScreen[str | None]):
    """A file with several tables or sheets: the analyst chooses the one to ask about."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, file: str, names: list[str]) -> None:
        super().__init__()
        self.file, self.names = file, names

    def compose(self) -> ComposeResult:
        with Vertical(id="prompt-box"):
            yield Static(Text(f"{self.file} holds {len(self.names)} tables. Which one?\n",
                              style="bold"))
            yield OptionList(*(Option(name) for name in self.names), id="table-choice")
            yield Static(Text("enter: open it · escape: cancel", style="#8a94a0"))

    def on_mount(self) -> None:
        self.query_one("#table-choice", OptionList).focus()

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(self.names[event.option_index])

    def action_cancel(self) -> None:
        self.dismiss(None)


class CompareScreen(ModalScreen[int | None]):
    """Look-alike readings side by side, with rows where they differ; a number key picks one."""

    BINDINGS = [Binding("1", "pick(0)", "Pick 1"), Binding("2", "pick(1)", "Pick 2"),
                Binding("3", "pick(2)", "Pick 3", show=False),
                Binding("escape", "cancel", "Cancel")]

    def __init__(self, comparison: Comparison, answer: str) -> None:
        super().__init__()
        self.comparison, self.answer = comparison, answer

    def compose(self) -> ComposeResult:
        c = self.comparison
        with Vertical(id="compare-box"):
            yield Static(self._title(), id="compare-title")
            with Horizontal(id="compare-side"):
                for i, reading in enumerate(c.readings):
                    parts = [Text(f"{i + 1}", style="bold reverse #c39bd3"), Text(""),
                             Text(reading.paraphrase, style="bold"), Text(""),
                             sql_view(reading.sql)]
                    if c.rows:
                        parts += [Text(""), Text("on the rows below: ", style="#8a94a0")
                                  + answer_text(pipeline.Reading(reading.form, "", "", c.answers[i],
                                                            0.0, {}, is_table=reading.is_table))]
                    yield Static(Group(*parts), classes="side")
            yield Static(self._sample(), id="compare-rows")
            yield Static(Text("1/2/3: pick the meant reading (taught as a strong signal) · "
                              "escape: cancel", style="#8a94a0"))

    def _title(self) -> Text:
        if len({repr(r.answer) for r in self.comparison.readings}) > 1:   # rival meanings
            return Text("What was taught fits these meanings alike, but here they answer "
                        "differently. Which one did you mean?", style="bold")
        return Text("These readings all give ", style="bold") + Text(
            self.answer, style="bold #9ad0c2") + Text(" on this table, but mean different "
                                                      "things. Which one did you mean?",
                                                      style="bold")

    def _sample(self):
        c = self.comparison
        if not c.rows:
            return Text("No rows of this table tell them apart (single rows, pairs and small "
                        "sets were tried); your pick still tells tabq which one you meant.",
                        style="#c9a25a")
        table = RichTable(title="rows where they differ", title_style="bold #8fb3d9",
                          box=None, header_style="bold #8fb3d9")
        for name in c.headers:
            table.add_column(name, overflow="ellipsis", max_width=16)
        for row in c.sample:
            table.add_row(*("·" if v is None else str(v) for v in row))
        return table

    def action_pick(self, index: int) -> None:
        if index < len(self.comparison.readings):
            self.dismiss(index)

    def action_cancel(self) -> None:
        self.dismiss(None)
