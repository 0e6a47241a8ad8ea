"""The hand-set prior: what common English words say about a query before any teaching.

A fragment is a piece of a logical form ("sum", "cmp:gt", "extreme:max"). Each has a bias (how
plausible it is with no word asking for it) and cue phrases that ask for it. These become weights
on the same features learning moves (`op:<fragment>` and `lex:<stems>|<fragment>`), so teaching
starts from this prior and can overrule any of it.
"""

from __future__ import annotations

from functools import lru_cache
from importlib import resources

from . import featurenames
from .text import split_words, stem

# fragment: (bias, {cue phrase: weight})
CUES: dict[str, tuple[float, dict[str, float]]] = {
    "count": (-1.0, {"how many": 3.0, "number of": 2.5, "count": 2.5, "how often": 2.0,
                     "total number": 1.0, "many": 0.5, "times": 0.5, "tally": 2.0}),
    "count_distinct": (-2.5, {"different": 2.6, "distinct": 3.0, "unique": 3.0,
                              "how many": 1.0, "number of": 0.8, "various": 1.5}),
    "sum": (-1.5, {"total": 2.6, "sum": 2.6, "combined": 2.2, "altogether": 2.0,
                   "in all": 1.5, "overall": 1.0, "how much": 1.2, "together": 1.4,
                   "total number": -1.5, "total of": 0.6}),
    "avg": (-1.5, {"average": 3.6, "mean": 3.3, "avg": 3.6, "typical": 1.5, "per": 0.3}),
    "median": (-2.5, {"median": 5.0, "middle": 1.0}),
    "min": (-1.8, {"minimum": 2.6, "lowest": 2.2, "smallest": 2.2, "least": 1.6, "min": 2.6,
                   "shortest": 2.0, "cheapest": 2.0, "lightest": 2.0, "earliest": 1.8,
                   "fewest": 1.5, "youngest": 1.5, "quickest": 1.6, "fastest": 1.6,
                   "coldest": 2.0, "coolest": 2.0, "lowest point": 1.0}),
    # ("record" is no cue of a maximum: its stem is also "recorded", and "records" the rows)
    "max": (-1.8, {"maximum": 2.6, "highest": 2.2, "largest": 2.2, "biggest": 2.2, "most": 1.4,
                   "max": 2.6, "longest": 2.0, "greatest": 2.0, "heaviest": 2.0,
                   "latest": 1.8, "top": 1.2, "priciest": 2.0, "oldest": 1.5,
                   "tallest": 2.0, "slowest": 1.6, "costliest": 2.0, "expensive": 1.4,
                   "peak": 2.0, "warmest": 2.0, "hottest": 2.0, "wettest": 2.0}),
    "values": (0.0, {"what": 0.5, "which": 0.5, "who": 0.6, "when": 0.6, "where": 0.6,
                     "what is": 0.5, "list": 0.3, "name": 0.3, "how many": -0.8}),
    "distinct": (-1.4, {"different": 1.6, "distinct": 2.0, "unique": 2.0, "list": 0.8,
                        "which": 0.5, "what": 0.3, "kinds": 1.0, "types": 1.0, "all": 0.3}),
    "difference": (-2.5, {"difference": 3.0, "how many more": 3.0, "how much more": 3.0,
                          "more than": 0.8, "fewer than": 0.8, "less than": 0.5,
                          "how many fewer": 3.0, "how much less": 3.0, "gap": 2.5,
                          "between": 0.5, "than": 0.8, "how much [comparative]": 3.0}),
    "which_of": (-2.0, {"or": 2.0, "which": 0.8, "who": 0.6, "more": 0.5, "first": 0.3}),
    "group_best": (-1.3, {"which": 0.8, "who": 0.8, "what": 0.3, "most": 1.8, "fewest": 1.8,
                          "least": 1.3, "highest": 0.8, "lowest": 0.8, "largest": 0.8,
                          "busiest": 1.8, "quietest": 1.8, "popular": 1.8, "common": 1.8, "frequent": 1.8,
                          "often": 1.5}),
    "top_n": (-2.5, {"top": 2.8, "best": 1.0, "first": 0.3, "highest": 0.6, "largest": 0.6,
                     "most": 0.5, "bottom": 2.0, "lowest": 0.6}),
    "group_top": (-2.5, {"top": 2.8, "best": 1.0, "bottom": 2.0, "highest": 0.6, "largest": 0.6,
                         "most": 0.8, "lowest": 0.6, "fewest": 0.8, "least": 0.6}),
    "yes_no": (-3.0, {"qtype:yes_no": 3.0, "is there": 3.5, "are there": 3.5, "was there": 3.5, "were there": 3.5,
                      "any": 1.2, "did": 1.4, "does": 1.4, "do": 1.2, "ever": 1.0,
                      "has": 0.8, "have": 0.6}),
    "per_group": (-3.0, {"per": 2.8, "each": 2.4, "for each": 1.5, "by": 1.4, "breakdown": 2.5,
                         "for every": 2.5, "grouped": 2.5, "split by": 2.0}),
    # filters on groups, shares and per-period tables (rules.groups_with …, share, per_period)
    "having": (-1.5, {"have": 2.0, "has": 2.0, "had": 1.5, "with": 1.8, "whose": 2.0}),
    # a share is reported out of 100, as analysts write it ("a 12% share"); a fraction, a
    # proportion or a ratio from 0 to 1
    "share:percent": (-3.0, {"percent": 4.0, "percentage": 4.0, "pct": 3.5, "per cent": 4.0,
                             "share": 4.0}),
    "share:fraction": (-3.0, {"fraction": 4.0, "proportion": 4.0, "ratio": 3.0}),
    # no word stands on "above average"'s comparison: only a comparison word beside an average
    # word brings it in ("above the average amount", "heavier than average"), not "average" alone
    "than:avg": (-5.0, {"average": 1.5, "mean": 1.5, "avg": 1.5,
                        **{f"{side} {the}{word}": 3.5 for side in ("than", "above", "below",
                                                                   "over", "under")
                           for the in ("", "the ") for word in ("average", "mean")}}),
    "than:median": (-5.5, {"median": 1.5, **{f"{side} {the}median": 4.0
                                             for side in ("than", "above", "below", "over",
                                                          "under") for the in ("", "the ")}}),
    "per:month": (-1.0, {"month": 2.0, "monthly": 2.0, "by month": 2.5, "per month": 2.5,
                         "each month": 2.5, "every month": 2.5, "a month": 1.0}),
    "per:year": (-1.0, {"year": 2.0, "yearly": 2.0, "annual": 1.5, "annually": 2.0,
                        "by year": 2.5, "per year": 2.5, "each year": 2.5, "every year": 2.5,
                        "a year": 1.0}),
    # the day of the week asked for ("which weekday", "day of the week"); "weekdays" and
    # "on a weekday" are the working week (analyse._day_mentions), a condition
    "per:weekday": (-1.0, {"weekday": 2.0, "day of week": 2.5, "of the week": 2.5,
                           "per weekday": 2.5, "each weekday": 2.5}),
    "day_of_week": (0.0, {"on": 0.3}),
    "group:sum": (0.0, {"total": 1.5, "sum": 1.5, "most": 0.6, "overall": 0.5}),
    "group:avg": (-1.6, {"average": 3.6, "mean": 3.3, "avg": 3.6, "typical": 1.5, "per": 0.4}),
    "group:max": (-2.2, {"maximum": 1.8, "max": 1.8, "single": 1.5, "highest": 0.6,
                         "largest": 0.6, "biggest": 0.6, "longest": 0.8}),
    "group:min": (-2.2, {"minimum": 1.8, "min": 1.8, "single": 1.5, "lowest": 0.6,
                         "smallest": 0.6, "shortest": 0.8}),
    "group:median": (-3.0, {"median": 5.0}),
    "eq": (0.0, {}),
    "cmp:gt": (-1.0, {"more than": 2.4, "over": 2.0, "above": 2.2, "greater than": 2.4,
                      "higher than": 2.4, "after": 1.8, "exceeding": 2.2, "exceed": 2.0,
                      "larger than": 2.4, "longer than": 2.4, "heavier than": 2.4,
                      "bigger than": 2.4, "later than": 2.2, "beyond": 1.6,
                      "older than": 2.0, "greater": 1.0, "more": 0.5, "than": 0.6}),
    "cmp:lt": (-1.0, {"less than": 2.4, "under": 2.0, "below": 2.2, "fewer than": 2.4,
                      "lower than": 2.4, "before": 1.8, "smaller than": 2.4,
                      "shorter than": 2.4, "lighter than": 2.4, "cheaper than": 2.4,
                      "earlier than": 2.2, "younger than": 2.0, "prior to": 2.2,
                      "than": 0.6, "less": 0.5}),
    "cmp:ge": (-1.5, {"at least": 3.0, "or more": 3.0, "minimum of": 1.5, "no less than": 3.0,
                      "or over": 2.5, "and above": 2.5, "or above": 2.5, "from": 0.6,
                      "onwards": 2.0, "or later": 2.5, "since": 2.0}),   # since May: from May on
    "cmp:le": (-1.5, {"at most": 3.0, "or less": 3.0, "or fewer": 3.0, "no more than": 3.2,
                      "up to": 2.2, "maximum of": 1.5, "or under": 2.5, "or below": 2.5,
                      "or earlier": 2.5, "until": 1.2}),
    "between": (-0.8, {"between": 2.5, "from": 0.6, "to": 0.3, "range": 1.0}),
    "contains": (-1.8, {"contain": 1.5, "containing": 1.5, "contains": 1.5, "include": 1.0,
                        "including": 0.8, "with": 0.2, "mention": 1.0, "word": 1.0}),
    "missing": (-3.0, {"missing": 3.5, "unknown": 3.0, "blank": 3.0, "empty": 3.0,
                       "null": 3.5, "not recorded": 3.0, "no value": 3.0, "without": 1.2,
                       "not known": 3.0, "unrecorded": 3.0, "lack": 1.5, "lacking": 1.5,
                       "no": 1.8}),
    "present": (-3.0, {"known": 2.0, "recorded": 0.8, "with a": 0.5, "have a": 0.8}),
    "period": (0.5, {"in": 0.5, "during": 0.8, "of": 0.2}),
    "and": (-0.3, {}),
    "or": (-1.5, {"or": 2.2, "either": 1.5}),
    "not": (-2.5, {"not": 3.0, "n't": 3.0, "except": 3.0, "other than": 3.0, "excluding": 3.0,
                   "without": 1.5, "non": 3.5, "never": 2.0, "no": 0.8, "besides": 2.0,
                   "apart from": 2.5, "aside from": 2.5, "outside": 2.5, "isn't": 3.0, "wasn't": 3.0,
                   "weren't": 3.0, "aren't": 3.0, "didn't": 3.0, "doesn't": 3.0}),
    "extreme:max": (-1.8, {"most": 2.0, "highest": 2.4, "largest": 2.4, "biggest": 2.4,
                           "maximum": 2.2, "longest": 2.4, "greatest": 2.4, "heaviest": 2.4,
                           "top": 1.6, "best": 1.4, "latest": 1.8, "last": 0.5, "max": 2.2,
                           "tallest": 2.4, "oldest": 1.2, "priciest": 2.4, "expensive": 2.0,
                           "more": 0.5, "slowest": 2.0, "costliest": 2.4,
                           "recent": 1.8, "newest": 1.8, "peak": 2.0, "warmest": 2.4,
                           "hottest": 2.4, "wettest": 2.4}),
    "extreme:min": (-1.8, {"least": 2.0, "lowest": 2.4, "smallest": 2.4, "minimum": 2.2,
                           "shortest": 2.4, "fewest": 2.4, "lightest": 2.4, "cheapest": 2.4,
                           "earliest": 2.2, "worst": 1.0, "min": 2.2, "youngest": 1.2,
                           "quickest": 2.4, "fastest": 2.2, "first": 0.4, "less": 0.5,
                           "soonest": 2.0, "coldest": 2.4, "coolest": 2.4, "driest": 2.4}),
    "first": (-2.6, {"first": 2.6, "earliest": 1.0, "top": 0.8, "opening": 1.5,
                     "begin": 1.0, "start": 1.0, "initial": 2.0}),
    "last": (-2.6, {"last": 2.6, "final": 2.6, "latest": 1.0, "bottom": 1.2, "end": 0.8,
                    "most recent": 1.0}),
    "next": (-2.5, {"after": 2.2, "next": 2.8, "following": 2.6, "below": 1.4, "then": 1.0,
                    "succeeded": 2.0, "right after": 2.0}),
    "prev": (-2.5, {"before": 2.2, "previous": 2.8, "preceding": 2.6, "above": 1.4,
                    "prior": 2.0, "preceded": 2.0, "right before": 2.0}),
    "dir:max": (0.0, {"most": 1.5, "highest": 1.5, "largest": 1.5, "biggest": 1.5,
                      "more": 1.0, "maximum": 1.2, "top": 1.2, "best": 1.0, "greatest": 1.5,
                      "longest": 1.5, "heaviest": 1.5, "busiest": 1.5, "popular": 1.5,
                      "common": 1.2, "frequent": 1.2, "often": 1.0, "expensive": 1.2,
                      "later": 1.0, "last": 0.8, "latest": 1.2, "oldest": 0.6, "recent": 1.2,
                      "tallest": 1.5, "max": 1.5, "priciest": 1.5, "costliest": 1.5}),
    "dir:min": (0.0, {"least": 1.5, "lowest": 1.5, "smallest": 1.5, "fewest": 1.5,
                      "less": 1.0, "fewer": 1.0, "minimum": 1.2, "bottom": 1.2, "worst": 0.8,
                      "shortest": 1.5, "lightest": 1.5, "cheapest": 1.5, "earliest": 1.2,
                      "first": 0.8, "rarest": 1.5, "quietest": 1.5, "rare": 1.2, "min": 1.5, "quickest": 1.5,
                      "fastest": 1.2, "youngest": 0.6, "soonest": 1.5}),
}

