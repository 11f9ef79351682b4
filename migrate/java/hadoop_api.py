"""Names from the Hadoop and JDK APIs that the front end resolves against (both MapReduce APIs)."""
from __future__ import annotations

MAPRED = "org.apache.hadoop.mapred"
MAPREDUCE = "org.apache.hadoop.mapreduce"

# fully qualified name -> what it is to the front end
KNOWN_CLASSES: dict[str, str] = {
    f"{MAPREDUCE}.Mapper": "mapper-base",
    f"{MAPREDUCE}.Reducer": "reducer-base",
    f"{MAPREDUCE}.Partitioner": "partitioner-base",
    f"{MAPREDUCE}.Job": "job",
    f"{MAPRED}.Mapper": "mapper-base",
    f"{MAPRED}.Reducer": "reducer-base",
    f"{MAPRED}.Partitioner": "partitioner-base",
    f"{MAPRED}.MapReduceBase": "mapred-base",
    f"{MAPRED}.JobConf": "jobconf",
    f"{MAPRED}.JobClient": "jobclient",
    f"{MAPRED}.OutputCollector": "collector",
    f"{MAPRED}.Reporter": "reporter",
    "org.apache.hadoop.io.WritableComparator": "comparator-base",
    "org.apache.hadoop.io.RawComparator": "comparator-base",
    "java.util.Comparator": "comparator-base",
    "org.apache.hadoop.io.Writable": "writable-base",
    "org.apache.hadoop.io.WritableComparable": "writable-base",
    "org.apache.hadoop.util.Tool": "tool",
    "org.apache.hadoop.conf.Configured": "configured",
    "org.apache.hadoop.conf.Configuration": "configuration",
    # Mapper and reducer classes that ship with Hadoop, recognised directly.
    f"{MAPREDUCE}.lib.map.TokenCounterMapper": "lib-mapper",
    f"{MAPREDUCE}.lib.map.InverseMapper": "lib-mapper",
    f"{MAPREDUCE}.lib.map.RegexMapper": "lib-mapper",
    f"{MAPREDUCE}.lib.reduce.IntSumReducer": "lib-reducer",
    f"{MAPREDUCE}.lib.reduce.LongSumReducer": "lib-reducer",
    f"{MAPRED}.lib.TokenCountMapper": "lib-mapper",
    f"{MAPRED}.lib.InverseMapper": "lib-mapper",
    f"{MAPRED}.lib.RegexMapper": "lib-mapper",
    f"{MAPRED}.lib.IdentityMapper": "lib-mapper",
    f"{MAPRED}.lib.IdentityReducer": "lib-reducer",
    f"{MAPRED}.lib.LongSumReducer": "lib-reducer",
    # the aggregate framework's own classes (ValueAggregatorJob sets them): known, not converted
    **{f"{api}.lib.aggregate.ValueAggregator{role}": f"lib-{role.lower()}"
       for api in (MAPREDUCE, MAPRED) for role in ("Mapper", "Reducer", "Combiner")},
}

# Writable classes -> the Java value type they hold (None = NullWritable).
WRITABLE_TYPES: dict[str, str | None] = {
    "org.apache.hadoop.io.Text": "String",
    "org.apache.hadoop.io.IntWritable": "int",
    "org.apache.hadoop.io.VIntWritable": "int",
    "org.apache.hadoop.io.LongWritable": "long",
    "org.apache.hadoop.io.VLongWritable": "long",
    "org.apache.hadoop.io.DoubleWritable": "double",
    "org.apache.hadoop.io.FloatWritable": "float",
    "org.apache.hadoop.io.BooleanWritable": "boolean",
    "org.apache.hadoop.io.NullWritable": None,
    "java.lang.String": "String",
    "java.lang.Object": "String",
}

INPUT_FORMATS = {
    "TextInputFormat": "text",
    "KeyValueTextInputFormat": "keyvalue",
}
OUTPUT_FORMATS = {"TextOutputFormat": "text"}

# java.lang, always in scope
JAVA_LANG = {"String", "Integer", "Long", "Double", "Float", "Boolean", "Math", "Object", "System",
             "Exception", "NumberFormatException", "ArrayIndexOutOfBoundsException",
             "IndexOutOfBoundsException", "RuntimeException", "Character", "StringBuilder"}

# packages whose classes the front end can name from a wildcard import without seeing source
WILDCARD_PACKAGES = {
    "org.apache.hadoop.io", MAPREDUCE, MAPRED, "org.apache.hadoop.conf", "org.apache.hadoop.util",
    "org.apache.hadoop.fs", f"{MAPREDUCE}.lib.input", f"{MAPREDUCE}.lib.output", f"{MAPREDUCE}.lib.map",
    f"{MAPREDUCE}.lib.reduce", f"{MAPRED}.lib", "java.util", "java.io",
}
SIMPLE_TO_FQCN: dict[str, list[str]] = {}
for _fq in list(KNOWN_CLASSES) + list(WRITABLE_TYPES):
    SIMPLE_TO_FQCN.setdefault(_fq.rsplit(".", 1)[1], []).append(_fq)
