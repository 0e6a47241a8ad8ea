"""The command line: a thin layer over the Python API. Errors become one line and an exit code."""

from __future__ import annotations

import argparse
import contextlib
import dataclasses
import fnmatch
import os
import sys
import warnings
from pathlib import Path

from . import api
from .errors import InputError, TabqError
from .progress import reading_label, working
from .output import BY_SUFFIX, FORMATS, dump_json, render
from .files import has_glob, is_table_name
from .safeio import atomic_write, printable, reason
from .table import ReadChoices

EXAMPLES = {
    "ask": 'tabq ask sample_tables/repair_jobs.csv "how many jobs were cancelled"',
    "teach": "tabq teach sample_tables/repair_jobs.csv confirmed.jsonl --model team-model",
    "eval": "tabq eval test.jsonl --train train.jsonl --model /tmp/m --predictions out.jsonl",
    "demo": "tabq demo",
    "lexicon export": "tabq lexicon export --model team-model team-words.json",
    "lexicon import": "tabq lexicon import team-words.json --model my-model --merge",
    "lexicon show": "tabq lexicon show --model team-model --word refunds",
    "lexicon diff": "tabq lexicon diff team-words-v1.json team-words-v2.json",
    "ui": "tabq ui sample_tables/repair_jobs.csv --model team-model",
    "completion": 'eval "$(tabq completion bash)"',
}


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="tabq", description="Answer plain-English questions about a local table.",
        epilog="Every answer comes with the SQL that produced it: check it before acting on it.")
    parser.add_argument("-V", "--version", action="version", version=f"tabq {_version()}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND")

    ask = commands.add_parser("ask", help="answer one question about a table",
                              description="Answer one question about a table, with the SQL "
                              "and a plain reading of it.",
                              epilog=f"example: {EXAMPLES['ask']}")
    ask.add_argument("table", help="a CSV, TSV, Parquet, JSON-lines, Excel or SQLite file")
    ask.add_argument("question", help="the question, in plain English")
    ask.add_argument("--table", dest="table_name", metavar="NAME",
                     help="which table or sheet of a SQLite or Excel file")
    _reading_options(ask)
    ask.add_argument("--model", metavar="DIR",
                     help="a model folder (default: $TABQ_MODEL, else your per-user tabq "
                     "folder; the untaught model until something is taught)")
    ask.add_argument("--top", type=int, default=3, metavar="K",
                     help="how many distinct answers to show (default 3)")
    _answer_options(ask)
    ask.set_defaults(run=_ask)

    teach = commands.add_parser(
        "teach", help="learn from confirmed answers",
        description="Learn from confirmed answers: lines {\"question\", \"answer\"} about one "
        "table. Each is logged in the model folder; the model learns at once.",
        epilog=f"example: {EXAMPLES['teach']}")
    teach.add_argument("table", help="the table the questions are about")
    teach.add_argument("examples", help="a JSON-lines file of {\"question\", \"answer\"}")
    teach.add_argument("--table", dest="table_name", metavar="NAME",
                       help="which table or sheet of a SQLite or Excel file")
    _reading_options(teach)
    teach.add_argument("--model", metavar="DIR",
                       help="the model folder (default: your per-user tabq folder)")
    _learning_options(teach)
    teach.set_defaults(run=_teach)

    evaluate = commands.add_parser(
        "eval", help="measure accuracy on examples with known answers",
        description="Answer every example {\"id\", \"question\", \"table\", \"answer\"} "
        "and report accuracy, oracle coverage (a right answer among the candidates), a "
        "breakdown by \"kind\" and time per question. With --train, learn first.",
        epilog=f"example: {EXAMPLES['eval']}")
    evaluate.add_argument("examples", help="JSON lines; \"table\" is relative to this file")
    evaluate.add_argument("--train", metavar="TRAIN", help="learn from these examples first")
    evaluate.add_argument("--model", metavar="DIR",
                          help="a model folder to start from (and to save to with --train); "
                          "default: the untaught prior, not your per-user folder nor "
                          "$TABQ_MODEL, so results do not depend on what was taught")
    evaluate.add_argument("--predictions", metavar="OUT",
                          help='write {"id", "answer", "sql"} a line')
    evaluate.add_argument("--json", action="store_true", help="print the report as JSON")
    _learning_options(evaluate)
    evaluate.set_defaults(run=_eval)

    demo = commands.add_parser("demo", help="ask the demo tables a few questions",
                               description="Ask the invented demo tables (a community bike "
                               "workshop) a few questions and show the answers with their SQL. "
                               "The demo shows tabq out of the box: it asks with the untaught "
                               "model, not your model folder.",
                               epilog=f"example: {EXAMPLES['demo']}")
    demo.set_defaults(run=_demo)
    _lexicon_parser(commands)

    ui = commands.add_parser("ui", help="the terminal app: ask, confirm answers, teach",
                             description="Open a table in the terminal app: ask questions, "
                             "confirm or correct answers, compare look-alike readings; each "
                             "confirmation teaches the model folder at once.",
                             epilog=f"example: {EXAMPLES['ui']}")
    ui.add_argument("table", help="a CSV, TSV, Parquet, JSON-lines, Excel or SQLite file")
    ui.add_argument("--table", dest="table_name", metavar="NAME",
                    help="which table or sheet of a SQLite or Excel file")
    _reading_options(ui)
    ui.add_argument("--model", metavar="DIR",
                    help="the model folder to teach (default: your per-user tabq folder)")
    ui.set_defaults(run=_ui)

    from .completion import SHELLS
    complete = commands.add_parser(
        "completion", help="print a shell completion script (bash, zsh or fish)",
        description="Print a completion script for tabq's commands and options, generated "
        "from this parser. bash: eval \"$(tabq completion bash)\" in ~/.bashrc; zsh: the same "
        "after compinit in ~/.zshrc; fish: tabq completion fish > "
        "~/.config/fish/completions/tabq.fish",
        epilog=f"example: {EXAMPLES['completion']}")
    complete.add_argument("shell", choices=SHELLS, help="the shell to complete in")
    complete.set_defaults(run=_completion)
    return parser