# "at least 3" and "at most 3" bound a number: they never ask for the least or the most; nor
# do "more than 20" and "fewer than 3" (a comparison) or "how many more" (a difference) ask for
# the most or the fewest.
_BOUNDS = (("at least", "least"), ("at most", "most"), ("more than", "more"),
           ("less than", "less"), ("fewer than", "fewer"), ("many more", "more"),
           ("much more", "more"), ("many fewer", "fewer"), ("much less", "less"))
for _fragment, (_, _cues) in CUES.items():
    for _bound, _word in _BOUNDS:
        if _word in _cues and _bound not in _cues:
            _cues[_bound] = -_cues[_word]


# "colder than 5": a comparative compares the way its superlative ranks (coldest is a minimum,
# so colder is below); the superlatives of the extremes say it for every such word.
for _extreme, _compare in (("extreme:max", "cmp:gt"), ("extreme:min", "cmp:lt")):
    for _word in list(CUES[_extreme][1]):
        if _word.endswith("est") and len(_word) > 5 and " " not in _word:
            CUES[_compare][1].setdefault(f"{_word[:-3]}er than", 2.4)


# "heavier than average", "above the mean": the average is what rows are compared with, not a
# measure asked for (one "average" would otherwise read as both).
for _fragment in ("avg", "group:avg"):
    for _side in ("than", "above", "below", "over", "under"):
        for _the in ("", "the "):
            for _word in ("average", "mean"):
                CUES[_fragment][1][f"{_side} {_the}{_word}"] = -2.0


