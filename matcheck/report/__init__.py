"""Render a report in one output format."""