def _answer_options(command: argparse.ArgumentParser) -> None:
    """How the answer is given: its format, all of it, and where."""
    shape = command.add_mutually_exclusive_group()
    shape.add_argument("--format", choices=FORMATS, default=None,
                       help="text (default; bars for a per-group answer), json (every answer "
                       "with its SQL), or the best answer's table as ndjson, csv or markdown; "
                       "default: from the -o file's extension, else text")
    shape.add_argument("--json", dest="format", action="store_const", const="json",
                       help="the same as --format json")
    command.add_argument("--all", dest="every", action="store_true",
                         help="every row of a long answer (text cuts it at 12, and at most "
                         "1000 rows are kept while ranking)")
    command.add_argument("-o", "--output", metavar="FILE",
                         help="write the answer to FILE instead of standard output (never "
                         "over the table asked)")


def _reading_options(command: argparse.ArgumentParser) -> None:
    """Choices that overrule tabq's reading guesses, when the read notes show a wrong one."""
    command.add_argument("--header-line", type=int, metavar="N",
                         help="the header is on line (or sheet row) N, counting from 1")
    command.add_argument("--decimal-mark", choices=(".", ","),
                         help="the decimal mark of the file's numbers")
    command.add_argument("--encoding", metavar="NAME",
                         help="the text encoding of a CSV file (utf-8, cp1252, cp1251, ...)")


def _choices(args: argparse.Namespace) -> ReadChoices | None:
    if args.header_line is not None and args.header_line < 1:
        raise InputError("--header-line counts from 1")
    return ReadChoices.of({"header_line": args.header_line, "decimal_mark": args.decimal_mark,
                           "encoding": args.encoding})


