"""The fitted numbers that turn candidate scores into the probability shown and the unsure flag.

Fitted by benchmarks/calibrate.py on 2026-12-04, untaught model (Model.prior()), on
zeroshot/penguins (50), zeroshot/ticket_sales (50), wtq (619), vocabulary/test (34) questions;
benchmarks/zeroshot2/ was kept out as the held-out test. AGREEMENT:
the value whose top answers are right most often, averaged over the sets (ties to the smaller).
TEMPERATURE: least log loss of "the top answer is right" against its probability, each set
weighing the same. SURE_AT and IGNORED_WORDS: of the thresholds from which the top answers of
the zeroshot sets are right at least 95% of the time, the one flagging the fewest (on the other
sets no threshold gets there short of flagging nearly all), tried with IGNORED_WORDS off, 2 and 3.
Asked at commit 5ba6539 ("+": with uncommitted changes).
Refit: python benchmarks/calibrate.py --write.
"""

AGREEMENT = 0.0  # weight of the log-sum-exp bonus for other readings giving the same answer
TEMPERATURE = 1.0443  # answer scores are divided by this before the softmax
SURE_AT = 0.22  # the top answer's probability from which it is not flagged unsure
IGNORED_WORDS = 2  # flagged too when its reading ignores this many content words (0: off)
