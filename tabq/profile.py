"""profile: step 4 of loading — what each column of TABLE holds (counts, ends, labels)."""

from __future__ import annotations

from .retype import INTEGER_TYPES, VIEW_KINDS, Plan
from .table import ROW, TABLE, Column, Con, ident

# Columns measured per scan. A distinct count keeps a hash table per thread: a thousand of them
# in one query took DuckDB past 4 GB on a 4-row table; one scan per 64 keeps the usual table at
# one scan.
BATCH = 64

def profile(con: Con, plans: list[Plan],
             row_count: int) -> tuple[Column, ...]:
    """Columns in file order, each base column followed by its views; one scan for the stats."""
    columns = []
    for plan in plans:
        columns.append(Column(plan.name, plan.header, plan.kind, plan.name, distinct=plan.distinct,
                              nulls=row_count - plan.nonnull, values=plan.values))
        columns += [Column(f"{plan.name}__{view}", plan.header, VIEW_KINDS[view], plan.name, view)
                    for view in plan.views]
    types = {row[0]: row[1] for row in con.execute(f"DESCRIBE {TABLE}").fetchall()}
    measured = [c for c in columns if c.kind != "text"]
    if not measured:
        return tuple(columns)
    parts = []
    for col in measured:
        ref, sql_type = ident(col.name), types[col.name]
        real = f" FILTER (WHERE NOT isnan({ref}))" if sql_type in ("DOUBLE", "FLOAT") else ""
        whole = ("true" if sql_type in INTEGER_TYPES else
                 f"coalesce(bool_and({ref} = trunc({ref})), false)" if col.kind == "number"
                 else "false")
        ends = f"min({ref}){real}, max({ref}){real}" if col.kind != "bool" else "NULL, NULL"
        parts.append(f"count(DISTINCT {ref}), count({ref}), {ends}, {whole}")
    stats: list = []
    for start in range(0, len(parts), BATCH):   # distinct counts hold a hash table each
        batch = parts[start:start + BATCH]
        stats += con.execute(f"SELECT {', '.join(batch)} FROM {TABLE}").fetchone()
    profiled = {}
    for i, col in enumerate(measured):
        distinct, nonnull, low, high, whole = stats[5 * i: 5 * i + 5]
        profiled[col.name] = Column(
            col.name, col.header, col.kind, col.base, col.view, distinct=distinct,
            nulls=row_count - nonnull, values=_bool_values(con, col) if col.kind == "bool" else (),
            minimum=_stat(low), maximum=_stat(high), integer=bool(whole) and nonnull > 0)
    return tuple(profiled.get(c.name, c) for c in columns)


def _stat(value: object) -> float | str | None:
    if value is None:
        return None
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return float(value)


def _bool_values(con: Con, col: Column) -> tuple[str, ...]:
    ref = ident(col.name)
    rows = con.execute(f"SELECT CAST({ref} AS VARCHAR) FROM {TABLE} WHERE {ref} IS NOT NULL "
                       f"GROUP BY {ref} ORDER BY count(*) DESC, min({ident(ROW)})").fetchall()
    return tuple(v for (v,) in rows)