def _lexicon_parser(commands) -> None:
    """`tabq lexicon export|import|show|diff`: what a model learned, as a file to share."""
    group = commands.add_parser(
        "lexicon", help="export, import, show or compare what a model learned",
        description="The learned lexicon (which words mean which columns, values and "
        "operations) as a JSON or CSV file to review, version, diff and share. "
        "Format: docs/lexicon.md.", epilog=f"example: {EXAMPLES['lexicon export']}")
    group.set_defaults(run=lambda args: _no_action(group))
    actions = group.add_subparsers(dest="action", metavar="ACTION")

    def action(name: str, help: str, description: str, run) -> argparse.ArgumentParser:
        parser = actions.add_parser(name, help=help, description=description,
                                    epilog=f"example: {EXAMPLES['lexicon ' + name]}")
        parser.set_defaults(run=run)
        return parser

    model_help = "the model folder (default: your per-user tabq folder)"
    export = action("export", "write the lexicon to a .json or .csv file",
                    "Write every learned weight of a model, with its support, to OUT "
                    "(.json or .csv), sorted so that versions diff well.", _lexicon_export)
    export.add_argument("out", metavar="OUT", help="the file to write (.json or .csv)")
    export.add_argument("--model", metavar="DIR", help=model_help)
    load = action("import", "load a lexicon file into a model",
                  "Load a lexicon file into a model folder. --merge (the default) adds its "
                  "weights to the model's; --replace makes them the model's. A bad file is "
                  "refused and the model left untouched.", _lexicon_import)
    load.add_argument("file", metavar="FILE", help="a lexicon file (.json or .csv)")
    load.add_argument("--model", metavar="DIR", help=model_help)
    mode = load.add_mutually_exclusive_group()
    mode.add_argument("--merge", dest="mode", action="store_const", const="merge",
                      help="add the file's weights to the model's (default)")
    mode.add_argument("--replace", dest="mode", action="store_const", const="replace",
                      help="make the file's weights the model's learned weights")
    load.set_defaults(mode="merge")
    show = action("show", "print a model's lexicon as a table",
                  "Print what a model learned as a table: word, kind of meaning, meaning, "
                  "learned offset, total weight and support.", _lexicon_show)
    show.add_argument("--model", metavar="DIR", help=model_help)
    show.add_argument("--word", metavar="W", help="only entries of this word (by its stem)")
    compare = action("diff", "what changed between two lexicon files",
                     "Report the entries added, removed and changed from lexicon A to B.",
                     _lexicon_diff)
    compare.add_argument("a", metavar="A", help="the older lexicon file")
    compare.add_argument("b", metavar="B", help="the newer lexicon file")


def _no_action(parser: argparse.ArgumentParser) -> int:
    parser.print_help(sys.stderr)
    return 2


def _lexicon_export(args: argparse.Namespace) -> int:
    from .store import ModelFolder
    from .teaching import export_lexicon
    folder = ModelFolder(args.model)
    lexicon = export_lexicon(folder, args.out)
    print(f"wrote {len(lexicon.entries)} entries and {len(lexicon.structure)} structure weights "
          f"({lexicon.confirmations} confirmations) from {folder.path} to {args.out}")
    return 0


def _lexicon_import(args: argparse.Namespace) -> int:
    from .store import ModelFolder
    from .teaching import import_lexicon
    folder = ModelFolder(args.model)
    report = import_lexicon(folder, args.file, args.mode)
    verb = "merged" if report.mode == "merge" else "replaced the learned weights with"
    print(f"{verb} {report.entries} weights from {args.file} into {folder.path} "
          f"(log batch {report.batch})")
    return 0


def _lexicon_show(args: argparse.Namespace) -> int:
    from .lexicon import as_table, imports, matching
    from .store import ModelFolder
    from .teaching import lexicon_of
    folder = ModelFolder(args.model)
    lexicon = lexicon_of(folder)
    print(as_table(matching(lexicon, args.word)))
    if not args.word:
        print(f"\n{lexicon.confirmations} confirmations"
              + (f", {lexicon.support_unknown} of them with unknown support"
                 if lexicon.support_unknown else ""))
        for record in imports(folder):
            print(printable(f"imported ({record.mode}) {record.source} on {record.time}, "
                            f"sha256 {record.sha256[:12]}"))
    return 0


