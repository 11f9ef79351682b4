"""Findings, the effort estimate, and their renderings (json, markdown)."""
