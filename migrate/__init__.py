"""mrlift: scan legacy Hadoop MapReduce (Java) repositories and lift them to PySpark DataFrame scripts."""

__version__ = "0.1.0"