def cue_key(phrase: str) -> str:
    """A cue phrase as the question grams spell it: stemmed words, or a "qtype:" tag or a
    "[bracketed]" gram of analyse's own as is."""
    if phrase.startswith("qtype:") or phrase.endswith("]"):
        return phrase
    return " ".join(stem(w) for w in split_words(phrase))


# Phrases that plainly ask for one of a few fragments; a form with none of them leaves the
# phrase unexplained ("before" asks for cmp:lt or prev). "how many" is not here: it often
# asks for a number in a cell.
STRONG_CUES: dict[str, frozenset[str]] = {}
for _fragment, (_, _cues) in CUES.items():
    for _phrase, _weight in _cues.items():
        if _weight >= 2.2 and _phrase not in ("how many", "number of", "how much"):
            _key = cue_key(_phrase)
            STRONG_CUES[_key] = STRONG_CUES.get(_key, frozenset()) | {_fragment}
for _key in list(STRONG_CUES):  # max/min words are also explained by superlative fragments
    if STRONG_CUES[_key] & {"max", "extreme:max", "dir:max"}:
        STRONG_CUES[_key] |= {"max", "extreme:max", "dir:max"}
    if STRONG_CUES[_key] & {"min", "extreme:min", "dir:min"}:
        STRONG_CUES[_key] |= {"min", "extreme:min", "dir:min"}
    # the first or last row of a date's rows is its earliest or latest date ("when did we last")
    if STRONG_CUES[_key] & {"first", "last"}:
        STRONG_CUES[_key] |= {"date_extreme"}
    # an aggregate's words are also explained by it measuring groups ("total" per month) or
    # by a comparison with it ("windier than the average")
    STRONG_CUES[_key] |= {f"{use}:{fn}" for fn in ("sum", "avg", "min", "max", "median")
                          if fn in STRONG_CUES[_key] for use in ("group", "than")}