def _lexicon_diff(args: argparse.Namespace) -> int:
    from .lexicon import diff, diff_text, read
    a, _ = read(args.a)
    b, _ = read(args.b)
    print(diff_text(diff(a, b), a, b))
    return 0


def _learning_options(parser: argparse.ArgumentParser) -> None:
    from .learn import OBJECTIVES
    from .teaching import DEFAULT_OBJECTIVE, EPOCHS
    parser.add_argument("--objective", choices=OBJECTIVES, default=DEFAULT_OBJECTIVE,
                        help=f"how to learn (default {DEFAULT_OBJECTIVE})")
    parser.add_argument("--epochs", type=int, default=EPOCHS, help=f"passes (default {EPOCHS})")
    parser.add_argument("--workers", type=int, default=None,
                        help="processes for candidate search (default: up to 2)")


def _version() -> str:
    from . import __version__
    return __version__


def main(argv: list[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if not getattr(args, "run", None):
        parser.print_help()
        return 2
    warnings.showwarning = _show_warning
    stdout = sys.stdout
    if args.command != "ui":    # the app draws on the terminal itself
        sys.stdout = _Output(stdout)
    try:
        code = args.run(args)
        sys.stdout.flush()      # a full device fails here, not in an exit hook, so it is said
        return code
    except OutputError as err:
        _drop_stdout()          # or the exit fails again, flushing what is left
        return _fail(str(err), err.exit_code)
    except TabqError as err:
        return _fail(str(err), err.exit_code)
    except KeyboardInterrupt:
        print("tabq: stopped", file=sys.stderr)
        return 130
    except BrokenPipeError:     # `tabq ask … | head`: the reader left, which is not an error
        _drop_stdout()
        return 0
    except OSError as err:      # a full disk or a read-only place tabq was writing to
        where = f"{err.filename}: " if err.filename is not None else ""
        return _fail(f"{where}{reason(err)}", 1)
    except Exception as err:  # a bug of ours: still one line, never a traceback
        return _fail(f"internal error ({err.__class__.__name__}): {err}", 1)
    finally:
        sys.stdout = stdout


class OutputError(TabqError):
    """Standard output cannot be written (a full device): not a bug, and not bad input."""


class _Output:
    """Standard output, whose write errors say they are the output's: an OSError from deep
    in a command is otherwise hard to tell from one of the model folder's."""

    def __init__(self, stream):
        self._stream = stream

    def write(self, text: str) -> int:
        return self._guarded(self._stream.write, text)

    def flush(self) -> None:
        self._guarded(self._stream.flush)

    def _guarded(self, call, *args):
        try:
            return call(*args)
        except BrokenPipeError:
            raise
        except OSError as err:
            raise OutputError(f"cannot write the output: {reason(err)}") from None

    def __getattr__(self, name: str):
        return getattr(self._stream, name)


def _fail(message: str, code: int) -> int:
    print(f"tabq: {_one_line(message)}", file=sys.stderr)
    return code


def _drop_stdout() -> None:
    """Point standard output at the null device: Python flushes it again on exit."""
    try:
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
    except (OSError, ValueError):
        pass


def _show_warning(message, category, *_) -> None:
    """A warning (a skipped damaged log line, say) as one line on stderr, like an error."""
    print(f"tabq: warning: {_one_line(str(message))}", file=sys.stderr)


def _one_line(text: str) -> str:
    """One line, its control characters escaped: messages quote paths and file contents."""
    return printable(" ".join(text.split()))[:300]


def _dump(data: object) -> str:
    return dump_json(data)


def _ask(args: argparse.Namespace) -> int:
    output = args.output if args.output not in (None, "-") else None
    fmt = args.format or _format_of(output)
    if output:
        refuse_input_as_output(Path(output), args.table)   # before the work, and again after
    # no --model: the default folder, as `tabq.open` and `tabq teach` use
    with working(reading_label(args.table)):
        table = api.open(args.table, model=args.model, table=args.table_name,
                         choices=_choices(args))
    with working("weighing readings of the question"):
        result = table.ask(args.question)
    colour = not output and fmt == "text" and _colour_wanted(sys.stdout)
    text = render(result, fmt, max(1, args.top), args.every, colour)
    if fmt in ("ndjson", "csv") and result.unsure:    # the file cannot say it; the person can
        print(_one_line(f"tabq: note: unsure answer ({result.unsure_reason}); its SQL: "
                        f"{result.sql}"), file=sys.stderr)
    if not output:
        sys.stdout.write(text)
        return 0
    refuse_input_as_output(Path(output), args.table, table.table.report)
    try:
        atomic_write(Path(output), text)
    except OSError as err:     # named as the person named it, not by the temporary file
        raise TabqError(f"-o {_shown(Path(output))}: cannot write it ({reason(err)})") from None
    print(printable(f"wrote the answer ({fmt}) to {output}"), file=sys.stderr)
    return 0


def _format_of(output: str | None) -> str:
    """The format a file's extension asks for; text for standard output or another name."""
    return BY_SUFFIX.get(Path(output).suffix.lower(), "text") if output else "text"


def _colour_wanted(stream) -> bool:
    """Colours only on a terminal, and never when NO_COLOR is set to anything (no-color.org)."""
    isatty = getattr(stream, "isatty", None)
    return bool(isatty and isatty()) and not os.environ.get("NO_COLOR")


def refuse_input_as_output(output: Path, given: str, report=None) -> None:
    """Refuse an output file that is the table asked (the same file by any name or link), one
    of the files it was read from, or a file that would be read as part of it next time (a
    table file in the folder asked, or a name the pattern asked matches)."""
    if output.is_dir():
        raise InputError(f"-o {_shown(output)}: is a folder; name a file")
    if not output.absolute().parent.is_dir():
        raise InputError(f"-o {_shown(output)}: its folder {_shown(output.absolute().parent)} "
                         "does not exist")
    sources = [Path(given)] if given != "-" else []
    folder = Path(given) if given != "-" and Path(given).is_dir() else None
    if report is not None and report.sources and folder is not None:
        sources += [folder / name for name in report.sources]
    for source in sources:
        if _same_file(output, source):
            raise InputError(f"-o {_shown(output)}: is the table asked; tabq never writes "
                             "over its input")
    if folder is not None and _same_file(output.absolute().parent, folder) \
            and is_table_name(output):
        raise InputError(f"-o {_shown(output)}: is inside the folder asked and would be read "
                         "as part of the table; write it elsewhere")
    if given != "-" and not os.path.lexists(given) and has_glob(given) \
            and fnmatch.fnmatch(str(output.absolute()), str(Path(given).absolute())):
        raise InputError(f"-o {_shown(output)}: matches the pattern asked and would be read "
                         "as part of the table; write it elsewhere")


def _same_file(a: Path, b: Path) -> bool:
    try:
        return os.path.samefile(a, b)
    except OSError:        # one of them does not exist (yet): not the same file
        return False


def _shown(path: Path) -> str:
    return printable(str(path))


def _teach(args: argparse.Namespace) -> int:
    from . import logic
    from .definitions import offered
    from .load import load_table
    from .store import ModelFolder
    from .teaching import read_examples, teach
    choices = _choices(args)
    with working(reading_label(args.table)):   # a bad table is refused before any logging
        load_table(args.table, args.table_name, choices)
    jobs = read_examples(args.examples, table=args.table, table_name=args.table_name)
    jobs = [dataclasses.replace(job, reading=choices) for job in jobs]
    folder = ModelFolder(args.model)
    known = set(offered(folder.load())) if folder.has_weights() else set()
    with _unless_counted(jobs, f"teaching {len(jobs)} confirmations"):
        report = teach(folder, jobs, args.objective, args.epochs, args.workers)
    print(f"taught {report.taught} confirmations ({report.reachable} with a reading that gives "
          f"the answer; {report.replayed} earlier ones replayed) into {folder.path}")
    for defined in offered(folder.load()):
        if defined not in known:   # a team word's meaning found from the answers: say it
            meaning = logic.paraphrase(defined.rows).removeprefix("rows where ")
            print(f"  '{printable(defined.word)}' now means: {printable(meaning)}")
    for record in report.records:
        if record.query is None and record.id not in report.skipped:
            print(f"  nothing learned from '{printable(record.question)}': no reading of it "
                  f"gives {printable(', '.join(map(str, record.answer)))}; it is logged and "
                  "teaches once one does (teach its words in simpler questions first)")
    for skipped in report.skipped:
        print(f"  skipped {skipped}", file=sys.stderr)
    return 0


def _eval(args: argparse.Namespace) -> int:
    import time as _time

    from .model import Model
    from .store import ModelFolder
    from .teaching import current, evaluate, learn_from, read_examples, teach
    from .teaching import write_predictions
    jobs = read_examples(args.examples)
    train_jobs = read_examples(args.train) if args.train else []
    folder = ModelFolder(args.model) if args.model else None
    # no --model: the untaught prior, never the default folder, so a figure is reproducible
    model = current(folder) if folder else Model.prior()
    trained = None
    if train_jobs:
        start = _time.perf_counter()
        with _unless_counted(train_jobs, f"learning from {len(train_jobs)} examples"):
            if folder:      # taught like any confirmation: logged, so the log still rebuilds it
                report = teach(folder, train_jobs, args.objective, args.epochs, args.workers)
                model = folder.load()
            else:
                model, report, _ = learn_from(model, train_jobs, args.objective, args.epochs,
                                              args.workers, fresh=train_jobs)
        trained = {"examples": report.taught, "oracle": report.reachable / max(report.taught, 1),
                   "not_simplest": report.not_simplest,
                   "seconds": round(_time.perf_counter() - start, 1)}
    with _unless_counted(jobs, f"answering {len(jobs)} examples"):
        result = evaluate(model, jobs, args.workers)
    if args.predictions:
        write_predictions(args.predictions, jobs, result)
    summary = {"examples": result.examples, "accuracy": round(result.accuracy, 4),
               "oracle": round(result.oracle, 4),
               "sure_accuracy": (round(result.sure_accuracy, 4) if result.sure
                                 else None),
               "flagged": round(result.flagged, 4),
               "seconds_per_question": round(result.seconds_per_question, 3),
               "by_kind": {k: {"right": r, "of": n} for k, (r, n) in result.by_kind.items()},
               **({"training": trained} if trained else {})}
    if args.json:
        print(_dump(summary))
        return 0
    if trained:
        print(f"trained on {trained['examples']} examples in {trained['seconds']} s "
              f"(oracle coverage {trained['oracle']:.1%}; {trained['not_simplest']} targets "
              "not the simplest reading that gives the answer)")
    print(f"accuracy {result.accuracy:.1%} ({round(result.accuracy * result.examples)}/"
          f"{result.examples}); oracle coverage {result.oracle:.1%}; "
          f"{result.seconds_per_question * 1000:.0f} ms per question")
    print("right among answers not flagged unsure: " + (
        f"{result.sure_accuracy:.1%} ({result.right_sure}/{result.sure})" if result.sure
        else "none was sure") + f"; flagged unsure {result.flagged:.1%}")
    for kind, (right, n) in result.by_kind.items():
        print(f"  {kind:18s} {right:4d}/{n:<4d} {right / n:.0%}")
    return 0


def _unless_counted(jobs: list, label: str):
    """A progress line for a few questions; many get the counting bar of `teaching.pool`
    (from COUNTED_FROM on), and two lines drawn at once would garble each other."""
    from .teaching.pool import COUNTED_FROM
    return working(label) if len(jobs) < COUNTED_FROM else contextlib.nullcontext()


def _ui(args: argparse.Namespace) -> int:
    from .ui import run
    run(args.table, args.model, args.table_name, _choices(args))
    return 0


def _completion(args: argparse.Namespace) -> int:
    from .completion import script
    sys.stdout.write(script(_parser(), args.shell))
    return 0


def _demo(args: argparse.Namespace) -> int:
    from .demo import run_demo
    run_demo(print)
    return 0



if __name__ == "__main__":
    sys.exit(main())
