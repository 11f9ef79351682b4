"""Generators: the only place that knows PySpark."""