# Words that ask for an operation rather than naming a column or value.
CUE_WORDS = frozenset(
    w for _, cues in CUES.values() for phrase in cues if not phrase.startswith("qtype:")
    for w in split_words(phrase)
) | {"how", "many", "much", "number", "there", "any", "ones", "one", "amount"}

# Nouns that name the rows themselves ("how many records"), on top of the table's own title.
ROW_NOUNS = frozenset(
    "row rows record records entry entries item items line lines case cases time times "
    "people person one ones thing things total".split()
)

# Header words that say a column holds money, which every word asking about money may mean.
_MONEY = ("price", "cost", "fee", "charg", "amount", "invoic", "bill", "payment", "fare")

# Everyday stand-ins for common column words: question stem → header stems it can mean.
SYNONYMS: dict[str, tuple[str, ...]] = {
    "peopl": ("popul",), "inhabit": ("popul",), "resid": ("popul",),   # pop of poptotal
    "cost": ("price", "fee", "amount", "charg"), "price": ("cost", "fee", "amount", "fare"),
    "paid": ("price", "amount", "fee", "payment"), "pay": ("price", "amount", "fee", "payment"),
    "charg": ("fee", "price", "amount"), "fare": ("price", "fee"),   # billed, not a cost
    "spent": ("amount", "cost", "price"), "spend": ("amount", "cost", "price"),
    "earn": ("revenu", "incom", "salari", "amount", "total"),
    "money": ("amount", "price", "revenu", "total"), "incom": ("revenu", "amount", "total"),
    "revenu": ("sale", "amount", "price", "incom", "total"), "sale": ("revenu", "amount", "sold"),
    "day": ("date",), "month": ("date",), "week": ("date",),
    "long": ("durat", "length", "minut", "hour", "day", "distanc", "dist"),
    "durat": ("minut", "hour", "length"), "far": ("distanc", "dist"),
    "heavi": ("weight", "mass", "kg", "lb"), "weigh": ("weight", "mass", "kg", "lb"),
    "weight": ("mass", "kg", "lb"), "light": ("weight", "mass", "kg", "lb"),
    "short": ("length", "durat", "height", "distanc", "dist"),
    "cheap": _MONEY, "expens": _MONEY, "costli": _MONEY, "pricey": _MONEY, "prici": _MONEY,
    "pric": _MONEY, "bill": _MONEY, "worth": _MONEY,
    "young": ("age",), "new": ("date", "year"), "recent": ("date", "year"),
    "earli": ("date", "time", "year"), "late": ("date", "time", "year"),
    "fast": ("time", "speed", "durat"), "quick": ("time", "durat"), "slow": ("time", "durat"),
    "busi": ("count",), "wide": ("width",), "deep": ("depth",),
    "mass": ("weight",), "tall": ("height",), "old": ("age",), "age": ("old",),
    "when": ("date", "year", "time", "day"), "date": ("day", "time"), "year": ("season", "date"),
    "who": ("name", "player", "person", "staff", "custom", "member", "owner", "driver"),
    "where": ("locat", "place", "citi", "venu", "site", "countri", "region", "island"),
    "citi": ("town", "locat"), "town": ("citi",), "countri": ("nation", "nationali"),
    "nation": ("countri",), "many": ("quantiti", "count", "number"),
    "quantiti": ("qty", "number", "count", "unit"), "piec": ("item", "qty"), "amount": ("quantiti", "total", "price"),
    "engin": ("displac", "size"),   # engine size: a car's displacement (displ)
    "big": ("size",), "larg": ("size",), "small": ("size",), "score": ("point", "result"),
    "point": ("score",), "kind": ("type", "categori", "class"), "type": ("categori", "kind", "class"),
    "categori": ("type", "class", "kind"), "status": ("state",),
    "sex": ("gender",),
    "gender": ("sex",), "rank": ("posit", "place"), "place": ("rank", "posit", "locat"),
    "team": ("club",), "club": ("team",), "titl": ("name",), "film": ("titl",),
    # the extremes a terse header writes as hi/lo/max/min beside a measure (temp_hi, tmax)
    "peak": ("high", "max", "top"), "high": ("height", "max"), "low": ("min",),
    "warm": ("temperatur", "high", "max"), "hot": ("temperatur", "high", "max"),
    "cool": ("temperatur", "low", "min"), "cold": ("temperatur", "low", "min"),
    "wet": ("precipit", "rain"), "rain": ("precipit",), "dri": ("precipit",),
}


