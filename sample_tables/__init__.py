"""The demo tables, shipped inside the package as tabq.sample_tables (see pyproject.toml)."""
