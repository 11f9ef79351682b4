"""Run the original job on Hadoop's local runner and the generated script on local Spark; compare."""