# Words related by meaning, read from WordNet 3.0 by tools/make_related.py (data/related.tsv):
# an adjective's attribute (heavy → weight), derived words (cite → citation), synonyms (pupil →
# student), a noun's broader word (student → enrollee). Weaker than SYNONYMS, which a person
# checked; analyse tries them only when no header is named otherwise (quality "related").
RELATIONS = ("attr", "deriv", "syn", "hyper")


@lru_cache(maxsize=len(RELATIONS))
def _related_table(relations: tuple[str, ...]) -> dict[str, frozenset[str]]:
    text = (resources.files("tabq") / "data" / "related.tsv").read_text("utf-8")
    table: dict[str, set[str]] = {}
    for line in text.splitlines():
        if line.startswith("#"):
            continue
        relation, key, related = line.split("\t")
        if relation in relations:
            table.setdefault(key, set()).update(related.split())
    return {key: frozenset(words) for key, words in table.items()}


def related(word_stem: str, relations: tuple[str, ...] = RELATIONS) -> frozenset[str]:
    """The header stems a question stem may mean by WordNet (heavi → weight, cite → citat), by
    the relations asked: an adjective's degree ("longest") means its attribute, not what the
    verb "to long" is a synonym of."""
    return _related_table(relations).get(word_stem, frozenset())

