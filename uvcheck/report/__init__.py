"""Renderers: terminal text, JSON, HTML, PDF and CSV, all from ``Assessment.to_dict()``."""
