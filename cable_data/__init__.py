"""Marks cable_data/ as the package ``linecalc.cable_data`` (see pyproject.toml), so its YAML files install as package data."""