# Header words that say a column holds what a wh-word asks for: a date, a place, a person.
# A "who" column may also be told by its values (people's names, see analyse).
_WH_WORDS = {
    "when": "date day time when month week year start end",
    "where": "place city town depot region country location site venue station address area "
             "branch store shop warehouse port county district destination island where hub "
             "ground stadium state",
    "who": "person name driver staff agent rep seller by owner customer client employee player "
           "mechanic manager author observer member user who buyer host winner artist director "
           "coach captain teacher student courier cashier operator worker technician assignee "
           "writer salesperson",
}
WH_COLUMNS: dict[str, frozenset[str]] = {
    wh: frozenset(stem(w) for w in words.split()) for wh, words in _WH_WORDS.items()}


def prior_weights() -> dict[str, float]:
    """Feature weights of the untaught model."""
    weights: dict[str, float] = {}
    for fragment, (bias, cues) in CUES.items():
        weights[featurenames.op(fragment)] = bias
        for phrase, weight in cues.items():
            weights[featurenames.lex(cue_key(phrase), fragment)] = weight
    weights.update(STRUCTURE_PRIOR)
    return weights


# Weights of the features that do not pair words with fragments (see features.py).
STRUCTURE_PRIOR: dict[str, float] = {
    "cover": 1.6,                   # per content word a column, value or number accounts for
    "cover:quoted": 2.0,
    "ent:exact": 1.0, "ent:stem": 0.7, "ent:partial": -1.2, "ent:fuzzy": -0.5,
    "ent:number": 0.3, "ent:compound": 1.3, "ent:code": 1.2,   # "Ohio" for OH: above a county named OHIO
    "ent:flag": 1.0,                 # "metro counties": inmetro = 1
    "ent:abbrev": 0.3,               # "part-timers": pt
    "ent:floating": -3.5, "ent:floating+col": 1.2,
    "ent:floating+word": -3.5,       # with the cover of its word: still below a named value
    "ent:floating+col_exact": 0.5,
    "contains:partial": -0.3, "contains:quoted": 1.0,
    "col:exact": 0.6, "col:partial": 0.0, "col:stem": 0.4, "col:fuzzy": -0.2,
    "col:synonym": 0.2, "col:abbrev": 0.2, "col:related": 0.0, "col:none": -0.9, "col:view": -0.15, "col:repeated": -1.5,
    "col:id": -0.6, "key:unique": -1.5,
    "key.rows_asked": -1.0, "values.row_name": 1.0,   # "which journal": a title, not a publisher
    "values.after_superlative": -1.5,   # "the temperature on the day with the most ozone"
    "head:counted_column_unused": -2.0,   # "how many drivers" counting the parcels
    "ent:floating_counted": -2.0,         # … or the parcels of one driver no word names
    "key.one_row_described": -2.5,   # "the branch of the most expensive job": no branch's sum
    "values.rows_as_measure": -1.0,  # "the 3 most cited journals": titles, not citation counts
    "values.col:none": -0.3, "values.col:exact": 0.6,
    "measure.col:none": -0.9, "key.col:none": -0.9, "order.col:none": -1.2,
    "measure.col:exact": 0.6, "key.col:exact": 0.3,
    "filter.col:none": -0.4, "filter.col:exact": 0.3,
    "num:ordinal_twice": -2.0,   # "when did we first …" reading "first" as a 1 too
    "num:unused": -2.5, "ent:unused": -1.0, "date:unused": -2.5,
    "teamword:unused": -2.5,         # a taught team word the reading leaves out
    "teamword:parts": -0.1,          # of two definitions that fit, the one saying less
    "num:answer_count": 0.5, "num:answer_count_misread": -3.0,
    "den:answer_count": 0.8, "den:answer_count_off": -1.0,   # "which 3 clients": 3 answers
    "dir:unasked": -2.5,             # a most or a least that no word asks for
    "num:counts_things": 1.5,        # "more than 20 late deliveries": a count per group …
    "num:counted_as_amount": -1.5,   # … not a sum of a column
    "num:compound_compared": -3.0,   # "4-cylinder": cyl = 4, no threshold
    "sum:of_rate": -1.0,             # a total of percbelowpoverty or avg_income means nothing
    "num:threshold_as_value": -1.5,  # "than 90" read as a value: a threshold, not a cell
    "present:participle": 1.0,
    "share:whole_named": 1.5, "share:whole_as_part": -1.5,   # "of the delivered parcels, …"
    "noun:counted_as_amount": -1.5,  # "the most orders": not order_date, nor any amount of it
    "noun:counted": 1.5,             # … but a count of them
    "degree_word:order": 1.0, "degree_word:measure": 1.0, "degree_word:group:sum": -1.0, "degree_word:group:max": 0.5,
    "degree_word:group:min": 0.5,
    "head:as_condition": -1.5,       # what "how many" counts is no condition's column
    "head:unused_measure": -1.0,     # "how many goals" (a goals column) not answered from it
    "head:counted_measure": -4.0,    # … but by counting rows
    # … or by counting its different values, or grouping by them
    **{f"head:{rule}|number": -2.5 for rule in (
        "count_distinct", "group_best_count", "group_best", "group_top_count", "group_top")},
    "cmp:date_year": -0.2, "cmp:out_of_range": -1.0, "num:as_entity": 0.3,
    "size": -0.25, "rows:all": 0.0, "rows:nested": -0.4,
    "super:nested": -3.0, "cue:unexplained": -1.2, "den:repeats": -3.0,
    "head:count_distinct": 2.5, "head:values": 0.6, "head:aggregate": 0.8,
    "whhead:values": 1.2, "whhead:distinct": 1.2, "whhead:group_best": 1.2,
    "whhead:group_best_count": 1.2, "whhead:group_top": 1.2, "whhead:group_top_count": 1.2,
    "whhead:top_n": 0.8, "whhead:top_values": 0.8,
    "whhead:groups_with_count": 1.2, "whhead:groups_with": 1.2,
    "head:count_groups_with_count": 2.5, "head:count_groups_with": 2.5,
    "ent:floating_yes": 1.6, "extreme.all": 0.2, "position.all": 0.2, "and:same_col": -2.0,
    "neighbour:multi": -0.8, "top_n.small": 0.5, "which_of.same": 0.0,
    "agg.on_single": -2.0,
    "col:wh": 0.4, "values.col:wh": 1.0, "key.col:wh": -0.3,   # "who": a person (WH_COLUMNS)
    "values.col:not_wh": -1.5,       # … not answered by a column of another kind
    "not:gap": -0.3, "not:before": -1.0,   # per word between a negation and what it negates
    # after execution: the answer against the question's wh-word
    "den:empty": -3.0, "den:null": -3.0, "den:many": -0.4, "den:huge": -1.5,
    "den:how_many|number": 1.2, "den:how_many|text": -2.5, "den:how_many|date": -2.5,
    "den:how_much|number": 1.0, "den:how_much|text": -2.0,
    "den:when|date": 1.5, "den:when|number": 0.2, "den:when|text": -0.3,
    "den:who|text": 1.0, "den:who|number": -1.5, "den:who|date": -1.5,
    "den:which|text": 0.6, "den:which|number": -0.8, "den:which|date": -0.5,
    "den:where|text": 0.8, "den:where|number": -1.5,
    "den:yes_no|yesno": 1.0, "den:yes_no|number": -0.5, "den:yes_no|text": -1.0, "den:other|yesno": -3.0,
    "den:how_many|yesno": -3.0, "den:which|yesno": -3.0, "den:what|yesno": -3.0,
    "den:who|yesno": -3.0, "den:when|yesno": -3.0,
    "den:repeats_number": -1.5, "den:table": -0.5, "den:list|many": 0.6,
    "den:how_many|many": -2.0, "den:how_much|many": -2.0,   # one quantity asked, a list given
    "den:singular|many": -0.6,
}
