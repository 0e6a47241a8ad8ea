"""Teaching: learning a team's words from confirmed answers, and measuring what was learned.

The CLI, the app and the benchmarks use only the names below. A model folder's log is the
model and its weights file a cache of it (`current` rebuilds a missing one); candidate searches
run on up to two processes grouped by table (`pool`), and a `Searches` cache keeps them for a
caller that teaches many times (the app).
"""

from .evaluation import EvalReport, evaluate, write_predictions
from .examples import ExamplesError, Job, read_examples
from .folder import REPLAY, current, export_lexicon, import_lexicon, lexicon_of, rebuild
from .folder import retract, teach, warm
from .learning import DEFAULT_OBJECTIVE, EPOCHS, Searches, TeachReport, learn_from

__all__ = ["DEFAULT_OBJECTIVE", "EPOCHS", "REPLAY", "EvalReport", "ExamplesError", "Job",
           "Searches", "TeachReport", "current", "evaluate", "export_lexicon",
           "import_lexicon", "learn_from", "lexicon_of", "read_examples", "rebuild", "retract",
           "teach", "warm", "write_predictions"]
