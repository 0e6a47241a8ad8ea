"""Messy table files for issue 15 ("never answer from a misread table").

`corpus.CASES` lists the cases: each writes its file(s) into a folder from Python rows, and its
questions carry answers computed from those rows before anything is written. The runner is
`benchmarks/messy_files.py`; the tests are `tests/test_messy_files.py`.
"""
