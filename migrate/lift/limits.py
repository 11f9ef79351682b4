"""Name what a mapper or reducer does that this version does not convert (the honest limits).

Recognises: Java APIs whose effect the plan cannot express yet or at all — date parsing
(SimpleDateFormat, DateTimeFormatter, Calendar), randomness, the wall clock, I/O inside a
task, collections kept in fields (state across records, in-mapper combining), counters.
Produces: a category, a reason and a suggested DataFrame equivalent for the hand-work item
raised where lifting stopped. Caveats: it only names; it never converts anything.
"""
from __future__ import annotations

import re
from dataclasses import dataclass


from migrate.java.index import ClassInfo


@dataclass(frozen=True)
class Limit:
    category: str
    pattern: str  # a regular expression over one source line
    reason: str
    suggestion: str
    profile: str
    fields_only: bool = False  # a local of this kind in the method is not state across records


LIMITS = (
    Limit("dates", r"\b(SimpleDateFormat|DateTimeFormatter|Calendar|LocalDateTime|LocalDate|ZonedDateTime)\b|\bDate\b",
          "date and time parsing is not converted in this version",
          "F.to_timestamp(col, pattern) and F.hour/F.dayofweek; pin spark.sql.session.timeZone to the old JVM zone",
          "P1"),
    Limit("randomness", r"\b(Random|ThreadLocalRandom|Math\.random|UUID\.randomUUID)\b",
          "random numbers give different output on every run; there is nothing to prove equal",
          "F.rand(seed) if any random order will do; otherwise decide what the output should be", "P3"),
    Limit("wall-clock", r"System\.(currentTimeMillis|nanoTime)|new Date\(\)|Instant\.now|LocalDateTime\.now",
          "the task reads the wall clock; the output depends on when it ran",
          "pass the run time as a script parameter and use F.lit(it)", "P3"),
    Limit("io-in-task", r"\b(FileSystem|FileReader|BufferedReader|FileInputStream|URL|HttpURLConnection|HttpClient|"
                        r"Socket|DriverManager|Connection)\b",
          "the task reads or writes outside its input and output (files, network, database)",
          "load the side data as a DataFrame and join it; call services outside the job", "P3"),
    Limit("task-state", r"\b(HashMap|TreeMap|HashSet|TreeSet|ArrayList|LinkedList|PriorityQueue|Map|List|Set)\s*<",
          "a collection kept across records (in-task state: in-mapper combining, top-N)",
          "the aggregation or window function the collection stands for (groupBy/agg, Window + row_number)", "P2",
          fields_only=True),
    Limit("counter", r"getCounter|incrCounter",
          "a Hadoop counter update the converter could not read",
          "count with a separate aggregation over the same DataFrame", "P1"),
)


def explain(cls: ClassInfo, line: int, ignore: set[str] = frozenset()) -> Limit | None:
    """The limit behind a failure at `line` of `cls`: the failing line first, then the class's
    fields (not those in `ignore`: side tables, which lift.sidefiles explains)."""
    lines = cls.file.lines
    candidates = [(lines[line - 1], False)] if 0 < line <= len(lines) else []
    for f in cls.fields():
        if f.position and not {d.name for d in f.declarators} & ignore:
            candidates.append((lines[f.position.line - 1], True))
    for text, is_field in candidates:
        code = text.split("//", 1)[0]
        for lim in LIMITS:
            if (is_field or not lim.fields_only) and re.search(lim.pattern, code):
                return lim
    return None
